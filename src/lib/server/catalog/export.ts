import type { RequestEvent } from '@sveltejs/kit';
import { allParts } from './parts';
import { partsToCsv } from './csv';
import { catalogAccess, partQueryOf } from './http';

/** The CSV download for the page and the API alike: the same filters as the table, every page. */
export async function csvExport(event: RequestEvent): Promise<Response> {
	const access = await catalogAccess(event, 'catalog.view');
	const query = partQueryOf(event.url.searchParams);
	const rows = await allParts(access.studioId, query);
	const stamp = new Date().toISOString().slice(0, 10);
	return new Response(partsToCsv(rows), {
		headers: {
			'content-type': 'text/csv; charset=utf-8',
			'content-disposition': `attachment; filename="parts-${stamp}.csv"`,
			'cache-control': 'private, no-store'
		}
	});
}
