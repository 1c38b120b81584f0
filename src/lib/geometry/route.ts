/**
 * Route search for tube runs and cable bundles through a scene's free space. Millimetres, Y up,
 * inner coordinates.
 *
 * Method: A* over a rectilinear "escape-line" grid (the non-uniform grid of candidate planes used
 * for orthogonal connector routing, after Lee, Yang and Wong, "Rectilinear paths among
 * rectilinear obstacles", 1996, and Wybrow, Marriott and Stuckey, "Orthogonal connector routing",
 * 2009). On each axis the candidate planes are the faces of every obstacle inflated by the tube's
 * half-width plus the clearance, the start, the end and the bounds; and each of those shifted by
 * ±r, ±2r, ±3r and ±4r (r the bend radius), where a bend's room or a leg of minimum length pins a
 * bend. The grid is never built: nodes are visited lazily, so only what the search reaches costs.
 *
 * A search state is (node, direction of travel); a state may bend. Moves: one step straight on to
 * the next plane, or a 90° bend into one of the four perpendicular directions, which needs the
 * bend's own box clear and then runs straight for at least 2r before the next bend can start (each
 * bend uses r of straight leg on both sides; the first leg from the start and the last into the
 * end need r). Cost = centre-line length of the polyline + the bend penalty per bend + any penalty
 * box's rate × the length run inside it. The heuristic (Manhattan distance + the penalty × the
 * fewest bends any rectilinear path from this state could make, from a 6-direction table) is
 * admissible and consistent, so the first route popped is optimal on the grid.
 *
 * What the tube occupies (the same boxes `routeBoxes` gives, so what the search calls clear is
 * what the checker sees): each straight piece is its segment grown by the half-width across its
 * axis; each bend is the square between the bend's two
 * tangent points grown by the half-width on every side (the loop checker's bend box: the exact
 * box of the bent tube plus half the width along each leg at its tangent end).
 *
 * Soft tube uses the same search with its own (smaller) bend radius: the waypoints are the corners
 * of a rectilinear path that the soft tube follows with bends no tighter than that radius, so the
 * room it needs is the same boxes. A flat cable bundle counts as a square of its width (it may
 * twist along the way), with its own minimum bend radius.
 */

import { EPSILON_MM, FACES, type Face } from './box';
import type { Box, Vec3 } from './schema';
import { centreLineLengthMm } from './loop-path';
import { lowerBound } from './sorted';

export interface RouteEnd {
	/** Port position pushed out along the port's direction by the fitting's or plug's reach. */
	point: Vec3;
	/** The port's direction: the route leaves the start along it and arrives against the end's. */
	direction: Face;
	/** The port's name in the scene ("SFX supply · pcie"), for the no-route words. */
	label?: string;
}

export type RouteSection =
	| { kind: 'round'; outerDiameterMm: number }
	| { kind: 'flat'; widthMm: number; thicknessMm: number };

export interface RouteObstacle {
	box: Box;
	id?: string;
	label?: string;
}

/** Room the route may use at a price: `costPerMm` is added per mm of centre-line inside `box`. */
export interface PenaltyBox {
	box: Box;
	costPerMm: number;
	id?: string;
}

export interface RouteInput {
	start: RouteEnd;
	end: RouteEnd;
	/** The room the tube must stay inside (with its clearance), usually the enclosure's inside. */
	bounds: Box;
	obstacles: readonly (Box | RouteObstacle)[];
	penalties?: readonly PenaltyBox[];
	section: RouteSection;
	clearanceMm: number;
	/** Centre-line bend radius. */
	bendRadiusMm: number;
	/** Cost of one bend in mm of length: high means fewest bends first. */
	bendPenaltyMm: number;
	mode: 'hard' | 'soft';
	maxAlternatives?: 1 | 2 | 3;
	/** States the search may expand before it gives up (work bound for the server). */
	maxExpansions?: number;
}

export interface Route {
	/** Intermediate points only: the full centre-line is [start, ...waypoints, end]. */
	waypoints: Vec3[];
	/** Centre-line length with each bend as its arc (see centreLineLengthMm). */
	lengthMm: number;
	bends: number;
	/** Polyline length + bendPenaltyMm × bends + penalty boxes' share: what the search minimised. */
	cost: number;
}

export type RouteResult =
	| { ok: true; routes: Route[] }
	| {
			ok: false;
			reason: string;
			narrowestGapMm?: number;
			blockedBy?: string[];
			/**
			 * `disconnected`: proven that no route exists (a flood fill or the ports' own room);
			 * `capped`: the search gave up at its step cap, so a route may still exist; `narrow`: the
			 * search ran out of moves (no route on the grid) for the reasons the words give.
			 */
			cause?: 'disconnected' | 'capped' | 'narrow' | 'input';
			/** When capped: the furthest point the best partial route reached. */
			furthest?: Vec3;
	  };

/** Expansions a search may make unless the caller says otherwise. */
export const DEFAULT_MAX_EXPANSIONS = 150_000;
/** Bend-radius multiples the candidate planes are shifted by (see the module comment). */
const SHIFTS = [1, 2, 3, 4];
const TOL = 1e-7;
/** A local copy: an imported binding is a getter call in some module loaders, on the hot path. */
const EPS = EPSILON_MM;

const AXIS_OF = [0, 0, 1, 1, 2, 2] as const;
const SIGN_OF = [-1, 1, -1, 1, -1, 1] as const;

function dirIndex(face: Face): number {
	return FACES.indexOf(face);
}

/** Half the room across the route's axis that the section needs (a flat bundle may twist). */
export function sectionHalfWidthMm(section: RouteSection): number {
	return section.kind === 'round' ? section.outerDiameterMm / 2 : section.widthMm / 2;
}

/** The centre-line length of the route's points, bends as arcs: the loop's own formula. */
export { centreLineLengthMm };

function segmentAxis(a: Vec3, b: Vec3): number {
	let axis = -1;
	for (let i = 0; i < 3; i++) {
		if (Math.abs(a[i] - b[i]) > TOL) axis = axis === -1 ? i : 3;
	}
	return axis;
}

/** Direction index (0..5) of a segment along one axis, or -1 when it is not axis-aligned. */
function directionOf(a: Vec3, b: Vec3): number {
	const axis = segmentAxis(a, b);
	if (axis < 0 || axis > 2) return -1;
	return axis * 2 + (b[axis] > a[axis] ? 1 : 0);
}

/**
 * The box a 90° bend at corner p takes, arriving along d1 and leaving along d2: the bent tube's
 * exact bounding box, with `half` more along each leg at its tangent end (see below).
 */
