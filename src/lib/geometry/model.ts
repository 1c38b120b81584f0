/**
 * The shared core of the fit report and of sweeps. A scene's world boxes are tallied in two parts:
 * a static part (every box that does not move) computed once, and the boxes of the controls a sweep
 * moves, added per position. checkScene is the case with nothing moving, so a sweep step and a full
 * report cannot disagree.
 */

import { EPSILON_MM, FACES, compareText, faceOf, type Face } from './box';
import {
	BOX_STRIDE,
	MAX,
	writePacked,
	type BoxRef,
	type PackedBox,
	type PackedBoxes
} from './packed';
import { STATUS_ORDER } from './types';
import { lowerBound } from './sorted';
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
	/** Every box packed (see packed.ts), same order as `boxes`. */
	flat: PackedBoxes;
	/** Per box: its index and where its numbers are (slot i of `flat`), made once for the hot loops. */
	refs: BoxRef[];
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
	const flat = new Float64Array(boxes.length * BOX_STRIDE);
	const obstacle = new Uint8Array(boxes.length);
	boxes.forEach((b, i) => {
		writePacked(flat, i, b.box);
		obstacle[i] = isObstacle(b) ? 1 : 0;
	});
	const refs = boxes.map((_, index): BoxRef => ({ index, coords: flat, slot: index }));
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
		refs,
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
	return FACES.filter((f) => out.has(f));
}

