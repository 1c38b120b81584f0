import { loadSheet } from '$lib/server/sheet';
import { renderSheetPdf } from '$lib/server/sheet-pdf';
import type { RequestHandler } from './$types';
import { pageRoute } from '$lib/server/errors';

/** The build sheet as a PDF (?variant=…&paper=a4|letter), for anyone who may see the build. */
export const GET: RequestHandler = pageRoute(async ({ locals, params, url }) => {
	const data = await loadSheet(locals, params.id, url);
	const pdf = await renderSheetPdf(data);
	const name = `build-sheet-${data.build.name}-${data.variant.name}`
		.toLowerCase()
		.replace(/[^a-z0-9]+/g, '-')
		.replace(/^-|-$/g, '')
		.slice(0, 80);
	return new Response(new Uint8Array(pdf), {
		headers: {
			'content-type': 'application/pdf',
			'content-length': String(pdf.byteLength),
			'content-disposition': `attachment; filename="${name || 'build-sheet'}.pdf"`,
			'cache-control': 'private, no-store',
			'x-content-type-options': 'nosniff'
		}
	});
});
