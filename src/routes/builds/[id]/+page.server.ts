import { error, redirect } from '@sveltejs/kit';
import { saveVersionForm, variantForm } from '$lib/schemas/builds';
import { requireBuild } from '$lib/server/access';
import {
	SceneRejected,
	enclosureVersionDef,
	forkVariant,
	loadVariant,
	newerEnclosureVersion,
	variantsOf
} from '$lib/server/builds';
import { forForm, formFail } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import {
	canonicalJson,
	frozenState,
	latestVersion,
	nextVersionNumber,
	recentRevisions,
	saveVersion
} from '$lib/server/versions';
import { variantSettingsSchema } from '$lib/builds/settings';
import { engineTubeKinds, fittingPartsForStudio, tubeKindsForStudio } from '$lib/server/loop';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build, access } = await requireBuild(locals, params.id, 'build.edit', url);
	const variantId = url.searchParams.get('variant') ?? undefined;
	let loaded;
	try {
		loaded = await loadVariant(build.id, build.studioId, build.enclosureVersionId, variantId);
	} catch (e) {
		// Stored settings that no longer validate are the server's fault: 500, not the mapping's 400.
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

export const actions: Actions = {
	/** "Save as version N — note": a numbered snapshot of the revision the designer is looking at. */
	version: async ({ locals, params, request, url }) => {
		const { build, access } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, saveVersionForm);
		if (!parsed.ok) return parsed.failure;
		// Read-only or no such variant: the message on the version form.
		return forForm(
			async () => {
				const result = await saveVersion({
					buildId: build.id,
					variantId: parsed.data.variantId,
					expectedRevision: parsed.data.revision,
					note: parsed.data.note,
					userId: access.user.id
				});
				if (!result.ok && result.reason === 'stale') {
					return formFail(409, parsed.values, {
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
			},
			{ values: parsed.values, field: 'version' }
		);
	},
	/** "Start a new variant from it": a copy of the approved version the designer may change. */
	startFrom: async ({ locals, params, request, url }) => {
		const { build } = await requireBuild(locals, params.id, 'build.edit', url);
		const parsed = await readForm(request, variantForm);
		if (!parsed.ok) return parsed.failure;
		const id = await forForm(
			() => forkVariant(build.id, parsed.data.variantId, undefined, { fromVersion: true }),
			{ values: parsed.values, field: 'startFrom' }
		);
		if (typeof id !== 'string') return id;
		redirect(303, `/builds/${build.id}?variant=${id}`);
	}
};
