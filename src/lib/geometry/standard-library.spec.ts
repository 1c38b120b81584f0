/** The standard library and demo data are what the demo seed shows: they must say what they claim. */
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import { innerSizeMm, innerVolumeLitres } from './enclosure';
import { DEMO_SPINE_OFFSETS, demoScene, standardParts } from './standard-library';
import { partDefSchema } from './schema';

describe('demo scene', () => {
	it('fits at its default positions: no overlaps, budgets within; two parts tight only in the worst case', () => {
		const report = checkScene(demoScene());
		expect(report.overlaps).toEqual([]);
		// The card (±1 mm) and the pump-reservoir (±0.5 mm) have 2.0 mm to the right panel: clear as
		// drawn, 1.0 and 1.5 mm once their tolerances are taken off, under the 2 mm margin.
		expect(report.totals.counts).toEqual({
			collides: 0,
			blocked: 0,
			outside: 0,
			tight: 2,
			clear: 6
		});
		const card = report.parts.find((p) => p.placementId === 'card')!;
		expect(card.gaps['+x']).toMatchObject({ gapMm: 2, against: { id: 'wall:right' } });
		expect(card.gaps['+x'].worstCaseMm).toBeCloseTo(1, 9);
		expect(report.parts.filter((p) => p.status === 'tight').map((p) => p.placementId)).toEqual([
			'card',
			'pump-res'
		]);
		expect(report.mounts.map((m) => [m.mountId, m.status])).toEqual([
			['psu', 'clear'],
			['radiator', 'clear'],
			['tray', 'clear']
		]);
		expect(report.budgets.heat).toMatchObject({
			status: 'clear',
			isEstimate: true,
			radiatorLengthMm: 280
		});
		expect(report.budgets.power).toMatchObject({ status: 'clear', ratingW: 600 });
		expect(report.compartments.map((c) => c.label)).toEqual([
			'card side',
			'CPU side',
			'radiator bay'
		]);
	});

	it('is a compact enclosure: 150 × 340 × 240 mm, about 12 L inside', () => {
		const { enclosure } = demoScene();
		expect(innerSizeMm(enclosure)).toEqual([150, 340, 240]);
		expect(innerVolumeLitres(enclosure)).toBeCloseTo(12.24, 9);
	});

	it('with the spine at 2 slots the card collides with it', () => {
		const scene = demoScene();
		const report = checkScene({
			...scene,
			dividerPositions: { ...scene.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] }
		});
		const hit = report.overlaps.find((o) => o.a.id === 'card/body')!;
		expect(hit).toMatchObject({ kind: 'collides', b: { id: 'divider:spine' } });
		expect(hit.depthMm[0]).toBeCloseTo(0.96, 9);
		// Best two, checked against the whole scene: the card 0.96 mm right (it has 2 mm to the right
		// panel), or the spine one position left.
		expect(hit.moves[0]).toMatchObject({
			targetId: 'card',
			targetKind: 'part',
			axis: 'x',
			sign: 1
		});
		expect(hit.moves[0].distanceMm).toBeCloseTo(0.96, 9);
		expect(hit.moves[1]).toMatchObject({
			targetId: 'spine',
			targetKind: 'divider',
			sign: -1,
			steps: 1,
			toOffsetMm: 86
		});
		expect(report.parts.find((p) => p.placementId === 'card')!.status).toBe('collides');
	});

	it('the support bar moved up one step hits the card; the fix is one step back down', () => {
		const scene = demoScene();
		const report = checkScene({ ...scene, bracketOffsets: { bar: 10 } });
		const [hit] = report.overlaps;
		expect(hit).toMatchObject({
			a: { id: 'bracket:bar' },
			b: { id: 'card/body' },
			kind: 'collides'
		});
		expect(hit.depthMm[1]).toBe(10);
		// Lifting the card 10 mm would push it 10 mm into the top panel (it is flush under it), so
		// the only move is the bar's.
		expect(hit.moves).toEqual([
			{
				targetId: 'bar',
				targetKind: 'bracket',
				axis: 'y',
				sign: -1,
				distanceMm: 10,
				steps: 1,
				toOffsetMm: 0
			}
		]);
	});
});

describe('standard library', () => {
	it('every entry parses, names its source and carries no invented ratings', () => {
		for (const part of standardParts()) {
			expect(partDefSchema.safeParse(part).success).toBe(true);
			expect(part.provenance).toBe('standard');
			expect(part.source?.length).toBeGreaterThan(10);
			expect(part.specs.psuRatingW).toBeUndefined();
		}
	});
});
