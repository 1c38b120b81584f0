/**
 * One candidate part, placed in a scene that is otherwise fixed: its status, gaps and mount stack
 * exactly as checkScene would report them for it, without recomputing the rest of the scene.
 *
 * The scene's boxes are prepared once (walls, dividers and brackets at their offsets, the mounts'
 * plates, every other placement's bodies and keep-outs) into a Model of the fit report, with the
 * candidate as its placement 0; each candidate is then tested against them alone by the report's
 * own functions: pairKind for what an overlap means, addGap for the nearest box ahead of each
 * face, facesOutside, mountReport and the problems that mark it (mountRankOf), and
 * placementStatus (held contact and worst-case gaps). A mount's plate depends on what it holds,
 * so each mount's plate boxes are kept with and without the plate, and the candidate's landing
 * mount uses the pair the engine would build (stackPlate). Millimetres, inner coordinates.
 */

import { EPSILON_MM, FACES, compareText, type Face } from './box';
import { FACE_AXES, bracketWorldBox, dividerWorldBox } from './enclosure';
import { SceneError } from './errors';
import {
	addGap,
	emptyTally,
	facesOutside,
	geometricStatus,
	mountRankOf,
	placementStatus,
	isHeldContact,
	problemsMarking,
	type Model,
	type Tally
} from './model';
import { mountReport, plateBoxes, stackPlate } from './mounts';
import { isObstacle, pairKind } from './pairs';
import type { BoxRef } from './packed';
import { placePart } from './resolve';
import type { Box, MountDef, PartDef, Placement, Scene, Vec3 } from './schema';
import {
	STATUS_ORDER,
	type FitStatus,
	type MountReport,
	type ResolvedPlacement,
	type ResolvedScene,
	type WorldBox
} from './types';

export interface ProbeBase {
	scene: Scene;
	resolved: ResolvedScene;
	/** The resolved scene without the placement being replaced, if any. */
	without: ResolvedScene;
	boxes: WorldBox[];
	/** Six numbers a box, same order as `boxes`. */
	flat: Float64Array;
	obstacle: Uint8Array;
	/**
	 * The report's model of the fixed scene: placement 0 is the candidate (its mount, tolerance,
	 * outside faces and mount rank are written per probe), placements 1.. the others.
	 */
	model: Model;
	tally: Tally;
	/**
	 * Per box: 0 for a box always there, else the plate group it belongs to: 3m + 1 for mount m's
	 * plates as the scene has them, 3m + 2 without the plate, 3m + 3 with it (standoffs on top).
	 */
	group: Uint16Array;
	/** Per group: whether its boxes are in the scene for the candidate being probed. */
	active: Uint8Array;
	mounts: Map<string, MountDef>;
	mountIndex: Map<string, number>;
	/** Per mount id: the other placements on it. */
	stacked: Map<string, ResolvedPlacement[]>;
	grid: Grid;
	/** Index of the moving control's slot in `boxes`, -1 without one. */
	movingSlot: number;
	moving: MovingControl | null;
	/** Scratch: the candidate's bodies, six numbers each. */
	bodyFlat: Float64Array;
	/** Scratch for probeAcross: the tally's gaps and what they are against, per face. */
	acrossGap: Float64Array;
	acrossAgainst: Int32Array;
}

/** A divider or bracket tried at each of its positions (see probeAcross). */
export interface MovingControl {
	kind: 'divider' | 'bracket';
	id: string;
}

/**
 * A uniform grid over the inner box: each cell lists the boxes reaching into it (walls, which
 * lie outside, are kept apart and always visited). A candidate is tested only against the boxes
 * in the cells it reaches, and a face's nearest box is searched cell layer by cell layer outward,
 * stopping when the next layer is farther than the nearest found: the same boxes the full scan
 * would pick, far fewer looked at.
 */
interface Grid {
	origin: Vec3;
	cell: number;
	dims: [number, number, number];
	/** Box indexes per cell, cell after cell (`start[c]` to `start[c + 1]`). */
	items: Int32Array;
	start: Int32Array;
	always: Int32Array;
	/** Visit stamps, one per box, so a box in several cells is looked at once per query. */
	seen: Uint32Array;
	stamp: number;
	/** The boxes one query gathered (each once), and scratch cell ranges: no allocation per query. */
	found: Int32Array;
	lo: Int32Array;
	hi: Int32Array;
	l: Int32Array;
	h: Int32Array;
}

