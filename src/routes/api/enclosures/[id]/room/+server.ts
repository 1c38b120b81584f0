import { json } from '@sveltejs/kit';
import { enclosureDefSchema } from '$lib/geometry';
import { roomTable } from '$lib/geometry/room';
import { getEnclosure } from '$lib/server/catalog/enclosures';
import { catalogAccess, notFound } from '$lib/server/catalog/http';
import { jsonRoute } from '$lib/server/errors';
import type { RequestHandler } from './$types';

/**
 * The enclosure's clearance table (its current version): the room per compartment and per mount
 * at every allowed position of its controls, each figure with what bounds it. Reads only.
 */
export const GET: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const enclosure = await getEnclosure(access.studioId, event.params.id);
	if (!enclosure) throw notFound();
	// Stored definitions were validated when saved; parsing again fills defaults a later schema added.
	const def = enclosureDefSchema.parse(enclosure.current.def);
	return json({
		enclosureId: enclosure.id,
		version: enclosure.current.version,
		room: roomTable(def)
	});
});
