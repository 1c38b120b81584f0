import { error, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { requireBuild } from '$lib/server/access';
import {
	SceneRejected,
	VariantRuleError,
	enclosureVersionDef,
	forkVariant,
	loadVariant,
	newerEnclosureVersion,
	variantsOf
} from '$lib/server/builds';
import { formFail, parseForm } from '$lib/server/forms';
import {
	VariantFrozen,
	VersionError,
	canonicalJson,
	frozenState,
	latestVersion,
	nextVersionNumber,
	recentRevisions,
	saveVersion
} from '$lib/server/versions';
import { variantSettingsSchema } from '$lib/builds/settings';
import { engineTubeKinds, fittingPartsForStudio, tubeKindsForStudio } from '$lib/server/loop';
import { line } from '$lib/schemas/common';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build, access } = await requireBuild(locals, params.id, 'build.edit', url);
	const variantId = url.searchParams.get('variant') ?? undefined;
	let loaded;
	try {
		loaded = await loadVariant(build.id, build.studioId, build.enclosureVersionId, variantId);
	} catch (e) {
		if (e instanceof SceneRejected) error(500, `This variant no longer validates: ${e.message}`);
		throw e;
	}
	if (!loaded) error(404, 'No such variant.');
	const enc = await enclosureVersionDef(build.enclosureVersionId);
	const variants = await variantsOf(build.id);
	const [latest, frozen, next, revisions, tubeKinds, fittings] = await Promise.all([
		latestVersion(loaded.variant.id),
		frozenState(loaded.variant.id),
		nextVersionNumber(loaded.variant),
		recentRevisions(loaded.variant.id, loaded.variant.version),
		tubeKindsForStudio(build.studioId),
		fittingPartsForStudio(build.studioId)
	]);
	// Earlier saved states seed the undo history, so undo reaches back across a reload.
	const history = revisions.flatMap((r) => {
		const parsed = variantSettingsSchema.safeParse(r.settings);
		return parsed.success ? [parsed.data] : [];
	});
	return {
		build: { id: build.id, name: build.name, clientName: build.clientName, notes: build.notes },
		enclosure: {
			name: enc?.name ?? loaded.enclosure.name,
			version: enc?.version ?? 1,
			definition: loaded.enclosure,
			newer: await newerEnclosureVersion(build.enclosureVersionId)
		},
		variant: { id: loaded.variant.id, name: loaded.variant.name, version: loaded.variant.version },
		/** The last version the designer saved on purpose, and whether the variant changed since. */
		savedVersion: latest
			? {
					number: latest.number,
					note: latest.note,
					at: latest.createdAt,
					settingsJson: canonicalJson(variantSettingsSchema.parse(latest.settings))
				}
			: null,
		nextVersion: next,
		frozen: frozen.frozen ? { reason: frozen.reason, version: frozen.version } : null,
		variants: variants.map((v) => ({ id: v.id, name: v.name, isProposal: v.isProposal })),
		settings: loaded.settings,
		history,
		parts: loaded.parts,
		/** The loop panel's catalogue: the studio's tube kinds (with the ones the loops use) and fittings. */
		tubeKinds: engineTubeKinds([
			...tubeKinds,
			...loaded.tubeKinds.filter((t) => !tubeKinds.some((k) => k.id === t.id))
		]),
		fittings,
		role: access.role
	};
};

const variantId = line('Variant', 64);

export const actions: Actions = {
	/** "Save as version N — note": a numbered snapshot of the revision the designer is looking at. */
	version: async ({ locals, params, request, url }) => {
		const { build, access } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(
			request,
			z.object({
				variantId,
				revision: z.coerce
					.number({ error: 'Revision must be a number.' })
					.int()
					.min(1)
					.max(2_147_483_647),
				note: line('Note', 200, 0).default('')
			})
		);
		if (!parsed.ok) return parsed.failure;
		try {
			const result = await saveVersion({
				buildId: build.id,
				variantId: parsed.data.variantId,
				expectedRevision: parsed.data.revision,
				note: parsed.data.note,
				userId: access.user.id
			});
			if (!result.ok && result.reason === 'stale') {
				return formFail(409, parsed.raw, {
					version:
						'Your latest change is still being saved (or someone else saved); wait a moment and try again.'
				});
			}
			if (!result.ok) {
				return {
					done: `Nothing changed since version ${result.version.number}; no new version made.`
				};
			}
			return { done: `Saved as version ${result.version.number}.` };
		} catch (e) {
			if (e instanceof VariantFrozen || e instanceof VersionError) {
				return formFail(e.status, parsed.raw, { version: e.message });
			}
			throw e;
		}
	},
	/** "Start a new variant from it": a copy of the approved version the designer may change. */
	startFrom: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await parseForm(request, z.object({ variantId }));
		if (!parsed.ok) return parsed.failure;
		let id: string;
		try {
			id = await forkVariant(build.id, parsed.data.variantId, undefined, { fromVersion: true });
		} catch (e) {
			if (e instanceof VariantRuleError) {
				return formFail(e.status, parsed.raw, { startFrom: e.message });
			}
			throw e;
		}
		redirect(303, `/builds/${build.id}?variant=${id}`);
	}
};
