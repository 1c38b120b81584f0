import { json } from '@sveltejs/kit';
import { catalogAccess, revisionOf, valueOf } from '$lib/server/catalog/http';
import {
	archivePart,
	deletePart,
	duplicatePart,
	getPart,
	restorePart,
	updatePart
} from '$lib/server/catalog/parts';
import { ServiceError, jsonRoute } from '$lib/server/errors';
import { catalogItem } from '../../catalog-item';
import type { RequestHandler } from './$types';

const part = catalogItem('part', { get: getPart, archive: archivePart, restore: restorePart });

export const GET: RequestHandler = part.GET;

/** Body: `{revision, ...part}`. Standard-library parts are read-only (404 here: not the studio's). */
export const PUT: RequestHandler = part.change(async (access, body, id) => {
	const { revision: _r, ...fields } = body;
	const saved = await updatePart(access.studioId, id, revisionOf(body), fields);
	return json({ part: valueOf(saved) });
});

/** Body: `{archived: boolean}` or `{duplicate: true}` (also copies a standard-library entry into the studio). */
export const PATCH: RequestHandler = part.change(async (access, body, id) => {
	if (body.duplicate === true) {
		const copy = await duplicatePart(access.studioId, id);
		return json({ part: valueOf(copy) }, { status: 201 });
	}
	return part.archived(access, body, id, 'Send {"archived": true|false} or {"duplicate": true}.');
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
