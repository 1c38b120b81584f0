/**
 * One candidate part, placed in a scene that is otherwise fixed: its status, gaps and mount stack
 * exactly as checkScene would report them for it, without recomputing the rest of the scene.
 *
 * The scene's boxes are prepared once (walls, dividers and brackets at their offsets, every other
 * placement's bodies and keep-outs); each candidate is then tested against them alone, with the
 * same rules as the full report: pairKind for what an overlap means, the nearest box ahead of
 * each face (ties to the smaller id) for gaps, held contact as the report counts it, and the
 * mount's stack as mountReport adds it up. Millimetres, inner coordinates.
 */

import { EPSILON_MM, FACES, compareText, type Face } from './box';
import { FACE_AXES } from './enclosure';
import { mountReport } from './mounts';
import { isObstacle, pairKind } from './pairs';
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
	/** The mount of the placement a box belongs to, for held contact on a stack. */
	mountOfBox: (string | undefined)[];
	mounts: Map<string, MountDef>;
	grid: Grid;
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
	cells: number[][];
	always: number[];
	/** Visit stamps, one per box, so a box in several cells is looked at once per query. */
	seen: Uint32Array;
	stamp: number;
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
	return { origin, cell, dims, cells, always, seen: new Uint32Array(boxes.length), stamp: 0 };
}

function clampCell(v: number, n: number): number {
	return v < 0 ? 0 : v >= n ? n - 1 : v;
}

/** Calls `visit` once for each box in the cells from lo to hi (cell indexes, inclusive), walls first. */
function visitCells(
	g: Grid,
	lo: number[],
	hi: number[],
	visit: (j: number) => void,
	fresh: boolean
): void {
	if (fresh) {
		g.stamp++;
		if (g.stamp === 0xffffffff) {
			g.seen.fill(0);
			g.stamp = 1;
		}
		for (const j of g.always) {
			g.seen[j] = g.stamp;
			visit(j);
		}
	}
	for (let x = lo[0]; x <= hi[0]; x++) {
		for (let y = lo[1]; y <= hi[1]; y++) {
			for (let z = lo[2]; z <= hi[2]; z++) {
				for (const j of g.cells[(x * g.dims[1] + y) * g.dims[2] + z]) {
					if (g.seen[j] === g.stamp) continue;
					g.seen[j] = g.stamp;
					visit(j);
				}
			}
		}
	}
}

