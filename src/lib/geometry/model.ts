/**
 * The shared core of the fit report and of sweeps. A scene's world boxes are tallied in two parts:
 * a static part (every box that does not move) computed once, and the boxes of the controls a sweep
 * moves, added per position. checkScene is the case with nothing moving, so a sweep step and a full
 * report cannot disagree.
 */

import { EPSILON_MM, FACES, compareText, faceOf, type Face } from './box';
import { STATUS_ORDER } from './types';
import { overlappingPairsFlat } from './broadphase';
import { FACE_AXES } from './enclosure';
import { mountReports } from './mounts';
import { isObstacle, pairKind } from './pairs';
import type { Box, Scene } from './schema';
import type {
	FitStatus,
	MountProblem,
	MountReport,
	OverlapKind,
	ResolvedScene,
	StatusCounts,
	WorldBox
} from './types';
import { unionVolume } from './union';

export interface Model {
	scene: Scene;
	resolved: ResolvedScene;
	/** Walls, dividers, brackets, plates, then each placement's bodies and keep-outs (placements by id). */
	boxes: WorldBox[];
	/** Six numbers a box, same order as `boxes`. */
	flat: Float64Array;
	/** Placement index per box, -1 for walls, dividers and brackets. */
	owner: Int32Array;
	obstacle: Uint8Array;
	/** Box indexes of each placement's bodies. */
	bodiesOf: number[][];
	/** Box indexes of every body, all placements together. */
	bodyBoxes: Int32Array;
	/** Faces of the inner box each placement's bodies cross; does not depend on controls. */
	outsideFaces: Face[][];
	/** Per placement: the face index (see FACE_INDEX) that points at its mount's panel, or -1. */
	mountFace: Int8Array;
	/** Per placement: its mount id, for telling stack contact from a tight gap. */
	mountOf: (string | undefined)[];
	/** Box index by id: controls move, their ids do not. */
	indexOf: Map<string, number>;
	/** Per box: for a wall, the face slot it bounds (2 × axis + 1 on the high side), else -1. */
	wallSide: Int8Array;
	/** Per placement: its part's toleranceMm. */
	toleranceMm: Float64Array;
	/** Mount reports (they do not depend on controls), and per placement the problems that mark it. */
	mounts: MountReport[];
	mountProblemsOf: MountProblem[][];
	/** Per placement: STATUS_ORDER index of its worst mount problem (that of 'clear' when none). */
	mountRank: Uint8Array;
}

/** Face slots in gap arrays: '-x', '+x', '-y', '+y', '-z', '+z'. */
/** The faces in slot order (box.ts's FACES: -x, +x, -y, +y, -z, +z). */
export const FACE_ORDER: readonly Face[] = FACES;

