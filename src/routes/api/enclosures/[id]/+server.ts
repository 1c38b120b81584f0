import { json } from '@sveltejs/kit';
import {
	archiveEnclosure,
	getEnclosure,
	restoreEnclosure,
	updateEnclosure
} from '$lib/server/catalog/enclosures';
import { jsonObject, readJson } from '$lib/server/api';
import { catalogAccess, found, revisionOf, valueOf } from '$lib/server/catalog/http';
import { ServiceError, jsonRoute } from '$lib/server/errors';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	return json({ enclosure: found(await getEnclosure(access.studioId, event.params.id)) });
});

/**
 * Body: `{revision, definition, description?, note?}`. A build using the current version makes
 * this a new version; a stale revision answers 409 with what is stored now.
 */
export const PUT: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	const saved = await updateEnclosure(
		access.studioId,
		event.params.id,
		revisionOf(body),
		access.user.id,
		{
			definition: body.definition,
			description: body.description as string | undefined,
			note: body.note as string | undefined
		}
	);
	return json({ enclosure: valueOf(saved) });
});

/** Body: `{archived: boolean}`. Enclosures are never deleted: builds pin their versions. */
export const PATCH: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	if (typeof body.archived !== 'boolean') {
		throw new ServiceError('invalid', 'Send {"archived": true} or {"archived": false}.', {
			field: 'archived'
		});
	}
	const change = body.archived ? archiveEnclosure : restoreEnclosure;
	return json({ enclosure: found(await change(access.studioId, event.params.id)) });
});
