import { superValidate } from 'sveltekit-superforms';
import { activeStudio } from '$lib/server/access';
import { partAdapter, savePartForm } from '$lib/server/catalog/part-form';
import { partCategorySchema } from '$lib/geometry';
import { saveAction } from '../../catalog-actions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'catalog.edit', url);
	const category = partCategorySchema.safeParse(url.searchParams.get('category'));
	const form = await superValidate(
		{ category: category.success ? category.data : 'other', applyTemplate: true },
		partAdapter,
		{ errors: false }
	);
	return { studioName: access.studioName, form };
};

export const actions: Actions = {
	save: saveAction(savePartForm)
};
