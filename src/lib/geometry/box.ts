/**
 * Axis-aligned box arithmetic. Millimetres, right-handed, Y up: X = width (left → right seen from
 * the front), Y = height, Z = depth (front → back).
 */

import type { Box, Vec3 } from './schema';

/**
 * One tolerance for every comparison in the engine, in millimetres.
 *
 * Two boxes overlap only when they share more than EPSILON_MM on every axis, so faces that touch
 * (a board flush on its tray, a card resting on its support bar) are contact, not collision, even
 * after the last-bit rounding that sums like `12.7 + 20.32 * 3` leave behind. 1e-6 mm (a nanometre)
 * is far below any measurement a builder can make (calipers read 0.01 mm) and far above the
 * rounding error of doubles at the ±10,000 mm the schema allows (about 2e-12 mm), so it never hides
 * a real interference and never reports a false one.
 */
export const EPSILON_MM = 1e-6;

export const AXES = ['x', 'y', 'z'] as const;
export type Axis = (typeof AXES)[number];
export type AxisIndex = 0 | 1 | 2;

/**
 * The six faces of a box, in slot order (a gap array's slot is 2 × axis, + 1 on the high side):
 * the one list of faces; `Face` and the scene format's `faceSchema` are made from it.
 */
export const FACES = ['-x', '+x', '-y', '+y', '-z', '+z'] as const;
export type Face = (typeof FACES)[number];
/** The outward unit vector of each face, in FACES order. */
export const FACE_UNIT: Readonly<Record<Face, Vec3>> = {
	'-x': [-1, 0, 0],
	'+x': [1, 0, 0],
	'-y': [0, -1, 0],
	'+y': [0, 1, 0],
	'-z': [0, 0, -1],
	'+z': [0, 0, 1]
};
/** The enclosure's panel on each face, in the same order: PANELS[k] is the wall on FACES[k]. */
export const PANELS = ['left', 'right', 'bottom', 'top', 'front', 'back'] as const;
export type PanelName = (typeof PANELS)[number];

/** The enclosure panel on a face: '-x' → 'left', '+z' → 'back'. */
export function panelOf(face: Face): PanelName {
	return PANELS[FACES.indexOf(face)];
}

export function axisIndex(axis: Axis): AxisIndex {
	return axis === 'x' ? 0 : axis === 'y' ? 1 : 2;
}

export function faceOf(axis: AxisIndex, sign: 1 | -1): Face {
	return `${sign > 0 ? '+' : '-'}${AXES[axis]}` as Face;
}

export function boxSize(box: Box): Vec3 {
	return [box.max[0] - box.min[0], box.max[1] - box.min[1], box.max[2] - box.min[2]];
}

export function boxVolume(box: Box): number {
	const [x, y, z] = boxSize(box);
	return x * y * z;
}

/** Shared extent of two boxes on one axis; ≤ 0 when they are apart or only touch. */
export function axisOverlap(a: Box, b: Box, axis: AxisIndex): number {
	return Math.min(a.max[axis], b.max[axis]) - Math.max(a.min[axis], b.min[axis]);
}

/** True when the boxes share a positive volume (more than EPSILON_MM on every axis). */
export function boxesOverlap(a: Box, b: Box): boolean {
	return (
		axisOverlap(a, b, 0) > EPSILON_MM &&
		axisOverlap(a, b, 1) > EPSILON_MM &&
		axisOverlap(a, b, 2) > EPSILON_MM
	);
}

/** The shared box of two overlapping boxes, or null when they only touch or are apart. */
export function intersectBoxes(a: Box, b: Box): Box | null {
	if (!boxesOverlap(a, b)) {
		return null;
	}
	return {
		min: [Math.max(a.min[0], b.min[0]), Math.max(a.min[1], b.min[1]), Math.max(a.min[2], b.min[2])],
		max: [Math.min(a.max[0], b.max[0]), Math.min(a.max[1], b.max[1]), Math.min(a.max[2], b.max[2])]
	};
}

/** True when `inner` lies within `outer`, allowing EPSILON_MM of rounding on every face. */
export function boxContains(outer: Box, inner: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (inner.min[i] < outer.min[i] - EPSILON_MM || inner.max[i] > outer.max[i] + EPSILON_MM) {
			return false;
		}
	}
	return true;
}

export function translateBox(box: Box, by: Vec3): Box {
	return {
		min: [box.min[0] + by[0], box.min[1] + by[1], box.min[2] + by[2]],
		max: [box.max[0] + by[0], box.max[1] + by[1], box.max[2] + by[2]]
	};
}

/** Smallest box holding all of `boxes`; the list must not be empty. */
export function boundsOf(boxes: readonly Box[]): Box {
	const min: Vec3 = [Infinity, Infinity, Infinity];
	const max: Vec3 = [-Infinity, -Infinity, -Infinity];
	for (const box of boxes) {
		for (let i = 0; i < 3; i++) {
			min[i] = Math.min(min[i], box.min[i]);
			max[i] = Math.max(max[i], box.max[i]);
		}
	}
	return { min, max };
}

/** Code-unit order, the same in every locale and runtime: the engine's sort for ids. */
export function compareText(a: string, b: string): number {
	return a < b ? -1 : a > b ? 1 : 0;
}
