import { json } from '@sveltejs/kit';
import { createEnclosure, listEnclosures } from '$lib/server/catalog/enclosures';
import { jsonObject, readJson } from '$lib/server/api';
import { catalogAccess, valueOf } from '$lib/server/catalog/http';
import { jsonRoute } from '$lib/server/errors';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const q = (event.url.searchParams.get('q') ?? '').slice(0, 200);
	const enclosures = await listEnclosures(access.studioId, {
		q,
		archived: event.url.searchParams.get('archived') === '1'
	});
	return json({ enclosures });
});

/** Body: `{definition, description?, note?}`; the definition is the engine's EnclosureDef. */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const body = await readJson(event.request, jsonObject);
	const made = await createEnclosure(access.studioId, access.user.id, {
		definition: body.definition,
		description: body.description as string | undefined,
		note: body.note as string | undefined
	});
	return json({ enclosure: valueOf(made) }, { status: 201 });
});
