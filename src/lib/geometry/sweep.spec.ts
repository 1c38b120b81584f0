/** Sweeps agree with a full report at every position, find the feasible runs, and refuse positions that are not allowed. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { FACES } from './box';
import { checkScene } from './check';
import { SceneError } from './errors';
import { sceneArb } from '../server/testing/engine-factories';
import { DEMO_SPINE_OFFSETS, demoScene } from './standard-library';
import { allowedPositions } from './positions';
import type { Scene } from './schema';
import { feasibleIntervals, sweep, sweepGrid } from './sweep';
import type { SweepControl, SweepMetrics } from './types';

function at(scene: Scene, control: SweepControl, offsetMm: number): Scene {
	const key = control.kind === 'divider' ? 'dividerPositions' : 'bracketOffsets';
	return { ...scene, [key]: { ...scene[key], [control.id]: offsetMm } };
}

function expectSameAsReport(point: SweepMetrics, scene: Scene) {
	const report = checkScene(scene);
	expect(point.interferenceVolumeMm3).toBeCloseTo(report.totals.interferenceVolumeMm3, 6);
	expect(point.collisions).toBe(report.overlaps.filter((o) => o.kind === 'collides').length);
	expect(point.counts).toEqual(report.totals.counts);
	expect(point.compartments).toEqual(
		report.compartments.map((c) => ({ id: c.id, label: c.label, sizeMm: c.sizeMm }))
	);
	for (const g of point.gaps) {
		const gap = report.parts.find((p) => p.placementId === g.placementId)!.gaps[g.face];
		expect(g.gapMm).toBe(gap.gapMm);
		expect(g.againstId).toBe(gap.against?.id ?? null);
	}
}

describe('sweep', () => {
	it('gives, at every position, what checkScene gives with the control moved there (1,000 random scenes)', () => {
		const withControl = sceneArb.filter(
			(s) => s.enclosure.dividers.length + s.enclosure.brackets.length > 0
		);
		fc.assert(
			fc.property(withControl, fc.nat(), (scene, pick) => {
				const controls: SweepControl[] = [
					...scene.enclosure.dividers.map((d) => ({ kind: 'divider' as const, id: d.id })),
					...scene.enclosure.brackets.map((b) => ({ kind: 'bracket' as const, id: b.id }))
				];
				const control = controls[pick % controls.length];
				// Gaps asked for half the placements: the others' statuses must come out right unasked.
				const gaps = scene.placements
					.filter((_, i) => i % 2 === pick % 2)
					.flatMap((p) => FACES.map((face) => ({ placementId: p.id, face })));
				const result = sweep(scene, { control, gaps });
				for (const point of result.points) {
					expectSameAsReport(point, at(scene, control, point.offsetMm));
				}
				const sorted = result.points.map((p) => p.offsetMm);
				expect(sorted).toEqual([...sorted].sort((a, b) => a - b));
			}),
			{ numRuns: 1000 }
		);
	});

	it('on the demo: the spine collides only at 2 slots, the bar only clears at its lowest', () => {
		const scene = demoScene();
		const spine = sweep(scene, {
			control: { kind: 'divider', id: 'spine' },
			gaps: [{ placementId: 'card', face: '-x' }]
		});
		expect(spine.points.map((p) => [p.label, p.collisions > 0])).toEqual([
			['4 slots', false],
			['3 slots', false],
			['2 slots', true]
		]);
		expect(spine.feasibleIntervals).toEqual([
			{
				fromMm: DEMO_SPINE_OFFSETS['4 slots'],
				toMm: DEMO_SPINE_OFFSETS['3 slots'],
				fromIndex: 0,
				toIndex: 1
			}
		]);
		expect(spine.points[1].gaps[0]).toEqual({
			placementId: 'card',
			face: '-x',
			gapMm: expect.closeTo(19.36, 9),
			againstId: 'divider:spine'
		});
		expect(spine.points[2].gaps[0].gapMm).toBeLessThan(0);
		const cardSide = (i: number) =>
			spine.points[i].compartments.find((c) => c.id === 'bulkhead.high+spine.high')!.sizeMm[0];
		expect(cardSide(1) - cardSide(2)).toBeCloseTo(20.32, 9);

		const bar = sweep(scene, { control: { kind: 'bracket', id: 'bar' } });
		expect(bar.points).toHaveLength(16);
		expect(bar.feasibleIntervals).toEqual([{ fromMm: 0, toMm: 0, fromIndex: 0, toIndex: 0 }]);
	});

	it('runs only the positions asked for, and refuses one that is not allowed', () => {
		const scene = demoScene();
		const control = { kind: 'bracket' as const, id: 'bar' };
		expect(sweep(scene, { control, positions: [30, 0] }).points.map((p) => p.offsetMm)).toEqual([
			0, 30
		]);
		expect(() => sweep(scene, { control, positions: [0, 15] })).toThrow(SceneError);
		try {
			sweep(scene, { control, positions: [0, 15] });
		} catch (e) {
			expect((e as SceneError).path).toBe('positions[1]');
		}
		expect(() => sweep(scene, { control: { kind: 'divider', id: 'nope' } })).toThrow(/control\.id/);
	});

	it.each([
		['all clear', [0, 0, 0], [{ fromMm: 0, toMm: 2, fromIndex: 0, toIndex: 2 }]],
		['all collide', [1, 1, 1], []],
		[
			'a run in the middle',
			[1, 0, 0, 1, 0],
			[
				{ fromMm: 1, toMm: 2, fromIndex: 1, toIndex: 2 },
				{ fromMm: 4, toMm: 4, fromIndex: 4, toIndex: 4 }
			]
		]
	])('feasible intervals: %s', (_name, collisions, expected) => {
		expect(feasibleIntervals(collisions.map((c, i) => ({ offsetMm: i, collisions: c })))).toEqual(
			expected
		);
	});
});

describe('sweepGrid', () => {
	it('every cell matches checkScene with both controls moved (demo: spine × bar)', () => {
		const scene = demoScene();
		const a = { kind: 'divider' as const, id: 'spine' };
		const b = { kind: 'bracket' as const, id: 'bar' };
		const grid = sweepGrid(scene, a, b, { gaps: [{ placementId: 'card', face: '-y' }] });
		expect(grid.cells).toHaveLength(3 * allowedPositions(scene.enclosure.brackets[0]).length);
		for (const cell of grid.cells) {
			expectSameAsReport(cell, at(at(scene, a, cell.offsetAMm), b, cell.offsetBMm));
		}
	});

	it('random scenes with two controls (300 scenes)', () => {
		const twoControls = sceneArb.filter(
			(s) => s.enclosure.dividers.length + s.enclosure.brackets.length >= 2
		);
		fc.assert(
			fc.property(twoControls, (scene) => {
				const controls: SweepControl[] = [
					...scene.enclosure.dividers.map((d) => ({ kind: 'divider' as const, id: d.id })),
					...scene.enclosure.brackets.map((b) => ({ kind: 'bracket' as const, id: b.id }))
				];
				const grid = sweepGrid(scene, controls[0], controls[1]);
				for (const cell of grid.cells) {
					expectSameAsReport(
						cell,
						at(at(scene, controls[0], cell.offsetAMm), controls[1], cell.offsetBMm)
					);
				}
			}),
			{ numRuns: 300 }
		);
	});
});
