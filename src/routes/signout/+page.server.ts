import { redirect } from '@sveltejs/kit';
import { endSession } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = () => redirect(303, '/');

export const actions: Actions = {
	default: async ({ locals, cookies }) => {
		if (locals.session) await endSession(cookies, locals.session.id);
		redirect(303, '/');
	}
};
