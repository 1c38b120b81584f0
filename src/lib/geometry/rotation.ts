/**
 * Quarter turns. A part turns only in 90° steps, right-handed, about X first, then Y, then Z, so
 * every rotation is a signed permutation of the axes: exact in floating point (only negation) and
 * every box stays axis-aligned.
 */

import type { Box, Rotation, Vec3 } from './schema';

/** out[i] = sign[i] · in[from[i]]. */
export interface AxisMap {
	from: [number, number, number];
	sign: [number, number, number];
}

const IDENTITY: AxisMap = { from: [0, 1, 2], sign: [1, 1, 1] };

/** One quarter turn about each axis, as the same signed permutation. */
const STEP: Record<'x' | 'y' | 'z', AxisMap> = {
	/** (x, y, z) → (x, −z, y) */
	x: { from: [0, 2, 1], sign: [1, -1, 1] },
	/** (x, y, z) → (z, y, −x) */
	y: { from: [2, 1, 0], sign: [1, 1, -1] },
	/** (x, y, z) → (−y, x, z) */
	z: { from: [1, 0, 2], sign: [-1, 1, 1] }
};

function then(first: AxisMap, next: AxisMap): AxisMap {
	const from: [number, number, number] = [0, 0, 0];
	const sign: [number, number, number] = [1, 1, 1];
	for (let i = 0; i < 3; i++) {
		from[i] = first.from[next.from[i]];
		sign[i] = next.sign[i] * first.sign[next.from[i]];
	}
	return { from, sign };
}

export function rotationMap(rotation: Rotation): AxisMap {
	let map = IDENTITY;
	for (const axis of ['x', 'y', 'z'] as const) {
		const turns = ((rotation[axis] % 4) + 4) % 4;
		for (let t = 0; t < turns; t++) {
			map = then(map, STEP[axis]);
		}
	}
	return map;
}

export function rotatePoint(map: AxisMap, p: Vec3): Vec3 {
	return [map.sign[0] * p[map.from[0]], map.sign[1] * p[map.from[1]], map.sign[2] * p[map.from[2]]];
}

export function rotateBox(map: AxisMap, box: Box): Box {
	const a = rotatePoint(map, box.min);
	const b = rotatePoint(map, box.max);
	return {
		min: [Math.min(a[0], b[0]), Math.min(a[1], b[1]), Math.min(a[2], b[2])],
		max: [Math.max(a[0], b[0]), Math.max(a[1], b[1]), Math.max(a[2], b[2])]
	};
}

export type Direction = '+x' | '-x' | '+y' | '-y' | '+z' | '-z';

export function rotateDirection(map: AxisMap, direction: Direction): Direction {
	const v: Vec3 = [0, 0, 0];
	v['xyz'.indexOf(direction[1])] = direction[0] === '+' ? 1 : -1;
	const r = rotatePoint(map, v);
	const axis = r.findIndex((c) => c !== 0);
	return `${r[axis] > 0 ? '+' : '-'}${'xyz'[axis]}` as Direction;
}