function buildGrid(boxes: readonly WorldBox[], inner: Box): Grid {
	const size = [0, 1, 2].map((i) => inner.max[i] - inner.min[i]);
	const cell = Math.max(20, Math.cbrt((size[0] * size[1] * size[2]) / 512));
	const dims = size.map((v) => Math.max(1, Math.ceil(v / cell))) as [number, number, number];
	const cells: number[][] = Array.from({ length: dims[0] * dims[1] * dims[2] }, () => []);
	const always: number[] = [];
	const origin = [...inner.min] as Vec3;
	boxes.forEach((b, i) => {
		if (b.kind === 'wall') {
			always.push(i);
			return;
		}
		const lo = [0, 1, 2].map((a) =>
			clampCell(Math.floor((b.box.min[a] - origin[a]) / cell), dims[a])
		);
		const hi = [0, 1, 2].map((a) =>
			clampCell(Math.floor((b.box.max[a] - origin[a]) / cell), dims[a])
		);
		for (let x = lo[0]; x <= hi[0]; x++) {
			for (let y = lo[1]; y <= hi[1]; y++) {
				for (let z = lo[2]; z <= hi[2]; z++) cells[(x * dims[1] + y) * dims[2] + z].push(i);
			}
		}
	});
	const start = new Int32Array(cells.length + 1);
	cells.forEach((c, k) => (start[k + 1] = start[k] + c.length));
	return {
		origin,
		cell,
		dims,
		items: Int32Array.from(cells.flat()),
		start,
		always: Int32Array.from(always),
		seen: new Uint32Array(boxes.length),
		stamp: 0,
		found: new Int32Array(boxes.length),
		lo: new Int32Array(3),
		hi: new Int32Array(3),
		l: new Int32Array(3),
		h: new Int32Array(3)
	};
}

function clampCell(v: number, n: number): number {
	return v < 0 ? 0 : v >= n ? n - 1 : v;
}

/**
 * Gathers into g.found (from 0; returns how many) each box in the cells from lo to hi (cell
 * indexes, inclusive) not gathered yet in this query; a fresh query starts with the walls.
 */
function gather(g: Grid, lo: Int32Array, hi: Int32Array, fresh: boolean): number {
	let n = 0;
	if (fresh) {
		g.stamp++;
		if (g.stamp === 0xffffffff) {
			g.seen.fill(0);
			g.stamp = 1;
		}
		for (let k = 0; k < g.always.length; k++) {
			const j = g.always[k];
			g.seen[j] = g.stamp;
			g.found[n++] = j;
		}
	}
	const [, d1, d2] = g.dims;
	for (let x = lo[0]; x <= hi[0]; x++) {
		for (let y = lo[1]; y <= hi[1]; y++) {
			for (let z = lo[2]; z <= hi[2]; z++) {
				const c = (x * d1 + y) * d2 + z;
				for (let k = g.start[c]; k < g.start[c + 1]; k++) {
					const j = g.items[k];
					if (g.seen[j] === g.stamp) continue;
					g.seen[j] = g.stamp;
					g.found[n++] = j;
				}
			}
		}
	}
	return n;
}

/** The cells a box (grown by pad) reaches, into g.lo and g.hi. */
function cellRange(g: Grid, box: Box, pad: number): void {
	for (let a = 0; a < 3; a++) {
		g.lo[a] = clampCell(Math.floor((box.min[a] - pad - g.origin[a]) / g.cell), g.dims[a]);
		g.hi[a] = clampCell(Math.floor((box.max[a] + pad - g.origin[a]) / g.cell), g.dims[a]);
	}
}