function bendBox(
	p: Vec3,
	d1: number,
	d2: number,
	r: number,
	half: number,
	out: Box = { min: [0, 0, 0], max: [0, 0, 0] }
): Box {
	// `out` lets the search reuse one box per query instead of allocating one per move.
	const { min, max } = out;
	for (let i = 0; i < 3; i++) {
		min[i] = p[i] - half;
		max[i] = p[i] + half;
	}
	const a1 = AXIS_OF[d1];
	const a2 = AXIS_OF[d2];
	// Along d1 the tube starts bending r before the corner and bulges half beyond it. Along d2 it
	// reaches r past the corner and bulges half behind it. Both tangent ends also take `half` more
	// along their legs: the loop checker's bend box (its tangent points and corner grown by the
	// tube's radius every way, loop.ts runPieces), so a route the search calls clear is clear there.
	if (SIGN_OF[d1] > 0) {
		min[a1] = p[a1] - r - half;
	} else {
		max[a1] = p[a1] + r + half;
	}
	if (SIGN_OF[d2] > 0) {
		max[a2] = p[a2] + r + half;
	} else {
		min[a2] = p[a2] - r - half;
	}
	return out;
}

/** A straight piece from a to b grown by `half` across its axis (and `back`/`front` along it). */
function pieceBox(
	a: Vec3,
	b: Vec3,
	half: number,
	back = 0,
	front = 0,
	out: Box = { min: [0, 0, 0], max: [0, 0, 0] }
): Box {
	const { min, max } = out;
	const axis = segmentAxis(a, b);
	for (let i = 0; i < 3; i++) {
		const lo = Math.min(a[i], b[i]);
		const hi = Math.max(a[i], b[i]);
		if (i === axis) {
			const forward = b[i] >= a[i];
			min[i] = lo - (forward ? back : front);
			max[i] = hi + (forward ? front : back);
		} else {
			min[i] = lo - half;
			max[i] = hi + half;
		}
	}
	return out;
}

/**
 * The boxes a routed tube or bundle occupies: each straight piece between its bends' tangent
 * points grown by the half-width across its axis, and each bend's box (bendBox). `points` is
 * the full centre-line [start, ...waypoints, end].
 */
export function routeBoxes(
	points: readonly Vec3[],
	section: RouteSection,
	bendRadiusMm: number
): Box[] {
	const half = sectionHalfWidthMm(section);
	const r = bendRadiusMm;
	const corners: Vec3[] = [points[0]];
	for (let i = 1; i + 1 < points.length; i++) {
		if (directionOf(points[i - 1], points[i]) !== directionOf(points[i], points[i + 1])) {
			corners.push(points[i]);
		}
	}
	corners.push(points[points.length - 1]);
	const out: Box[] = [];
	for (let i = 0; i + 1 < corners.length; i++) {
		const a = corners[i];
		const b = corners[i + 1];
		const d = directionOf(a, b);
		if (d < 0) continue;
		const axis = AXIS_OF[d];
		const s = SIGN_OF[d];
		const from = [...a] as Vec3;
		const to = [...b] as Vec3;
		if (i > 0) from[axis] += s * r;
		if (i + 2 < corners.length) to[axis] -= s * r;
		if ((to[axis] - from[axis]) * s > TOL) out.push(pieceBox(from, to, half));
		if (i + 2 < corners.length) {
			out.push(bendBox(b, d, directionOf(b, corners[i + 2]), r, half));
		}
	}
	return out;
}

/** Candidate coordinates on one axis, sorted and without near-duplicates. */
function axisCoords(base: number[], r: number, lo: number, hi: number): Float64Array {
	const all: number[] = [];
	for (const v of base) {
		all.push(v);
		if (r > 0) {
			for (const k of SHIFTS) all.push(v - k * r, v + k * r);
		}
	}
	const kept = all.filter((v) => v >= lo - TOL && v <= hi + TOL).sort((a, b) => a - b);
	const out: number[] = [];
	for (const v of kept) {
		const c = Math.min(hi, Math.max(lo, v));
		if (out.length === 0 || c - out[out.length - 1] > 1e-6) out.push(c);
	}
	return Float64Array.from(out);
}

function findCoord(coords: Float64Array, v: number): number {
	let lo = 0;
	let hi = coords.length - 1;
	while (lo <= hi) {
		const mid = (lo + hi) >> 1;
		if (coords[mid] < v - 1e-6) lo = mid + 1;
		else if (coords[mid] > v + 1e-6) hi = mid - 1;
		else return mid;
	}
	return -1;
}

/** Obstacles (already grown by the clearance) binned on a uniform grid for box queries. */
class ObstacleIndex {
	readonly min: Float64Array;
	readonly max: Float64Array;
	/** Bin b's obstacles are items[offsets[b] .. offsets[b + 1]). */
	private readonly offsets: Int32Array;
	private readonly items: Int32Array;
	private readonly ox: number;
	private readonly oy: number;
	private readonly oz: number;
	private readonly inv: Float64Array;
	private readonly per: number;
	private readonly stamp: Uint32Array;
	/** Scratch for binsOf. */
	private readonly range = new Int32Array(6);
	private tick = 0;

	constructor(boxes: readonly Box[], bounds: Box) {
		const count = boxes.length;
		this.min = new Float64Array(count * 3);
		this.max = new Float64Array(count * 3);
		this.stamp = new Uint32Array(count);
		[this.ox, this.oy, this.oz] = bounds.min;
		const per = Math.max(1, Math.min(24, Math.round(Math.cbrt(count) * 2)));
		this.per = per;
		this.inv = Float64Array.from(
			[0, 1, 2],
			(a) => per / Math.max(1e-3, bounds.max[a] - bounds.min[a])
		);
		const lists: number[][] = Array.from({ length: per * per * per }, () => []);
		boxes.forEach((b, i) => {
			for (let a = 0; a < 3; a++) {
				this.min[i * 3 + a] = b.min[a];
				this.max[i * 3 + a] = b.max[a];
			}
			const r = this.binsOf(b);
			for (let z = r[4]; z <= r[5]; z++) {
				for (let y = r[2]; y <= r[3]; y++) {
					for (let x = r[0]; x <= r[1]; x++) lists[x + per * (y + per * z)].push(i);
				}
			}
		});
		this.offsets = new Int32Array(lists.length + 1);
		let total = 0;
		lists.forEach((l, b) => {
			this.offsets[b] = total;
			total += l.length;
		});
		this.offsets[lists.length] = total;
		this.items = new Int32Array(total);
		lists.forEach((l, b) => this.items.set(l, this.offsets[b]));
	}

	private bin(v: number, a: number): number {
		const o = a === 0 ? this.ox : a === 1 ? this.oy : this.oz;
		const k = Math.floor((v - o) * this.inv[a]);
		return k < 0 ? 0 : k >= this.per ? this.per - 1 : k;
	}

	/** The bins `b` spans, [x0, x1, y0, y1, z0, z1] inclusive, in one reused array (no allocation). */
	private binsOf(b: Box): Int32Array {
		const r = this.range;
		for (let a = 0; a < 3; a++) {
			r[2 * a] = this.bin(b.min[a], a);
			r[2 * a + 1] = this.bin(b.max[a], a);
		}
		return r;
	}

	/** Index of an obstacle sharing positive volume with `b`, or -1 (touching is clear). */
	first(b: Box): number {
		return this.scan(b, null);
	}

	all(b: Box): number[] {
		const out: number[] = [];
		this.scan(b, out);
		return out;
	}

