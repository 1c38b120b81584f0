import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { requireBuild } from '$lib/server/access';
import {
	VariantRuleError,
	deleteBuild,
	deleteVariant,
	forkVariant,
	markProposal,
	moveVariant,
	renameVariant,
	variantsOf
} from '$lib/server/builds';
import { formFail, parseForm } from '$lib/server/forms';
import { line } from '$lib/schemas/common';
import type { Actions, PageServerLoad } from './$types';

const variantId = line('Variant', 64);

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build } = await requireBuild(locals, params.id, 'build.edit', url);
	const list = await variantsOf(build.id);
	return {
		build: { id: build.id, name: build.name },
		variants: list.map((v) => ({
			id: v.id,
			name: v.name,
			isProposal: v.isProposal,
			version: v.version,
			updatedAt: v.updatedAt
		}))
	};
};

async function run(fn: () => Promise<unknown>) {
	try {
		await fn();
	} catch (e) {
		if (e instanceof VariantRuleError) return formFail(e.status, {}, { _: e.message });
		throw e;
	}
	return null;
}

export const actions: Actions = {
	fork: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(
			request,
			z.object({ variantId, name: line('Name', 80).optional() })
		);
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
		const parsed = await parseForm(request, z.object({ variantId, name: line('Name', 80) }));
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() => renameVariant(build.id, parsed.data.variantId, parsed.data.name))) ?? {
				done: 'Renamed.'
			}
		);
	},
	move: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(
			request,
			z.object({ variantId, by: z.enum(['-1', '1'], { error: 'Move by −1 or 1.' }) })
		);
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() =>
				moveVariant(build.id, parsed.data.variantId, parsed.data.by === '1' ? 1 : -1)
			)) ?? { done: 'Moved.' }
		);
	},
	delete: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(
			request,
			z.object({ variantId, confirm: z.literal('yes', { error: 'Tick the box to confirm.' }) })
		);
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() => deleteVariant(build.id, parsed.data.variantId))) ?? { done: 'Deleted.' }
		);
	},
	deleteBuild: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(
			request,
			z.object({ confirm: z.literal('yes', { error: 'Tick the box to confirm.' }) })
		);
		if (!parsed.ok) return parsed.failure;
		const failed = await run(() => deleteBuild(build.id));
		if (failed) return failed;
		redirect(303, '/builds');
	},
	propose: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(request, z.object({ variantId }));
		if (!parsed.ok) return parsed.failure;
		return (
			(await run(() => markProposal(build.id, parsed.data.variantId))) ?? {
				done: 'Marked as the proposal.'
			}
		);
	}
};
