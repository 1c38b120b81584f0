import { json } from '@sveltejs/kit';
import { getEnclosureVersion } from '$lib/server/catalog/enclosures';
import { catalogAccess, notFound } from '$lib/server/catalog/http';
import { jsonRoute } from '$lib/server/errors';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const version = await getEnclosureVersion(access.studioId, event.params.versionId);
	if (!version || version.enclosureId !== event.params.id) throw notFound();
	return json({ version });
});
