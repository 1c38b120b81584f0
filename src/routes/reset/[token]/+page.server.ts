import { redirect } from '@sveltejs/kit';
import { findValidReset, resetPassword } from '$lib/server/accounts';
import { endAllSessions } from '$lib/server/auth';
import { formFail } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import { resetSchema } from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	await enforce(event, 'reset-token', limits.shareToken);
	const reset = await findValidReset(event.params.token);
	return { valid: !!reset };
};

export const actions: Actions = {
	default: async (event) => {
		await enforce(event, 'reset-token', limits.shareToken);
		const parsed = await readForm(event.request, resetSchema);
		if (!parsed.ok) return parsed.failure;
		const userId = await resetPassword(event.params.token, parsed.data.password);
		if (!userId) {
			return formFail(
				400,
				{},
				{ _: 'This link has expired or was already used. Ask for a new one.' }
			);
		}
		// A new password ends every session, including any an attacker may hold.
		await endAllSessions(event.cookies, userId);
		redirect(303, '/signin?reset=1');
	}
};
