import { redirect } from '@sveltejs/kit';
import {
	deleteBuildForm,
	deleteVariantForm,
	forkVariantForm,
	moveVariantForm,
	renameVariantForm,
	variantForm
} from '$lib/schemas/builds';
import { requireBuild } from '$lib/server/access';
import {
	deleteBuild,
	deleteVariant,
	forkVariant,
	markProposal,
	moveVariant,
	renameVariant,
	variantsOf
} from '$lib/server/builds';
import { forForm } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import { buildPage, fieldsOf } from '../../../build-pages';
import type { Actions, PageServerLoad } from './$types';

const VARIANT_FIELDS = ['id', 'name', 'isProposal', 'version', 'updatedAt'] as const;

export const load: PageServerLoad = (event) =>
	buildPage(event, 'build.edit', async (build) => ({
		variants: fieldsOf(await variantsOf(build.id), VARIANT_FIELDS)
	}));

/** Runs a variant rule; a refusal comes back as the form's failure (message on `_`), else null. */
async function run(fn: () => Promise<unknown>) {
	return (await forForm(async () => void (await fn()))) ?? null;
}

export const actions: Actions = {
	fork: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, forkVariantForm);
		if (!parsed.ok) return parsed.failure;
		let id = '';
		const failed = await run(
			async () => (id = await forkVariant(build.id, parsed.data.variantId, parsed.data.name))
		);
		if (failed) return failed;
		redirect(303, `/builds/${build.id}?variant=${id}`);
	},
	rename: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, renameVariantForm);
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() => renameVariant(build.id, parsed.data.variantId, parsed.data.name))) ?? {
				done: 'Renamed.'
			}
		);
	},
	move: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, moveVariantForm);
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() =>
				moveVariant(build.id, parsed.data.variantId, parsed.data.by === '1' ? 1 : -1)
			)) ?? { done: 'Moved.' }
		);
	},
	delete: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, deleteVariantForm);
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() => deleteVariant(build.id, parsed.data.variantId))) ?? { done: 'Deleted.' }
		);
	},
	deleteBuild: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, deleteBuildForm);
		if (!parsed.ok) return parsed.failure;
		const failed = await run(() => deleteBuild(build.id));
		if (failed) return failed;
		redirect(303, '/builds');
	},
	propose: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, variantForm);
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() => markProposal(build.id, parsed.data.variantId))) ?? {
				done: 'Marked as the proposal.'
			}
		);
	}
};
