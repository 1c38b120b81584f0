import { fail } from '@sveltejs/kit';
import { activeStudio } from '$lib/server/access';
import { decodeCsv, importPartsCsv, MAX_CSV_BYTES } from '$lib/server/catalog/csv';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'catalog.edit', url);
	return { studioName: access.studioName, maxMb: MAX_CSV_BYTES / 1024 / 1024 };
};

/**
 * Preview and commit both read the CSV text itself (the preview hands it back to the page), so
 * the server keeps nothing between the two steps and the commit checks every row again.
 */
export const actions: Actions = {
	preview: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const file = (await request.formData()).get('file');
		if (!(file instanceof File) || file.size === 0) {
			return fail(400, { fileError: 'Choose a CSV file to import.' });
		}
		if (file.size > MAX_CSV_BYTES) {
			return fail(400, {
				fileError: `The file is ${(file.size / 1024 / 1024).toFixed(1)} MB; at most 2 MB can be imported at once.`
			});
		}
		const decoded = decodeCsv(new Uint8Array(await file.arrayBuffer()));
		if (!decoded.text) return fail(400, { fileError: decoded.error });
		const report = await importPartsCsv(access.studioId, decoded.text, false);
		if (report.fileError) return fail(400, { fileError: report.fileError });
		return {
			step: 'preview' as const,
			fileName: file.name.slice(0, 200),
			csv: decoded.text,
			report
		};
	},
	commit: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const text = String((await request.formData()).get('csv') ?? '');
		const decoded = decodeCsv(new TextEncoder().encode(text));
		if (!decoded.text) return fail(400, { fileError: decoded.error });
		const report = await importPartsCsv(access.studioId, decoded.text, true);
		if (report.fileError) return fail(400, { fileError: report.fileError });
		return { step: 'done' as const, report };
	}
};
