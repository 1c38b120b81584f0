/**
 * Clearing advice checked against the whole scene. For one problem (an overlapping pair) and each
 * thing that may move — an unlocked part, or a divider or bracket among its allowed positions —
 * along each axis (a control only along its own) and in both directions, the smallest move that
 * clears the pair without creating a collision or block with anything, or deepening one the moved
 * thing already has, and without taking a part further past the inside than it already is.
 *
 * Moving along one axis changes a pair's overlap only along that axis, so only boxes that share
 * area with the moved box seen along it can be met; the pair's volume grows or shrinks with its
 * depth along the axis. The search visits candidate stops in order: where the moved box has just
 * passed a box it meets (its far face), where an overlap it already has is back to its present
 * depth, and for a control each allowed position. The first stop that passes every check is the
 * smallest move, since between stops the answer to every check stays the same or gets worse.
 */

import { AXES, EPSILON_MM, axisIndex, compareText, type AxisIndex } from './box';
import type { Model } from './model';
import { pairKind } from './pairs';
import { allowedPositions, controlDef, formatMm } from './positions';
import type { BracketDef, DividerDef } from './schema';
import type { ClearingMove } from './types';

/** Open intervals (lo, hi) of move distance, sorted by lo: where a move would be worse off. */
type Intervals = [number, number][];

interface Mover {
	kind: 'part' | 'divider' | 'bracket';
	id: string;
	/** Box indexes that move together. */
	boxes: number[];
	/** For a part: how far its bodies reach past the inner box now, per axis, low and high side. */
	past?: number[];
	def?: DividerDef | BracketDef;
	current?: number;
	/** For a control: its allowed offsets, ascending. */
	offsets?: number[];
	/** Per axis and direction (slot 2 × axis + 1 for +): see blockedIntervals, found once. */
	blocked: Intervals[];
}

/** Caches per report: a mover's blocked intervals are found once however many of its problems are advised. */
export interface AdviceCache {
	movers: Map<string, Mover>;
}

export function adviceCache(): AdviceCache {
	return { movers: new Map() };
}

/** The thing box `i` moves with, or null for a wall, a plate or a locked part. */
function moverOf(model: Model, cache: AdviceCache, i: number): Mover | null {
	const box = model.boxes[i];
	const p = model.owner[i];
	const key = p >= 0 ? `p:${p}` : box.id;
	const cached = cache.movers.get(key);
	if (cached) return cached;
	let mover: Mover | null = null;
	if (p >= 0) {
		const rp = model.resolved.placements[p];
		if (rp.placement.locked === true) return null;
		const boxes: number[] = [];
		for (const b of [...rp.bodies, ...rp.keepouts]) boxes.push(model.indexOf.get(b.id)!);
		const inner = model.resolved.innerBox;
		const past: number[] = [];
		for (let a = 0; a < 3; a++) {
			past.push(
				Math.max(0, inner.min[a] - rp.bounds.min[a]),
				Math.max(0, rp.bounds.max[a] - inner.max[a])
			);
		}
		mover = {
			kind: 'part',
			id: rp.placement.id,
			boxes,
			past,
			blocked: blockedIntervals(model, boxes, -1, p)
		};
	} else if (box.kind === 'divider' || box.kind === 'bracket') {
		const def = controlDef(model.scene.enclosure, { kind: box.kind, id: box.ownerId });
		if (!def) return null;
		const current =
			box.kind === 'divider'
				? model.resolved.dividerPositions[def.id]
				: model.resolved.bracketOffsets[def.id];
		const offsets = allowedPositions(def)
			.map((q) => q.offsetMm)
			.sort((x, y) => x - y);
		mover = {
			kind: box.kind,
			id: def.id,
			boxes: [i],
			def,
			current,
			offsets,
			blocked: blockedIntervals(model, [i], axisIndex(def.axis), -1)
		};
	}
	if (mover) cache.movers.set(key, mover);
	return mover;
}