export function buildModel(scene: Scene, resolved: ResolvedScene): Model {
	const boxes: WorldBox[] = [
		...resolved.walls,
		...resolved.dividers,
		...resolved.brackets,
		...resolved.plates
	];
	const owners: number[] = boxes.map(() => -1);
	const bodiesOf: number[][] = [];
	const mounts = new Map(scene.enclosure.mounts.map((m) => [m.id, m]));
	const mountFace = new Int8Array(resolved.placements.length).fill(-1);
	const mountOf: (string | undefined)[] = [];
	const outsideFaces: Face[][] = [];
	resolved.placements.forEach((rp, p) => {
		bodiesOf.push(rp.bodies.map((_, k) => boxes.length + k));
		for (const b of [...rp.bodies, ...rp.keepouts]) {
			boxes.push(b);
			owners.push(p);
		}
		outsideFaces.push(facesOutside(resolved.innerBox, rp.bodies));
		const mount = rp.placement.mountId === undefined ? undefined : mounts.get(rp.placement.mountId);
		mountOf.push(mount?.id);
		if (mount) {
			const { axis, high } = FACE_AXES[mount.face];
			mountFace[p] = 2 * axis + (high ? 1 : 0);
		}
	});
	const owner = Int32Array.from(owners);
	const flat = new Float64Array(boxes.length * 6);
	const obstacle = new Uint8Array(boxes.length);
	boxes.forEach((b, i) => {
		writeFlat(flat, i, b.box);
		obstacle[i] = isObstacle(b) ? 1 : 0;
	});
	const indexOf = new Map(boxes.map((b, i) => [b.id, i]));
	const bodyBoxes = Int32Array.from(bodiesOf.flat());
	const wallSide = Int8Array.from(boxes, (b) => {
		if (b.kind !== 'wall') return -1;
		const { axis, high } = FACE_AXES[b.face!];
		return 2 * axis + (high ? 1 : 0);
	});
	const toleranceMm = Float64Array.from(resolved.placements, (rp) => rp.part.toleranceMm);
	const reports = mountReports(scene, resolved);
	const placementIndex = new Map(resolved.placements.map((rp, p) => [rp.placement.id, p]));
	const mountProblemsOf: MountProblem[][] = resolved.placements.map(() => []);
	for (const m of reports) {
		for (const problem of m.problems) {
			for (const id of problem.placementIds) mountProblemsOf[placementIndex.get(id)!].push(problem);
		}
	}
	const mountRank = Uint8Array.from(mountProblemsOf, mountRankOf);
	for (const list of mountProblemsOf) {
		list.sort(
			(x, y) =>
				STATUS_ORDER.indexOf(x.status) - STATUS_ORDER.indexOf(y.status) ||
				compareText(x.mountId, y.mountId)
		);
	}
	return {
		scene,
		resolved,
		boxes,
		flat,
		owner,
		obstacle,
		bodiesOf,
		bodyBoxes,
		outsideFaces,
		mountFace,
		mountOf,
		indexOf,
		wallSide,
		toleranceMm,
		mounts: reports,
		mountProblemsOf,
		mountRank
	};
}

/** STATUS_ORDER index of the worst of the mount problems that mark a placement ('clear' when none). */
export function mountRankOf(problems: readonly MountProblem[]): number {
	let rank = STATUS_ORDER.indexOf('clear');
	for (const problem of problems) rank = Math.min(rank, STATUS_ORDER.indexOf(problem.status));
	return rank;
}

/** The problems of a mount report that mark one placement (see MountProblem.placementIds). */
export function problemsMarking(report: MountReport, placementId: string): MountProblem[] {
	return report.problems.filter((problem) => problem.placementIds.includes(placementId));
}

export function writeFlat(flat: Float64Array, i: number, box: Box): void {
	const o = i * 6;
	flat[o] = box.min[0];
	flat[o + 1] = box.min[1];
	flat[o + 2] = box.min[2];
	flat[o + 3] = box.max[0];
	flat[o + 4] = box.max[1];
	flat[o + 5] = box.max[2];
}

export function facesOutside(inner: Box, bodies: readonly WorldBox[]): Face[] {
	const out = new Set<Face>();
	for (const b of bodies) {
		for (let a = 0; a < 3; a++) {
			if (b.box.min[a] < inner.min[a] - EPSILON_MM) {
				out.add(faceOf(a as 0 | 1 | 2, -1));
			}
			if (b.box.max[a] > inner.max[a] + EPSILON_MM) {
				out.add(faceOf(a as 0 | 1 | 2, 1));
			}
		}
	}
	return FACE_ORDER.filter((f) => out.has(f));
}

/** What overlaps and gaps add up to, per placement. */
export interface Tally {
	collides: Uint8Array;
	blocked: Uint8Array;
	/** Per placement × FACE_ORDER: nearest gap (mm, +Infinity when nothing is ahead) and its box. */
	gap: Float64Array;
	against: Int32Array;
	/** Sum of the 'collides' pair volumes (see `regions` for the union). */
	interferenceMm3: number;
	/** The 'collides' overlap boxes, six numbers each, for the union volume. */
	regions: number[];
	keepoutMm3: number;
	collisions: number;
	/** In a sweep step: the placements the moved boxes touched; the rest keep their static status. */
	touched: number[] | null;
	touchedFlag: Uint8Array;
}