	private scan(b: Box, out: number[] | null): number {
		this.tick = (this.tick + 1) >>> 0 || 1;
		const tick = this.tick;
		const per = this.per;
		const r = this.binsOf(b);
		const { min, max, stamp, items, offsets } = this;
		const b0 = b.min[0];
		const b1 = b.min[1];
		const b2 = b.min[2];
		const c0 = b.max[0];
		const c1 = b.max[1];
		const c2 = b.max[2];
		for (let z = r[4]; z <= r[5]; z++) {
			for (let y = r[2]; y <= r[3]; y++) {
				for (let x = r[0]; x <= r[1]; x++) {
					const bin = x + per * (y + per * z);
					for (let k = offsets[bin], end = offsets[bin + 1]; k < end; k++) {
						const i = items[k];
						if (stamp[i] === tick) continue;
						stamp[i] = tick;
						const o = i * 3;
						if (
							Math.min(c0, max[o]) - Math.max(b0, min[o]) > EPS &&
							Math.min(c1, max[o + 1]) - Math.max(b1, min[o + 1]) > EPS &&
							Math.min(c2, max[o + 2]) - Math.max(b2, min[o + 2]) > EPS
						) {
							if (!out) return i;
							out.push(i);
						}
					}
				}
			}
		}
		return -1;
	}
}

/**
 * Fewest segments a rectilinear path can have that starts along direction d, ends along e and
 * moves in every direction of the set `need` (bit per direction): a lower bound on the bends
 * (segments − 1) from any state. Breadth-first over (last direction, directions used).
 */
const MIN_SEGMENTS: Uint8Array = (() => {
	const table = new Uint8Array(6 * 6 * 64).fill(255);
	for (let d = 0; d < 6; d++) {
		const dist = new Int16Array(6 * 64).fill(-1);
		const queue: number[] = [d * 64 + (1 << d)];
		dist[queue[0]] = 1;
		for (let q = 0; q < queue.length; q++) {
			const s = queue[q];
			const last = s >> 6;
			const mask = s & 63;
			for (let n = 0; n < 6; n++) {
				if (AXIS_OF[n] === AXIS_OF[last]) continue;
				const t = n * 64 + (mask | (1 << n));
				if (dist[t] < 0) {
					dist[t] = dist[s] + 1;
					queue.push(t);
				}
			}
		}
		for (let s = 0; s < 6 * 64; s++) {
			if (dist[s] < 0) continue;
			const e = s >> 6;
			const mask = s & 63;
			// Every subset of the directions used is covered by this path.
			for (let need = mask; ; need = (need - 1) & mask) {
				const k = (d * 6 + e) * 64 + need;
				if (dist[s] < table[k]) table[k] = dist[s];
				if (need === 0) break;
			}
		}
	}
	return table;
})();

/** Min-heap on f, ties to the larger g (deeper first: on the plateaus of a Manhattan grid). */
class Heap {
	private f: number[] = [];
	private g: number[] = [];
	private s: number[] = [];
	get size() {
		return this.s.length;
	}
	private less(i: number, j: number) {
		return this.f[i] < this.f[j] || (this.f[i] === this.f[j] && this.g[i] > this.g[j]);
	}
	private swap(i: number, j: number) {
		const { f, g, s } = this;
		const tf = f[i];
		f[i] = f[j];
		f[j] = tf;
		const tg = g[i];
		g[i] = g[j];
		g[j] = tg;
		const ts = s[i];
		s[i] = s[j];
		s[j] = ts;
	}
	push(f: number, g: number, s: number) {
		this.f.push(f);
		this.g.push(g);
		this.s.push(s);
		let i = this.s.length - 1;
		while (i > 0) {
			const p = (i - 1) >> 1;
			if (!this.less(i, p)) break;
			this.swap(i, p);
			i = p;
		}
	}
	pop(): { f: number; g: number; s: number } {
		const top = { f: this.f[0], g: this.g[0], s: this.s[0] };
		const lastF = this.f.pop()!;
		const lastG = this.g.pop()!;
		const lastS = this.s.pop()!;
		if (this.s.length > 0) {
			this.f[0] = lastF;
			this.g[0] = lastG;
			this.s[0] = lastS;
			let i = 0;
			for (;;) {
				const l = 2 * i + 1;
				const r = l + 1;
				let m = i;
				if (l < this.s.length && this.less(l, m)) m = l;
				if (r < this.s.length && this.less(r, m)) m = r;
				if (m === i) break;
				this.swap(i, m);
				i = m;
			}
		}
		return top;
	}
}

/** Grids up to this many states keep their scores in flat arrays; larger ones in maps. */
const DENSE_STATES = 4_000_000;

interface StateStore {
	gGet(s: number): number;
	gSet(s: number, g: number, from: number): void;
	parent: { get(s: number): number | undefined };
	closed: { has(s: number): boolean; add(s: number): void };
}

function denseStore(n: number): StateStore {
	const g = new Float64Array(n).fill(Infinity);
	const from = new Float64Array(n);
	const done = new Uint8Array(n);
	return {
		gGet: (s) => g[s],
		gSet: (s, v, f) => {
			g[s] = v;
			from[s] = f;
		},
		parent: { get: (s) => from[s] },
		closed: {
			has: (s) => done[s] === 1,
			add: (s) => {
				done[s] = 1;
			}
		}
	};
}

/** Open addressing on typed arrays: several times faster than a Map for millions of states. */
function sparseStore(): StateStore {
	let cap = 1 << 16;
	let keys = new Float64Array(cap).fill(-1);
	let gs = new Float64Array(cap);
	let froms = new Float64Array(cap);
	let size = 0;
	const slot = (s: number): number => {
		let i = (Math.imul(s | 0, 0x9e3779b1) ^ ((s / 4294967296) | 0)) & (cap - 1);
		while (keys[i] !== -1 && keys[i] !== s) i = (i + 1) & (cap - 1);
		return i;
	};
	const growTable = () => {
		const [ok, og, of] = [keys, gs, froms];
		cap *= 2;
		keys = new Float64Array(cap).fill(-1);
		gs = new Float64Array(cap);
		froms = new Float64Array(cap);
		for (let i = 0; i < ok.length; i++) {
			if (ok[i] === -1) continue;
			const j = slot(ok[i]);
			keys[j] = ok[i];
			gs[j] = og[i];
			froms[j] = of[i];
		}
	};
	return {
		gGet: (s) => {
			const i = slot(s);
			return keys[i] === s ? gs[i] : Infinity;
		},
		gSet: (s, v, f) => {
			let i = slot(s);
			if (keys[i] !== s) {
				if (++size * 2 > cap) {
					growTable();
					i = slot(s);
				}
				keys[i] = s;
			}
			gs[i] = v;
			froms[i] = f;
		},
		parent: {
			get: (s) => {
				const i = slot(s);
				return keys[i] === s ? froms[i] : undefined;
			}
		},
		closed: { has: () => false, add: () => {} }
	};
}

interface Prepared {
	obstacles: RouteObstacle[];
	index: ObstacleIndex;
	coords: [Float64Array, Float64Array, Float64Array];
	/** Bounds the tube box must stay inside: the input bounds less the clearance. */
	room: Box;
	half: number;
	r: number;
}

