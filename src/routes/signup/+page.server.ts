import { redirect } from '@sveltejs/kit';
import { signUp } from '$lib/server/accounts';
import { startSession } from '$lib/server/auth';
import { readForm } from '$lib/server/forms';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import { signUpSchema } from '$lib/schemas/account';
import { safeNext } from '$lib/server/redirects';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next'), url.origin) ?? '/builds');
	return { next: url.searchParams.get('next') ?? '' };
};

export const actions: Actions = {
	default: async (event) => {
		await enforce(event, 'signup', limits.signUp);
		const parsed = await readForm(event.request, signUpSchema);
		if (!parsed.ok) return parsed.failure;
		const next = safeNext(parsed.values.next, event.url.origin);
		const { userId } = await signUp({ ...parsed.data, next });
		if (userId) {
			// Signed up from an invitation mailed to this very address: the address is proven.
			await startSession(event.cookies, userId);
			redirect(303, next ?? '/studios/new');
		}
		// The same answer for a new address and a known one: the mail says which it was.
		redirect(303, '/check-mail');
	}
};
