import { json } from '@sveltejs/kit';
import { jsonObject, readJson } from '$lib/server/api';
import { catalogAccess, found, revisionOf, valueOf } from '$lib/server/catalog/http';
import {
	archivePart,
	deletePart,
	duplicatePart,
	getPart,
	restorePart,
	updatePart
} from '$lib/server/catalog/parts';
import { ServiceError, jsonRoute } from '$lib/server/errors';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	return json({ part: found(await getPart(access.studioId, event.params.id)) });
});

/** Body: `{revision, ...part}`. Standard-library parts are read-only (404 here: not the studio's). */
export const PUT: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	const { revision: _r, ...part } = body;
	const saved = await updatePart(access.studioId, event.params.id, revisionOf(body), part);
	return json({ part: valueOf(saved) });
});

/** Body: `{archived: boolean}` or `{duplicate: true}` (also copies a standard-library entry into the studio). */
export const PATCH: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	if (body.duplicate === true) {
		const copy = await duplicatePart(access.studioId, event.params.id);
		return json({ part: valueOf(copy) }, { status: 201 });
	}
	if (typeof body.archived !== 'boolean') {
		throw new ServiceError('invalid', 'Send {"archived": true|false} or {"duplicate": true}.', {
			field: 'archived'
		});
	}
	const change = body.archived ? archivePart : restorePart;
	return json({ part: found(await change(access.studioId, event.params.id)) });
});

/** Deletes a part no build places; 409 when one does (archive it instead). */
export const DELETE: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const done = await deletePart(access.studioId, event.params.id);
	if (!done.ok) {
		throw new ServiceError(done.status === 404 ? 'not-found' : 'conflict', done.message);
	}
	return new Response(null, { status: 204 });
});
