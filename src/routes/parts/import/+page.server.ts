import { fail } from '@sveltejs/kit';
import { activeStudio } from '$lib/server/access';
import { csvCommitForm, csvUploadForm } from '$lib/catalog/schemas';
import { decodeCsv, importPartsCsv, MAX_CSV_BYTES } from '$lib/server/catalog/csv';
import { readForm } from '$lib/server/forms';
import { studioPage } from '../../studio-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('catalog.edit', async () => ({
	maxMb: MAX_CSV_BYTES / 1024 / 1024
}));

/**
 * Preview and commit both read the CSV text itself (the preview hands it back to the page), so
 * the server keeps nothing between the two steps and the commit checks every row again. Both read
 * the post through the form schemas (superforms takes the file as a File).
 */
export const actions: Actions = {
	preview: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const parsed = await readForm(request, csvUploadForm);
		if (!parsed.ok) return fail(400, { fileError: firstError(parsed.failure.data.errors) });
		const { file } = parsed.data;
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
		const parsed = await readForm(request, csvCommitForm);
		if (!parsed.ok) return fail(400, { fileError: firstError(parsed.failure.data.errors) });
		const decoded = decodeCsv(new TextEncoder().encode(parsed.data.csv));
		if (!decoded.text) return fail(400, { fileError: decoded.error });
		const report = await importPartsCsv(access.studioId, decoded.text, true);
		if (report.fileError) return fail(400, { fileError: report.fileError });
		return { step: 'done' as const, report };
	}
};

/** The page shows one message about the file, whichever field the form schema refused. */
const firstError = (errors: Record<string, string>) =>
	Object.values(errors)[0] ?? 'The file cannot be read.';
