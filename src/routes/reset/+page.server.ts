import { requestPasswordReset } from '$lib/server/accounts';
import { readForm } from '$lib/server/forms';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import { resetRequestSchema } from '$lib/schemas/account';
import type { Actions } from './$types';

export const actions: Actions = {
	default: async (event) => {
		await enforce(event, 'reset', limits.reset);
		const parsed = await readForm(event.request, resetRequestSchema);
		if (!parsed.ok) return parsed.failure;
		await requestPasswordReset(parsed.data.email);
		// The same answer whether or not the address has an account.
		return { sent: true, values: { email: parsed.data.email } };
	}
};
