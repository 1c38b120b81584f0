/** Box arithmetic against three.js Box3 as an independent oracle, plus the touching-face edge cases. */
import fc from 'fast-check';
import { Vector3 } from 'three';
import { fromBox3, toBox3 } from '../server/testing/engine-box3';
import { describe, expect, it } from 'vitest';
import {
	EPSILON_MM,
	boxContains,
	boxesOverlap,
	boxVolume,
	intersectBoxes,
	translateBox
} from './box';
import { boxArb, gridMm } from '../server/testing/engine-factories';
import type { Box, Vec3 } from './schema';

const b = (min: Vec3, max: Vec3): Box => ({ min, max });

describe('overlap edge cases', () => {
	it.each([
		['faces touch on x', b([0, 0, 0], [10, 10, 10]), b([10, 0, 0], [20, 10, 10]), false, 0],
		['faces touch on y', b([0, 0, 0], [10, 10, 10]), b([0, 10, 0], [10, 20, 10]), false, 0],
		['edges touch', b([0, 0, 0], [10, 10, 10]), b([10, 10, 0], [20, 20, 10]), false, 0],
		['corners touch', b([0, 0, 0], [10, 10, 10]), b([10, 10, 10], [20, 20, 20]), false, 0],
		[
			'touch after rounding (0.1 + 0.2)',
			b([0, 0, 0], [0.1 + 0.2, 1, 1]),
			b([0.3, 0, 0], [1, 1, 1]),
			false,
			0
		],
		['apart', b([0, 0, 0], [10, 10, 10]), b([10.5, 0, 0], [20, 10, 10]), false, 0],
		['overlap by 1 mm', b([0, 0, 0], [10, 10, 10]), b([9, 0, 0], [20, 10, 10]), true, 100],
		['nested', b([0, 0, 0], [10, 10, 10]), b([2, 2, 2], [4, 4, 4]), true, 8],
		['identical', b([0, 0, 0], [10, 10, 10]), b([0, 0, 0], [10, 10, 10]), true, 1000],
		[
			'overlap below epsilon',
			b([0, 0, 0], [10, 10, 10]),
			b([10 - EPSILON_MM / 2, 0, 0], [20, 10, 10]),
			false,
			0
		]
	])('%s', (_name, a, c, overlaps, volume) => {
		expect(boxesOverlap(a, c)).toBe(overlaps);
		expect(boxesOverlap(c, a)).toBe(overlaps);
		const i = intersectBoxes(a, c);
		expect(i === null ? 0 : boxVolume(i)).toBeCloseTo(volume, 9);
	});

	it.each([
		['flush inside', b([0, 0, 0], [170, 170, 170]), b([0, 0, 0], [170, 1.6, 170]), true],
		['one face out', b([0, 0, 0], [170, 170, 170]), b([0, 0, 0], [170.5, 1.6, 170]), false],
		['rounding on a face', b([0, 0, 0], [0.3, 1, 1]), b([0, 0, 0], [0.1 + 0.2, 1, 1]), true]
	])('containment: %s', (_name, outer, inner, contained) => {
		expect(boxContains(outer, inner)).toBe(contained);
	});
});

describe('against three.js Box3 (1,000 random pairs each)', () => {
	const positive = (s: Vector3) => s.x > EPSILON_MM && s.y > EPSILON_MM && s.z > EPSILON_MM;

	it('overlap test and overlap box match intersectsBox + intersect', () => {
		fc.assert(
			fc.property(boxArb(0, 50, 40), boxArb(0, 50, 40), (a, c) => {
				const A = toBox3(a);
				const C = toBox3(c);
				const shared = A.clone().intersect(C);
				const expected = A.intersectsBox(C) && positive(shared.getSize(new Vector3()));
				expect(boxesOverlap(a, c)).toBe(expected);
				const mine = intersectBoxes(a, c);
				if (expected) {
					expect(mine).toEqual(fromBox3(shared));
					const s = shared.getSize(new Vector3());
					expect(boxVolume(mine!)).toBeCloseTo(s.x * s.y * s.z, 6);
				} else {
					expect(mine).toBeNull();
				}
			}),
			{ numRuns: 1000 }
		);
	});

	it('containment matches containsBox', () => {
		fc.assert(
			fc.property(boxArb(0, 50, 80), boxArb(0, 50, 40), (outer, inner) => {
				expect(boxContains(outer, inner)).toBe(toBox3(outer).containsBox(toBox3(inner)));
			}),
			{ numRuns: 1000 }
		);
	});

	it('symmetric and translation invariant', () => {
		fc.assert(
			fc.property(
				boxArb(),
				boxArb(),
				fc.tuple(gridMm(-500, 500), gridMm(-500, 500), gridMm(-500, 500)),
				(a, c, t) => {
					expect(intersectBoxes(a, c)).toEqual(intersectBoxes(c, a));
					const moved = intersectBoxes(translateBox(a, t), translateBox(c, t));
					const here = intersectBoxes(a, c);
					expect(moved === null).toBe(here === null);
					if (here && moved) expect(moved).toEqual(translateBox(here, t));
				}
			),
			{ numRuns: 1000 }
		);
	});
});