interface SearchOptions {
	half: number;
	r: number;
	bendPenaltyMm: number;
	/** Expansions left for every search of one findRoute call together. */
	budget: { left: number };
}

type SearchAnswer =
	| { found: true; points: Vec3[]; bends: number; cost: number; expansions: number }
	| {
			found: false;
			expansions: number;
			exhausted: boolean;
			/** Obstacles that stopped the moves of the state that came closest to the end. */
			blockers: number[];
			startBlockedBy: number;
			/** The centre-line from the start to the state that came closest to the end (corners). */
			partial: Vec3[];
	  };

function normalise(o: Box | RouteObstacle, i: number): RouteObstacle {
	if ('box' in o) return { box: o.box, id: o.id ?? `obstacle ${i + 1}`, label: o.label };
	return { box: o, id: `obstacle ${i + 1}` };
}

function grow(b: Box, by: number): Box {
	return {
		min: [b.min[0] - by, b.min[1] - by, b.min[2] - by],
		max: [b.max[0] + by, b.max[1] + by, b.max[2] + by]
	};
}

function prepare(input: RouteInput, half: number, r: number): Prepared {
	const c = input.clearanceMm;
	const obstacles = input.obstacles.map(normalise);
	const room: Box = grow(input.bounds, -c);
	const index = new ObstacleIndex(
		obstacles.map((o) => grow(o.box, c)),
		input.bounds
	);
	const w = half + c;
	const coords = [0, 1, 2].map((a) => {
		const base = [input.start.point[a], input.end.point[a], room.min[a] + half, room.max[a] - half];
		for (const o of obstacles) base.push(o.box.min[a] - w, o.box.max[a] + w);
		for (const p of input.penalties ?? []) base.push(p.box.min[a], p.box.max[a]);
		return axisCoords(base, r, room.min[a] + half, room.max[a] - half);
	}) as [Float64Array, Float64Array, Float64Array];
	return { obstacles, index, coords, room, half, r };
}

function penaltyCost(a: Vec3, b: Vec3, penalties: readonly PenaltyBox[]): number {
	let cost = 0;
	for (const p of penalties) {
		let len = 0;
		let inside = true;
		for (let i = 0; i < 3; i++) {
			const lo = Math.min(a[i], b[i]);
			const hi = Math.max(a[i], b[i]);
			if (hi - lo > TOL) {
				len = Math.min(hi, p.box.max[i]) - Math.max(lo, p.box.min[i]);
				if (len <= 0) inside = false;
			} else if (!(lo > p.box.min[i] && lo < p.box.max[i])) {
				inside = false;
			}
		}
		if (inside && len > 0) cost += len * p.costPerMm;
	}
	return cost;
}

