/**
 * Mount stacks. Along a mount's normal (from its panel inward) the parts on it stack up: adapter
 * plate + standoffs + radiator + fans must stay within the mount's budget, ideally with the
 * scene's margin to spare (common practice).
 */

import { EPSILON_MM, compareText, faceOf, type Face } from './box';
import { FACE_AXES } from './enclosure';
import type { Box, EnclosureDef, MountDef, PartDef, Scene, Vec3 } from './schema';
import type {
	FitStatus,
	MountProblem,
	MountReport,
	ResolvedPlacement,
	ResolvedScene,
	StackEntry,
	WorldBox
} from './types';

/** The classes a part answers to in a mount's `accepts`: '240', '120', 'SFX', 'Mini-ITX'. */
export function partClasses(part: PartDef): string[] {
	const s = part.specs;
	const out: string[] = [];
	if (s.radiatorClass !== undefined) out.push(String(s.radiatorClass));
	if (s.fanSizeMm !== undefined) out.push(String(s.fanSizeMm));
	if (s.psuFormFactor !== undefined) out.push(s.psuFormFactor);
	if (s.boardFormFactor !== undefined) out.push(s.boardFormFactor);
	return out;
}

/** Radiator classes are named by the fans they carry (common practice): a 240 takes 120 mm fans. */
function fanSizeOfClass(cls: string): string | null {
	const n = Number(cls);
	if (n === 120 || n === 240 || n === 360) return '120';
	if (n === 140 || n === 280 || n === 420) return '140';
	return null;
}

/**
 * Whether a mount takes a part: any part when it lists no classes, and a part with no class of its
 * own (a CPU block on the board, a fitting) always; else one of the part's classes must be listed.
 */
export function mountAccepts(mount: MountDef, part: PartDef): boolean {
	const classes = partClasses(part);
	if (mount.accepts.length === 0 || classes.length === 0) {
		return true;
	}
	if (classes.some((c) => mount.accepts.includes(c))) {
		return true;
	}
	if ((mount.kind === 'radiator' || mount.kind === 'fan') && part.specs.fanSizeMm !== undefined) {
		const fan = String(part.specs.fanSizeMm);
		return mount.accepts.some((c) => fanSizeOfClass(c) === fan);
	}
	return false;
}

/**
 * Parts side by side (two fans on one radiator) share a layer; a layer is as thick as the union of
 * its parts' extents along the normal, and the layers add up. Positions along the normal only order
 * the layers, so a stray gap between radiator and fans does not count as used room.
 */
function stackLayers(
	mount: MountDef,
	mounted: ResolvedPlacement[],
	inner: number
): { entries: StackEntry[]; layersMm: number } {
	const { axis, high } = FACE_AXES[mount.face];
	const spans = mounted.map((rp) => {
		const near = high ? inner - rp.bounds.max[axis] : rp.bounds.min[axis];
		const thickness = rp.bounds.max[axis] - rp.bounds.min[axis];
		return { id: rp.placement.id, near, far: near + thickness, thickness };
	});
	spans.sort((a, b) => a.near - b.near || compareText(a.id, b.id));
	const entries: StackEntry[] = [];
	let layersMm = 0;
	let layer = -1;
	let lo = 0;
	let hi = -Infinity;
	for (const s of spans) {
		if (s.near >= hi - EPSILON_MM) {
			if (layer >= 0) layersMm += hi - lo;
			layer++;
			lo = s.near;
			hi = s.far;
		} else {
			hi = Math.max(hi, s.far);
		}
		entries.push({ placementId: s.id, thicknessMm: s.thickness, layer });
	}
	if (layer >= 0) layersMm += hi - lo;
	entries.sort((a, b) => a.layer - b.layer || compareText(a.placementId, b.placementId));
	return { entries, layersMm };
}

/**
 * The adapter plate's thickness a mount counts for parts of these classes: its plateMm when one
 * of them is in plateFor (for every class, and for parts of no class, when plateFor is missing).
 */
export function plateNeeded(mount: MountDef, classes: readonly string[]): number {
	const needed = mount.plateFor === undefined || mount.plateFor.some((c) => classes.includes(c));
	return needed ? (mount.plateMm ?? 0) : 0;
}

/** The plate a mount counts for the parts on it (see plateNeeded), 0 with no parts on it. */
export function stackPlate(mount: MountDef, mounted: readonly { part: PartDef }[]): number {
	if (mounted.length === 0) return 0;
	// A plate for every class needs no classes looked up (this runs once per "what fits" candidate).
	if (mount.plateFor === undefined) return plateNeeded(mount, []);
	const classes: string[] = [];
	for (const rp of mounted) classes.push(...partClasses(rp.part));
	return plateNeeded(mount, classes);
}

/**
 * A mount's plate (plateMm thick, none at 0) and standoff layer as fixed boxes: over the mount's
 * region on the panel's two axes, the plate from the panel inward, the standoffs (as one layer)
 * on top of it. Only layers thicker than 0.
 */
