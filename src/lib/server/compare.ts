/** Loading two or three variants of a build and comparing them with the engine's reports. */
import { ServiceError } from './errors';
import { checkInPool } from './engine/pool';
import { compareVariants, type CompareInput, type ControlSetting } from '$lib/builds/compare';
import { allowedPositions, formatMm, type Scene } from '$lib/geometry';
import type { BuildRow } from './db/schema';
import { loadVariant, variantsOf } from './builds';

/** `?variants=a,b,c` → 2 or 3 of this build's variants; with none named, the first two. */
export async function loadComparison(build: BuildRow, param: string | null) {
	const all = await variantsOf(build.id);
	let ids = (param ?? '')
		.split(',')
		.map((s) => s.trim())
		.filter(Boolean);
	if (ids.length === 0) ids = all.slice(0, 2).map((v) => v.id);
	ids = [...new Set(ids)];
	if (ids.length < 2 || ids.length > 3) {
		throw new ServiceError('invalid', 'Compare two or three variants (variants=a,b or a,b,c).');
	}
	const unknown = ids.filter((id) => !all.some((v) => v.id === id));
	if (unknown.length) {
		throw new ServiceError('not-found', 'A variant named in the address is not in this build.');
	}
	const loaded = await Promise.all(
		ids.map((id) => loadVariant(build.id, build.studioId, build.enclosureVersionId, id))
	);
	const items = await Promise.all(
		loaded.map(async (l) => {
			if (!l) throw new ServiceError('not-found', 'Variant not found.');
			return {
				id: l.variant.id,
				name: l.variant.name,
				scene: l.scene,
				report: await checkInPool(l.scene),
				marginMm: l.settings.marginMm
			};
		})
	);
	const inputs: CompareInput[] = items.map((i) => ({
		id: i.id,
		name: i.name,
		report: i.report,
		marginMm: i.marginMm,
		controls: controlSettings(i.scene)
	}));
	return { all, items, inputs, rows: compareVariants(inputs) };
}

/** A variant's divider and bracket settings, by the names of their allowed positions. */
function controlSettings(scene: Scene): ControlSetting[] {
	const named = (c: Parameters<typeof allowedPositions>[0], at: number) =>
		allowedPositions(c).find((o) => Math.abs(o.offsetMm - at) < 1e-6)?.label ?? formatMm(at);
	return [
		...scene.enclosure.dividers.map((d) => {
			const at = scene.dividerPositions[d.id] ?? allowedPositions(d)[0]?.offsetMm ?? 0;
			return { key: `divider:${d.id}`, label: d.label, offsetMm: at, position: named(d, at) };
		}),
		...scene.enclosure.brackets.map((b) => {
			const at = scene.bracketOffsets[b.id] ?? 0;
			return { key: `bracket:${b.id}`, label: b.label, offsetMm: at, position: named(b, at) };
		})
	];
}
