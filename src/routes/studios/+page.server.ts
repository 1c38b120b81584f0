import { error, redirect } from '@sveltejs/kit';
import { RuleError, studiosOf, switchStudio } from '$lib/server/accounts';
import { requireUser } from '$lib/server/access';
import { parseForm } from '$lib/server/forms';
import { z } from 'zod';
import { line } from '$lib/schemas/common';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	return { studios: await studiosOf(user.id) };
};

export const actions: Actions = {
	switch: async ({ locals, request, url }) => {
		const user = requireUser(locals, url);
		const parsed = await parseForm(request, z.object({ studioId: line('Studio', 64) }));
		if (!parsed.ok) return parsed.failure;
		try {
			await switchStudio(user.id, parsed.data.studioId);
		} catch (e) {
			if (e instanceof RuleError) error(e.status, e.message);
			throw e;
		}
		redirect(303, '/builds');
	}
};
