import { redirect } from '@sveltejs/kit';
import { checkCredentials, resendConfirmation } from '$lib/server/accounts';
import { startSession } from '$lib/server/auth';
import { formFail } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import { safeNext } from '$lib/server/redirects';
import { signInSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals, url }) => {
	if (locals.user) redirect(303, safeNext(url.searchParams.get('next'), url.origin) ?? '/builds');
	return { next: url.searchParams.get('next') ?? '', reset: url.searchParams.has('reset') };
};

export const actions: Actions = {
	default: async (event) => {
		await enforce(event, 'signin-address', limits.signInAddress);
		const parsed = await readForm(event.request, signInSchema);
		if (!parsed.ok) return parsed.failure;
		await enforce(event, 'signin', limits.signIn, parsed.data.email);
		const user = await checkCredentials(parsed.data.email, parsed.data.password);
		if (!user) {
			// One answer for "no such e-mail" and "wrong password".
			return formFail(
				400,
				{ email: parsed.data.email },
				{ _: 'That e-mail and password do not match an account.' }
			);
		}
		if (!user.emailVerifiedAt) {
			// The right password, but the address was never confirmed: no session, a fresh link.
			await resendConfirmation(user);
			redirect(303, '/check-mail');
		}
		await startSession(event.cookies, user.id);
		redirect(303, safeNext(parsed.values.next, event.url.origin) ?? '/builds');
	}
};
