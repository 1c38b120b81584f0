/**
 * Free space: the maximal empty axis-aligned boxes of a container among obstacles. Millimetres,
 * inner coordinates. A box is maximal when none of its six faces can move outward without
 * entering an obstacle or leaving the container.
 *
 * Method (the "maximal spaces" split used in 3D packing): start with the container as the only
 * free box; each obstacle splits every free box it overlaps into the up to six slabs of that box
 * on either side of the obstacle along each axis, and slabs held inside another free box are
 * dropped. Every empty box disjoint from an obstacle lies wholly on one side of it along some
 * axis, so it stays inside one of the slabs: after the last obstacle the free boxes are exactly
 * the maximal empty boxes.
 */

import {
	EPSILON_MM,
	FACES,
	boxSize,
	boxVolume,
	compareText,
	panelOf,
	type Face,
	type PanelName
} from './box';
import { FACE_AXES, PANEL_LABELS } from './enclosure';
import type { Box, MountDef, Vec3 } from './schema';
import type { ResolvedScene } from './types';

export interface LabelledBox {
	box: Box;
	label: string;
	id?: string;
}

export interface FreeBox {
	box: Box;
	sizeMm: Vec3;
	volumeMm3: number;
	/** What each face of the box rests against: an obstacle's label, or the container face's. */
	boundedBy: Record<Face, string>;
}

/** Longest list of free boxes one search keeps; past it the search stops splitting and says so. */
export const MAX_FREE_BOXES = 20_000;

function overlaps(a: Box, b: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (Math.min(a.max[i], b.max[i]) - Math.max(a.min[i], b.min[i]) <= EPSILON_MM) return false;
	}
	return true;
}

function contains(outer: Box, inner: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (inner.min[i] < outer.min[i] - EPSILON_MM || inner.max[i] > outer.max[i] + EPSILON_MM) {
			return false;
		}
	}
	return true;
}

/**
 * The maximal empty boxes of `container` among `obstacles` (which may reach outside it). Boxes
 * thinner than `minSizeMm` on any axis are left out (they never grow back: later splits only cut).
 */
export function maximalEmptyBoxes(
	container: Box,
	obstacles: readonly Box[],
	minSizeMm = EPSILON_MM
): { boxes: Box[]; complete: boolean } {
	let spaces: Box[] = [{ min: [...container.min], max: [...container.max] }];
	let complete = true;
	const near = obstacles.filter((o) => overlaps(o, container));
	for (const o of near) {
		const kept: Box[] = [];
		const pieces: Box[] = [];
		for (const s of spaces) {
			if (!overlaps(s, o)) {
				kept.push(s);
				continue;
			}
			for (let a = 0; a < 3; a++) {
				if (o.min[a] - s.min[a] >= minSizeMm) {
					const p: Box = { min: [...s.min], max: [...s.max] };
					p.max[a] = o.min[a];
					pieces.push(p);
				}
				if (s.max[a] - o.max[a] >= minSizeMm) {
					const p: Box = { min: [...s.min], max: [...s.max] };
					p.min[a] = o.max[a];
					pieces.push(p);
				}
			}
		}
		// Untouched boxes stay maximal (a piece is inside an old box, and old boxes were maximal);
		// a piece survives only when no other box holds it.
		const fresh: Box[] = [];
		for (let i = 0; i < pieces.length; i++) {
			const p = pieces[i];
			let held = false;
			for (let j = 0; j < pieces.length && !held; j++) {
				if (j === i || !contains(pieces[j], p)) continue;
				// Two equal pieces: keep the first.
				held = !contains(p, pieces[j]) || j < i;
			}
			for (let j = 0; j < kept.length && !held; j++) held = contains(kept[j], p);
			if (!held) fresh.push(p);
		}
		spaces = kept.concat(fresh);
		if (spaces.length > MAX_FREE_BOXES) {
			spaces = spaces.sort((x, y) => boxVolume(y) - boxVolume(x)).slice(0, MAX_FREE_BOXES);
			complete = false;
		}
	}
	return { boxes: spaces, complete };
}

const FACE_AXIS: Record<Face, [number, boolean]> = {
	'-x': [0, false],
	'+x': [0, true],
	'-y': [1, false],
	'+y': [1, true],
	'-z': [2, false],
	'+z': [2, true]
};

/** The label of what a face of `box` rests against: the first obstacle touching it over some area, else the container's face. */
export function faceBound(
	box: Box,
	face: Face,
	obstacles: readonly LabelledBox[],
	containerLabels: Record<Face, string>
): string {
	const [a, high] = FACE_AXIS[face];
	const at = high ? box.max[a] : box.min[a];
	let best: LabelledBox | null = null;
	for (const o of obstacles) {
		const touching = high
			? Math.abs(o.box.min[a] - at) <= EPSILON_MM
			: Math.abs(o.box.max[a] - at) <= EPSILON_MM;
		if (!touching) continue;
		let shares = true;
		for (let i = 0; i < 3 && shares; i++) {
			if (
				i !== a &&
				Math.min(box.max[i], o.box.max[i]) - Math.max(box.min[i], o.box.min[i]) <= EPSILON_MM
			) {
				shares = false;
			}
		}
		if (shares && (!best || compareText(o.id ?? o.label, best.id ?? best.label) < 0)) best = o;
	}
	return best ? best.label : containerLabels[face];
}

