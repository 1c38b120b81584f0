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
import { allowedPositions, formatMm } from './positions';
import type { BracketDef, DividerDef } from './schema';
import type { ClearingMove, OverlapKind } from './types';

/** One box of the moving thing against one it can meet along `axis`, with its present depth. */
interface Contact {
	m: number;
	o: number;
	axis: AxisIndex;
	/** 'warning' contacts are not problems and never stop a move. */
	kind: OverlapKind;
	/** Present overlap along the axis, or 0 when the boxes do not overlap now. */
	depth0: number;
}

interface Mover {
	kind: 'part' | 'divider' | 'bracket';
	id: string;
	/** Box indexes that move together. */
	boxes: number[];
	contacts: Contact[];
	/** For a part: how far its bodies reach past the inner box now, per axis, low and high side. */
	past?: number[];
	def?: DividerDef | BracketDef;
	current?: number;
	/** For a control: its allowed offsets, ascending. */
	offsets?: number[];
}

/** Caches per report: a mover's contacts are found once however many of its problems are advised. */
export interface AdviceCache {
	movers: Map<string, Mover>;
}

export function adviceCache(): AdviceCache {
	return { movers: new Map() };
}

function axisOverlap(f: Float64Array, i: number, j: number, a: number): number {
	return Math.min(f[i * 6 + 3 + a], f[j * 6 + 3 + a]) - Math.max(f[i * 6 + a], f[j * 6 + a]);
}

/** Every pair of a moving box and another box that share area seen along some axis and have a meaning. */
function contactsOf(model: Model, boxes: readonly number[], axes: readonly AxisIndex[]): Contact[] {
	const f = model.flat;
	const own = new Set(boxes);
	const out: Contact[] = [];
	const n = model.boxes.length;
	for (const m of boxes) {
		for (let o = 0; o < n; o++) {
			if (own.has(o)) continue;
			const dx = axisOverlap(f, m, o, 0);
			const dy = axisOverlap(f, m, o, 1);
			if (!(dx > EPSILON_MM) && !(dy > EPSILON_MM)) continue;
			const dz = axisOverlap(f, m, o, 2);
			let kind: OverlapKind | null | undefined;
			for (const a of axes) {
				// Seen along a, the boxes share area when they overlap on the other two axes.
				const [d, u, v] = a === 0 ? [dx, dy, dz] : a === 1 ? [dy, dx, dz] : [dz, dx, dy];
				if (!(u > EPSILON_MM && v > EPSILON_MM)) continue;
				if (kind === undefined) kind = pairKind(model.boxes[m], model.boxes[o]);
				if (!kind) break;
				out.push({ m, o, axis: a, kind, depth0: d > EPSILON_MM ? d : 0 });
			}
		}
	}
	return out;
}

function controlDef(model: Model, kind: 'divider' | 'bracket', id: string): DividerDef | BracketDef | undefined {
	const enclosure = model.scene.enclosure;
	return kind === 'divider' ? enclosure.dividers.find((d) => d.id === id) : enclosure.brackets.find((b) => b.id === id);
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
			past.push(Math.max(0, inner.min[a] - rp.bounds.min[a]), Math.max(0, rp.bounds.max[a] - inner.max[a]));
		}
		mover = { kind: 'part', id: rp.placement.id, boxes, contacts: contactsOf(model, boxes, [0, 1, 2]), past };
	} else if (box.kind === 'divider' || box.kind === 'bracket') {
		const def = controlDef(model, box.kind, box.ownerId);
		if (!def) return null;
		const current = box.kind === 'divider' ? model.resolved.dividerPositions[def.id] : model.resolved.bracketOffsets[def.id];
		const offsets = allowedPositions(def)
			.map((q) => q.offsetMm)
			.sort((x, y) => x - y);
		mover = { kind: box.kind, id: def.id, boxes: [i], contacts: contactsOf(model, [i], [axisIndex(def.axis)]), def, current, offsets };
	}
	if (mover) cache.movers.set(key, mover);
	return mover;
}

/**
 * Whether moving the mover by t (signed mm along a) clears the pair (mt, ot) and passes every
 * check: no collision or block it does not have now, none deeper than now, a part no further
 * past the inside than now.
 */
