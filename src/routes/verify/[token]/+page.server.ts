import { redirect } from '@sveltejs/kit';
import { findValidVerification, verifyEmail } from '$lib/server/accounts';
import { startSession } from '$lib/server/auth';
import { formFail } from '$lib/server/errors';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import { safeNext } from '$lib/server/redirects';
import type { Actions, PageServerLoad } from './$types';

/** Opening the mailed link only shows it; confirming is a post (a GET never writes). */
export const load: PageServerLoad = async (event) => {
	await enforce(event, 'verify-token', limits.shareToken);
	const found = await findValidVerification(event.params.token);
	return { valid: !!found, email: found?.email ?? null };
};

export const actions: Actions = {
	default: async (event) => {
		await enforce(event, 'verify-token', limits.shareToken);
		const done = await verifyEmail(event.params.token);
		if (!done) {
			return formFail(
				400,
				{},
				{ _: 'This link has expired or was already used. Sign in, or sign up again for a new one.' }
			);
		}
		await startSession(event.cookies, done.userId);
		redirect(303, safeNext(done.next, event.url.origin) ?? '/studios/new');
	}
};
