import { csvExport } from '$lib/server/catalog/export';
import type { RequestHandler } from './$types';

/** The table's current filter as a CSV download (same columns as the API's export). */
export const GET: RequestHandler = (event) => csvExport(event);