export interface ProbeResult {
	status: FitStatus;
	/** The part's own status (overlaps, outside, gaps), before its mount's stack is counted. */
	partStatus: FitStatus;
	/** Free distance ahead of each face (null: nothing ahead), and what it is against. */
	gaps: Record<Face, { gapMm: number | null; against: string | null; held: boolean }>;
	/** Smallest free distance on a face that is not held, or the mount's spare when smaller. */
	spareMm: number | null;
	overlaps: { with: string; label: string; kind: 'collides' | 'blocked' | 'warning' }[];
	outsideFaces: Face[];
	mount: MountReport | null;
	placed: ResolvedPlacement;
}

/**
 * Which plate boxes are there with the candidate in: every mount's as the scene has them, the
 * candidate's mount's as the engine would build them with the candidate on it. Returns the other
 * placements on the candidate's mount.
 */
function activatePlates(base: ProbeBase, placed: ResolvedPlacement): ResolvedPlacement[] {
	const { active } = base;
	const id = placed.placement.mountId;
	const mount = id === undefined ? undefined : base.mounts.get(id);
	active.fill(0);
	active[0] = 1;
	for (let k = 0; k < base.mounts.size; k++) active[3 * k + 1] = 1;
	if (!mount) return [];
	const k = base.mountIndex.get(mount.id)!;
	const stacked = base.stacked.get(mount.id)!;
	active[3 * k + 1] = 0;
	active[stackPlate(mount, [...stacked, placed]) > 0 ? 3 * k + 3 : 3 * k + 2] = 1;
	return stacked;
}

/** Overlap volume of a box with base box j, or 0 when they only touch or are apart. */
function overlapWith(box: Box, flat: Float64Array, j: number): number {
	const o = j * 6;
	const x = Math.min(box.max[0], flat[o + 3]) - Math.max(box.min[0], flat[o]);
	if (!(x > EPSILON_MM)) return 0;
	const y = Math.min(box.max[1], flat[o + 4]) - Math.max(box.min[1], flat[o + 1]);
	if (!(y > EPSILON_MM)) return 0;
	const z = Math.min(box.max[2], flat[o + 5]) - Math.max(box.min[2], flat[o + 2]);
	if (!(z > EPSILON_MM)) return 0;
	return x * y * z;
}

