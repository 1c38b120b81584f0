/**
 * What a check or a sweep will cost, counted before the work starts, and the limits a request must
 * stay under. The fit report's work grows with the boxes and with the pairs the broadphase hands
 * on: boxes that overlap in 3D (each becomes a tallied pair and maybe a listed overlap) and boxes
 * whose shadows overlap seen along an axis (the gap pass visits each). Both are bounded here from
 * one-axis interval overlaps, counted by sorting (O(n log n), no pair is ever made):
 *
 * - two boxes can overlap in 3D only if their extents overlap on every axis, so the 3D pairs are
 *   at most the smallest of the three one-axis counts;
 * - two boxes share area seen along axis a only if they overlap on both other axes, so those pairs
 *   are at most the smaller of the other two counts.
 *
 * Limits (reasoning in docs/scene-format.md, "Limits"): a real enclosure has tens to a few hundred
 * boxes. The pair bound never exceeds 4 × n(n − 1)/2, so a scene of up to 500 boxes is under the
 * pair limit whatever its layout; what the limits refuse is thousands of boxes piled on each other.
 */

import { compareText } from './box';
import { resolveScene } from './resolve';
import type { Box, Scene } from './schema';
import type { ResolvedScene } from './types';

/** Most world boxes a check or sweep takes (walls, controls, bodies, keep-outs). */
export const MAX_CHECK_BOXES = 2_000;
/** Most candidate pairs (3D overlaps plus the gap pass's pairs on three axes, bounded as above). */
export const MAX_CANDIDATE_PAIRS = 500_000;
/** Most positions a sweep evaluates (one control's points, or a grid's cells). */
export const MAX_SWEEP_POINTS = 10_000;
/** Most grid cells of a two-control sweep: each cell is a row of the answer (about 0.3 KB). */
export const MAX_GRID_CELLS = 2_500;
/** Most positions × boxes of a sweep: each position visits, at worst, every box. */
export const MAX_SWEEP_WORK = 2_000_000;
/**
 * Most rows of a sweep's answer: per position one row, one per gap asked for and one per
 * compartment (about 80 bytes each, so about 16 MB at most).
 */
export const MAX_SWEEP_ROWS = 200_000;
/** Most obstacles one route search takes (the scene's boxes plus other runs' boxes). */
export const MAX_ROUTE_OBSTACLES = 4_000;
/** Search states one route request may expand, across its alternatives and its explanation. */
export const MAX_ROUTE_EXPANSIONS = 150_000;
/** Overlaps the fit report lists; the rest are counted in `overlapsNotListed`, totals stay exact. */
export const MAX_LISTED_OVERLAPS = 200;

export interface SceneCost {
	boxes: number;
	/** Upper bound of the pairs the check will visit (see the module comment). */
	candidatePairs: number;
	/** Upper bound of the pairs that overlap in 3D (a part of candidatePairs). */
	overlapPairsBound: number;
}

/** A limit a request goes over: which one, where, and a message that names it. */
export interface CostExcess {
	limit:
		| 'boxes'
		| 'candidatePairs'
		| 'sweepPoints'
		| 'gridCells'
		| 'sweepWork'
		| 'sweepRows'
		| 'routeObstacles';
	/** The request field that carries the cost, like `scene.placements` or `positions`. */
	path: string;
	value: number;
	max: number;
	message: string;
}

/**
 * Pairs of closed intervals [lo[i], hi[i]] that meet (touching counts, so the count is an upper
 * bound of pairs that overlap by more than the engine's tolerance). Sorted starts and ends: the
 * pairs are C(n, 2) minus the pairs where one ends before the other starts.
 */
export function intervalPairs(lo: Float64Array, hi: Float64Array): number {
	const n = lo.length;
	if (n < 2) return 0;
	const starts = Float64Array.from(lo).sort();
	const ends = Float64Array.from(hi).sort();
	// For each start, the intervals that ended strictly before it are pairs that do not meet.
	let disjoint = 0;
	let e = 0;
	for (let s = 0; s < n; s++) {
		while (e < n && ends[e] < starts[s]) e++;
		disjoint += e;
	}
	return (n * (n - 1)) / 2 - disjoint;
}

/** The cost of checking these world boxes, from their one-axis interval overlaps. */
export function boxesCost(boxes: readonly Box[]): SceneCost {
	const n = boxes.length;
	const counts = [0, 1, 2].map((a) => {
		const lo = new Float64Array(n);
		const hi = new Float64Array(n);
		for (let i = 0; i < n; i++) {
			lo[i] = boxes[i].min[a];
			hi[i] = boxes[i].max[a];
		}
		return intervalPairs(lo, hi);
	});
	const [x, y, z] = counts;
	const overlapPairsBound = Math.min(x, y, z);
	const gapPairsBound = Math.min(y, z) + Math.min(x, z) + Math.min(x, y);
	return { boxes: n, candidatePairs: overlapPairsBound + gapPairsBound, overlapPairsBound };
}

function plural(n: number, word: string): string {
	return `${n.toLocaleString('en-US')} ${word}`;
}

/**
 * What each limit's message says, from the amount asked for, the limit, and the amount's factors
 * where it is a product (positions × boxes).
 */
const SAYS: Record<
	CostExcess['limit'],
	(value: number, max: number, factors: readonly [number, number]) => string
