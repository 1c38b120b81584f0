/**
 * Enclosure → inner box, wall boxes, divider and bracket boxes, compartments. Inner coordinates:
 * origin at the inner front-bottom-left corner, X width, Y height, Z depth, millimetres.
 */

import {
	AXES,
	EPSILON_MM,
	PANELS,
	axisIndex,
	boxSize,
	compareText,
	type AxisIndex,
	type PanelName
} from './box';
import { SceneError } from './errors';
import { allowedIndex, defaultOffset } from './positions';
import { formatPath, openingAxes } from './schema';
import type { BracketDef, Box, DividerDef, EnclosureDef, Vec3 } from './schema';
import type { Compartment, WorldBox } from './types';

/** Panels as (axis, low or high side), in the order walls are listed (PANELS). */
export const FACE_AXES: Record<PanelName, { axis: AxisIndex; high: boolean }> = {
	left: { axis: 0, high: false },
	right: { axis: 0, high: true },
	bottom: { axis: 1, high: false },
	top: { axis: 1, high: true },
	front: { axis: 2, high: false },
	back: { axis: 2, high: true }
};
const PAIRS: [PanelName, PanelName][] = [
	['left', 'right'],
	['bottom', 'top'],
	['front', 'back']
];
/** A panel's name as the reports write it within a sentence: 'left panel'. */
export function panelText(panel: PanelName): string {
	return `${panel} panel`;
}
/** Each panel's name as the reports write it on its own: 'Left panel'. */
export const PANEL_LABELS = Object.fromEntries(
	PANELS.map((p) => [p, panelText(p).replace(/^./, (c) => c.toUpperCase())])
) as Readonly<Record<PanelName, string>>;

/** Inner size per axis: outer − both wall thicknesses + both wall offsets. */
export function innerSizeMm(enclosure: EnclosureDef): Vec3 {
	const w = enclosure.walls;
	return PAIRS.map(
		([lo, hi], i) =>
			enclosure.outerMm[i] - w[lo].thicknessMm - w[hi].thicknessMm + w[lo].offsetMm + w[hi].offsetMm
	) as Vec3;
}

export function innerBoxOf(enclosure: EnclosureDef): Box {
	return { min: [0, 0, 0], max: innerSizeMm(enclosure) };
}

/** 1 L = 10⁶ mm³ (SI). */
export function innerVolumeLitres(enclosure: EnclosureDef): number {
	const [x, y, z] = innerSizeMm(enclosure);
	return (x * y * z) / 1e6;
}

/**
 * One box per wall with thickness, just outside the inner box. The shell has no open edges and no
 * point in two walls: the side panels (X) take the edges and corners they meet, the bottom and top
 * (Y) reach over the front and back panels' thickness but stop at the side panels, and the front
 * and back (Z) cover only the inner width and height. So a part through a corner is counted once.
 */
export function wallBoxes(enclosure: EnclosureDef): WorldBox[] {
	const size = innerSizeMm(enclosure);
	const w = enclosure.walls;
	const lo: Vec3 = [-w.left.thicknessMm, -w.bottom.thicknessMm, -w.front.thicknessMm];
	const hi: Vec3 = [
		size[0] + w.right.thicknessMm,
		size[1] + w.top.thicknessMm,
		size[2] + w.back.thicknessMm
	];
	const out: WorldBox[] = [];
	for (const face of PANELS) {
		const spec = w[face];
		if (!(spec.thicknessMm > 0)) {
			continue;
		}
		const { axis, high } = FACE_AXES[face];
		const min: Vec3 = [...lo];
		const max: Vec3 = [...hi];
		for (let i = 0; i < axis; i++) {
			min[i] = 0;
			max[i] = size[i];
		}
		min[axis] = high ? size[axis] : -spec.thicknessMm;
		max[axis] = high ? size[axis] + spec.thicknessMm : 0;
		out.push({
			id: `wall:${face}`,
			kind: 'wall',
			label: PANEL_LABELS[face],
			box: { min, max },
			ownerId: `wall:${face}`,
			wallKind: spec.kind,
			face
		});
	}
	return out;
}

export function dividerBoxAt(enclosure: EnclosureDef, divider: DividerDef, offsetMm: number): Box {
	const size = innerSizeMm(enclosure);
	const min: Vec3 = [0, 0, 0];
	const max: Vec3 = [...size];
	for (let i = 0; i < 3; i++) {
		const span = divider.span?.[AXES[i]];
		if (span) {
			min[i] = span.minMm;
			max[i] = span.maxMm;
		}
	}
	const a = axisIndex(divider.axis);
	min[a] = offsetMm;
	max[a] = offsetMm + divider.thicknessMm;
	return { min, max };
}