export function emptyTally(placements: number, track = false): Tally {
	return {
		collides: new Uint8Array(placements),
		blocked: new Uint8Array(placements),
		gap: new Float64Array(placements * 6).fill(Infinity),
		against: new Int32Array(placements * 6).fill(-1),
		interferenceMm3: 0,
		regions: [],
		keepoutMm3: 0,
		collisions: 0,
		touched: track ? [] : null,
		touchedFlag: new Uint8Array(track ? placements : 0)
	};
}

function touch(tally: Tally, p: number): void {
	if (tally.touched && !tally.touchedFlag[p]) {
		tally.touchedFlag[p] = 1;
		tally.touched.push(p);
	}
}

/** Copies `from` into `into` (same size), so a sweep reuses one scratch tally for every step. */
export function copyTallyInto(from: Tally, into: Tally): Tally {
	into.collides.set(from.collides);
	into.blocked.set(from.blocked);
	into.gap.set(from.gap);
	into.against.set(from.against);
	into.interferenceMm3 = from.interferenceMm3;
	into.regions.length = 0;
	for (let k = 0; k < from.regions.length; k++) into.regions.push(from.regions[k]);
	into.keepoutMm3 = from.keepoutMm3;
	into.collisions = from.collisions;
	if (into.touched) {
		for (const p of into.touched) into.touchedFlag[p] = 0;
		into.touched.length = 0;
	}
	return into;
}

/** Overlap volume of boxes i (in flatA) and j (in flatB), or 0 when they only touch or are apart. */
function overlapVolume(flatA: Float64Array, i: number, flatB: Float64Array, j: number): number {
	const a = i * 6;
	const b = j * 6;
	const x = Math.min(flatA[a + 3], flatB[b + 3]) - Math.max(flatA[a], flatB[b]);
	if (!(x > EPSILON_MM)) return 0;
	const y = Math.min(flatA[a + 4], flatB[b + 4]) - Math.max(flatA[a + 1], flatB[b + 1]);
	if (!(y > EPSILON_MM)) return 0;
	const z = Math.min(flatA[a + 5], flatB[b + 5]) - Math.max(flatA[a + 2], flatB[b + 2]);
	if (!(z > EPSILON_MM)) return 0;
	return x * y * z;
}

function flag(tally: Tally, flags: Uint8Array, p: number): void {
	if (p >= 0) {
		flags[p] = 1;
		touch(tally, p);
	}
}

/** Union volume (mm³) of a tally's collision regions: each point inside a body counted once. */
export function interferenceUnion(tally: Tally): number {
	return unionVolume(tally.regions);
}

/** Boxes i (in flatA) and j (in flatB) overlap with this meaning. */
function addPair(
	model: Model,
	tally: Tally,
	i: number,
	j: number,
	kind: OverlapKind,
	volume: number,
	flatA: Float64Array,
	slotA: number,
	flatB: Float64Array,
	slotB: number
): void {
	const placementI = model.owner[i];
	const placementJ = model.owner[j];
	if (kind === 'collides') {
		tally.collisions++;
		tally.interferenceMm3 += volume;
		const a = slotA * 6;
		const b = slotB * 6;
		for (let k = 0; k < 3; k++) tally.regions.push(Math.max(flatA[a + k], flatB[b + k]));
		for (let k = 3; k < 6; k++) tally.regions.push(Math.min(flatA[a + k], flatB[b + k]));
		flag(tally, tally.collides, placementI);
		flag(tally, tally.collides, placementJ);
		return;
	}
	tally.keepoutMm3 += volume;
	if (kind === 'blocked') {
		flag(tally, tally.blocked, placementI);
		flag(tally, tally.blocked, placementJ);
	}
}

