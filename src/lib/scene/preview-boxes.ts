/**
 * Boxes for catalogue previews, in engine coordinates (mm, Y up, Z front → back): an enclosure with
 * every allowed divider position ghosted and each bracket's travel, or a part with its keep-outs.
 * Pure, so pages compute them while the user types and the 3D code only draws.
 */
import {
	allowedPositions,
	bracketBoxAt,
	dividerBoxAt,
	innerBoxOf,
	wallBoxes,
	type Box,
	type EnclosureDef,
	type PartDef
} from '$lib/geometry';

export type PreviewRole =
	| 'wall'
	| 'wall-mesh'
	| 'divider'
	| 'divider-ghost'
	| 'bracket'
	| 'bracket-travel'
	| 'mount'
	| 'body'
	| 'keepout'
	| 'keepout-warning';

export type PreviewBox = { id: string; box: Box; role: PreviewRole; label: string };

/** The envelope a bracket sweeps over its whole travel. */
function travelEnvelope(b: EnclosureDef['brackets'][number]): Box {
	const first = bracketBoxAt(b, b.travel.minMm);
	const last = bracketBoxAt(b, b.travel.maxMm);
	return {
		min: [0, 1, 2].map((i) => Math.min(first.min[i], last.min[i])) as Box['min'],
		max: [0, 1, 2].map((i) => Math.max(first.max[i], last.max[i])) as Box['max']
	};
}

/**
 * `chosen` maps a divider id to the allowed position drawn solid; the others are ghosts. Brackets
 * are drawn at their first allowed offset with their travel as a ghost.
 */
export function enclosurePreviewBoxes(
	def: EnclosureDef,
	chosen: Record<string, number> = {}
): PreviewBox[] {
	const out: PreviewBox[] = wallBoxes(def).map((w) => ({
		id: w.id,
		box: w.box,
		role: w.wallKind === 'mesh' ? 'wall-mesh' : 'wall',
		label: w.label
	}));
	for (const d of def.dividers) {
		const positions = allowedPositions(d).slice(0, 200);
		const solid = chosen[d.id] ?? positions[0]?.offsetMm;
		for (const p of positions) {
			const isChosen = p.offsetMm === solid;
			out.push({
				id: `divider:${d.id}@${p.offsetMm}`,
				box: dividerBoxAt(def, d, p.offsetMm),
				role: isChosen ? 'divider' : 'divider-ghost',
				label: `${d.label} · ${p.label}`
			});
		}
	}
	for (const b of def.brackets) {
		out.push({
			id: `bracket-travel:${b.id}`,
			box: travelEnvelope(b),
			role: 'bracket-travel',
			label: `${b.label} travel`
		});
		out.push({
			id: `bracket:${b.id}`,
			box: bracketBoxAt(b, b.travel.minMm),
			role: 'bracket',
			label: b.label
		});
	}
	for (const m of def.mounts) {
		out.push({ id: `mount:${m.id}`, box: m.region, role: 'mount', label: m.label });
	}
	return out;
}

export function partPreviewBoxes(def: Pick<PartDef, 'bodies' | 'keepouts'>): PreviewBox[] {
	return [
		...def.bodies.map((b) => ({
			id: `body:${b.id}`,
			box: b.box,
			role: 'body' as const,
			label: b.label || 'Body'
		})),
		...def.keepouts.map((k) => ({
			id: `keepout:${k.id}`,
			box: k.box,
			role: k.severity === 'warning' ? ('keepout-warning' as const) : ('keepout' as const),
			label: k.label
		}))
	];
}

/** Where the camera looks: the enclosure's inside, or the bounds of everything shown. */
export function frameOf(def: EnclosureDef): Box {
	return innerBoxOf(def);
}
