import { csvExport } from '$lib/server/catalog/export';
import type { RequestHandler } from './$types';

/** The catalogue (or the filtered view the query names) as CSV; see docs/catalog-csv.md. */
export const GET: RequestHandler = (event) => csvExport(event);
