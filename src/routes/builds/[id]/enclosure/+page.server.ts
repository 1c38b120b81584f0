import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { enclosureChanges } from '$lib/catalog/enclosure-diff';
import { requireBuild } from '$lib/server/access';
import { VariantRuleError, moveOn, planMoveOn } from '$lib/server/builds';
import { formFail, parseForm } from '$lib/server/forms';
import { line } from '$lib/schemas/common';
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
		const parsed = await parseForm(request, z.object({ toVersionId: line('Version', 64) }));
		if (!parsed.ok) return parsed.failure;
		try {
			await moveOn(build, parsed.data.toVersionId);
		} catch (e) {
			if (e instanceof VariantRuleError) return formFail(e.status, {}, { _: e.message });
			throw e;
		}
		redirect(303, `/builds/${build.id}`);
	}
};