/** Prepares a scene for probing; `ignorePlacementId` leaves one placement out (for a replacement). */
export function probeBase(
	scene: Scene,
	resolved: ResolvedScene,
	ignorePlacementId?: string,
	moving?: MovingControl
): ProbeBase {
	const placements = resolved.placements.filter((rp) => rp.placement.id !== ignorePlacementId);
	const without: ResolvedScene =
		ignorePlacementId === undefined ? resolved : { ...resolved, placements };
	const inner = resolved.innerBox;
	const mountList = scene.enclosure.mounts;
	// A control that moves (see probeAcross) is left out of the fixed boxes.
	const movingId = moving ? `${moving.kind}:${moving.id}` : null;
	const boxes: WorldBox[] = [...resolved.walls, ...resolved.dividers, ...resolved.brackets].filter(
		(b) => b.id !== movingId
	);
	const groups: number[] = boxes.map(() => 0);
	const owners: number[] = boxes.map(() => -1);
	const stacked = new Map<string, ResolvedPlacement[]>(mountList.map((m) => [m.id, []]));
	for (const rp of placements) {
		if (rp.placement.mountId !== undefined) stacked.get(rp.placement.mountId)?.push(rp);
	}
	mountList.forEach((m, k) => {
		const mounted = stacked.get(m.id)!;
		const variants = [
			mounted.length ? plateBoxes(m, inner, stackPlate(m, mounted)) : [],
			plateBoxes(m, inner, 0),
			plateBoxes(m, inner, m.plateMm ?? 0)
		];
		variants.forEach((list, v) => {
			for (const b of list) {
				boxes.push(b);
				groups.push(3 * k + 1 + v);
				owners.push(-1);
			}
		});
	});
	placements.forEach((rp, k) => {
		for (const b of [...rp.bodies, ...rp.keepouts]) {
			boxes.push(b);
			groups.push(0);
			owners.push(k + 1);
		}
	});
	// The last slot holds the moving control's box at the position being tried: in no grid cell,
	// in its own group, switched on by probeAcross alone.
	const movingGroup = 3 * mountList.length + 1;
	let movingSlot = -1;
	if (moving) {
		const current = [...resolved.dividers, ...resolved.brackets].find((b) => b.id === movingId);
		if (!current) throw new SceneError('control.id', `No ${moving.kind} with id ${moving.id}`);
		movingSlot = boxes.length;
		boxes.push(current);
		groups.push(movingGroup);
		owners.push(-1);
	}
	const flat = new Float64Array(boxes.length * 6);
	const obstacle = new Uint8Array(boxes.length);
	boxes.forEach((b, i) => {
		flat.set(b.box.min, i * 6);
		flat.set(b.box.max, i * 6 + 3);
		obstacle[i] = isObstacle(b) ? 1 : 0;
	});
	const mounts = new Map(mountList.map((m) => [m.id, m]));
	const placementMountFace = (id: string | undefined) => {
		const m = id === undefined ? undefined : mounts.get(id);
		if (!m) return -1;
		const { axis, high } = FACE_AXES[m.face];
		return 2 * axis + (high ? 1 : 0);
	};
	const model: Model = {
		scene,
		resolved: without,
		boxes,
		flat,
		refs: boxes.map((_, index) => ({ index, coords: flat, slot: index })),
		owner: Int32Array.from(owners),
		obstacle,
		bodiesOf: [[], ...placements.map(() => [])],
		bodyBoxes: new Int32Array(0),
		outsideFaces: [[], ...placements.map(() => [])],
		mountFace: Int8Array.from([
			-1,
			...placements.map((rp) => placementMountFace(rp.placement.mountId))
		]),
		mountOf: [undefined, ...placements.map((rp) => rp.placement.mountId)],
		indexOf: new Map(),
		wallSide: Int8Array.from(boxes, (b) => {
			if (b.kind !== 'wall') return -1;
			const { axis, high } = FACE_AXES[b.face!];
			return 2 * axis + (high ? 1 : 0);
		}),
		toleranceMm: Float64Array.from([0, ...placements.map((rp) => rp.part.toleranceMm)]),
		mounts: [],
		mountProblemsOf: [],
		mountRank: new Uint8Array(placements.length + 1)
	};
	return {
		scene,
		resolved,
		without,
		boxes,
		flat,
		obstacle,
		model,
		tally: emptyTally(1),
		group: Uint16Array.from(groups),
		active: new Uint8Array(movingGroup + 1),
		movingSlot,
		moving: moving ?? null,
		bodyFlat: new Float64Array(6 * 8),
		acrossGap: new Float64Array(6),
		acrossAgainst: new Int32Array(6),
		mounts,
		mountIndex: new Map(mountList.map((m, k) => [m.id, k])),
		stacked,
		grid: buildGrid(movingSlot < 0 ? boxes : boxes.slice(0, movingSlot), inner)
	};
}

/** Probes one placement of `part` (its id must not be another placement's). */
export function probe(base: ProbeBase, part: PartDef, placement: Placement): ProbeResult {
	return probePlaced(base, placePart(part, placement));
}

/** `probe` for a placement already resolved (the same one tried at many positions of a control). */
export function probePlaced(base: ProbeBase, placed: ResolvedPlacement): ProbeResult {
	const { report, overlaps } = probeCore(base, placed, true);
	const { model, tally, boxes } = base;
	const margin = base.scene.marginMm;
	const gaps = {} as ProbeResult['gaps'];
	FACES.forEach((face, f) => {
		const j = tally.against[f];
		gaps[face] =
			j < 0
				? { gapMm: null, against: null, held: false }
				: {
						gapMm: tally.gap[f],
						against: boxes[j].label,
						held: isHeldContact(model, 0, f, tally.gap[f], j)
					};
	});
	return {
		status: placementStatus(model, tally, 0, margin),
		partStatus: geometricStatus(model, tally, 0, margin),
		gaps,
		spareMm: spareOf(model, tally, report),
		overlaps: overlaps!.sort((x, y) => compareText(x.with, y.with)),
		outsideFaces: model.outsideFaces[0],
		mount: report,
		placed
	};
}

/**
 * Fills the base's model and tally for the candidate as placement 0: its mount, tolerance,
 * outside faces and mount rank, its overlaps (listed when `list`) and nearest gaps.
 */
