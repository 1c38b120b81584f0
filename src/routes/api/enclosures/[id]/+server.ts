import { error, json } from '@sveltejs/kit';
import {
	archiveEnclosure,
	getEnclosure,
	restoreEnclosure,
	updateEnclosure
} from '$lib/server/catalog/enclosures';
import { jsonObject, readJson } from '$lib/server/api';
import { answer, catalogAccess, revisionOf } from '$lib/server/catalog/http';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const enclosure = await getEnclosure(access.studioId, event.params.id);
	if (!enclosure) error(404, 'Not found.');
	return json({ enclosure });
};

/**
 * Body: `{revision, definition, description?, note?}`. A build using the current version makes
 * this a new version; a stale revision answers 409 with what is stored now.
 */
export const PUT: RequestHandler = async (event) => {
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
	return answer(saved, 200, 'enclosure');
};

/** Body: `{archived: boolean}`. Enclosures are never deleted: builds pin their versions. */
export const PATCH: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	if (typeof body.archived !== 'boolean') {
		error(400, 'Send {"archived": true} or {"archived": false}.');
	}
	const row = await (body.archived ? archiveEnclosure : restoreEnclosure)(
		access.studioId,
		event.params.id
	);
	if (!row) error(404, 'Not found.');
	return json({ enclosure: row });
};
