import { json } from '@sveltejs/kit';
import { decodeCsv, importPartsCsv, MAX_CSV_BYTES } from '$lib/server/catalog/csv';
import { problem } from '$lib/server/api';
import { catalogAccess } from '$lib/server/catalog/http';
import type { RequestHandler } from './$types';

/**
 * Body: the CSV file as text/csv. Without `?commit=1` a preview that writes nothing; with it, the
 * valid rows are written in one transaction. Answers the report either way (422 for a bad file).
 */
export const POST: RequestHandler = async (event) => {
	const access = await catalogAccess(event, 'catalog.edit');
	const type = event.request.headers.get('content-type') ?? '';
	if (!/^(text\/csv|text\/plain|application\/csv)/i.test(type)) {
		return problem(415, 'Send the CSV as text/csv.');
	}
	if (Number(event.request.headers.get('content-length') ?? 0) > MAX_CSV_BYTES) {
		return problem(413, 'The file is larger than 2 MB.');
	}
	const decoded = decodeCsv(new Uint8Array(await event.request.arrayBuffer()));
	if (!decoded.text) return problem(422, decoded.error ?? 'The file cannot be read.');
	const report = await importPartsCsv(
		access.studioId,
		decoded.text,
		event.url.searchParams.get('commit') === '1'
	);
	return json({ report }, { status: report.fileError ? 422 : 200 });
};
