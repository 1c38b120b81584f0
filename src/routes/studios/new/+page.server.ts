import { redirect } from '@sveltejs/kit';
import { createStudio } from '$lib/server/accounts';
import { requireUser } from '$lib/server/access';
import { readForm } from '$lib/server/forms';
import { studioSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	requireUser(locals, url);
	return {};
};

export const actions: Actions = {
	default: async ({ locals, request, url }) => {
		const user = requireUser(locals, url);
		const parsed = await readForm(request, studioSchema);
		if (!parsed.ok) return parsed.failure;
		await createStudio(user.id, parsed.data.name);
		redirect(303, '/builds');
	}
};
