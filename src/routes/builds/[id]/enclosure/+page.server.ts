import { redirect } from '@sveltejs/kit';
import { enclosureChanges } from '$lib/catalog/enclosure-diff';
import { moveOnForm } from '$lib/schemas/builds';
import { requireBuild } from '$lib/server/access';
import { moveOn, planMoveOn } from '$lib/server/builds';
import { forForm } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build } = await requireBuild(locals, params.id, 'build.edit', url);
	const plan = await planMoveOn(build);
	return {
		build: { id: build.id, name: build.name },
		from: plan ? { version: plan.from.version, name: plan.from.definition.name } : null,
		to: plan?.to ? { id: plan.to.id, version: plan.to.version } : null,
		changes: plan?.to ? enclosureChanges(plan.from.definition, plan.to.definition) : [],
		variants: plan?.variants ?? []
	};
};

export const actions: Actions = {
	default: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, moveOnForm);
		if (!parsed.ok) return parsed.failure;
		const refused = await forForm(async () => void (await moveOn(build, parsed.data.toVersionId)));
		if (refused) return refused;
		redirect(303, `/builds/${build.id}`);
	}
};
