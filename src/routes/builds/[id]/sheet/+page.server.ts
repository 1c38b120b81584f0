import { tickForm } from '$lib/schemas/builds';
import { forForm, forPage } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import { loadSheet, setTick } from '$lib/server/sheet';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) =>
	forPage(() => loadSheet(locals, params.id, url));

export const actions: Actions = {
	/** Ticks or unticks one checklist item; works as a plain form post without JavaScript. */
	tick: async ({ locals, params, request }) => {
		const parsed = await readForm(request, tickForm);
		if (!parsed.ok) return parsed.failure;
		// A key the sheet does not have answers on `key`; no such variant shows the error page.
		return forForm(() => setTick(locals, params.id, parsed.data), { values: parsed.values });
	}
};
