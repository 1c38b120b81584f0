import { error, json } from '@sveltejs/kit';
import { jsonObject, problem, readJson } from '$lib/server/api';
import { answer, catalogAccess, revisionOf } from '$lib/server/catalog/http';
import {
	archivePart,
	deletePart,
	duplicatePart,
	getPart,
	restorePart,
	updatePart
} from '$lib/server/catalog/parts';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const part = await getPart(access.studioId, event.params.id);
	if (!part) error(404, 'Not found.');
	return json({ part });
};

/** Body: `{revision, ...part}`. Standard-library parts are read-only (404 here: not the studio's). */
export const PUT: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	const { revision: _r, ...part } = body;
	return answer(
		await updatePart(access.studioId, event.params.id, revisionOf(body), part),
		200,
		'part'
	);
};

/** Body: `{archived: boolean}` or `{duplicate: true}` (also copies a standard-library entry into the studio). */
export const PATCH: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	if (body.duplicate === true) {
		return answer(await duplicatePart(access.studioId, event.params.id), 201, 'part');
	}
	if (typeof body.archived !== 'boolean') {
		error(400, 'Send {"archived": true|false} or {"duplicate": true}.');
	}
	const part = await (body.archived ? archivePart : restorePart)(access.studioId, event.params.id);
	if (!part) error(404, 'Not found.');
	return json({ part });
};

/** Deletes a part no build places; 409 when one does (archive it instead). */
export const DELETE: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const done = await deletePart(access.studioId, event.params.id);
	if (!done.ok) return problem(done.status, done.message);
	return new Response(null, { status: 204 });
};