/**
 * Nearest box ahead of each face of body `bodySlot` (of placement `placement`). A box counts for the +a face when
 * it shares area with the body seen along a and reaches past that face (its max beyond the body's
 * max by more than EPSILON_MM), or lies within the body's span along a on the +a side of its
 * centre (a thin divider the body went through): then the gap is its min − the body's max,
 * negative when it overlaps the face. A wall is a half-space: it counts only for the face toward it (the right panel for +x),
 * its gap measured to the inner face, so a body through it reports how far it has gone past.
 * Ties go to the smaller id, so the answer does not depend on the order boxes are visited.
 */
export function addGap(
	model: Model,
	tally: Tally,
	placement: number,
	bodyFlat: Float64Array,
	bodySlot: number,
	obstacleFlat: Float64Array,
	obstacleSlot: number,
	obstacleIndex: number
): void {
	const bodyAt = bodySlot * 6;
	const obstacleAt = obstacleSlot * 6;
	const sharesX =
		Math.min(bodyFlat[bodyAt + 3], obstacleFlat[obstacleAt + 3]) -
			Math.max(bodyFlat[bodyAt], obstacleFlat[obstacleAt]) >
		EPSILON_MM;
	const sharesY =
		Math.min(bodyFlat[bodyAt + 4], obstacleFlat[obstacleAt + 4]) -
			Math.max(bodyFlat[bodyAt + 1], obstacleFlat[obstacleAt + 1]) >
		EPSILON_MM;
	if (!sharesX && !sharesY) {
		return;
	}
	const sharesZ =
		Math.min(bodyFlat[bodyAt + 5], obstacleFlat[obstacleAt + 5]) -
			Math.max(bodyFlat[bodyAt + 2], obstacleFlat[obstacleAt + 2]) >
		EPSILON_MM;
	if (sharesY && sharesZ) {
		gapAlong(model, tally, placement, bodyFlat, bodyAt, obstacleFlat, obstacleAt, 0, obstacleIndex);
	}
	if (sharesX && sharesZ) {
		gapAlong(model, tally, placement, bodyFlat, bodyAt, obstacleFlat, obstacleAt, 1, obstacleIndex);
	}
	if (sharesX && sharesY) {
		gapAlong(model, tally, placement, bodyFlat, bodyAt, obstacleFlat, obstacleAt, 2, obstacleIndex);
	}
}

/** The obstacle shares area with the body seen along `axis`: offer it to the face it is ahead of. */
function gapAlong(
	model: Model,
	tally: Tally,
	placement: number,
	bodyFlat: Float64Array,
	bodyAt: number,
	obstacleFlat: Float64Array,
	obstacleAt: number,
	axis: number,
	obstacleIndex: number
): void {
	const side = model.wallSide[obstacleIndex];
	if (side >= 0) {
		if (side >> 1 !== axis) return;
		const inner = model.resolved.innerBox;
		if (side & 1) {
			offerGap(
				model,
				tally,
				placement * 6 + 2 * axis + 1,
				inner.max[axis] - bodyFlat[bodyAt + 3 + axis],
				obstacleIndex
			);
		} else {
			offerGap(
				model,
				tally,
				placement * 6 + 2 * axis,
				bodyFlat[bodyAt + axis] - inner.min[axis],
				obstacleIndex
			);
		}
		return;
	}
	const beyondHigh = obstacleFlat[obstacleAt + 3 + axis] > bodyFlat[bodyAt + 3 + axis] + EPSILON_MM;
	const beyondLow = obstacleFlat[obstacleAt + axis] < bodyFlat[bodyAt + axis] - EPSILON_MM;
	// A box within the body's span along the axis (a thin divider the body went through) goes to the face
	// on its side of the body's centre.
	const within = !beyondHigh && !beyondLow;
	const centre =
		obstacleFlat[obstacleAt + axis] +
		obstacleFlat[obstacleAt + 3 + axis] -
		bodyFlat[bodyAt + axis] -
		bodyFlat[bodyAt + 3 + axis];
	if (beyondHigh || (within && centre >= 0)) {
		offerGap(
			model,
			tally,
			placement * 6 + 2 * axis + 1,
			obstacleFlat[obstacleAt + axis] - bodyFlat[bodyAt + 3 + axis],
			obstacleIndex
		);
	}
	if (beyondLow || (within && centre <= 0)) {
		offerGap(
			model,
			tally,
			placement * 6 + 2 * axis,
			bodyFlat[bodyAt + axis] - obstacleFlat[obstacleAt + 3 + axis],
			obstacleIndex
		);
	}
}

