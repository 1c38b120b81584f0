/**
 * The cost model (cost.ts) against brute force written here: its pair counts must never be below
 * the pairs the engine really visits, real builds must sit far under the limits, the hostile pile
 * far over them; and the report's capped overlap list must leave every total as it was.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import {
	MAX_CANDIDATE_PAIRS,
	MAX_CHECK_BOXES,
	MAX_GRID_CELLS,
	MAX_LISTED_OVERLAPS,
	MAX_SWEEP_POINTS,
	MAX_SWEEP_ROWS,
	MAX_SWEEP_WORK,
	boxesCost,
	checkExcess,
	intervalPairs,
	sceneBoxCount,
	sceneCost,
	sweepExcess
} from './cost';
import { EPSILON_MM } from './box';
import { boxArb, gridMm, sceneArb } from '../server/testing/engine-factories';
import { demoScene } from './standard-library';
import { largestAllowedPile, pileSceneInput } from '../server/testing/engine-hostile';
import { resolveScene } from './resolve';
import { sceneSchema, type Box } from './schema';

const shared = (a: Box, b: Box, axis: number) =>
	Math.min(a.max[axis], b.max[axis]) - Math.max(a.min[axis], b.min[axis]) > EPSILON_MM;

/** Brute force: pairs overlapping in 3D, and pairs sharing area seen along each axis (the gap pass). */
function bruteCounts(boxes: Box[]) {
	let overlap = 0;
	let beams = 0;
	for (let i = 0; i < boxes.length; i++) {
		for (let j = i + 1; j < boxes.length; j++) {
			const s = [0, 1, 2].map((a) => shared(boxes[i], boxes[j], a));
			if (s[0] && s[1] && s[2]) overlap++;
			if (s[1] && s[2]) beams++;
			if (s[0] && s[2]) beams++;
			if (s[0] && s[1]) beams++;
		}
	}
	return { overlap, beams };
}

/** Boxes crowded into a small space, so many overlap (the case the bound is for). */
const crowdedBoxes = fc.array(boxArb(0, 40, 30), { minLength: 0, maxLength: 60 });
const spreadBoxes = fc.array(boxArb(-200, 400, 60), { minLength: 0, maxLength: 60 });

describe('intervalPairs', () => {
	it('counts the pairs of closed intervals that meet, as brute force does', () => {
		fc.assert(
			fc.property(
				fc.array(fc.tuple(gridMm(-50, 50), gridMm(0, 30)), { maxLength: 80 }),
				(spans) => {
					const lo = Float64Array.from(spans.map(([a]) => a));
					const hi = Float64Array.from(spans.map(([a, w]) => a + w));
					let brute = 0;
					for (let i = 0; i < spans.length; i++) {
						for (let j = i + 1; j < spans.length; j++) {
							if (lo[i] <= hi[j] && lo[j] <= hi[i]) brute++;
						}
					}
					expect(intervalPairs(lo, hi)).toBe(brute);
				}
			),
			{ numRuns: 300 }
		);
	});
});

describe('boxesCost', () => {
	it('is an upper bound of the overlapping pairs and of the gap pass pairs (brute force)', () => {
		fc.assert(
			fc.property(fc.oneof(crowdedBoxes, spreadBoxes), (boxes) => {
				const cost = boxesCost(boxes);
				const brute = bruteCounts(boxes);
				expect(cost.boxes).toBe(boxes.length);
				expect(cost.overlapPairsBound).toBeGreaterThanOrEqual(brute.overlap);
				expect(cost.candidatePairs).toBeGreaterThanOrEqual(brute.overlap + brute.beams);
				// Never more than four times all pairs: why any scene of up to 500 boxes passes.
				expect(cost.candidatePairs).toBeLessThanOrEqual(
					(4 * boxes.length * (boxes.length - 1)) / 2
				);
			}),
			{ numRuns: 300 }
		);
	});

	it('is exact for a pile of identical boxes: every pair, once in 3D and three times seen along an axis', () => {
		const n = 300;
		const boxes = Array.from({ length: n }, (): Box => ({ min: [0, 0, 0], max: [10, 10, 10] }));
		const all = (n * (n - 1)) / 2;
		expect(boxesCost(boxes)).toEqual({ boxes: n, candidatePairs: 4 * all, overlapPairsBound: all });
	});

	it('bounds the pairs the engine reports for random scenes', () => {
		fc.assert(
			fc.property(sceneArb, (scene) => {
				const report = checkScene(scene, { maxListedOverlaps: Infinity });
				expect(sceneCost(scene).overlapPairsBound).toBeGreaterThanOrEqual(report.overlaps.length);
				const resolved = resolveScene(scene);
				const boxes =
					resolved.walls.length +
					resolved.dividers.length +
					resolved.brackets.length +
					resolved.placements.reduce((n, rp) => n + rp.bodies.length + rp.keepouts.length, 0);
				expect(sceneBoxCount(scene)).toBe(boxes);
			}),
			{ numRuns: 150 }
		);
	});
});

