/** Quarter turns against three.js rotation matrices and Box3.applyMatrix4. */
import fc from 'fast-check';
import { Matrix4, Vector3 } from 'three';
import { fromBox3, toBox3 } from '../server/testing/engine-box3';
import { describe, expect, it } from 'vitest';
import { boxArb, gridMm } from '../server/testing/engine-factories';
import { rotateBox, rotateDirection, rotatePoint, rotationMap } from './rotation';
import type { Rotation, Vec3 } from './schema';

/** X first, then Y, then Z: M = Rz · Ry · Rx. */
function threeMatrix(r: Rotation): Matrix4 {
	const q = Math.PI / 2;
	return new Matrix4()
		.makeRotationZ(r.z * q)
		.multiply(new Matrix4().makeRotationY(r.y * q))
		.multiply(new Matrix4().makeRotationX(r.x * q));
}

const round = (v: number) => Math.round(v * 1e6) / 1e6 + 0;
const rotationArb = fc.record({
	x: fc.integer({ min: 0, max: 3 }),
	y: fc.integer({ min: 0, max: 3 }),
	z: fc.integer({ min: 0, max: 3 })
});
const pointArb = fc.tuple(gridMm(-200, 200), gridMm(-200, 200), gridMm(-200, 200));

describe('quarter turns', () => {
	it('match three.js rotation matrices applied X, then Y, then Z', () => {
		fc.assert(
			fc.property(rotationArb, pointArb, (r, p) => {
				const v = new Vector3(...p).applyMatrix4(threeMatrix(r));
				expect(rotatePoint(rotationMap(r), p).map((c) => c + 0)).toEqual(
					[v.x, v.y, v.z].map(round)
				);
			}),
			{ numRuns: 1000 }
		);
	});

	it('turn boxes as Box3.applyMatrix4 does', () => {
		fc.assert(
			fc.property(rotationArb, boxArb(-100, 100, 80), (r, box) => {
				const expected = fromBox3(toBox3(box).applyMatrix4(threeMatrix(r)));
				const got = rotateBox(rotationMap(r), box);
				expect([...got.min, ...got.max].map((c) => c + 0)).toEqual(
					[...expected.min, ...expected.max].map(round)
				);
			}),
			{ numRuns: 1000 }
		);
	});

	it.each(['x', 'y', 'z'] as const)('four quarter turns about %s are the identity', (axis) => {
		const one = rotationMap({ x: 0, y: 0, z: 0, [axis]: 1 });
		fc.assert(
			fc.property(boxArb(-100, 100, 80), (box) => {
				let turned = box;
				for (let k = 0; k < 4; k++) turned = rotateBox(one, turned);
				expect(turned.min.map((c) => c + 0)).toEqual(box.min);
				expect(turned.max.map((c) => c + 0)).toEqual(box.max);
			}),
			{ numRuns: 1000 }
		);
	});

	it.each([
		[{ x: 1, y: 0, z: 0 }, [1, 2, 3], [1, -3, 2]],
		[{ x: 0, y: 1, z: 0 }, [1, 2, 3], [3, 2, -1]],
		[{ x: 0, y: 0, z: 1 }, [1, 2, 3], [-2, 1, 3]],
		[{ x: 2, y: 0, z: 0 }, [1, 2, 3], [1, -2, -3]],
		[{ x: 1, y: 0, z: 1 }, [1, 2, 3], [3, 1, 2]]
	] as [Rotation, Vec3, Vec3][])('%o turns %o to %o', (r, p, q) => {
		expect(rotatePoint(rotationMap(r), p).map((c) => c + 0)).toEqual(q);
	});

	it.each([
		[{ x: 0, y: 0, z: 3 }, '+y', '+x'],
		[{ x: 1, y: 0, z: 0 }, '+y', '+z'],
		[{ x: 0, y: 1, z: 0 }, '+x', '-z']
	] as const)('%o turns direction %s to %s', (r, from, to) => {
		expect(rotateDirection(rotationMap(r), from)).toBe(to);
	});
});
