import { error, redirect } from '@sveltejs/kit';
import { activeStudio, roleMay } from '$lib/server/access';
import { partFormFor, savePartForm } from '$lib/server/catalog/part-form';
import {
	archivePart,
	deletePart,
	duplicatePart,
	getPart,
	partUseCount,
	restorePart
} from '$lib/server/catalog/parts';
import { archivedAction, itemPage, saveAction } from '../../catalog-actions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = itemPage(getPart, async (part, access, url) => ({
	canEdit: roleMay(access.role, 'catalog.edit') && !part.isStandard,
	part,
	uses: part.isStandard ? 0 : await partUseCount(access.studioId, part.id),
	saved: url.searchParams.has('saved'),
	copied: url.searchParams.has('copied'),
	form: await partFormFor(part)
}));

export const actions: Actions = {
	save: saveAction(savePartForm),
	duplicate: async ({ locals, url, params }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const copy = await duplicatePart(access.studioId, params.id);
		if (!copy.ok) error(copy.status === 404 ? 404 : 400, 'Could not copy this part.');
		redirect(303, `/parts/${copy.value.id}?copied=1`);
	},
	archive: archivedAction(archivePart, '/parts'),
	restore: archivedAction(restorePart, '/parts'),
	delete: async ({ locals, url, params }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const done = await deletePart(access.studioId, params.id);
		if (!done.ok) error(done.status, done.message);
		redirect(303, '/parts');
	}
};