function offerGap(
	model: Model,
	tally: Tally,
	slot: number,
	gap: number,
	obstacleIndex: number
): void {
	const current = tally.gap[slot];
	if (
		gap < current ||
		(gap === current &&
			compareText(model.boxes[obstacleIndex].id, model.boxes[tally.against[slot]].id) < 0)
	) {
		tally.gap[slot] = gap;
		tally.against[slot] = obstacleIndex;
		touch(tally, (slot / 6) | 0);
	}
}

/**
 * Gaps along axis a. Only boxes that share area seen along a can be ahead of each other, so the
 * broadphase runs on the boxes stretched to the same unit slab along a: its pairs are exactly the
 * pairs whose projections on the other two axes overlap.
 */
function tallyGapsAlong(model: Model, tally: Tally, obstacles: readonly number[], a: number): void {
	const m = obstacles.length;
	const beams = new Float64Array(m * 6);
	for (let k = 0; k < m; k++) {
		beams.set(model.flat.subarray(obstacles[k] * 6, obstacles[k] * 6 + 6), k * 6);
		beams[k * 6 + a] = 0;
		beams[k * 6 + 3 + a] = 1;
	}
	const found = overlappingPairsFlat(beams, m);
	for (let q = 0; q < found.count; q++) {
		const i = obstacles[found.pairs[2 * q]];
		const j = obstacles[found.pairs[2 * q + 1]];
		const placementI = model.owner[i];
		const placementJ = model.owner[j];
		if (placementI === placementJ) continue;
		if (placementI >= 0) {
			gapAlong(model, tally, placementI, model.flat, i * 6, model.flat, j * 6, a, j);
		}
		if (placementJ >= 0) {
			gapAlong(model, tally, placementJ, model.flat, j * 6, model.flat, i * 6, a, i);
		}
	}
}

export interface FoundPair {
	i: number;
	j: number;
	kind: OverlapKind;
	volumeMm3: number;
}

/**
 * Tallies every box with `included[i]` set (all when null) against the others. Returns the
 * meaningful overlapping pairs too, for the report.
 */
export function tallyStatic(
	model: Model,
	included: Uint8Array | null
): { tally: Tally; pairs: FoundPair[] } {
	const tally = emptyTally(model.bodiesOf.length);
	const ids: number[] = [];
	for (let i = 0; i < model.boxes.length; i++) {
		if (!included || included[i]) ids.push(i);
	}
	const sub = new Float64Array(ids.length * 6);
	ids.forEach((id, k) => sub.set(model.flat.subarray(id * 6, id * 6 + 6), k * 6));
	const found = overlappingPairsFlat(sub, ids.length);
	const pairs: FoundPair[] = [];
	for (let k = 0; k < found.count; k++) {
		const i = ids[found.pairs[2 * k]];
		const j = ids[found.pairs[2 * k + 1]];
		const kind = pairKind(model.boxes[i], model.boxes[j]);
		if (!kind) continue;
		const volumeMm3 = overlapVolume(model.flat, i, model.flat, j);
		addPair(model, tally, i, j, kind, volumeMm3, model.flat, i, model.flat, j);
		pairs.push({ i: Math.min(i, j), j: Math.max(i, j), kind, volumeMm3 });
	}
	const obstacles = ids.filter((i) => model.obstacle[i]);
	for (let a = 0; a < 3; a++) {
		tallyGapsAlong(model, tally, obstacles, a);
	}
	return { tally, pairs };
}