/**
 * The distances d > 0 (in direction s along a) at which the mover would be worse off against the
 * boxes it meets, as open intervals (lo, hi), sorted by lo, per axis and direction: a box it does
 * not overlap now is met from where their faces touch until it has passed it; one it overlaps now
 * is deeper while the overlap is still growing (when the moving box trails it) and until it is back
 * to its present depth. Only pairs that share area seen along the axis can meet, and warnings never
 * stop a move. Found in one pass over the scene's boxes per mover, straight into intervals: the
 * search reads nothing else about the pairs.
 */
function blockedIntervals(
	model: Model,
	boxes: readonly number[],
	only: -1 | AxisIndex,
	ownerOf: number
): Intervals[] {
	const f = model.flat;
	const owner = model.owner;
	const out: Intervals[] = [[], [], [], [], [], []];
	const n = model.boxes.length;
	const single = boxes.length === 1 ? boxes[0] : -1;
	// Boxes that share area with none of the mover's boxes along any axis are left out at once,
	// tested against the bounds of all of them: one test per box instead of one per pair.
	const lo = [Infinity, Infinity, Infinity];
	const hi = [-Infinity, -Infinity, -Infinity];
	for (const m of boxes) {
		for (let k = 0; k < 3; k++) {
			lo[k] = Math.min(lo[k], f[m * 6 + k]);
			hi[k] = Math.max(hi[k], f[m * 6 + 3 + k]);
		}
	}
	const near: number[] = [];
	for (let o = 0; o < n; o++) {
		if (ownerOf >= 0 ? owner[o] === ownerOf : o === single) continue;
		const oo = o * 6;
		const ox = Math.min(hi[0], f[oo + 3]) - Math.max(lo[0], f[oo]) > EPSILON_MM;
		const oy = Math.min(hi[1], f[oo + 4]) - Math.max(lo[1], f[oo + 1]) > EPSILON_MM;
		const oz = Math.min(hi[2], f[oo + 5]) - Math.max(lo[2], f[oo + 2]) > EPSILON_MM;
		if ((ox && oy) || (ox && oz) || (oy && oz)) near.push(o);
	}
	const overlapsOn = [false, false, false];
	const depth = [0, 0, 0];
	for (const m of boxes) {
		const mo = m * 6;
		for (const o of near) {
			const oo = o * 6;
			let sharing = 0;
			for (let k = 0; k < 3; k++) {
				depth[k] = Math.min(f[mo + 3 + k], f[oo + 3 + k]) - Math.max(f[mo + k], f[oo + k]);
				overlapsOn[k] = depth[k] > EPSILON_MM;
				if (overlapsOn[k]) sharing++;
			}
			// Seen along an axis, the boxes share area when they overlap on the other two.
			if (sharing < 2) continue;
			const kind = pairKind(model.boxes[m], model.boxes[o]);
			if (!kind || kind === 'warning') continue;
			for (let a = 0; a < 3; a++) {
				if (only >= 0 && only !== a) continue;
				if (!overlapsOn[(a + 1) % 3] || !overlapsOn[(a + 2) % 3]) continue;
				const m0 = f[mo + a];
				const m1 = f[mo + 3 + a];
				const o0 = f[oo + a];
				const o1 = f[oo + 3 + a];
				for (const s of [1, -1] as const) {
					const past = s > 0 ? o1 - m0 : m1 - o0;
					if (!overlapsOn[a]) {
						const enter = s > 0 ? o0 - m1 : m0 - o1;
						if (past > 0) out[2 * a + (s > 0 ? 1 : 0)].push([enter, past]);
					} else {
						const trailing =
							s > 0
								? m0 < o0 - EPSILON_MM && m1 < o1 - EPSILON_MM
								: m1 > o1 + EPSILON_MM && m0 > o0 + EPSILON_MM;
						if (trailing) out[2 * a + (s > 0 ? 1 : 0)].push([0, past - depth[a]]);
					}
				}
			}
		}
	}
	for (const intervals of out) intervals.sort((x, y) => x[0] - y[0]);
	return out;
}

