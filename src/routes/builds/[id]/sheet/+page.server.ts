import { fail } from '@sveltejs/kit';
import { parseForm } from '$lib/server/forms';
import { TickRejected, loadSheet, setTick, tickSchema } from '$lib/server/sheet';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) =>
	loadSheet(locals, params.id, url);

export const actions: Actions = {
	/** Ticks or unticks one checklist item; works as a plain form post without JavaScript. */
	tick: async ({ locals, params, request }) => {
		const parsed = await parseForm(request, tickSchema);
		if (!parsed.ok) return parsed.failure;
		try {
			return await setTick(locals, params.id, parsed.data);
		} catch (e) {
			if (e instanceof TickRejected) {
				return fail(400, { values: parsed.raw, errors: { key: e.message } });
			}
			throw e;
		}
	}
};