describe('limits', () => {
	it('the demo build sits far under every limit', () => {
		const cost = sceneCost(demoScene());
		expect(cost.boxes * 20).toBeLessThan(MAX_CHECK_BOXES);
		expect(cost.candidatePairs * 100).toBeLessThan(MAX_CANDIDATE_PAIRS);
		expect(checkExcess(demoScene())).toBeNull();
	});

	it('a scene of 500 boxes passes whatever its layout: the pile of 500 identical boxes', () => {
		// 496 placements + 6 walls + a divider + a bracket = 504 boxes is the largest pile allowed.
		const n = largestAllowedPile();
		expect(n + 8).toBeGreaterThanOrEqual(500);
		expect(checkExcess(sceneSchema.parse(pileSceneInput(n)))).toBeNull();
	});

	it('the crash scene (4,900 identical placements) is refused on its box count, naming the limit', () => {
		const excess = checkExcess(sceneSchema.parse(pileSceneInput(4_900)));
		expect(excess).toMatchObject({
			limit: 'boxes',
			path: 'placements',
			value: 4_908,
			max: MAX_CHECK_BOXES
		});
		expect(excess!.message).toContain('2,000 boxes');
	});

	it('a pile under the box limit is refused on its candidate pairs', () => {
		const excess = checkExcess(sceneSchema.parse(pileSceneInput(1_500)), 'settings.placements');
		expect(excess).toMatchObject({
			limit: 'candidatePairs',
			path: 'settings.placements',
			max: MAX_CANDIDATE_PAIRS
		});
		expect(excess!.message).toContain('500,000 candidate pairs');
	});

	it('sweeps: grid cells, positions, positions × boxes and answer rows', () => {
		expect(
			sweepExcess({ boxes: 30, points: 100 * 100, grid: true, path: 'controlB' })
		).toMatchObject({ limit: 'gridCells', max: MAX_GRID_CELLS, path: 'controlB' });
		expect(sweepExcess({ boxes: 30, points: 50 * 50, grid: true, path: 'controlB' })).toBeNull();
		expect(
			sweepExcess({ boxes: 30, points: MAX_SWEEP_POINTS + 1, grid: false, path: 'positions' })
		).toMatchObject({ limit: 'sweepPoints' });
		expect(
			sweepExcess({ boxes: 1_000, points: 5_000, grid: false, path: 'control' })
		).toMatchObject({ limit: 'sweepWork', max: MAX_SWEEP_WORK, value: 5_000_000 });
		expect(
			sweepExcess({ boxes: 100, points: 10_000, grid: false, path: 'control', rowsPerPoint: 30 })
		).toMatchObject({ limit: 'sweepRows', max: MAX_SWEEP_ROWS, path: 'gaps' });
		// The benchmark's sweep: 200 positions over 100 boxes.
		expect(
			sweepExcess({ boxes: 100, points: 200, grid: false, path: 'control', rowsPerPoint: 3 })
		).toBeNull();
	});
});

describe('the capped overlap list', () => {
	it('lists the first overlaps by id and says how many more; totals and statuses are the uncapped ones', () => {
		const scene = sceneSchema.parse(pileSceneInput(60));
		const full = checkScene(scene, { maxListedOverlaps: Infinity });
		const capped = checkScene(scene);
		expect(full.overlaps.length).toBeGreaterThan(MAX_LISTED_OVERLAPS);
		expect(full.overlapsNotListed).toBe(0);
		expect(capped.overlaps).toEqual(full.overlaps.slice(0, MAX_LISTED_OVERLAPS));
		expect(capped.overlapsNotListed).toBe(full.overlaps.length - MAX_LISTED_OVERLAPS);
		expect(capped.totals).toEqual(full.totals);
		expect(capped.parts).toEqual(full.parts);
	});

	it('for random scenes and any cap: a prefix of the full list, the same totals', () => {
		fc.assert(
			fc.property(sceneArb, fc.integer({ min: 0, max: 4 }), (scene, cap) => {
				const full = checkScene(scene, { maxListedOverlaps: Infinity });
				const capped = checkScene(scene, { maxListedOverlaps: cap });
				expect(capped.overlaps).toEqual(full.overlaps.slice(0, cap));
				expect(capped.overlaps.length + capped.overlapsNotListed).toBe(full.overlaps.length);
				expect(capped.totals).toEqual(full.totals);
			}),
			{ numRuns: 150 }
		);
	});

	it('bounds the report of the largest allowed pile (under 1 MB of JSON)', () => {
		const report = checkScene(sceneSchema.parse(pileSceneInput(largestAllowedPile())));
		expect(report.overlaps).toHaveLength(MAX_LISTED_OVERLAPS);
		expect(JSON.stringify(report).length).toBeLessThan(1_000_000);
	});
});