> = {
	boxes: (value, max) =>
		`The scene has ${plural(value, 'boxes')}; the limit is ${plural(max, 'boxes')} (walls, dividers, brackets, bodies and keep-outs).`,
	candidatePairs: (value, max) =>
		`The scene's boxes are piled so close that checking them could take up to ${plural(value, 'pairs')}; the limit is ${plural(max, 'candidate pairs')}.`,
	gridCells: (value, max) =>
		`The grid has ${plural(value, 'cells')}; the limit is ${plural(max, 'cells')}. Sweep fewer positions of either control.`,
	sweepPoints: (value, max) =>
		`The sweep has ${plural(value, 'positions')}; the limit is ${plural(max, 'positions')}.`,
	sweepWork: (value, max, [points, boxes]) =>
		`The sweep is ${plural(points, 'positions')} × ${plural(boxes, 'boxes')} = ${plural(value, 'position-boxes')}; the limit is ${plural(max, 'position-boxes')}.`,
	sweepRows: (value, max) =>
		`The sweep would answer ${plural(value, 'rows')} (positions × gaps and compartments); the limit is ${plural(max, 'rows')}. Ask for fewer gaps or positions.`,
	routeObstacles: (value, max) =>
		`The route would have to clear ${plural(value, 'boxes')}; the limit is ${plural(max, 'boxes')}.`
};

/** The excess when `value` goes over `max`, else null. */
function over(
	limit: CostExcess['limit'],
	path: string,
	value: number,
	max: number,
	factors: readonly [number, number] = [value, 1]
): CostExcess | null {
	return value > max
		? { limit, path, value, max, message: SAYS[limit](value, max, factors) }
		: null;
}

/** The first limit the scene's cost goes over, or null. `path` names the field carrying it. */
export function sceneExcess(cost: SceneCost, path = 'placements'): CostExcess | null {
	return (
		over('boxes', path, cost.boxes, MAX_CHECK_BOXES) ??
		over('candidatePairs', path, cost.candidatePairs, MAX_CANDIDATE_PAIRS)
	);
}

/**
 * The first sweep limit a sweep goes over, or null: `points` positions (a grid: rows × columns)
 * over a scene of `boxes` boxes, each position answering `rowsPerPoint` rows (1 + gaps asked for +
 * compartments).
 */
export function sweepExcess(input: {
	boxes: number;
	points: number;
	grid: boolean;
	path: string;
	rowsPerPoint?: number;
}): CostExcess | null {
	const { boxes, points, grid, path } = input;
	const rows = points * (input.rowsPerPoint ?? 1);
	return (
		(grid ? over('gridCells', path, points, MAX_GRID_CELLS) : null) ??
		over('sweepPoints', path, points, MAX_SWEEP_POINTS) ??
		over('sweepWork', path, points * boxes, MAX_SWEEP_WORK, [points, boxes]) ??
		over('sweepRows', 'gaps', rows, MAX_SWEEP_ROWS)
	);
}

/** World boxes of a scene, counted from its definitions without placing anything. */
export function sceneBoxCount(scene: Scene): number {
	const sizes = new Map(scene.parts.map((p) => [p.id, p.bodies.length + p.keepouts.length]));
	// A panel of zero thickness is no box (see wallBoxes).
	let n = Object.values(scene.enclosure.walls).filter((w) => w.thicknessMm > 0).length;
	n += scene.enclosure.dividers.length + scene.enclosure.brackets.length;
	for (const p of scene.placements) n += sizes.get(p.partId) ?? 0;
	return n;
}

/** The cost of checking a scene at its current positions (resolving is linear in the boxes). */
export function sceneCost(scene: Scene, resolved: ResolvedScene = resolveScene(scene)): SceneCost {
	const boxes: Box[] = [...resolved.walls, ...resolved.dividers, ...resolved.brackets].map(
		(w) => w.box
	);
	for (const rp of resolved.placements) {
		for (const b of rp.bodies) boxes.push(b.box);
		for (const b of rp.keepouts) boxes.push(b.box);
	}
	return boxesCost(boxes);
}

/**
 * The first limit checking this scene goes over, or null; `path` names the field for the answer.
 * Counts boxes first, so a scene with far too many is refused before it is even placed.
 */
export function checkExcess(scene: Scene, path = 'placements'): CostExcess | null {
	const boxes = sceneBoxCount(scene);
	if (boxes > MAX_CHECK_BOXES) {
		return sceneExcess({ boxes, candidatePairs: 0, overlapPairsBound: 0 }, path);
	}
	return sceneExcess(sceneCost(scene), path);
}

/**
 * The first `max` pairs in the fit report's order (by the lower box id, then the higher), so a
 * capped list is the start of the full one. Pairs are `{i, j}` indexes into `boxes`. One numeric
 * key a pair and a typed-array sort: no comparator runs per pair.
 */
export function firstPairsById<P extends { i: number; j: number }>(
	boxes: readonly { id: string }[],
	pairs: readonly P[],
	max: number
): readonly P[] {
	if (pairs.length <= max) return pairs;
	if (max <= 0) return [];
	const n = boxes.length;
	const order = Array.from({ length: n }, (_, k) => k).sort((a, b) =>
		compareText(boxes[a].id, boxes[b].id)
	);
	const rank = new Float64Array(n);
	order.forEach((k, r) => (rank[k] = r));
	const keys = new Float64Array(pairs.length);
	pairs.forEach((p, k) => {
		const a = rank[p.i];
		const b = rank[p.j];
		keys[k] = a < b ? a * n + b : b * n + a;
	});
	const threshold = keys.slice().sort()[max - 1];
	return pairs.filter((_, k) => keys[k] <= threshold);
}

/** The route search's limit this many obstacles go over, or null. */
export function routeExcess(obstacles: number, path = 'run.avoid'): CostExcess | null {
	return over('routeObstacles', path, obstacles, MAX_ROUTE_OBSTACLES);
}