export function bracketBoxAt(bracket: BracketDef, offsetMm: number): Box {
	const a = axisIndex(bracket.axis);
	const min: Vec3 = [...bracket.box.min];
	const max: Vec3 = [...bracket.box.max];
	min[a] += offsetMm;
	max[a] += offsetMm;
	return { min, max };
}

/** The divider's openings as boxes through its slab at that offset, in inner coordinates. */
export function dividerOpeningBoxes(
	enclosure: EnclosureDef,
	divider: DividerDef,
	offsetMm: number
): Box[] {
	const slab = dividerBoxAt(enclosure, divider, offsetMm);
	const [u, v] = openingAxes(divider.axis);
	return (divider.openings ?? []).map((o) => {
		const min: Vec3 = [...slab.min];
		const max: Vec3 = [...slab.max];
		min[u] = slab.min[u] + o.at[0];
		max[u] = min[u] + o.size[0];
		min[v] = slab.min[v] + o.at[1];
		max[v] = min[v] + o.size[1];
		return { min, max };
	});
}

/**
 * `box` minus `hole` as at most six disjoint boxes (slices below and above the hole on X, then on
 * Y, then on Z within the hole's X and Y extent). A hole that misses the box leaves it whole.
 */
export function subtractBox(box: Box, hole: Box): Box[] {
	for (let i = 0; i < 3; i++) {
		if (!(hole.min[i] < box.max[i] && box.min[i] < hole.max[i])) return [box];
	}
	const out: Box[] = [];
	const rest: Box = { min: [...box.min], max: [...box.max] };
	for (let i = 0; i < 3; i++) {
		if (hole.min[i] > rest.min[i]) {
			const max: Vec3 = [...rest.max];
			max[i] = hole.min[i];
			out.push({ min: [...rest.min], max });
			rest.min[i] = hole.min[i];
		}
		if (hole.max[i] < rest.max[i]) {
			const min: Vec3 = [...rest.min];
			min[i] = hole.max[i];
			out.push({ min, max: [...rest.max] });
			rest.max[i] = hole.max[i];
		}
	}
	return out;
}

/** The solid part of a divider at that offset: its slab minus every opening (disjoint boxes). */
export function dividerPiecesAt(
	enclosure: EnclosureDef,
	divider: DividerDef,
	offsetMm: number
): Box[] {
	let pieces = [dividerBoxAt(enclosure, divider, offsetMm)];
	for (const hole of dividerOpeningBoxes(enclosure, divider, offsetMm)) {
		pieces = pieces.flatMap((p) => subtractBox(p, hole));
	}
	return pieces;
}

/** The id of a divider's k-th solid piece: the first keeps `divider:<id>`, the next `divider:<id>#2`, … */
export function dividerPieceId(dividerId: string, k: number): string {
	return k === 0 ? `divider:${dividerId}` : `divider:${dividerId}#${k + 1}`;
}

/** One world box per solid piece (one, the whole slab, for a divider without openings). */
export function dividerWorldBoxes(
	enclosure: EnclosureDef,
	divider: DividerDef,
	offsetMm: number
): WorldBox[] {
	return dividerPiecesAt(enclosure, divider, offsetMm).map((box, k) => ({
		id: dividerPieceId(divider.id, k),
		kind: 'divider',
		label: divider.label,
		box,
		ownerId: divider.id
	}));
}

/** The whole slab as one box, openings ignored (compartments and room read it this way). */
export function dividerWorldBox(
	enclosure: EnclosureDef,
	divider: DividerDef,
	offsetMm: number
): WorldBox {
	return {
		id: `divider:${divider.id}`,
		kind: 'divider',
		label: divider.label,
		box: dividerBoxAt(enclosure, divider, offsetMm),
		ownerId: divider.id
	};
}

export function bracketWorldBox(bracket: BracketDef, offsetMm: number): WorldBox {
	return {
		id: `bracket:${bracket.id}`,
		kind: 'bracket',
		label: bracket.label,
		box: bracketBoxAt(bracket, offsetMm),
		ownerId: bracket.id
	};
}

/**
 * The offset a control takes in a scene: the one given, or its first allowed position. A given
 * offset that is not allowed throws; it is never moved to the nearest allowed one.
 */
export function controlOffset(
	def: DividerDef | BracketDef,
	given: Record<string, number>,
	key: 'dividerPositions' | 'bracketOffsets'
): number {
	const offset = given[def.id];
	if (offset === undefined) {
		return defaultOffset(def);
	}
	if (!Number.isFinite(offset) || allowedIndex(def, offset) < 0) {
		throw new SceneError(formatPath([key, def.id]), `${offset} mm is not an allowed position`);
	}
	return offset;
}