/** What overlaps and gaps add up to, per placement. */
export interface Tally {
	collides: Uint8Array;
	blocked: Uint8Array;
	/** Per placement × FACES (slot p × 6 + face): nearest gap (mm, +Infinity when nothing is ahead) and its box. */
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

/** Overlap volume (mm³) of two packed boxes, or 0 when they only touch or are apart. */
function overlapVolume(a: PackedBox, b: PackedBox): number {
	const coordsA = a.coords;
	const coordsB = b.coords;
	const atA = a.slot * BOX_STRIDE;
	const atB = b.slot * BOX_STRIDE;
	const x = Math.min(coordsA[atA + MAX], coordsB[atB + MAX]) - Math.max(coordsA[atA], coordsB[atB]);
	if (!(x > EPSILON_MM)) return 0;
	const y =
		Math.min(coordsA[atA + MAX + 1], coordsB[atB + MAX + 1]) -
		Math.max(coordsA[atA + 1], coordsB[atB + 1]);
	if (!(y > EPSILON_MM)) return 0;
	const z =
		Math.min(coordsA[atA + MAX + 2], coordsB[atB + MAX + 2]) -
		Math.max(coordsA[atA + 2], coordsB[atB + 2]);
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

/** Boxes `a` and `b` overlap by `volumeMm3` with this meaning. */
function addPair(
	model: Model,
	tally: Tally,
	a: BoxRef,
	b: BoxRef,
	kind: OverlapKind,
	volumeMm3: number
): void {
	const placementA = model.owner[a.index];
	const placementB = model.owner[b.index];
	if (kind === 'collides') {
		tally.collisions++;
		tally.interferenceMm3 += volumeMm3;
		const atA = a.slot * BOX_STRIDE;
		const atB = b.slot * BOX_STRIDE;
		// The overlap region: the larger min and the smaller max on each axis.
		for (let k = 0; k < 3; k++) tally.regions.push(Math.max(a.coords[atA + k], b.coords[atB + k]));
		for (let k = MAX; k < BOX_STRIDE; k++) {
			tally.regions.push(Math.min(a.coords[atA + k], b.coords[atB + k]));
		}
		flag(tally, tally.collides, placementA);
		flag(tally, tally.collides, placementB);
		return;
	}
	tally.keepoutMm3 += volumeMm3;
	if (kind === 'blocked') {
		flag(tally, tally.blocked, placementA);
		flag(tally, tally.blocked, placementB);
	}
}

/**
 * Nearest box ahead of each face of one body of placement `placement`. A box counts for the +a face when
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
	body: PackedBox,
	obstacle: BoxRef
): void {
	const bodyCoords = body.coords;
	const obstacleCoords = obstacle.coords;
	const bodyAt = body.slot * BOX_STRIDE;
	const obstacleAt = obstacle.slot * BOX_STRIDE;
	const sharesX =
		Math.min(bodyCoords[bodyAt + MAX], obstacleCoords[obstacleAt + MAX]) -
			Math.max(bodyCoords[bodyAt], obstacleCoords[obstacleAt]) >
		EPSILON_MM;
	const sharesY =
		Math.min(bodyCoords[bodyAt + MAX + 1], obstacleCoords[obstacleAt + MAX + 1]) -
			Math.max(bodyCoords[bodyAt + 1], obstacleCoords[obstacleAt + 1]) >
		EPSILON_MM;
	if (!sharesX && !sharesY) {
		return;
	}
	const sharesZ =
		Math.min(bodyCoords[bodyAt + MAX + 2], obstacleCoords[obstacleAt + MAX + 2]) -
			Math.max(bodyCoords[bodyAt + 2], obstacleCoords[obstacleAt + 2]) >
		EPSILON_MM;
	if (sharesY && sharesZ) gapAlong(model, tally, placement, body, obstacle, 0);
	if (sharesX && sharesZ) gapAlong(model, tally, placement, body, obstacle, 1);
	if (sharesX && sharesY) gapAlong(model, tally, placement, body, obstacle, 2);
}

/** The obstacle shares area with the body seen along `axis`: offer it to the face it is ahead of. */
function gapAlong(
	model: Model,
	tally: Tally,
	placement: number,
	body: PackedBox,
	obstacle: BoxRef,
	axis: number
): void {
	// Gap slots: placement × 6 + 2 × axis, + 1 for the face on the high side.
	const lowFace = placement * 6 + 2 * axis;
	const highFace = lowFace + 1;
	const bodyCoords = body.coords;
	const bodyMin = bodyCoords[body.slot * BOX_STRIDE + axis];
	const bodyMax = bodyCoords[body.slot * BOX_STRIDE + MAX + axis];
	const side = model.wallSide[obstacle.index];
	if (side >= 0) {
		if (side >> 1 !== axis) return;
		const inner = model.resolved.innerBox;
		if (side & 1) offerGap(model, tally, highFace, inner.max[axis] - bodyMax, obstacle.index);
		else offerGap(model, tally, lowFace, bodyMin - inner.min[axis], obstacle.index);
		return;
	}
	const obstacleMin = obstacle.coords[obstacle.slot * BOX_STRIDE + axis];
	const obstacleMax = obstacle.coords[obstacle.slot * BOX_STRIDE + MAX + axis];
	const beyondHigh = obstacleMax > bodyMax + EPSILON_MM;
	const beyondLow = obstacleMin < bodyMin - EPSILON_MM;
	// A box within the body's span along the axis (a thin divider the body went through) goes to the face
	// on its side of the body's centre.
	const within = !beyondHigh && !beyondLow;
	const centre = obstacleMin + obstacleMax - bodyMin - bodyMax;
	if (beyondHigh || (within && centre >= 0)) {
		offerGap(model, tally, highFace, obstacleMin - bodyMax, obstacle.index);
	}
	if (beyondLow || (within && centre <= 0)) {
		offerGap(model, tally, lowFace, bodyMin - obstacleMax, obstacle.index);
	}
}

/** Keeps `gap` (mm) against box `against` for gap slot `faceSlot` when it is the nearest so far. */
function offerGap(
	model: Model,
	tally: Tally,
	faceSlot: number,
	gap: number,
	against: number
): void {
	const current = tally.gap[faceSlot];
	if (
		gap < current ||
		(gap === current &&
			compareText(model.boxes[against].id, model.boxes[tally.against[faceSlot]].id) < 0)
	) {
		tally.gap[faceSlot] = gap;
		tally.against[faceSlot] = against;
		touch(tally, (faceSlot / 6) | 0);
	}
}

/**
 * Gaps along `axis`. Only boxes that share area seen along it can be ahead of each other, so the
 * broadphase runs on the boxes stretched to the same unit slab along it: its pairs are exactly the
 * pairs whose projections on the other two axes overlap.
 */
function tallyGapsAlong(
	model: Model,
	tally: Tally,
	obstacles: readonly number[],
	axis: number
): void {
	const beams: PackedBoxes = new Float64Array(obstacles.length * BOX_STRIDE);
	obstacles.forEach((box, k) => {
		beams.set(model.flat.subarray(box * BOX_STRIDE, (box + 1) * BOX_STRIDE), k * BOX_STRIDE);
		beams[k * BOX_STRIDE + axis] = 0;
		beams[k * BOX_STRIDE + MAX + axis] = 1;
	});
	const found = overlappingPairsFlat(beams, obstacles.length);
	for (let q = 0; q < found.count; q++) {
		const a = model.refs[obstacles[found.pairs[2 * q]]];
		const b = model.refs[obstacles[found.pairs[2 * q + 1]]];
		const placementA = model.owner[a.index];
		const placementB = model.owner[b.index];
		if (placementA === placementB) continue;
		if (placementA >= 0) gapAlong(model, tally, placementA, a, b, axis);
		if (placementB >= 0) gapAlong(model, tally, placementB, b, a, axis);
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
	const sub: PackedBoxes = new Float64Array(ids.length * BOX_STRIDE);
	ids.forEach((id, k) =>
		sub.set(model.flat.subarray(id * BOX_STRIDE, (id + 1) * BOX_STRIDE), k * BOX_STRIDE)
	);
	const found = overlappingPairsFlat(sub, ids.length);
	const pairs: FoundPair[] = [];
	for (let k = 0; k < found.count; k++) {
		const i = ids[found.pairs[2 * k]];
		const j = ids[found.pairs[2 * k + 1]];
		const kind = pairKind(model.boxes[i], model.boxes[j]);
		if (!kind) continue;
		const volumeMm3 = overlapVolume(model.refs[i], model.refs[j]);
		addPair(model, tally, model.refs[i], model.refs[j], kind, volumeMm3);
		pairs.push({ i: Math.min(i, j), j: Math.max(i, j), kind, volumeMm3 });
	}
	const obstacles = ids.filter((i) => model.obstacle[i]);
	for (let axis = 0; axis < 3; axis++) {
		tallyGapsAlong(model, tally, obstacles, axis);
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
	/** Box indexes of the short boxes, by their min along the axis. */
	order: Int32Array;
	/** Their mins along the axis (mm), same order. */
	mins: Float64Array;
	/** Longest extent along the axis among the sorted boxes. */
	reach: number;
	/** Box indexes of the long boxes. */
	long: Int32Array;
}

export function slideIndex(model: Model, included: Uint8Array, axis: number): SlideIndex {
	const coords = model.flat;
	const minOf = (box: number) => coords[box * BOX_STRIDE + axis];
	const maxOf = (box: number) => coords[box * BOX_STRIDE + MAX + axis];
	const ids: number[] = [];
	for (let i = 0; i < model.boxes.length; i++) if (included[i]) ids.push(i);
	let lo = Infinity;
	let hi = -Infinity;
	for (const i of ids) {
		lo = Math.min(lo, minOf(i));
		hi = Math.max(hi, maxOf(i));
	}
	const longest = (hi - lo) / 4;
	const extent = (i: number) => maxOf(i) - minOf(i);
	const short = ids.filter((i) => !(extent(i) > longest)).sort((x, y) => minOf(x) - minOf(y));
	return {
		axis,
		order: Int32Array.from(short),
		mins: Float64Array.from(short, minOf),
		reach: short.reduce((r, i) => Math.max(r, extent(i)), 0),
		long: Int32Array.from(ids.filter((i) => extent(i) > longest))
	};
}

/** What one sweep step moves, and what it reports beyond the statuses. */
export interface MovingStep {
	/** The moved dividers and brackets: box index, and their geometry for this step (own array). */
	moved: readonly BoxRef[];
	/** Per moved box, same order: the static boxes sorted along its slide axis. */
	slides: readonly SlideIndex[];
	marginMm: number;
	/** Placements whose gaps the sweep reports: offered every moved box, however far. */
	reportedPlacements: readonly number[];
}

/**
 * Adds moved control boxes to a copy of a static tally (written into `scratch`).
 *
 * Only static boxes within `marginMm` of a moved box along its slide axis are visited: farther
 * ones can neither overlap it nor be made tight by it, so their status stays the static one (the
 * gaps of `reportedPlacements`, which a sweep reports, are offered in full).
 */
export function tallyMoving(
	model: Model,
	base: Tally,
	step: MovingStep,
	scratch: Tally = emptyTally(model.bodiesOf.length, true)
): Tally {
	const tally = copyTallyInto(base, scratch);
	const { moved, slides, marginMm, reportedPlacements } = step;
	for (let k = 0; k < moved.length; k++) {
		const box = moved[k];
		const { axis, order, mins, reach, long } = slides[k];
		const pad = marginMm + 1;
		const lo = box.coords[box.slot * BOX_STRIDE + axis] - pad;
		const hi = box.coords[box.slot * BOX_STRIDE + MAX + axis] + pad;
		for (let q = 0; q < long.length; q++) visitNear(model, tally, box, model.refs[long[q]]);
		const end = lowerBound(mins, hi);
		for (let q = lowerBound(mins, lo - reach); q < end; q++) {
			const near = order[q];
			if (model.flat[near * BOX_STRIDE + MAX + axis] >= lo) {
				visitNear(model, tally, box, model.refs[near]);
			}
		}
		for (let l = k + 1; l < moved.length; l++) {
			const other = moved[l];
			const volume = overlapVolume(box, other);
			const kind = volume > 0 ? pairKind(model.boxes[box.index], model.boxes[other.index]) : null;
			if (kind) addPair(model, tally, box, other, kind, volume);
		}
		for (const p of reportedPlacements) {
			for (const body of model.bodiesOf[p]) addGap(model, tally, p, model.refs[body], box);
		}
	}
	return tally;
}

/** A moved box against a static one near it: their overlap, and the gap it leaves the static one. */
function visitNear(model: Model, tally: Tally, moved: BoxRef, near: BoxRef): void {
	const volume = overlapVolume(moved, near);
	if (volume > 0) {
		const kind = pairKind(model.boxes[moved.index], model.boxes[near.index]);
		if (kind) addPair(model, tally, moved, near, kind, volume);
	}
	const p = model.owner[near.index];
	if (p >= 0 && model.obstacle[near.index]) addGap(model, tally, p, near, moved);
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
