import { json } from '@sveltejs/kit';
import { partCategorySchema } from '$lib/geometry';
import { jsonObject, readJson } from '$lib/server/api';
import { catalogAccess, partQueryOf, valueOf } from '$lib/server/catalog/http';
import { ServiceError, jsonRoute } from '$lib/server/errors';
import {
	createPart,
	getPartsByIds,
	listParts,
	listPartsForStudio
} from '$lib/server/catalog/parts';
import type { RequestHandler } from './$types';

/** A build places a few dozen parts; the editor asks for all of them in one call. */
const MAX_IDS = 500;

/**
 * `?ids=a,b` → those parts (archived and standard included, for builds that place them);
 * `?search=1&q=&category=&limit=` → the add-part search (archived left out);
 * otherwise one page of the catalogue table (`q, category, scope, archived, sort, dir, page, size`).
 */
export const GET: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const params = event.url.searchParams;
	const ids = params.get('ids');
	if (ids !== null) {
		const list = ids.split(',').filter(Boolean);
		if (list.length > MAX_IDS || list.some((id) => id.length > 64)) {
			throw new ServiceError(
				'invalid',
				`ids: at most ${MAX_IDS} ids of at most 64 characters each.`,
				{
					issues: [{ path: 'ids', message: 'Too many or too long' }]
				}
			);
		}
		return json({ parts: await getPartsByIds(access.studioId, list) });
	}
	if (params.get('search') === '1') {
		const category = partCategorySchema.safeParse(params.get('category'));
		const parts = await listPartsForStudio(access.studioId, {
			q: (params.get('q') ?? '').slice(0, 200),
			category: category.success ? category.data : undefined,
			limit: Math.min(100, Math.max(1, Math.floor(Number(params.get('limit')) || 50)))
		});
		return json({ parts });
	}
	const page = await listParts(access.studioId, partQueryOf(params));
	return json({ parts: page.rows, total: page.total, page: page.page, pageSize: page.pageSize });
});

/** Body: the part (name, category, bodies, keepouts, ports, specs, provenance, toleranceMm, source, priceMinor, currency, supplierNote). */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const made = await createPart(access.studioId, await readJson(event.request, jsonObject));
	return json({ part: valueOf(made) }, { status: 201 });
});