/**
 * Static boxes sorted along the axis a control slides on, so a sweep step finds the few near the
 * moved box by binary search. Boxes long along that axis (walls across it, a full-width shelf) are
 * kept apart and always visited.
 */
export interface SlideIndex {
	axis: number;
	order: Int32Array;
	mins: Float64Array;
	/** Longest extent along the axis among the sorted boxes. */
	reach: number;
	long: Int32Array;
}

export function slideIndex(model: Model, included: Uint8Array, axis: number): SlideIndex {
	const f = model.flat;
	const ids: number[] = [];
	for (let i = 0; i < model.boxes.length; i++) if (included[i]) ids.push(i);
	let lo = Infinity;
	let hi = -Infinity;
	for (const i of ids) {
		lo = Math.min(lo, f[i * 6 + axis]);
		hi = Math.max(hi, f[i * 6 + 3 + axis]);
	}
	const longest = (hi - lo) / 4;
	const extent = (i: number) => f[i * 6 + 3 + axis] - f[i * 6 + axis];
	const short = ids
		.filter((i) => !(extent(i) > longest))
		.sort((x, y) => f[x * 6 + axis] - f[y * 6 + axis]);
	return {
		axis,
		order: Int32Array.from(short),
		mins: Float64Array.from(short, (i) => f[i * 6 + axis]),
		reach: short.reduce((r, i) => Math.max(r, extent(i)), 0),
		long: Int32Array.from(ids.filter((i) => extent(i) > longest))
	};
}

/** First index in the sorted `mins` at or above `v`. */
function lowerBound(mins: Float64Array, v: number): number {
	let lo = 0;
	let hi = mins.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (mins[mid] < v) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}

/**
 * Adds moved control boxes to a copy of a static tally (written into `scratch`): `moving[k]` is
 * the box index of a divider or bracket, its geometry for this step in `movingFlat` at k.
 *
 * Only static boxes within `marginMm` of a moved box along its slide axis are visited: farther
 * ones can neither overlap it nor be made tight by it, so their status stays the static one (the
 * gaps of `extraPlacements`, which a sweep reports, are offered in full).
 */
export function tallyMoving(
	model: Model,
	base: Tally,
	moving: readonly number[],
	movingFlat: Float64Array,
	slides: readonly SlideIndex[],
	marginMm: number,
	extraPlacements: readonly number[],
	scratch: Tally = emptyTally(model.bodiesOf.length, true)
): Tally {
	const tally = copyTallyInto(base, scratch);
	for (let k = 0; k < moving.length; k++) {
		const mi = moving[k];
		const { axis, order, mins, reach, long } = slides[k];
		const pad = marginMm + 1;
		const lo = movingFlat[k * 6 + axis] - pad;
		const hi = movingFlat[k * 6 + 3 + axis] + pad;
		for (let q = 0; q < long.length; q++) visitNear(model, tally, mi, k, movingFlat, long[q]);
		const end = lowerBound(mins, hi);
		for (let q = lowerBound(mins, lo - reach); q < end; q++) {
			const i = order[q];
			if (model.flat[i * 6 + 3 + axis] >= lo) visitNear(model, tally, mi, k, movingFlat, i);
		}
		for (let l = k + 1; l < moving.length; l++) {
			const volume = overlapVolume(movingFlat, k, movingFlat, l);
			const kind = volume > 0 ? pairKind(model.boxes[mi], model.boxes[moving[l]]) : null;
			if (kind) addPair(model, tally, mi, moving[l], kind, volume, movingFlat, k, movingFlat, l);
		}
		for (const p of extraPlacements) {
			for (const bi of model.bodiesOf[p]) {
				addGap(model, tally, p, model.flat, bi, movingFlat, k, mi);
			}
		}
	}
	return tally;
}