/** One A* run on the prepared grid. */
function search(input: RouteInput, prep: Prepared, opt: SearchOptions): SearchAnswer {
	const { coords, index } = prep;
	const { half, r, bendPenaltyMm: B } = opt;
	const penalties = input.penalties ?? [];
	const [xs, ys, zs] = coords;
	const nx = xs.length;
	const ny = ys.length;
	const sd = dirIndex(input.start.direction);
	// The route arrives at the end moving against the end port's direction.
	const ed = dirIndex(input.end.direction) ^ 1;
	const E = input.end.point;
	const S = input.start.point;
	const ei = [findCoord(xs, E[0]), findCoord(ys, E[1]), findCoord(zs, E[2])];
	const si = [findCoord(xs, S[0]), findCoord(ys, S[1]), findCoord(zs, S[2])];
	const goalNode = ei[0] + nx * (ei[1] + ny * ei[2]);
	const GOAL = -2;
	const point = (n: number, out: Vec3 = [0, 0, 0]): Vec3 => {
		const i = n % nx;
		const j = Math.floor(n / nx) % ny;
		const k = Math.floor(n / (nx * ny));
		out[0] = xs[i];
		out[1] = ys[j];
		out[2] = zs[k];
		return out;
	};
	// Scratch for the hot loop (no allocation per move): the box queried, the current point, the next.
	const qb: Box = { min: [0, 0, 0], max: [0, 0, 0] };
	const P: Vec3 = [0, 0, 0];
	const Q: Vec3 = [0, 0, 0];
	const idx = [0, 0, 0];
	const stride = [1, nx, nx * ny];
	const ae = AXIS_OF[ed];
	/**
	 * Lower bound of the cost to the end. Per axis, the travel needed, counting the legs the
	 * rules allow: the current leg any length, the last leg (along the end's axis) at least r,
	 * every other leg at least 2r; a move shorter than its leg can be must go past and come back.
	 * Then the fewest bends of a path moving in every direction needed. Admissible; not always
	 * consistent, so states are re-opened when a cheaper way reaches them.
	 */
	const h = (p: Vec3, d: number): number => {
		let need = 0;
		let travel = 0;
		const ad = AXIS_OF[d];
		for (let a = 0; a < 3; a++) {
			const delta = E[a] - p[a];
			const dist = Math.abs(delta);
			if (delta > TOL) need |= 1 << (a * 2 + 1);
			else if (delta < -TOL) need |= 1 << (a * 2);
			if (a === ad) {
				// Going back along the current axis takes a middle leg of at least 2r.
				const ahead = delta * SIGN_OF[d];
				travel += ahead < -TOL ? Math.max(dist, 2 * r) : dist;
			} else if (a === ae) {
				const ahead = delta * SIGN_OF[ed];
				if (ahead >= r - TOL) {
					travel += dist;
				} else {
					// Short of r or behind: back at least one middle leg, then the last leg.
					need |= 1 << (ed ^ 1);
					travel += ahead >= 0 ? ahead + 4 * r : dist + 2 * r;
				}
			} else if (dist > TOL && dist < 2 * r - TOL) {
				// Only middle legs run along this axis: over by one leg and back.
				need |= 3 << (a * 2);
				travel += dist + 4 * r;
			} else {
				travel += dist;
			}
		}
		return travel + B * (MIN_SEGMENTS[(d * 6 + ed) * 64 + need] - 1);
	};
	// Every grid plane lies inside the room less the half-width, so every box is inside the room.
	const clear = (b: Box): number => index.first(b);

	const states = nx * ny * coords[2].length * 6;
	const store = states <= DENSE_STATES ? denseStore(states) : sparseStore();
	const { gGet, gSet, parent } = store;
	const heap = new Heap();
	let goalG = Infinity;
	let goalParent = -1;
	let best = { h: Infinity, state: -1 };
	// Only the closest state's blockers are ever told, so only its are kept: its moves are tried
	// right after it becomes the closest, and a closer one starts a new set.
	let bestBlockers = new Set<number>();

	const relax = (state: number, g: number, from: number, p: Vec3, d: number) => {
		if (gGet(state) <= g + 1e-9) return;
		gSet(state, g, from);
		heap.push(g + h(p, d), g, state);
	};
	const reachGoal = (g: number, from: number) => {
		if (g < goalG - 1e-9) {
			goalG = g;
			goalParent = from;
			heap.push(g, g, GOAL);
		}
	};
	const noteBlock = (from: number, o: number) => {
		if (o < 0) return;
		if (from === best.state) bestBlockers.add(o);
	};

	/** Index along axis `a` of the first coordinate at least `dist` from `from` in direction `d`. */
	const landing = (a: number, from: number, d: number, dist: number): number => {
		const c = coords[a];
		if (SIGN_OF[d] > 0) {
			// First index with c[i] ≥ from + dist.
			const lo = lowerBound(c, from + dist - 1e-6);
			return lo < c.length ? lo : -1;
		}
		// Last index with c[i] ≤ from − dist.
		const target = from - dist + 1e-6;
		let lo = -1;
		let hi = c.length - 1;
		while (lo < hi) {
			const mid = (lo + hi + 1) >> 1;
			if (c[mid] > target) hi = mid - 1;
			else lo = mid;
		}
		return lo;
	};
	const withAxis = (idx: number[], a: number, v: number) => {
		const out = [...idx];
		out[a] = v;
		return out[0] + nx * (out[1] + ny * out[2]);
	};
	const onRay = (p: Vec3, d: number): number => {
		const a = AXIS_OF[d];
		for (let i = 0; i < 3; i++) {
			if (i !== a && Math.abs(p[i] - E[i]) > 1e-6) return -1;
		}
		const dist = (E[a] - p[a]) * SIGN_OF[d];
		return dist >= -1e-9 ? dist : -1;
	};

	// Walk back from a state: the states' nodes, then keep the corners where the direction changes.
	const START = -1;
	const nodeOf = (s: number) => (s - (s % 6)) / 6;
	let chain: number[] = [];
	function cornersTo(last: number): Vec3[] {
		chain = [];
		for (let s = last; s !== START && s !== undefined; s = parent.get(s)!) chain.push(s);
		chain.reverse();
		const out: Vec3[] = [S];
		for (let i = 1; i < chain.length; i++) {
			if (chain[i] % 6 !== chain[i - 1] % 6) out.push(point(nodeOf(chain[i - 1])));
		}
		return out;
	}
	/** The corners from the start to a state, and the state's own point: a partial route. */
	function partialTo(state: number): Vec3[] {
		if (state < 0) return [[...S] as Vec3];
		const out = cornersTo(state);
		out.push(point(nodeOf(state)));
		return out;
	}

	// Leaving the start: straight along the port for at least r before any bend.
	let startBlockedBy = -1;
	{
		const a = AXIS_OF[sd];
		const direct = onRay(S, sd);
		if (direct >= 0 && sd === ed) {
			const o = clear(pieceBox(S, E, half));
			if (o === -1) reachGoal(direct + penaltyCost(S, E, penalties), START);
		}
		const li = landing(a, S[a], sd, Math.max(r, 1e-3));
		if (li >= 0) {
			const n = withAxis(si, a, li);
			const L = point(n);
			const o = clear(pieceBox(S, L, half, 0, half));
			if (o === -1) {
				relax(n * 6 + sd, Math.abs(L[a] - S[a]) + penaltyCost(S, L, penalties), START, L, sd);
			} else {
				startBlockedBy = o;
			}
		}
	}

	// No route: cut off by the step budget, or (exhausted) with every state tried.
	const failed = (expansions: number, exhausted: boolean): SearchAnswer => ({
		found: false,
		expansions,
		exhausted,
		blockers: [...bestBlockers],
		startBlockedBy,
		partial: partialTo(best.state)
	});
	let expansions = 0;
	while (heap.size > 0) {
		const top = heap.pop();
		if (top.s === GOAL) break;
		if (top.f >= goalG - 1e-9) break;
		const state = top.s;
		const g = gGet(state);
		if (top.g > g + 1e-9) continue;
		expansions++;
		if (--opt.budget.left < 0) return failed(expansions, false);
		const d = state % 6;
		const n = (state - d) / 6;
		point(n, P);
		const hp = top.f - g;
		if (hp < best.h) {
			best = { h: hp, state };
			bestBlockers = new Set();
		}
		idx[0] = n % nx;
		idx[1] = Math.floor(n / nx) % ny;
		idx[2] = Math.floor(n / (nx * ny));
		const a = AXIS_OF[d];

		// Straight on to the next plane.
		const next = idx[a] + SIGN_OF[d];
		if (next >= 0 && next < coords[a].length) {
			const m = n + (next - idx[a]) * stride[a];
			point(m, Q);
			const len = Math.abs(Q[a] - P[a]);
			if (m === goalNode && d === ed) {
				const o = clear(pieceBox(P, Q, half, half, 0, qb));
				if (o === -1) reachGoal(g + len + penaltyCost(P, Q, penalties), state);
				else noteBlock(state, o);
			}
			const o = clear(pieceBox(P, Q, half, half, half, qb));
			if (o === -1) relax(m * 6 + d, g + len + penaltyCost(P, Q, penalties), state, Q, d);
			else noteBlock(state, o);
		}

		// A bend into each perpendicular direction, then at least 2r straight.
		for (let d2 = 0; d2 < 6; d2++) {
			const a2 = AXIS_OF[d2];
			if (a2 === a) continue;
			const o = clear(bendBox(P, d, d2, r, half, qb));
			if (o !== -1) {
				noteBlock(state, o);
				continue;
			}
			if (d2 === ed) {
				const dist = onRay(P, d2);
				if (dist >= r - 1e-6 && dist > 1e-6) {
					const ob = clear(pieceBox(P, E, half, half, 0, qb));
					if (ob === -1) reachGoal(g + B + dist + penaltyCost(P, E, penalties), state);
					else noteBlock(state, ob);
				}
			}
			const li = landing(a2, P[a2], d2, Math.max(2 * r, 1e-3));
			if (li < 0) continue;
			const m = n + (li - idx[a2]) * stride[a2];
			const L = point(m, Q);
			const ob = clear(pieceBox(P, L, half, half, half, qb));
			if (ob !== -1) {
				noteBlock(state, ob);
				continue;
			}
			relax(
				m * 6 + d2,
				g + B + Math.abs(L[a2] - P[a2]) + penaltyCost(P, L, penalties),
				state,
				L,
				d2
			);
		}
	}

	if (goalParent === -1 && goalG === Infinity) return failed(expansions, true);

	const points = cornersTo(goalParent);
	if (chain.length > 0 && chain[chain.length - 1] % 6 !== ed) {
		points.push(point(nodeOf(chain[chain.length - 1])));
	}
	points.push(E);
	return { found: true, points, bends: points.length - 2, cost: goalG, expansions };
}

/**
 * Proof that no route can leave the start (which = 'start') or reach the end ('end'), from the
 * port's own room alone. Every route the search can find runs straight out of the start along its
 * port for at least max(r, 1e-3) to its first corner (and into the end for at least r from its
 * last corner), that straight piece clear, and the corner's bend box clear into some
 * perpendicular direction. So when no grid plane on that ray offers both, there is no route on
 * the grid: a check of O(planes on one axis) that spares a search which could only end at its
 * step cap. Returns null when some corner could serve (or a straight run from port to port might),
 * else what is in the way (obstacle indexes; `bounds` when the ray meets the room's edge first).
 */