/** The first d ≥ from outside every open interval (lo, hi) of `blocked`, sorted by lo. */
function firstFree(blocked: readonly [number, number][], from: number): number {
	let d = from;
	for (const [lo, hi] of blocked) {
		if (lo + EPSILON_MM >= d) break;
		if (hi - EPSILON_MM > d) d = hi;
	}
	return d;
}

/** Whether d lies inside one of the open intervals. */
function isBlocked(blocked: readonly [number, number][], d: number): boolean {
	for (const [lo, hi] of blocked) {
		if (lo + EPSILON_MM >= d) return false;
		if (hi - EPSILON_MM > d) return true;
	}
	return false;
}

/** Distance to clear the pair (mt, ot) moving mt in direction s along a. */
function clearDistance(f: Float64Array, a: AxisIndex, s: 1 | -1, mt: number, ot: number): number {
	return s > 0 ? f[ot * 6 + 3 + a] - f[mt * 6 + a] : f[mt * 6 + 3 + a] - f[ot * 6 + a];
}

/** Smallest passing move of a part along a in direction s, or null. */
function partMove(
	model: Model,
	mover: Mover,
	a: AxisIndex,
	s: 1 | -1,
	mt: number,
	ot: number
): ClearingMove | null {
	const d = firstFree(
		mover.blocked[2 * a + (s > 0 ? 1 : 0)],
		clearDistance(model.flat, a, s, mt, ot)
	);
	// No further past the inside than the part is now.
	const bounds = model.resolved.placements[model.owner[mover.boxes[0]]].bounds;
	const inner = model.resolved.innerBox;
	const limit =
		s > 0
			? inner.max[a] + mover.past![2 * a + 1] - bounds.max[a]
			: bounds.min[a] - inner.min[a] + mover.past![2 * a];
	if (d > limit + EPSILON_MM) return null;
	return { targetId: mover.id, targetKind: 'part', axis: AXES[a], sign: s, distanceMm: d };
}

/** The nearest allowed position of a divider or bracket in direction s that passes, or null. */
function controlMove(
	model: Model,
	mover: Mover,
	s: 1 | -1,
	mt: number,
	ot: number
): ClearingMove | null {
	const def = mover.def!;
	const a = axisIndex(def.axis);
	const offsets = mover.offsets!;
	const current = mover.current!;
	const here = offsets.findIndex((p) => Math.abs(p - current) <= EPSILON_MM);
	const clear = clearDistance(model.flat, a, s, mt, ot);
	const blocked = mover.blocked[2 * a + (s > 0 ? 1 : 0)];
	for (let k = here + s; k >= 0 && k < offsets.length; k += s) {
		const d = Math.abs(offsets[k] - current);
		if (d < clear - EPSILON_MM || isBlocked(blocked, d)) continue;
		return {
			targetId: def.id,
			targetKind: mover.kind as 'divider' | 'bracket',
			axis: def.axis,
			sign: s,
			distanceMm: d,
			steps: Math.abs(k - here),
			toOffsetMm: offsets[k]
		};
	}
	return null;
}

const KIND_ORDER = { part: 0, divider: 1, bracket: 2 } as const;

function byDistance(x: ClearingMove, y: ClearingMove): number {
	return (
		(Math.abs(x.distanceMm - y.distanceMm) > EPSILON_MM ? x.distanceMm - y.distanceMm : 0) ||
		KIND_ORDER[x.targetKind] - KIND_ORDER[y.targetKind] ||
		compareText(x.targetId, y.targetId) ||
		axisIndex(x.axis) - axisIndex(y.axis) ||
		y.sign - x.sign
	);
}

const AXIS_WORDS = ['width', 'height', 'depth'] as const;
const MORE_WORDS = ['wider', 'taller', 'deeper'] as const;

