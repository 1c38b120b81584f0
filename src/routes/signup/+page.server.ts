import { redirect } from '@sveltejs/kit';
import { RuleError, createUser } from '$lib/server/accounts';
import { startSession } from '$lib/server/auth';
import { formFail, parseForm } from '$lib/server/forms';
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
		const parsed = await parseForm(event.request, signUpSchema);
		if (!parsed.ok) return parsed.failure;
		try {
			const userId = await createUser(parsed.data);
			await startSession(event.cookies, userId);
		} catch (e) {
			if (e instanceof RuleError) {
				return formFail(400, { name: parsed.data.name, email: parsed.data.email }, { [e.field]: e.message });
			}
			throw e;
		}
		redirect(303, safeNext(parsed.raw.next, event.url.origin) ?? '/studios/new');
	}
};