function approachBlocked(
	input: RouteInput,
	prep: Prepared,
	which: 'start' | 'end'
): { blockers: number[]; bounds: boolean } | null {
	const { coords, index, half, r } = prep;
	const S = input.start.point;
	const E = input.end.point;
	const sd = dirIndex(input.start.direction);
	const ed = dirIndex(input.end.direction) ^ 1;
	// A straight run from port to port needs no corner at all: nothing to prove here.
	if (sd === ed) {
		const a = AXIS_OF[sd];
		const inLine = [0, 1, 2].every((i) => i === a || Math.abs(S[i] - E[i]) <= 1e-6);
		if (inLine && (E[a] - S[a]) * SIGN_OF[sd] > 1e-6) return null;
	}
	const p0 = which === 'start' ? S : E;
	// The ray is walked away from the port: along the start's direction, back from the end.
	const ray = which === 'start' ? sd : ed ^ 1;
	const a = AXIS_OF[ray];
	const c = coords[a];
	const i0 = findCoord(c, p0[a]);
	if (i0 < 0) return null;
	const minLeg = which === 'start' ? Math.max(r, 1e-3) - 1e-6 : Math.max(r - 1e-6, 1e-6);
	const blockers = new Set<number>();
	const C: Vec3 = [p0[0], p0[1], p0[2]];
	const qb: Box = { min: [0, 0, 0], max: [0, 0, 0] };
	for (let i = i0 + SIGN_OF[ray]; i >= 0 && i < c.length; i += SIGN_OF[ray]) {
		C[a] = c[i];
		const piece =
			which === 'start' ? pieceBox(S, C, half, 0, half, qb) : pieceBox(C, E, half, half, 0, qb);
		const o = index.first(piece);
		if (o !== -1) {
			blockers.add(o);
			return { blockers: [...blockers], bounds: false };
		}
		if (Math.abs(C[a] - p0[a]) < minLeg) continue;
		for (let d = 0; d < 6; d++) {
			if (AXIS_OF[d] === a) continue;
			const bend =
				which === 'start' ? bendBox(C, sd, d, r, half, qb) : bendBox(C, d, ed, r, half, qb);
			const ob = index.first(bend);
			if (ob === -1) return null;
			blockers.add(ob);
		}
	}
	return { blockers: [...blockers], bounds: true };
}

/**
 * Proof that the start and the end are not connected at all, for the section's width with bends
 * of no radius (a relaxation: every route with bends is also such a path). Breadth-first over the
 * zero-radius escape-line grid (the inflated obstacles' faces, the ports and the room's edges),
 * one plane to the next, each step's piece clear. On that grid a cell between neighbouring planes
 * is wholly free or wholly blocked, so the grid's nodes are connected exactly when the free space
 * is: "no route exists", not "the search gave up". `blockers`: what stops the reached region,
 * nearest the end first.
 */
function floodConnected(
	input: RouteInput,
	half: number
): { connected: boolean; blockers: number[] } {
	const prep = prepare(input, half, 0);
	const { coords, index } = prep;
	const [xs, ys, zs] = coords;
	const nx = xs.length;
	const ny = ys.length;
	const nz = zs.length;
	const S = input.start.point;
	const E = input.end.point;
	const s = findCoord(xs, S[0]) + nx * (findCoord(ys, S[1]) + ny * findCoord(zs, S[2]));
	const e = findCoord(xs, E[0]) + nx * (findCoord(ys, E[1]) + ny * findCoord(zs, E[2]));
	const seen = new Uint8Array(nx * ny * nz);
	const queue = new Int32Array(nx * ny * nz);
	const blockers = new Map<number, number>();
	const P: Vec3 = [0, 0, 0];
	const Q: Vec3 = [0, 0, 0];
	const qb: Box = { min: [0, 0, 0], max: [0, 0, 0] };
	const stride = [1, nx, nx * ny];
	const size = [nx, ny, nz];
	let head = 0;
	let tail = 0;
	queue[tail++] = s;
	seen[s] = 1;
	while (head < tail) {
		const n = queue[head++];
		if (n === e) return { connected: true, blockers: [] };
		const ijk = [n % nx, Math.floor(n / nx) % ny, Math.floor(n / (nx * ny))];
		P[0] = xs[ijk[0]];
		P[1] = ys[ijk[1]];
		P[2] = zs[ijk[2]];
		for (let d = 0; d < 6; d++) {
			const a = AXIS_OF[d];
			const j = ijk[a] + SIGN_OF[d];
			if (j < 0 || j >= size[a]) continue;
			const m = n + SIGN_OF[d] * stride[a];
			if (seen[m]) continue;
			Q[0] = P[0];
			Q[1] = P[1];
			Q[2] = P[2];
			Q[a] = coords[a][j];
			const o = index.first(pieceBox(P, Q, half, 0, 0, qb));
			if (o !== -1) {
				if (!blockers.has(o)) blockers.set(o, boxDistance(prep.obstacles[o].box, E));
				continue;
			}
			seen[m] = 1;
			queue[tail++] = m;
		}
	}
	return {
		connected: false,
		blockers: [...blockers.entries()].sort((x, y) => x[1] - y[1]).map(([o]) => o)
	};
}

/** Distance from a point to a box (0 inside). */
function boxDistance(b: Box, p: Vec3): number {
	let s = 0;
	for (let a = 0; a < 3; a++) {
		const d = Math.max(b.min[a] - p[a], 0, p[a] - b.max[a]);
		s += d * d;
	}
	return Math.sqrt(s);
}

/** Distance between two boxes (0 when they touch or overlap). */
function boxGap(a: Box, b: Box): number {
	let s = 0;
	for (let k = 0; k < 3; k++) {
		const d = Math.max(a.min[k] - b.max[k], 0, b.min[k] - a.max[k]);
		s += d * d;
	}
	return Math.sqrt(s);
}

function routeFrom(points: Vec3[], bends: number, cost: number, r: number): Route {
	return {
		waypoints: points.slice(1, -1).map((p) => [...p] as Vec3),
		lengthMm: centreLineLengthMm(points, r),
		bends,
		cost
	};
}

function fmt(mm: number): string {
	return `${(Math.round(mm * 10) / 10).toFixed(1)} mm`;
}

function names(prep: Prepared, ids: Iterable<number>): string[] {
	const out = new Set<string>();
	for (const i of ids) {
		const o = prep.obstacles[i];
		if (o) out.add(o.label ? `${o.label} (${o.id})` : o.id!);
	}
	return [...out];
}

function validate(input: RouteInput, half: number): string | null {
	const { start, end, bounds } = input;
	if (!(half > 0)) return 'The section needs a positive size.';
	if (!(input.bendRadiusMm >= 0) || !(input.clearanceMm >= 0) || !(input.bendPenaltyMm >= 0)) {
		return 'Bend radius, clearance and bend penalty must not be negative.';
	}
	const room = grow(bounds, -(input.clearanceMm + half));
	for (const [end_, name] of [
		[start, 'start'],
		[end, 'end']
	] as const) {
		for (let a = 0; a < 3; a++) {
			if (end_.point[a] < room.min[a] - 1e-6 || end_.point[a] > room.max[a] + 1e-6) {
				return `The ${name} is closer to the bounds than the tube's half-width plus its clearance (${fmt(half + input.clearanceMm)}).`;
			}
		}
	}
	if (segmentAxis(start.point, end.point) === -1) {
		return 'The start and the end are the same point.';
	}
	return null;
}

