import { redirect } from '@sveltejs/kit';
import { newBuildForm } from '$lib/schemas/builds';
import { activeStudio } from '$lib/server/access';
import { createBuild } from '$lib/server/builds';
import { listEnclosures } from '$lib/server/catalog/enclosures';
import { forForm } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'build.edit', url);
	const list = (await listEnclosures(access.studioId)).map(({ id, name, volumeLitres }) => ({
		id,
		name,
		volumeLitres
	}));
	return { enclosures: list, preselect: url.searchParams.get('enclosure') ?? '' };
};

export const actions: Actions = {
	default: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'build.edit', url);
		const parsed = await readForm(request, newBuildForm);
		if (!parsed.ok) return parsed.failure;
		// An enclosure that is not there (or not this studio's) is a wrong choice in the form: 400 on
		// its field, the form shown again.
		const id = await forForm(
			() => createBuild({ ...parsed.data, studioId: access.studioId, userId: access.user.id }),
			{ values: parsed.values, field: 'enclosureId', status: 400 }
		);
		if (typeof id !== 'string') return id;
		redirect(303, `/builds/${id}`);
	}
};