export function describeFreeBox(
	box: Box,
	obstacles: readonly LabelledBox[],
	containerLabels: Record<Face, string>
): FreeBox {
	const boundedBy = {} as Record<Face, string>;
	for (const f of FACES) boundedBy[f] = faceBound(box, f, obstacles, containerLabels);
	return { box, sizeMm: boxSize(box), volumeMm3: boxVolume(box), boundedBy };
}

/** Free boxes biggest first; ties by position, so the order never depends on the obstacles' order. */
export function byVolume(a: Box, b: Box): number {
	const d = boxVolume(b) - boxVolume(a);
	if (Math.abs(d) > EPSILON_MM) return d;
	for (let i = 0; i < 3; i++) {
		if (Math.abs(a.min[i] - b.min[i]) > EPSILON_MM) return a.min[i] - b.min[i];
	}
	return 0;
}

export function sameLabels(label: string): Record<Face, string> {
	return { '-x': label, '+x': label, '-y': label, '+y': label, '-z': label, '+z': label };
}

// — free space in a resolved scene —

/** Everything a new part must keep out of: dividers, brackets, placed bodies and their keep-outs. */
export function sceneObstacles(resolved: ResolvedScene, ignorePlacementId?: string): LabelledBox[] {
	const out: LabelledBox[] = [];
	for (const b of [...resolved.dividers, ...resolved.brackets]) {
		out.push({ box: b.box, label: b.label, id: b.id });
	}
	for (const rp of resolved.placements) {
		if (rp.placement.id === ignorePlacementId) continue;
		for (const b of [...rp.bodies, ...rp.keepouts]) {
			out.push({ box: b.box, label: b.label, id: b.id });
		}
	}
	return out;
}

/** The panel that face `f` of `box` lies on (the inner box's face `f`), or null. */
export function panelUnder(box: Box, inner: Box, f: Face): PanelName | null {
	const [a, high] = FACE_AXIS[f];
	const onPanel = high
		? Math.abs(box.max[a] - inner.max[a]) <= EPSILON_MM
		: Math.abs(box.min[a] - inner.min[a]) <= EPSILON_MM;
	return onPanel ? panelOf(f) : null;
}

/** Labels for a container's faces: the panel where it lies on the inner box, else `other`. */
export function containerLabels(container: Box, inner: Box, other: string): Record<Face, string> {
	const out = {} as Record<Face, string>;
	for (const f of FACES) {
		const panel = panelUnder(container, inner, f);
		out[f] = panel ? PANEL_LABELS[panel] : other;
	}
	return out;
}

export interface FreeSpaceResult {
	boxes: FreeBox[];
	/** False when the search hit MAX_FREE_BOXES and kept only the biggest. */
	complete: boolean;
}

function search(
	resolved: ResolvedScene,
	container: Box,
	otherLabel: string,
	keep: (b: Box) => boolean,
	limit: number,
	ignorePlacementId?: string
): FreeSpaceResult {
	const obstacles = sceneObstacles(resolved, ignorePlacementId);
	const { boxes, complete } = maximalEmptyBoxes(
		container,
		obstacles.map((o) => o.box),
		1
	);
	const labels = containerLabels(container, resolved.innerBox, otherLabel);
	return {
		boxes: boxes
			.filter(keep)
			.sort(byVolume)
			.slice(0, limit)
			.map((b) => describeFreeBox(b, obstacles, labels)),
		complete
	};
}

/** The largest empty boxes of a compartment (or any box inside the enclosure), biggest first. */
export function freeSpaceIn(resolved: ResolvedScene, container: Box, limit = 8): FreeSpaceResult {
	return search(resolved, container, 'the compartment edge', () => true, limit);
}

/**
 * The largest empty boxes holding a point: searched in the compartment around it (the whole
 * inside when it lies in none, on a divider say), biggest first. None when the point is inside
 * an obstacle.
 */
export function freeSpaceAround(resolved: ResolvedScene, point: Vec3, limit = 8): FreeSpaceResult {
	const holds = (b: Box) =>
		b.min.every((v, i) => v - EPSILON_MM <= point[i] && point[i] <= b.max[i] + EPSILON_MM);
	const room = resolved.compartments.find((c) => holds(c.box))?.box ?? resolved.innerBox;
	return search(resolved, room, 'the compartment edge', holds, limit);
}

/** The largest empty boxes in front of a mount: inside its region, touching its panel. */
export function freeSpaceAtMount(
	resolved: ResolvedScene,
	mount: MountDef,
	limit = 8
): FreeSpaceResult {
	const { axis, high } = FACE_AXES[mount.face];
	const inner = resolved.innerBox;
	const region: Box = { min: [...mount.region.min], max: [...mount.region.max] };
	for (let i = 0; i < 3; i++) {
		region.min[i] = Math.max(region.min[i], inner.min[i]);
		region.max[i] = Math.min(region.max[i], inner.max[i]);
	}
	const panel = high ? inner.max[axis] : inner.min[axis];
	const touches = (b: Box) => Math.abs((high ? b.max[axis] : b.min[axis]) - panel) <= EPSILON_MM;
	return search(resolved, region, `the edge of ${mount.label}`, touches, limit);
}