/** Alternatives: the same search with a much lower and a much higher bend penalty. */
function penaltiesToTry(B: number, count: number): number[] {
	const out = [B];
	if (count >= 2) out.push(B * 10 + 100);
	if (count >= 3) out.push(B / 10);
	return out;
}

/**
 * Up to `maxAlternatives` routes, best (lowest cost) first; or, when none exists, why: the
 * narrowest gap on the best route a thinner tube could take, and the obstacles around it.
 */
export function findRoute(input: RouteInput): RouteResult {
	const half = sectionHalfWidthMm(input.section);
	const bad = validate(input, half);
	if (bad) return { ok: false, reason: bad, cause: 'input' };
	const r = input.bendRadiusMm;
	const prep = prepare(input, half, r);
	for (const which of ['start', 'end'] as const) {
		const shut = approachBlocked(input, prep, which);
		if (shut) return noRoomToTurn(input, prep, which, shut);
	}
	const maxExpansions = input.maxExpansions ?? DEFAULT_MAX_EXPANSIONS;
	const budget = { left: maxExpansions };
	const found: Route[] = [];
	const seen = new Set<string>();
	let first: SearchAnswer | null = null;
	for (const B of penaltiesToTry(input.bendPenaltyMm, input.maxAlternatives ?? 1)) {
		const answer = search(input, prep, { half, r, bendPenaltyMm: B, budget });
		first ??= answer;
		if (!answer.found) break;
		const key = `${answer.bends}:${answer.points.map((p) => p.join(',')).join(';')}`;
		if (seen.has(key)) continue;
		seen.add(key);
		const straight = centreLineLengthMm(answer.points, 0);
		const extra = answer.cost - straight - B * answer.bends;
		found.push(
			routeFrom(
				answer.points,
				answer.bends,
				straight + input.bendPenaltyMm * answer.bends + extra,
				r
			)
		);
	}
	if (found.length > 0) {
		found.sort((a, b) => a.cost - b.cost || a.bends - b.bends);
		return { ok: true, routes: found };
	}
	return explain(input, prep, first!, maxExpansions, budget);
}

function endName(input: RouteInput, which: 'start' | 'end'): string {
	const label = input[which].label;
	return label ? `The ${which} (${label})` : `The ${which}`;
}

/** Words for a port with no room for its first (or last) straight leg and bend. */
function noRoomToTurn(
	input: RouteInput,
	prep: Prepared,
	which: 'start' | 'end',
	shut: { blockers: number[]; bounds: boolean }
): RouteResult {
	const blockedBy = names(prep, shut.blockers);
	const what = [...blockedBy, ...(shut.bounds ? ["the enclosure's panels"] : [])];
	const r = prep.r;
	const leg = which === 'start' ? 'out of its port' : 'into its port';
	return {
		ok: false,
		cause: 'disconnected',
		reason: `No route exists: ${endName(input, which).replace(/^The/, 'the')} has no room to turn. The ${fmt(2 * prep.half)} section runs at least ${fmt(Math.max(r, 0))} straight ${leg} and then bends with a ${fmt(r)} radius, keeping ${fmt(input.clearanceMm)} of clearance, and ${what.length ? what.join(', ') : 'something'} ${what.length > 1 || (shut.bounds && !blockedBy.length) ? 'are' : 'is'} in the way. Move the part or the port, use an angled plug or fitting, or a tighter-bending section.`,
		blockedBy
	};
}

/**
 * Words for a search that stopped at its step cap. First a flood fill tells "no route exists"
 * from "the search gave up"; when it gave up, the words say how far its best partial route got
 * (the furthest point, what stopped it there) and the tightest spot on the way.
 */
function capped(
	input: RouteInput,
	prep: Prepared,
	answer: Extract<SearchAnswer, { found: false }>,
	maxExpansions: number
): RouteResult {
	const flood = floodConnected(input, prep.half);
	if (!flood.connected) {
		const blockedBy = names(prep, flood.blockers.slice(0, 6));
		return {
			ok: false,
			cause: 'disconnected',
			reason: `No route exists: the start and the end are not connected for the ${fmt(2 * prep.half)} section with its ${fmt(input.clearanceMm)} clearance, not even without bends${blockedBy.length ? ` (closed off by ${blockedBy.join(', ')})` : ''}.`,
			narrowestGapMm: 0,
			blockedBy
		};
	}
	const path = answer.partial;
	const far = path[path.length - 1];
	const E = input.end.point;
	const left = Math.abs(E[0] - far[0]) + Math.abs(E[1] - far[1]) + Math.abs(E[2] - far[2]);
	// What stopped the furthest state's moves; else the obstacle nearest that point.
	let stoppers = answer.blockers;
	if (!stoppers.length && prep.obstacles.length) {
		let nearest = 0;
		prep.obstacles.forEach((o, i) => {
			if (boxDistance(o.box, far) < boxDistance(prep.obstacles[nearest].box, far)) nearest = i;
		});
		stoppers = [nearest];
	}
	const stoppedBy = names(prep, stoppers.slice(0, 3));
	// The tightest spot on the partial route: the least room between its tube and an obstacle.
	let tight = -1;
	let tightGap = Infinity;
	if (path.length > 1) {
		for (const b of routeBoxes(path, input.section, prep.r)) {
			prep.obstacles.forEach((o, i) => {
				const g = boxGap(b, o.box);
				if (g < tightGap) {
					tightGap = g;
					tight = i;
				}
			});
		}
	}
	const at = `(${far.map((v) => Math.round(v)).join(', ')}) mm`;
	const tightWords =
		tight >= 0 ? ` Its tightest spot is ${fmt(tightGap)} from ${names(prep, [tight])[0]}.` : '';
	return {
		ok: false,
		cause: 'capped',
		reason: `The search stopped after ${maxExpansions.toLocaleString('en-US')} steps without reaching the end. Its best partial route got to ${at}, ${fmt(left)} short of the end${stoppedBy.length ? `, where ${stoppedBy.join(', ')} ${stoppedBy.length > 1 ? 'stop' : 'stops'} it` : ''}.${tightWords} A way through exists for the section without its bends, so a route may exist: add a waypoint past that point or route a shorter run.`,
		narrowestGapMm: Number.isFinite(tightGap) ? Math.round(tightGap * 10) / 10 : undefined,
		blockedBy: stoppedBy,
		furthest: [...far] as Vec3
	};
}