export function plateBoxes(mount: MountDef, inner: Box, plateMm: number): WorldBox[] {
	const out: WorldBox[] = [];
	const { axis, high } = FACE_AXES[mount.face];
	const layers: [string, string, number][] = [
		['plate', 'adapter plate', plateMm],
		['standoff', 'standoffs', mount.standoffMm]
	];
	let from = 0;
	for (const [kind, words, thickness] of layers) {
		if (!(thickness > 0)) continue;
		const min: Vec3 = [...mount.region.min];
		const max: Vec3 = [...mount.region.max];
		min[axis] = high ? inner.max[axis] - from - thickness : inner.min[axis] + from;
		max[axis] = min[axis] + thickness;
		from += thickness;
		out.push({
			id: `${kind}:${mount.id}`,
			kind: 'plate',
			label: `${mount.label} ${words}`,
			box: { min, max },
			ownerId: `${kind}:${mount.id}`,
			mountId: mount.id
		});
	}
	return out;
}

/**
 * The plate and the standoff layer of every mount with parts on it, so gaps, stack and the 3D
 * view tell one story (see plateBoxes).
 */
export function mountPlates(
	enclosure: EnclosureDef,
	inner: Box,
	placements: readonly ResolvedPlacement[]
): WorldBox[] {
	const out: WorldBox[] = [];
	for (const mount of [...enclosure.mounts].sort((a, b) => compareText(a.id, b.id))) {
		const mounted = placements.filter((rp) => rp.placement.mountId === mount.id);
		if (mounted.length === 0) continue;
		out.push(...plateBoxes(mount, inner, stackPlate(mount, mounted)));
	}
	return out;
}

function overflowOf(mount: MountDef, rp: ResolvedPlacement): Partial<Record<Face, number>> {
	const normal = FACE_AXES[mount.face].axis;
	const out: Partial<Record<Face, number>> = {};
	for (let a = 0; a < 3; a++) {
		if (a === normal && mount.kind !== 'psu-bay') continue;
		const low = mount.region.min[a] - rp.bounds.min[a];
		const high = rp.bounds.max[a] - mount.region.max[a];
		if (low > EPSILON_MM) out[faceOf(a as 0 | 1 | 2, -1)] = low;
		if (high > EPSILON_MM) out[faceOf(a as 0 | 1 | 2, 1)] = high;
	}
	return out;
}

export function mountReport(mount: MountDef, scene: Scene, resolved: ResolvedScene): MountReport {
	const mounted = resolved.placements.filter((rp) => rp.placement.mountId === mount.id);
	const { axis } = FACE_AXES[mount.face];
	const { entries, layersMm } = stackLayers(mount, mounted, resolved.innerBox.max[axis]);
	const plateMm = stackPlate(mount, mounted);
	const usedMm = plateMm + mount.standoffMm + layersMm;
	const budgetMm = mount.budgetMm ?? null;
	const spareMm = budgetMm === null ? null : budgetMm - usedMm;
	const unaccepted = mounted
		.filter((rp) => !mountAccepts(mount, rp.part))
		.map((rp) => rp.placement.id);
	const overflow = mounted
		.map((rp) => ({ placementId: rp.placement.id, overflowMm: overflowOf(mount, rp) }))
		.filter((o) => Object.keys(o.overflowMm).length > 0);
	const all = entries.map((e) => e.placementId).sort(compareText);
	const problems: MountProblem[] = [];
	const problem = (
		kind: MountProblem['kind'],
		status: FitStatus,
		placementIds: string[],
		amountMm: number
	) =>
		problems.push({ mountId: mount.id, label: mount.label, kind, status, placementIds, amountMm });
	if (spareMm !== null && spareMm < -EPSILON_MM) problem('over-budget', 'collides', all, -spareMm);
	if (unaccepted.length > 0) problem('unaccepted', 'blocked', [...unaccepted].sort(compareText), 0);
	if (overflow.length > 0) {
		const most = Math.max(...overflow.flatMap((o) => Object.values(o.overflowMm)));
		problem('overhang', 'outside', overflow.map((o) => o.placementId).sort(compareText), most);
	}
	if (spareMm !== null && spareMm >= -EPSILON_MM && spareMm < scene.marginMm - EPSILON_MM) {
		problem('tight', 'tight', all, scene.marginMm - spareMm);
	}
	return {
		mountId: mount.id,
		label: mount.label,
		kind: mount.kind,
		stack: entries,
		plateMm,
		standoffMm: mount.standoffMm,
		availableMm: budgetMm === null ? null : budgetMm - plateMm - mount.standoffMm,
		usedMm,
		budgetMm,
		spareMm,
		unaccepted,
		overflow,
		problems,
		status: problems[0]?.status ?? 'clear'
	};
}

export function mountReports(scene: Scene, resolved: ResolvedScene): MountReport[] {
	return [...scene.enclosure.mounts]
		.sort((a, b) => compareText(a.id, b.id))
		.map((m) => mountReport(m, scene, resolved));
}