function probeCore(
	base: ProbeBase,
	placed: ResolvedPlacement,
	list: boolean
): { report: MountReport | null; overlaps: ProbeResult['overlaps'] | null } {
	const placement = placed.placement;
	const { flat, boxes, obstacle, model, tally, group, active } = base;
	const stacked = activatePlates(base, placed);
	const mount = placement.mountId === undefined ? undefined : base.mounts.get(placement.mountId);
	if (mount) {
		const { axis, high } = FACE_AXES[mount.face];
		model.mountFace[0] = 2 * axis + (high ? 1 : 0);
	} else model.mountFace[0] = -1;
	model.mountOf[0] = mount?.id;
	model.toleranceMm[0] = placed.part.toleranceMm;
	model.outsideFaces[0] = facesOutside(base.resolved.innerBox, placed.bodies);
	tally.collides[0] = 0;
	tally.blocked[0] = 0;
	tally.gap.fill(Infinity);
	tally.against.fill(-1);
	const overlaps: ProbeResult['overlaps'] | null = list ? [] : null;
	const g = base.grid;
	const found = g.found;
	// A body's overlaps and its nearest boxes come from one gathering of the cells it covers (grown
	// by the tolerance, so touching boxes are seen for the gaps); keep-outs only overlap. Overlaps
	// and nearest gaps are a union and a minimum (ties to the smaller id): the order does not count.
	const bodies = bodyRefs(bodyFlatOf(base, placed), placed.bodies.length);
	for (let k = 0; k < placed.bodies.length; k++) {
		const own = placed.bodies[k];
		const b = own.box;
		const body = bodies[k];
		// The cells the body covers, then layer by layer outward along each axis while a layer could
		// still hold something nearer than the nearest found on that side.
		cellRange(g, b, EPSILON_MM);
		let n = gather(g, g.lo, g.hi, true);
		for (let q = 0; q < n; q++) {
			const j = found[q];
			if (active[group[j]] !== 1) continue;
			if (overlapWith(b, flat, j) > 0) {
				const kind = pairKind(own, boxes[j]);
				if (kind === 'collides') tally.collides[0] = 1;
				else if (kind === 'blocked') tally.blocked[0] = 1;
				if (kind) overlaps?.push({ with: boxes[j].id, label: boxes[j].label, kind });
			}
			if (obstacle[j]) addGap(model, tally, 0, body, model.refs[j]);
		}
		for (let a = 0; a < 3; a++) {
			for (let dir = 1; dir >= -1; dir -= 2) {
				const slot = dir > 0 ? 2 * a + 1 : 2 * a;
				for (let c = dir > 0 ? g.hi[a] + 1 : g.lo[a] - 1; c >= 0 && c < g.dims[a]; c += dir) {
					const near =
						dir > 0
							? g.origin[a] + c * g.cell - b.max[a]
							: b.min[a] - (g.origin[a] + (c + 1) * g.cell);
					if (near > tally.gap[slot] + EPSILON_MM) break;
					g.l.set(g.lo);
					g.h.set(g.hi);
					g.l[a] = c;
					g.h[a] = c;
					n = gather(g, g.l, g.h, false);
					for (let q = 0; q < n; q++) {
						const j = found[q];
						if (obstacle[j] && active[group[j]] === 1) {
							addGap(model, tally, 0, body, model.refs[j]);
						}
					}
				}
			}
		}
	}
	for (const own of placed.keepouts) {
		cellRange(g, own.box, 0);
		const n = gather(g, g.lo, g.hi, true);
		for (let q = 0; q < n; q++) {
			const j = found[q];
			if (active[group[j]] !== 1 || overlapWith(own.box, flat, j) <= 0) continue;
			const kind = pairKind(own, boxes[j]);
			if (!kind) continue;
			if (kind === 'collides') tally.collides[0] = 1;
			else if (kind === 'blocked') tally.blocked[0] = 1;
			overlaps?.push({ with: boxes[j].id, label: boxes[j].label, kind });
		}
	}
	let report: MountReport | null = null;
	model.mountRank[0] = STATUS_ORDER.indexOf('clear');
	if (mount) {
		report = mountReport(mount, base.scene, {
			...base.without,
			placements: [...stacked, placed]
		});
		model.mountRank[0] = mountRankOf(problemsMarking(report, placement.id));
	}
	return { report, overlaps };
}