/**
 * Why no single move clears a problem, in words: the part (bodies and error keep-outs) is longer
 * along the problem's axis than the room between the fixed boxes on either side of it, or every
 * move runs into something else, or nothing involved may move.
 */
function noMoveText(model: Model, movers: Mover[], a: AxisIndex): string {
	const part = movers.find((m) => m.kind === 'part');
	if (movers.length === 0) {
		return 'Nothing here may move: a locked part against a fixed panel, plate or another locked part. Unlock a part to get a move.';
	}
	if (part) {
		const rp = model.resolved.placements[model.owner[part.boxes[0]]];
		const need = [...rp.bodies, ...rp.keepouts.filter((k) => k.severity === 'error')].map(
			(b) => b.box
		);
		const lo = Math.min(...need.map((b) => b.min[a]));
		const hi = Math.max(...need.map((b) => b.max[a]));
		const room = roomAlong(model, rp.bounds, a, part.id);
		if (hi - lo > room + EPSILON_MM) {
			return `No move along ${AXIS_WORDS[a]} clears this; the part is ${MORE_WORDS[a]} than the space (${formatMm(hi - lo)} with its keep-outs, ${formatMm(room)} between what bounds it).`;
		}
	}
	return `No move along ${AXIS_WORDS[a]} or any other single axis clears this without running into something else.`;
}

/** Room along a between the nearest fixed boxes (walls, dividers, brackets, plates) wholly on either side of the centre of `bounds`. */
function roomAlong(
	model: Model,
	bounds: { min: number[]; max: number[] },
	a: AxisIndex,
	placementId: string
): number {
	const f = model.flat;
	const inner = model.resolved.innerBox;
	const centre = (bounds.min[a] + bounds.max[a]) / 2;
	let lo = inner.min[a];
	let hi = inner.max[a];
	for (let i = 0; i < model.boxes.length; i++) {
		const box = model.boxes[i];
		if (model.owner[i] >= 0 || box.kind === 'wall' || box.ownerId === placementId) continue;
		let shares = true;
		for (let k = 0; k < 3; k++) {
			if (
				k !== a &&
				Math.min(f[i * 6 + 3 + k], bounds.max[k]) - Math.max(f[i * 6 + k], bounds.min[k]) <=
					EPSILON_MM
			) {
				shares = false;
			}
		}
		if (!shares) continue;
		// Only boxes wholly on one side of the part's centre bound it; one across the centre is
		// the obstacle itself, not a side of the space.
		if (f[i * 6 + 3 + a] <= centre) lo = Math.max(lo, f[i * 6 + 3 + a]);
		else if (f[i * 6 + a] >= centre) hi = Math.min(hi, f[i * 6 + a]);
	}
	return Math.max(0, hi - lo);
}

/** Moves (best two) that clear the overlapping pair of boxes i and j, or words when none does. */
export function adviseOverlap(
	model: Model,
	cache: AdviceCache,
	i: number,
	j: number,
	axis: AxisIndex
): { moves: ClearingMove[]; noMove?: string } {
	const movers: { mover: Mover; mt: number; ot: number }[] = [];
	for (const [mt, ot] of [
		[i, j],
		[j, i]
	]) {
		const mover = moverOf(model, cache, mt);
		if (mover) movers.push({ mover, mt, ot });
	}
	const options: ClearingMove[] = [];
	for (const { mover, mt, ot } of movers) {
		for (const s of [1, -1] as const) {
			if (mover.kind === 'part') {
				for (const a of [0, 1, 2] as const) {
					const move = partMove(model, mover, a, s, mt, ot);
					if (move) options.push(move);
				}
			} else {
				const move = controlMove(model, mover, s, mt, ot);
				if (move) options.push(move);
			}
		}
	}
	options.sort(byDistance);
	if (options.length > 0) return { moves: options.slice(0, 2) };
	return {
		moves: [],
		noMove: noMoveText(
			model,
			movers.map((m) => m.mover),
			axis
		)
	};
}