function visitNear(
	model: Model,
	tally: Tally,
	mi: number,
	k: number,
	movingFlat: Float64Array,
	i: number
): void {
	const volume = overlapVolume(movingFlat, k, model.flat, i);
	if (volume > 0) {
		const kind = pairKind(model.boxes[mi], model.boxes[i]);
		if (kind) addPair(model, tally, mi, i, kind, volume, movingFlat, k, model.flat, i);
	}
	const p = model.owner[i];
	if (p >= 0 && model.obstacle[i]) addGap(model, tally, p, model.flat, i, movingFlat, k, mi);
}

/**
 * Contact where a part is held does not make it tight: resting on what is below it (−y), and for
 * a mounted part its mount's panel, plate or standoffs (on the face toward the panel) and the other
 * parts on the same mount (fans butted together on a radiator, a block on its board).
 */
export function isHeldContact(
	model: Model,
	p: number,
	face: number,
	gap: number,
	against: number
): boolean {
	if (!(Math.abs(gap) <= EPSILON_MM) || against < 0) {
		return false;
	}
	if (face === 2) {
		return true;
	}
	const mountFace = model.mountFace[p];
	if (mountFace < 0) {
		return false;
	}
	const box = model.boxes[against];
	if (box.kind === 'plate') {
		return face === mountFace && box.mountId === model.mountOf[p];
	}
	if (box.kind === 'wall') {
		const wallFace = FACE_AXES[box.face!];
		return face === mountFace && 2 * wallFace.axis + (wallFace.high ? 1 : 0) === mountFace;
	}
	const other = model.owner[against];
	return other >= 0 && model.mountOf[other] === model.mountOf[p];
}

/** A gap's worst case: the gap less the part's tolerance and the other side's (0 for fixed boxes). */
export function worstCaseGap(model: Model, p: number, gap: number, against: number): number {
	const other = against < 0 ? -1 : model.owner[against];
	return gap - model.toleranceMm[p] - (other >= 0 ? model.toleranceMm[other] : 0);
}

export function geometricStatus(
	model: Model,
	tally: Tally,
	p: number,
	marginMm: number
): FitStatus {
	if (tally.collides[p]) return 'collides';
	if (tally.blocked[p]) return 'blocked';
	if (model.outsideFaces[p].length > 0) return 'outside';
	for (let f = 0; f < 6; f++) {
		const gap = tally.gap[p * 6 + f];
		const against = tally.against[p * 6 + f];
		if (
			against >= 0 &&
			worstCaseGap(model, p, gap, against) < marginMm - EPSILON_MM &&
			!isHeldContact(model, p, f, gap, against)
		) {
			return 'tight';
		}
	}
	return 'clear';
}

/** The worse of the part's own status and that of the mount stack it is on. */
export function placementStatus(
	model: Model,
	tally: Tally,
	p: number,
	marginMm: number
): FitStatus {
	const own = STATUS_ORDER.indexOf(geometricStatus(model, tally, p, marginMm));
	return STATUS_ORDER[Math.min(own, model.mountRank[p])];
}

export function emptyCounts(): StatusCounts {
	return { collides: 0, blocked: 0, outside: 0, tight: 0, clear: 0 };
}

export function statusCounts(
	model: Model,
	tally: Tally,
	marginMm: number
): { statuses: FitStatus[]; counts: StatusCounts } {
	const counts = emptyCounts();
	const statuses = model.bodiesOf.map((_, p) => placementStatus(model, tally, p, marginMm));
	for (const s of statuses) counts[s]++;
	return { statuses, counts };
}

/**
 * Counts for a sweep step: the static statuses, redone only for the placements the moved boxes
 * touched (a placement nothing moved against keeps its status).
 */
export function stepCounts(
	model: Model,
	tally: Tally,
	marginMm: number,
	base: { statuses: FitStatus[]; counts: StatusCounts }
): StatusCounts {
	const counts = { ...base.counts };
	for (const p of tally.touched ?? model.bodiesOf.map((_, i) => i)) {
		counts[base.statuses[p]]--;
		counts[placementStatus(model, tally, p, marginMm)]++;
	}
	return counts;
}