function cellRange(g: Grid, box: Box, pad: number): { lo: number[]; hi: number[] } {
	return {
		lo: [0, 1, 2].map((a) =>
			clampCell(Math.floor((box.min[a] - pad - g.origin[a]) / g.cell), g.dims[a])
		),
		hi: [0, 1, 2].map((a) =>
			clampCell(Math.floor((box.max[a] + pad - g.origin[a]) / g.cell), g.dims[a])
		)
	};
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

/** Prepares a scene for probing; `ignorePlacementId` leaves one placement out (for a replacement). */
export function probeBase(
	scene: Scene,
	resolved: ResolvedScene,
	ignorePlacementId?: string
): ProbeBase {
	const placements = resolved.placements.filter((rp) => rp.placement.id !== ignorePlacementId);
	const without: ResolvedScene =
		ignorePlacementId === undefined ? resolved : { ...resolved, placements };
	const boxes: WorldBox[] = [...resolved.walls, ...resolved.dividers, ...resolved.brackets];
	const mountOfBox: (string | undefined)[] = boxes.map(() => undefined);
	for (const rp of placements) {
		for (const b of [...rp.bodies, ...rp.keepouts]) {
			boxes.push(b);
			mountOfBox.push(rp.placement.mountId);
		}
	}
	const flat = new Float64Array(boxes.length * 6);
	const obstacle = new Uint8Array(boxes.length);
	boxes.forEach((b, i) => {
		flat.set(b.box.min, i * 6);
		flat.set(b.box.max, i * 6 + 3);
		obstacle[i] = isObstacle(b) ? 1 : 0;
	});
	return {
		scene,
		resolved,
		without,
		boxes,
		flat,
		obstacle,
		mountOfBox,
		mounts: new Map(scene.enclosure.mounts.map((m) => [m.id, m])),
		grid: buildGrid(boxes, resolved.innerBox)
	};
}

function worst(a: FitStatus, b: FitStatus): FitStatus {
	return STATUS_ORDER.indexOf(a) <= STATUS_ORDER.indexOf(b) ? a : b;
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

/** Probes one placement of `part` (its id must not be another placement's). */
export function probe(base: ProbeBase, part: PartDef, placement: Placement): ProbeResult {
	return probePlaced(base, placePart(part, placement));
}

/** `probe` for a placement already resolved (the same one tried at many positions of a control). */
export function probePlaced(base: ProbeBase, placed: ResolvedPlacement): ProbeResult {
	const placement = placed.placement;
	const { flat, boxes, obstacle } = base;
	const margin = base.scene.marginMm;
	let collides = false;
	let blocked = false;
	const overlaps: ProbeResult['overlaps'] = [];
	const g = base.grid;
	for (const own of [...placed.bodies, ...placed.keepouts]) {
		const { lo, hi } = cellRange(g, own.box, 0);
		visitCells(
			g,
			lo,
			hi,
			(j) => {
				if (overlapWith(own.box, flat, j) <= 0) return;
				const kind = pairKind(own, boxes[j]);
				if (!kind) return;
				if (kind === 'collides') collides = true;
				else if (kind === 'blocked') blocked = true;
				overlaps.push({ with: boxes[j].id, label: boxes[j].label, kind });
			},
			true
		);
	}
	overlaps.sort((x, y) => compareText(x.with, y.with));
	const inner = base.resolved.innerBox;
	// Faces of the inner box crossed, as bits in FACES order.
	let outside = 0;
	for (const b of placed.bodies) {
		for (let a = 0; a < 3; a++) {
			if (b.box.min[a] < inner.min[a] - EPSILON_MM) outside |= 1 << (2 * a);
			if (b.box.max[a] > inner.max[a] + EPSILON_MM) outside |= 1 << (2 * a + 1);
		}
	}
	// Nearest obstacle ahead of each face, over all bodies: ties to the smaller box id.
	const gap = [Infinity, Infinity, Infinity, Infinity, Infinity, Infinity];
	const against = [-1, -1, -1, -1, -1, -1];
	const offer = (slot: number, g: number, j: number) => {
		if (
			g < gap[slot] ||
			(g === gap[slot] && compareText(boxes[j].id, boxes[against[slot]].id) < 0)
		) {
			gap[slot] = g;
			against[slot] = j;
		}
	};
	for (const body of placed.bodies) {
		const b = body.box;
		const test = (j: number) => {
			if (!obstacle[j]) return;
			const o = j * 6;
			const ox = Math.min(b.max[0], flat[o + 3]) - Math.max(b.min[0], flat[o]) > EPSILON_MM;
			const oy = Math.min(b.max[1], flat[o + 4]) - Math.max(b.min[1], flat[o + 1]) > EPSILON_MM;
			if (!ox && !oy) return;
			const oz = Math.min(b.max[2], flat[o + 5]) - Math.max(b.min[2], flat[o + 2]) > EPSILON_MM;
			for (let a = 0; a < 3; a++) {
				const across = a === 0 ? oy && oz : a === 1 ? ox && oz : ox && oy;
				if (!across) continue;
				const bodyCentre = b.min[a] + b.max[a];
				const obstacleCentre = flat[o + a] + flat[o + 3 + a];
				if (obstacleCentre >= bodyCentre) offer(2 * a + 1, flat[o + a] - b.max[a], j);
				if (obstacleCentre <= bodyCentre) offer(2 * a, b.min[a] - flat[o + 3 + a], j);
			}
		};
		// The cells the body covers, then layer by layer outward along each axis while a layer could
		// still hold something nearer than the nearest found on that side.
		const { lo, hi } = cellRange(g, b, EPSILON_MM);
		visitCells(g, lo, hi, test, true);
		for (let a = 0; a < 3; a++) {
			for (const dir of [1, -1]) {
				const slot = dir > 0 ? 2 * a + 1 : 2 * a;
				for (let k = dir > 0 ? hi[a] + 1 : lo[a] - 1; k >= 0 && k < g.dims[a]; k += dir) {
					const near =
						dir > 0
							? g.origin[a] + k * g.cell - b.max[a]
							: b.min[a] - (g.origin[a] + (k + 1) * g.cell);
					if (near > gap[slot] + EPSILON_MM) break;
					const l = [...lo];
					const h = [...hi];
					l[a] = k;
					h[a] = k;
					visitCells(g, l, h, test, false);
				}
			}
		}
	}
	const mount = placement.mountId === undefined ? undefined : base.mounts.get(placement.mountId);
	let mountFace = -1;
	if (mount) {
		const { axis, high } = FACE_AXES[mount.face];
		mountFace = 2 * axis + (high ? 1 : 0);
	}
	const held = (f: number): boolean => {
		const j = against[f];
		if (!(Math.abs(gap[f]) <= EPSILON_MM) || j < 0) return false;
		if (f === 2) return true;
		if (mountFace < 0) return false;
		const box = boxes[j];
		if (box.kind === 'wall') {
			const w = FACE_AXES[box.face!];
			return f === mountFace && 2 * w.axis + (w.high ? 1 : 0) === mountFace;
		}
		return base.mountOfBox[j] !== undefined && base.mountOfBox[j] === placement.mountId;
	};
	const worstCase = (f: number) =>
		gap[f] - placed.part.toleranceMm - (boxes[against[f]].toleranceMm ?? 0);
	let partStatus: FitStatus = 'clear';
	if (collides) partStatus = 'collides';
	else if (blocked) partStatus = 'blocked';
	else if (outside !== 0) partStatus = 'outside';
	// Tight on the worst case: the gap less both sides' tolerances (docs/scene-format.md, "Gaps").
	else if (gap.some((g, f) => against[f] >= 0 && worstCase(f) < margin - EPSILON_MM && !held(f))) {
		partStatus = 'tight';
	}
	const gaps = {} as ProbeResult['gaps'];
	let spareMm: number | null = null;
	FACES.forEach((face, f) => {
		const j = against[f];
		const h = held(f);
		gaps[face] =
			j < 0
				? { gapMm: null, against: null, held: false }
				: { gapMm: gap[f], against: boxes[j].label, held: h };
		if (j >= 0 && !h && (spareMm === null || gap[f] < spareMm)) spareMm = gap[f];
	});
	let report: MountReport | null = null;
	let status = partStatus;
	if (mount) {
		const stacked = base.without.placements.filter((rp) => rp.placement.mountId === mount.id);
		report = mountReport(mount, base.scene, { ...base.without, placements: [...stacked, placed] });
		status = worst(status, report.status);
		if (report.spareMm !== null && (spareMm === null || report.spareMm < spareMm)) {
			spareMm = report.spareMm;
		}
	}
	return {
		status,
		partStatus,
		gaps,
		spareMm,
		overlaps,
		outsideFaces: FACES.filter((_f, i) => (outside & (1 << i)) !== 0),
		mount: report,
		placed
	};
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
	const fittings = placed.keepouts.filter((k) => k.keepoutKind === 'fitting');
	return placed.ports.map((p) => {
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
			if (base.obstacle[j] && overlapWith(box, base.flat, j) > 0) hit = base.boxes[j].label;
		}
		return { id: p.id, thread: p.thread, usable: hit === null, blockedBy: hit, box };
	});
}
