import { redirect } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import { endAllSessions } from '$lib/server/auth';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	const user = requireUser(locals, url);
	return { email: user.email, name: user.name };
};

export const actions: Actions = {
	everywhere: async ({ locals, cookies, url }) => {
		const user = requireUser(locals, url);
		await endAllSessions(cookies, user.id);
		redirect(303, '/signin');
	}
};