/** Words for a failed search (see findRoute). */
function explain(
	input: RouteInput,
	prep: Prepared,
	answer: SearchAnswer,
	maxExpansions: number,
	budget: { left: number }
): RouteResult {
	if (answer.found) throw new Error('unreachable');
	const stopped = (): RouteResult => capped(input, prep, answer, maxExpansions);
	if (!answer.exhausted) return stopped();
	const { half, r } = prep;
	const need = 2 * (half + input.clearanceMm);
	// Room for the tube's width but not its bends?
	if (r > 0) {
		const flat = search(input, prep, { half, r: 0, bendPenaltyMm: input.bendPenaltyMm, budget });
		if (!flat.found && !flat.exhausted) return stopped();
		if (flat.found) {
			const blockers = new Set<number>();
			for (let i = 1; i + 1 < flat.points.length; i++) {
				const d1 = directionOf(flat.points[i - 1], flat.points[i]);
				const d2 = directionOf(flat.points[i], flat.points[i + 1]);
				const box = grow(bendBox(flat.points[i], d1, d2, r, half), 0);
				for (const o of prep.index.all(box)) blockers.add(o);
			}
			const blockedBy = names(prep, blockers);
			return {
				ok: false,
				cause: 'narrow',
				reason: `There is room for the ${fmt(2 * half)} section but not for its ${fmt(r)} bends${blockedBy.length ? `, at ${blockedBy.join(', ')}` : ''}. A 90° fitting in place of a bend, a soft tube or a tighter-bending bundle may fit.`,
				blockedBy
			};
		}
	}
	// The widest section with any route: bisect the half-width with bends of no radius.
	let lo = 0;
	let hi = half;
	let loRoute: Vec3[] | null = null;
	const thin = (w: number) => {
		const p = prepare(input, w, 0);
		return search(input, p, { half: w, r: 0, bendPenaltyMm: input.bendPenaltyMm, budget });
	};
	const zero = thin(1e-3);
	if (!zero.found && !zero.exhausted) return stopped();
	if (!zero.found) {
		const ids = new Set<number>(zero.found ? [] : zero.blockers);
		if (answer.startBlockedBy >= 0) ids.add(answer.startBlockedBy);
		const blockedBy = names(prep, ids.size ? ids : answer.blockers);
		return {
			ok: false,
			cause: 'disconnected',
			reason: `The start and the end are not connected: no opening at all leads from one to the other${blockedBy.length ? ` (closed off by ${blockedBy.join(', ')})` : ''}.`,
			narrowestGapMm: 0,
			blockedBy
		};
	}
	loRoute = zero.points;
	lo = 1e-3;
	for (let k = 0; k < 8 && hi - lo > 0.05; k++) {
		const mid = (lo + hi) / 2;
		const t = thin(mid);
		if (t.found) {
			lo = mid;
			loRoute = t.points;
		} else if (!t.exhausted) {
			break;
		} else {
			hi = mid;
		}
	}
	// What closes the passage: obstacles the best thin route would touch with a slightly wider tube.
	const wider = new ObstacleIndex(
		prep.obstacles.map((o) => grow(o.box, input.clearanceMm)),
		input.bounds
	);
	const blockers = new Set<number>();
	for (const b of routeBoxes(loRoute, { kind: 'round', outerDiameterMm: 2 * hi + 0.1 }, 0)) {
		for (const o of wider.all(b)) blockers.add(o);
	}
	const blockedBy = names(prep, blockers);
	const gap = 2 * lo + 2 * input.clearanceMm;
	return {
		ok: false,
		cause: 'narrow',
		reason: `The narrowest gap on the best route is about ${fmt(gap)}${blockedBy.length ? `, at ${blockedBy.join(', ')}` : ''}; the ${fmt(2 * half)} section needs ${fmt(need)} with its clearance.`,
		narrowestGapMm: Math.round(gap * 10) / 10,
		blockedBy
	};
}

/** Do the boxes keep `clearanceMm` from every one of `others` (touching at that distance is clear)? */
function clearOf(boxes: readonly Box[], others: readonly Box[], clearanceMm: number): boolean {
	for (const b of boxes) {
		for (const o of others) {
			let overlap = true;
			for (let a = 0; a < 3 && overlap; a++) {
				overlap =
					Math.min(b.max[a], o.max[a] + clearanceMm) - Math.max(b.min[a], o.min[a] - clearanceMm) >
					EPS;
			}
			if (overlap) return false;
		}
	}
	return true;
}

/**
 * Routes several runs each on its own, none an obstacle for another: for cable bundles, which may
 * lie together. Same answer shape as routeMany, in the runs' order.
 */
export function routeEach(
	runs: readonly ManyRun[],
	shared: Omit<RouteInput, 'start' | 'end' | 'section' | 'bendRadiusMm' | 'mode'>,
	onProgress?: (done: number, total: number) => void
): { order: string[]; results: Record<string, RouteResult> } {
	const results: Record<string, RouteResult> = {};
	runs.forEach((run, i) => {
		results[run.id] = findRoute({ ...shared, ...run });
		onProgress?.(i + 1, runs.length);
	});
	return { order: runs.map((r) => r.id), results };
}

/** One run to route among several (see routeMany). */
export interface ManyRun {
	id: string;
	start: RouteEnd;
	end: RouteEnd;
	section: RouteSection;
	bendRadiusMm: number;
	mode: 'hard' | 'soft';
}

/**
 * Routes several runs one after another, each routed run's boxes becoming obstacles for the next.
 * Hardest first: each run is searched alone, and the runs that fail or cost most go first, so the
 * easy ones take what room is left.
 */
export function routeMany(
	runs: readonly ManyRun[],
	shared: Omit<RouteInput, 'start' | 'end' | 'section' | 'bendRadiusMm' | 'mode'>,
	/** Told after each search: `done` of `total` (each run is searched alone, then in order). */
	onProgress?: (done: number, total: number) => void
): { order: string[]; results: Record<string, RouteResult> } {
	const total = runs.length * 2;
	let done = 0;
	const solo = runs.map((run) => {
		const res = findRoute({ ...shared, ...run, maxAlternatives: 1 });
		onProgress?.(++done, total);
		return { run, res, cost: res.ok ? res.routes[0].cost : Infinity };
	});
	solo.sort((a, b) => b.cost - a.cost || (a.run.id < b.run.id ? -1 : 1));
	const obstacles: (Box | RouteObstacle)[] = [...shared.obstacles];
	const results: Record<string, RouteResult> = {};
	const c = shared.clearanceMm;
	const placed: Box[] = [];
	solo.forEach(({ run, res: alone }) => {
		// Runs placed before only take free space away, so a run's best route alone that is still
		// clear of them (with the clearance) is still its best: no second search. The first run sees
		// only the scene, so its search alone is always its answer.
		const reuse =
			alone.ok &&
			(shared.maxAlternatives ?? 1) === 1 &&
			clearOf(
				routeBoxes(
					[run.start.point, ...alone.routes[0].waypoints, run.end.point],
					run.section,
					run.bendRadiusMm
				),
				placed,
				c
			);
		const res = reuse ? alone : findRoute({ ...shared, ...run, obstacles });
		onProgress?.(++done, total);
		results[run.id] = res;
		if (res.ok) {
			const points = [run.start.point, ...res.routes[0].waypoints, run.end.point];
			routeBoxes(points, run.section, run.bendRadiusMm).forEach((box, i) => {
				placed.push(box);
				obstacles.push({ box, id: `run:${run.id}#${i + 1}`, label: `run ${run.id}` });
			});
		}
	});
	return { order: solo.map((s) => s.run.id), results };
}
