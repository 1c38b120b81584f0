import { error, json } from '@sveltejs/kit';
import { getEnclosureVersion } from '$lib/server/catalog/enclosures';
import { catalogAccess } from '$lib/server/catalog/http';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const version = await getEnclosureVersion(access.studioId, event.params.versionId);
	if (!version || version.enclosureId !== event.params.id) error(404, 'Not found.');
	return json({ version });
};
