import { superValidate } from 'sveltekit-superforms';
import { partAdapter, savePartForm } from '$lib/server/catalog/part-form';
import { partCategorySchema } from '$lib/geometry';
import { saveAction } from '../../catalog-actions';
import { studioPage } from '../../studio-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('catalog.edit', async (_access, { url }) => {
	const category = partCategorySchema.safeParse(url.searchParams.get('category'));
	const form = await superValidate(
		{ category: category.success ? category.data : 'other', applyTemplate: true },
		partAdapter,
		{ errors: false }
	);
	return { form };
});

export const actions: Actions = {
	save: saveAction(savePartForm)
};
