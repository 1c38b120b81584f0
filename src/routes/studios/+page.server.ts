import { redirect } from '@sveltejs/kit';
import { switchStudioForm } from '$lib/schemas/account';
import { studiosOf, switchStudio } from '$lib/server/accounts';
import { requireUser } from '$lib/server/access';
import { forPage } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	return { studios: await studiosOf(user.id) };
};

export const actions: Actions = {
	switch: async ({ locals, request, url }) => {
		const user = requireUser(locals, url);
		const parsed = await readForm(request, switchStudioForm);
		if (!parsed.ok) return parsed.failure;
		// Not a member of that studio: the error page (404).
		await forPage(() => switchStudio(user.id, parsed.data.studioId));
		redirect(303, '/builds');
	}
};