/**
 * The probed part's bodies as gap records over `bodyFlat`. Index -1: they are not among the
 * model's boxes; the field is there so addGap sees one record shape (the model's own) and stays fast.
 */
function bodyRefs(bodyFlat: Float64Array, count: number): BoxRef[] {
	return Array.from({ length: count }, (_, slot) => ({ index: -1, coords: bodyFlat, slot }));
}

/** The candidate's bodies, six numbers each, in a scratch array of the base. */
function bodyFlatOf(base: ProbeBase, placed: ResolvedPlacement): Float64Array {
	const n = placed.bodies.length * 6;
	if (base.bodyFlat.length < n) base.bodyFlat = new Float64Array(n);
	const out = base.bodyFlat;
	for (let k = 0; k < placed.bodies.length; k++) {
		const { min, max } = placed.bodies[k].box;
		out[k * 6] = min[0];
		out[k * 6 + 1] = min[1];
		out[k * 6 + 2] = min[2];
		out[k * 6 + 3] = max[0];
		out[k * 6 + 4] = max[1];
		out[k * 6 + 5] = max[2];
	}
	return out;
}

/** Smallest free distance on a face that is not held, or the mount's spare when smaller; null when neither. */
function spareOf(model: Model, tally: Tally, report: MountReport | null): number | null {
	let spareMm: number | null = null;
	for (let f = 0; f < 6; f++) {
		const j = tally.against[f];
		const gap = tally.gap[f];
		if (j >= 0 && !isHeldContact(model, 0, f, gap, j) && (spareMm === null || gap < spareMm)) {
			spareMm = gap;
		}
	}
	if (report && report.spareMm !== null && (spareMm === null || report.spareMm < spareMm)) {
		spareMm = report.spareMm;
	}
	return spareMm;
}

export interface CellResult {
	status: FitStatus;
	spareMm: number | null;
	/** Clear or tight. */
	fits: boolean;
}

/** The moving control's world box at an offset, as resolveScene builds it. */
export function movingBoxAt(base: ProbeBase, offsetMm: number): WorldBox {
	const c = base.moving!;
	const enclosure = base.scene.enclosure;
	if (c.kind === 'divider') {
		return dividerWorldBox(
			enclosure,
			enclosure.dividers.find((d) => d.id === c.id)!,
			offsetMm
		);
	}
	return bracketWorldBox(
		enclosure.brackets.find((b) => b.id === c.id)!,
		offsetMm
	);
}

/**
 * One placement (whose landing does not depend on the control) at every position of the base's
 * moving control: probed once against the fixed boxes, then per position only the control's box
 * is added (its overlaps through pairKind, its gaps through addGap) and the status taken again
 * by placementStatus. Overlaps and nearest gaps are a union and a minimum (ties to the smaller
 * id), so this is the full probe's answer at each position; the mount's stack does not move.
 */
export function probeAcross(
	base: ProbeBase,
	placed: ResolvedPlacement,
	at: readonly WorldBox[]
): CellResult[] {
	const slot = base.movingSlot;
	if (slot < 0) throw new Error('probeAcross needs a base with a moving control');
	const { report } = probeCore(base, placed, false);
	const { model, tally, flat, boxes } = base;
	// The fixed scene's tally, restored before each position (scratch kept on the base).
	const gap = base.acrossGap;
	const against = base.acrossAgainst;
	gap.set(tally.gap);
	against.set(tally.against);
	const collides = tally.collides[0];
	const blocked = tally.blocked[0];
	const own = placed.keepouts.length ? [...placed.bodies, ...placed.keepouts] : placed.bodies;
	const bodies = bodyRefs(bodyFlatOf(base, placed), placed.bodies.length);
	const margin = base.scene.marginMm;
	const atFlat = flatOf(at);
	const o = slot * 6;
	const out: CellResult[] = new Array(at.length);
	for (let p = 0; p < at.length; p++) {
		const w = at[p];
		tally.gap.set(gap);
		tally.against.set(against);
		tally.collides[0] = collides;
		tally.blocked[0] = blocked;
		boxes[slot] = w;
		for (let i = 0; i < 6; i++) flat[o + i] = atFlat[p * 6 + i];
		for (const b of own) {
			if (overlapWith(b.box, flat, slot) <= 0) continue;
			const kind = pairKind(b, w);
			if (kind === 'collides') tally.collides[0] = 1;
			else if (kind === 'blocked') tally.blocked[0] = 1;
		}
		for (const body of bodies) addGap(model, tally, 0, body, model.refs[slot]);
		const status = placementStatus(model, tally, 0, margin);
		out[p] = {
			status,
			spareMm: spareOf(model, tally, report),
			fits: status === 'clear' || status === 'tight'
		};
	}
	return out;
}