function passes(model: Model, mover: Mover, a: AxisIndex, t: number, mt: number, ot: number): boolean {
	const f = model.flat;
	if (Math.min(f[mt * 6 + 3 + a] + t, f[ot * 6 + 3 + a]) - Math.max(f[mt * 6 + a] + t, f[ot * 6 + a]) > EPSILON_MM) return false;
	for (const c of mover.contacts) {
		if (c.axis !== a || c.kind === 'warning') continue;
		const d = Math.min(f[c.m * 6 + 3 + a] + t, f[c.o * 6 + 3 + a]) - Math.max(f[c.m * 6 + a] + t, f[c.o * 6 + a]);
		if (d > EPSILON_MM && (c.depth0 === 0 || d > c.depth0 + EPSILON_MM)) return false;
	}
	if (mover.past) {
		const rp = model.resolved.placements[model.owner[mover.boxes[0]]];
		const inner = model.resolved.innerBox;
		if (inner.min[a] - (rp.bounds.min[a] + t) > mover.past[2 * a] + EPSILON_MM) return false;
		if (rp.bounds.max[a] + t - inner.max[a] > mover.past[2 * a + 1] + EPSILON_MM) return false;
	}
	return true;
}

/** Smallest passing move of a part along a in direction s, or null. */
function partMove(model: Model, mover: Mover, a: AxisIndex, s: 1 | -1, mt: number, ot: number): ClearingMove | null {
	const f = model.flat;
	const clear = s > 0 ? f[ot * 6 + 3 + a] - f[mt * 6 + a] : f[mt * 6 + 3 + a] - f[ot * 6 + a];
	const stops = [clear];
	for (const c of mover.contacts) {
		if (c.axis !== a || c.kind === 'warning') continue;
		const past = s > 0 ? f[c.o * 6 + 3 + a] - f[c.m * 6 + a] : f[c.m * 6 + 3 + a] - f[c.o * 6 + a];
		if (past > clear) stops.push(past);
		if (c.depth0 > 0 && past - c.depth0 > clear) stops.push(past - c.depth0);
	}
	stops.sort((x, y) => x - y);
	for (const d of stops) {
		if (passes(model, mover, a, s * d, mt, ot)) {
			return { targetId: mover.id, targetKind: 'part', axis: AXES[a], sign: s, distanceMm: d };
		}
	}
	return null;
}

/** The nearest allowed position of a divider or bracket in direction s that passes, or null. */
function controlMove(model: Model, mover: Mover, s: 1 | -1, mt: number, ot: number): ClearingMove | null {
	const def = mover.def!;
	const a = axisIndex(def.axis);
	const offsets = mover.offsets!;
	const current = mover.current!;
	const here = offsets.findIndex((p) => Math.abs(p - current) <= EPSILON_MM);
	for (let k = here + s; k >= 0 && k < offsets.length; k += s) {
		const t = offsets[k] - current;
		if (passes(model, mover, a, t, mt, ot)) {
			return { targetId: def.id, targetKind: mover.kind as 'divider' | 'bracket', axis: def.axis, sign: s, distanceMm: Math.abs(t), steps: Math.abs(k - here), toOffsetMm: offsets[k] };
		}
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
		const need = [...rp.bodies, ...rp.keepouts.filter((k) => k.severity === 'error')].map((b) => b.box);
		const lo = Math.min(...need.map((b) => b.min[a]));
		const hi = Math.max(...need.map((b) => b.max[a]));
		const room = roomAlong(model, rp.bounds, a, part.id);
		if (hi - lo > room + EPSILON_MM) {
			return `No move along ${AXIS_WORDS[a]} clears this; the part is ${MORE_WORDS[a]} than the space (${formatMm(hi - lo)} with its keep-outs, ${formatMm(room)} between what bounds it).`;
		}
	}
	return `No move along ${AXIS_WORDS[a]} or any other single axis clears this without running into something else.`;
}

/** Room along a between the nearest fixed boxes (walls, dividers, brackets, plates) on either side of `bounds`. */
function roomAlong(model: Model, bounds: { min: number[]; max: number[] }, a: AxisIndex, placementId: string): number {
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
			if (k !== a && Math.min(f[i * 6 + 3 + k], bounds.max[k]) - Math.max(f[i * 6 + k], bounds.min[k]) <= EPSILON_MM) shares = false;
		}
		if (!shares) continue;
		const mid = (f[i * 6 + a] + f[i * 6 + 3 + a]) / 2;
		if (mid < centre) lo = Math.max(lo, f[i * 6 + 3 + a]);
		else hi = Math.min(hi, f[i * 6 + a]);
	}
	return Math.max(0, hi - lo);
}

/** Moves (best two) that clear the overlapping pair of boxes i and j, or words when none does. */
export function adviseOverlap(model: Model, cache: AdviceCache, i: number, j: number, axis: AxisIndex): { moves: ClearingMove[]; noMove?: string } {
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
	return { moves: [], noMove: noMoveText(model, movers.map((m) => m.mover), axis) };
}
