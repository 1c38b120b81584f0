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
import { FACE_AXES } from './enclosure';
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
	for (let k = 0; 3 * k + 1 < active.length; k++) active[3 * k + 1] = 1;
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
	ignorePlacementId?: string
): ProbeBase {
	const placements = resolved.placements.filter((rp) => rp.placement.id !== ignorePlacementId);
	const without: ResolvedScene =
		ignorePlacementId === undefined ? resolved : { ...resolved, placements };
	const inner = resolved.innerBox;
	const mountList = scene.enclosure.mounts;
	const boxes: WorldBox[] = [...resolved.walls, ...resolved.dividers, ...resolved.brackets];
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
		active: new Uint8Array(3 * mountList.length + 1),
		mounts,
		mountIndex: new Map(mountList.map((m, k) => [m.id, k])),
		stacked,
		grid: buildGrid(boxes, inner)
	};
}

/** Probes one placement of `part` (its id must not be another placement's). */
export function probe(base: ProbeBase, part: PartDef, placement: Placement): ProbeResult {
	return probePlaced(base, placePart(part, placement));
}

/** `probe` for a placement already resolved (the same one tried at many positions of a control). */
export function probePlaced(base: ProbeBase, placed: ResolvedPlacement): ProbeResult {
	const placement = placed.placement;
	const { flat, boxes, obstacle, model, tally, group, active } = base;
	const stacked = activatePlates(base, placed);
	const margin = base.scene.marginMm;
	const mount = placement.mountId === undefined ? undefined : base.mounts.get(placement.mountId);
	const here = (j: number) => active[group[j]] === 1;
	// Placement 0 of the model is the candidate.
	const { axis: mountAxis, high: mountHigh } = mount
		? FACE_AXES[mount.face]
		: { axis: -1, high: false };
	model.mountFace[0] = mount ? 2 * mountAxis + (mountHigh ? 1 : 0) : -1;
	model.mountOf[0] = mount?.id;
	model.toleranceMm[0] = placed.part.toleranceMm;
	model.outsideFaces[0] = facesOutside(base.resolved.innerBox, placed.bodies);
	tally.collides[0] = 0;
	tally.blocked[0] = 0;
	tally.gap.fill(Infinity);
	tally.against.fill(-1);
	const overlaps: ProbeResult['overlaps'] = [];
	const g = base.grid;
	for (const own of [...placed.bodies, ...placed.keepouts]) {
		const { lo, hi } = cellRange(g, own.box, 0);
		visitCells(
			g,
			lo,
			hi,
			(j) => {
				if (!here(j) || overlapWith(own.box, flat, j) <= 0) return;
				const kind = pairKind(own, boxes[j]);
				if (!kind) return;
				if (kind === 'collides') tally.collides[0] = 1;
				else if (kind === 'blocked') tally.blocked[0] = 1;
				overlaps.push({ with: boxes[j].id, label: boxes[j].label, kind });
			},
			true
		);
	}
	overlaps.sort((x, y) => compareText(x.with, y.with));
	// Nearest obstacle ahead of each face, over all bodies, by the report's own gap rule.
	const bodyFlat = new Float64Array(placed.bodies.length * 6);
	placed.bodies.forEach((body, k) => {
		bodyFlat.set(body.box.min, k * 6);
		bodyFlat.set(body.box.max, k * 6 + 3);
	});
	placed.bodies.forEach((body, k) => {
		const b = body.box;
		const test = (j: number) => {
			if (obstacle[j] && here(j)) addGap(model, tally, 0, bodyFlat, k, flat, j, j);
		};
		// The cells the body covers, then layer by layer outward along each axis while a layer could
		// still hold something nearer than the nearest found on that side.
		const { lo, hi } = cellRange(g, b, EPSILON_MM);
		visitCells(g, lo, hi, test, true);
		for (let a = 0; a < 3; a++) {
			for (const dir of [1, -1]) {
				const slot = dir > 0 ? 2 * a + 1 : 2 * a;
				for (let c = dir > 0 ? hi[a] + 1 : lo[a] - 1; c >= 0 && c < g.dims[a]; c += dir) {
					const near =
						dir > 0
							? g.origin[a] + c * g.cell - b.max[a]
							: b.min[a] - (g.origin[a] + (c + 1) * g.cell);
					if (near > tally.gap[slot] + EPSILON_MM) break;
					const l = [...lo];
					const h = [...hi];
					l[a] = c;
					h[a] = c;
					visitCells(g, l, h, test, false);
				}
			}
		}
	});
	let report: MountReport | null = null;
	model.mountRank[0] = STATUS_ORDER.indexOf('clear');
	if (mount) {
		report = mountReport(mount, base.scene, {
			...base.without,
			placements: [...stacked, placed]
		});
		model.mountRank[0] = mountRankOf(problemsMarking(report, placement.id));
	}
	const partStatus = geometricStatus(model, tally, 0, margin);
	const status = placementStatus(model, tally, 0, margin);
	const gaps = {} as ProbeResult['gaps'];
	let spareMm: number | null = null;
	FACES.forEach((face, f) => {
		const j = tally.against[f];
		const gap = tally.gap[f];
		const held = isHeldContact(model, 0, f, gap, j);
		gaps[face] =
			j < 0
				? { gapMm: null, against: null, held: false }
				: { gapMm: gap, against: boxes[j].label, held };
		if (j >= 0 && !held && (spareMm === null || gap < spareMm)) spareMm = gap;
	});
	if (report && report.spareMm !== null && (spareMm === null || report.spareMm < spareMm)) {
		spareMm = report.spareMm;
	}
	return {
		status,
		partStatus,
		gaps,
		spareMm,
		overlaps,
		outsideFaces: model.outsideFaces[0],
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
	activatePlates(base, placed);
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
			if (!base.active[base.group[j]] || !base.obstacle[j]) continue;
			if (overlapWith(box, base.flat, j) > 0) hit = base.boxes[j].label;
		}
		return { id: p.id, thread: p.thread, usable: hit === null, blockedBy: hit, box };
	});
}
