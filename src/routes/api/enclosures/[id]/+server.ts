import { json } from '@sveltejs/kit';
import {
	archiveEnclosure,
	getEnclosure,
	restoreEnclosure,
	updateEnclosure
} from '$lib/server/catalog/enclosures';
import { revisionOf, valueOf } from '$lib/server/catalog/http';
import { catalogItem } from '../../catalog-item';
import type { RequestHandler } from './$types';

const enclosure = catalogItem('enclosure', {
	get: getEnclosure,
	archive: archiveEnclosure,
	restore: restoreEnclosure
});

export const GET: RequestHandler = enclosure.GET;

/**
 * Body: `{revision, definition, description?, note?}`. A build using the current version makes
 * this a new version; a stale revision answers 409 with what is stored now.
 */
export const PUT: RequestHandler = enclosure.change(async (access, body, id) => {
	const saved = await updateEnclosure(access.studioId, id, revisionOf(body), access.user.id, {
		definition: body.definition,
		description: body.description as string | undefined,
		note: body.note as string | undefined
	});
	return json({ enclosure: valueOf(saved) });
});

/** Body: `{archived: boolean}`. Enclosures are never deleted: builds pin their versions. */
export const PATCH: RequestHandler = enclosure.change((access, body, id) =>
	enclosure.archived(access, body, id, 'Send {"archived": true} or {"archived": false}.')
);
