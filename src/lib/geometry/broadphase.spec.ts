/** The broadphase's pair set against box-intersect (an independent package) and brute force. */
import boxIntersect from 'box-intersect';
import fc from 'fast-check';
import { Vector3 } from 'three';
import { toBox3 } from '../server/testing/engine-box3';
import { describe, expect, it } from 'vitest';
import { EPSILON_MM, translateBox } from './box';
import { overlappingPairs } from './broadphase';
import { boxArb, gridMm } from '../server/testing/engine-factories';
import type { Box } from './schema';

const key = ([i, j]: [number, number]) => `${i},${j}`;

/** box-intersect's closed-box pairs, keeping those whose three.js overlap box has volume. */
function oraclePairs(boxes: Box[]): string[] {
	const out: string[] = [];
	boxIntersect(
		boxes.map((b) => [...b.min, ...b.max]),
		(i, j) => {
			const size = toBox3(boxes[i]).intersect(toBox3(boxes[j])).getSize(new Vector3());
			if (size.x > EPSILON_MM && size.y > EPSILON_MM && size.z > EPSILON_MM) {
				out.push(key([Math.min(i, j), Math.max(i, j)]));
			}
		}
	);
	return out.sort();
}

const mine = (boxes: Box[]) => overlappingPairs(boxes).map(key).sort();

/** A mix of small boxes and a few long ones (walls, shelves) that span many grid cells. */
const boxSetArb = fc
	.integer({ min: 0, max: 400 })
	.chain((n) =>
		fc
			.tuple(
				fc.array(boxArb(0, 300, 40), { minLength: n, maxLength: n }),
				fc.array(boxArb(0, 300, 300), { maxLength: 4 })
			)
			.map(([small, big]) => [...small, ...big])
	);

describe('overlappingPairs', () => {
	it('finds exactly the pairs box-intersect finds (1,000 random box sets, 0–404 boxes)', () => {
		fc.assert(
			fc.property(boxSetArb, (boxes) => {
				const pairs = overlappingPairs(boxes);
				expect(pairs.every(([i, j]) => i < j)).toBe(true);
				expect(new Set(pairs.map(key)).size).toBe(pairs.length);
				expect(mine(boxes)).toEqual(oraclePairs(boxes));
			}),
			{ numRuns: 1000 }
		);
	});

	it('is translation invariant', () => {
		fc.assert(
			fc.property(
				boxSetArb,
				fc.tuple(gridMm(-5000, 5000), gridMm(-5000, 5000), gridMm(-5000, 5000)),
				(boxes, t) => {
					expect(mine(boxes.map((b) => translateBox(b, t)))).toEqual(mine(boxes));
				}
			),
			{ numRuns: 200 }
		);
	});

	it('does not depend on the order of the boxes', () => {
		fc.assert(
			fc.property(boxSetArb, fc.nat(), (boxes, seed) => {
				const order = boxes
					.map((_, i) => i)
					.sort((a, b) => ((a * 7919 + seed) % 101) - ((b * 7919 + seed) % 101));
				const shuffled = order.map((i) => boxes[i]);
				const back = overlappingPairs(shuffled)
					.map(([i, j]) => [order[i], order[j]].sort((x, y) => x - y) as [number, number])
					.map(key)
					.sort();
				expect(back).toEqual(mine(boxes));
			}),
			{ numRuns: 200 }
		);
	});

	it.each([
		[
			'a row of touching boxes',
			Array.from(
				{ length: 100 },
				(_, i) => ({ min: [i * 10, 0, 0], max: [i * 10 + 10, 10, 10] }) as Box
			),
			0
		],
		[
			'a stack of identical boxes',
			Array.from({ length: 60 }, () => ({ min: [0, 0, 0], max: [10, 10, 10] }) as Box),
			(60 * 59) / 2
		],
		[
			'one big box over a grid of small ones',
			[
				{ min: [0, 0, 0], max: [1000, 1000, 1000] } as Box,
				...Array.from(
					{ length: 99 },
					(_, i) => ({ min: [i * 10 + 1, 1, 1], max: [i * 10 + 5, 5, 5] }) as Box
				)
			],
			99
		],
		['empty input', [] as Box[], 0]
	])('%s', (_name, boxes, count) => {
		expect(overlappingPairs(boxes)).toHaveLength(count);
		expect(mine(boxes)).toEqual(oraclePairs(boxes));
	});
});