const SIDE_WORDS: Record<'x' | 'y' | 'z', [string, string]> = {
	x: ['left of', 'right of'],
	y: ['below', 'above'],
	z: ['in front of', 'behind']
};

function sideLabel(divider: DividerDef, high: boolean): string {
	const named = divider.sides?.[high ? 'high' : 'low'];
	if (named !== undefined) {
		return named;
	}
	return `${SIDE_WORDS[divider.axis][high ? 1 : 0]} ${divider.label}`;
}

interface Cell {
	box: Box;
	sides: { def: DividerDef; high: boolean }[];
}

/** True when the slab cuts the cell in two: strictly inside on its axis, covering it on the others. */
function cuts(slab: Box, axis: AxisIndex, cell: Box): boolean {
	if (
		slab.min[axis] <= cell.min[axis] + EPSILON_MM ||
		slab.max[axis] >= cell.max[axis] - EPSILON_MM
	) {
		return false;
	}
	for (let i = 0; i < 3; i++) {
		if (
			i !== axis &&
			(slab.min[i] > cell.min[i] + EPSILON_MM || slab.max[i] < cell.max[i] - EPSILON_MM)
		) {
			return false;
		}
	}
	return true;
}

/** Side names of the bounding dividers, by divider id; an empty side name is left out. */
function cellLabel(cell: Cell): string {
	const words = [...cell.sides]
		.sort((a, b) => compareText(a.def.id, b.def.id))
		.map((s) => sideLabel(s.def, s.high))
		.filter((label) => label.length > 0);
	return words.length === 0 ? 'Inside' : words.join(', ');
}

function cellId(cell: Cell): string {
	if (cell.sides.length === 0) {
		return 'inside';
	}
	return cell.sides
		.map((s) => `${s.def.id}.${s.high ? 'high' : 'low'}`)
		.sort()
		.join('+');
}

/** A divider at its chosen position, as compartments need it. */
export interface Slab {
	def: DividerDef;
	axis: AxisIndex;
	box: Box;
}

export function slabsFor(
	enclosure: EnclosureDef,
	dividerPositions: Record<string, number>
): Slab[] {
	return enclosure.dividers.map((d) => ({
		def: d,
		axis: axisIndex(d.axis),
		box: dividerBoxAt(enclosure, d, controlOffset(d, dividerPositions, 'dividerPositions'))
	}));
}

/**
 * The cells the dividers cut. A divider splits every cell it crosses from side to side; one that
 * spans only part of a cell (a short shelf) leaves it whole. Repeats until nothing splits, so the
 * order of the dividers does not matter.
 */
export function compartmentsFor(
	enclosure: EnclosureDef,
	dividerPositions: Record<string, number>
): Compartment[] {
	return cutCompartments(innerBoxOf(enclosure), slabsFor(enclosure, dividerPositions));
}

/**
 * compartmentsFor on slabs already placed. A sweep passes one `labels` map for all its steps: a
 * compartment's label follows from its id, so it is built once.
 */
export function cutCompartments(
	inner: Box,
	slabs: readonly Slab[],
	labels = new Map<string, string>()
): Compartment[] {
	let cells: Cell[] = [{ box: inner, sides: [] }];
	let split = true;
	while (split) {
		split = false;
		const next: Cell[] = [];
		for (const cell of cells) {
			const slab = slabs.find((s) => cuts(s.box, s.axis, cell.box));
			if (!slab) {
				next.push(cell);
				continue;
			}
			split = true;
			const lowBox: Box = { min: [...cell.box.min], max: [...cell.box.max] };
			const highBox: Box = { min: [...cell.box.min], max: [...cell.box.max] };
			lowBox.max[slab.axis] = slab.box.min[slab.axis];
			highBox.min[slab.axis] = slab.box.max[slab.axis];
			next.push(
				{ box: lowBox, sides: [...cell.sides, { def: slab.def, high: false }] },
				{ box: highBox, sides: [...cell.sides, { def: slab.def, high: true }] }
			);
		}
		cells = next;
	}
	return cells
		.map((cell) => {
			const id = cellId(cell);
			let label = labels.get(id);
			if (label === undefined) {
				label = cellLabel(cell);
				labels.set(id, label);
			}
			return { id, label, box: cell.box, sizeMm: boxSize(cell.box) };
		})
		.sort((a, b) => compareText(a.id, b.id));
}
