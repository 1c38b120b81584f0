/**
 * Packed boxes: the engine's hot loops keep boxes in one Float64Array, six numbers a box (mm):
 * the min corner x, y, z, then the max corner x, y, z. No object per box, and one box's numbers
 * sit side by side in memory. These names say where a number is instead of a bare `i * 6 + 3`.
 */

import type { Box } from './schema';

/** Numbers one box takes in a packed array. */
export const BOX_STRIDE = 6;
/** Where the max corner starts among a box's six numbers (the min corner starts at 0). */
export const MAX = 3;

/** Boxes packed BOX_STRIDE numbers each: box k's min x is at k × BOX_STRIDE, its max x at + MAX. */
export type PackedBoxes = Float64Array;

/** One box in a packed array: the array, and the box's slot in it. */
export interface PackedBox {
	coords: PackedBoxes;
	slot: number;
}

/**
 * A box of a fit model (`index` into its boxes) and where its numbers are for this step: the
 * model's own array for a box that does not move, a sweep's array of moved dividers for one that does.
 */
export interface BoxRef extends PackedBox {
	index: number;
}

/** Writes `box` into slot `slot` of `coords`. */
export function writePacked(coords: PackedBoxes, slot: number, box: Box): void {
	const at = slot * BOX_STRIDE;
	coords[at] = box.min[0];
	coords[at + 1] = box.min[1];
	coords[at + 2] = box.min[2];
	coords[at + MAX] = box.max[0];
	coords[at + MAX + 1] = box.max[1];
	coords[at + MAX + 2] = box.max[2];
}

/** The boxes packed in order. */
export function packBoxes(boxes: readonly Box[]): PackedBoxes {
	const coords = new Float64Array(boxes.length * BOX_STRIDE);
	for (let k = 0; k < boxes.length; k++) writePacked(coords, k, boxes[k]);
	return coords;
}
