import { error } from '@sveltejs/kit';
import { requireBuild } from '$lib/server/access';
import { SceneRejected, enclosureVersionDef, loadVariant, newerEnclosureVersion, variantsOf } from '$lib/server/builds';
import type { PageServerLoad } from './$types';

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
	return {
		build: { id: build.id, name: build.name, clientName: build.clientName, notes: build.notes },
		enclosure: { name: enc?.name ?? loaded.enclosure.name, version: enc?.version ?? 1, definition: loaded.enclosure, newer: await newerEnclosureVersion(build.enclosureVersionId) },
		variant: { id: loaded.variant.id, name: loaded.variant.name, version: loaded.variant.version },
		variants: variants.map((v) => ({ id: v.id, name: v.name, isProposal: v.isProposal })),
		settings: loaded.settings,
		parts: loaded.parts,
		role: access.role
	};
};