/** The control's boxes at its positions, six numbers each: made once for every candidate. */
const flats = new WeakMap<readonly WorldBox[], Float64Array>();
function flatOf(at: readonly WorldBox[]): Float64Array {
	let f = flats.get(at);
	if (!f) {
		f = new Float64Array(at.length * 6);
		at.forEach((w, p) => {
			f!.set(w.box.min, p * 6);
			f!.set(w.box.max, p * 6 + 3);
		});
		flats.set(at, f);
	}
	return f;
}

/** Common practice: a G 1/4 fitting is about 22 mm across and stands about 20 mm off its port. */
export const FITTING_ACROSS_MM = 22;
export const FITTING_DEPTH_MM = 20;

export interface PortUse {
	id: string;
	thread: string;
	usable: boolean;
	/** What the fitting's room runs into, when it is not usable. */
	blockedBy: string | null;
	/** The room a fitting needs on this port, in inner coordinates. */
	box: Box;
}

/**
 * Which ports of a placed part keep room for a fitting. The room is the part's own fitting
 * keep-out where one covers the port (the part says how much its fittings need), else a 22 mm
 * square 20 mm out along the port's direction; it must be clear of walls, dividers, brackets and
 * other parts' bodies.
 */
export function portUse(base: ProbeBase, placed: ResolvedPlacement): PortUse[] {
	activatePlates(base, placed);
	const fittings = placed.keepouts.filter((k) => k.keepoutKind === 'fitting');
	// A power port takes a cable's plug, not a fitting.
	const coolant = placed.ports.filter((p) => p.kind !== 'power');
	return coolant.map((p) => {
		const axis = 'xyz'.indexOf(p.direction[1]);
		const sign = p.direction[0] === '+' ? 1 : -1;
		const min = [...p.position] as Vec3;
		const max = [...p.position] as Vec3;
		for (let i = 0; i < 3; i++) {
			if (i === axis) continue;
			min[i] -= FITTING_ACROSS_MM / 2;
			max[i] += FITTING_ACROSS_MM / 2;
		}
		if (sign > 0) max[axis] += FITTING_DEPTH_MM;
		else min[axis] -= FITTING_DEPTH_MM;
		let box: Box = { min, max };
		const own = fittings.find((k) =>
			k.box.min.every(
				(v, i) => v - EPSILON_MM <= p.position[i] && p.position[i] <= k.box.max[i] + EPSILON_MM
			)
		);
		if (own) {
			// The keep-out's share in front of this port: its cross-section within the square, out to its far face.
			const b: Box = { min: [...own.box.min], max: [...own.box.max] };
			for (let i = 0; i < 3; i++) {
				if (i === axis) continue;
				b.min[i] = Math.max(b.min[i], min[i]);
				b.max[i] = Math.min(b.max[i], max[i]);
			}
			if (sign > 0) b.min[axis] = p.position[axis];
			else b.max[axis] = p.position[axis];
			box = b;
		}
		let hit: string | null = null;
		for (let j = 0; j < base.boxes.length && hit === null; j++) {
			if (!base.active[base.group[j]] || !base.obstacle[j]) continue;
			if (overlapWith(box, base.flat, j) > 0) hit = base.boxes[j].label;
		}
		return { id: p.id, thread: p.thread, usable: hit === null, blockedBy: hit, box };
	});
}
