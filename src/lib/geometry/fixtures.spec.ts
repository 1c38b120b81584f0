/** The shared fixtures are what the demo seed shows: they must say what they claim. */
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import { innerSizeMm, innerVolumeLitres } from './enclosure';
import { DEMO_SPINE_OFFSETS, demoScene, standardParts } from './fixtures';
import { partDefSchema } from './schema';

describe('demo scene', () => {
	it('fits at its default positions: no overlaps, every part clear, budgets within', () => {
		const report = checkScene(demoScene());
		expect(report.overlaps).toEqual([]);
		expect(report.totals.counts).toEqual({ collides: 0, blocked: 0, outside: 0, tight: 0, clear: 8 });
		expect(report.mounts.map((m) => [m.mountId, m.status])).toEqual([
			['psu', 'clear'],
			['radiator', 'clear'],
			['tray', 'clear']
		]);
		expect(report.budgets.heat).toMatchObject({ status: 'clear', isEstimate: true, radiatorLengthMm: 280 });
		expect(report.budgets.power).toMatchObject({ status: 'clear', ratingW: 600 });
		expect(report.compartments.map((c) => c.label)).toEqual(['card side', 'CPU side', 'radiator bay']);
	});

	it('is a compact enclosure: 150 × 340 × 240 mm, about 12 L inside', () => {
		const { enclosure } = demoScene();
		expect(innerSizeMm(enclosure)).toEqual([150, 340, 240]);
		expect(innerVolumeLitres(enclosure)).toBeCloseTo(12.24, 9);
	});

	it('with the spine at 2 slots the card collides with it', () => {
		const scene = demoScene();
		const report = checkScene({ ...scene, dividerPositions: { ...scene.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] } });
		const hit = report.overlaps.find((o) => o.a.id === 'card/body')!;
		expect(hit).toMatchObject({ kind: 'collides', b: { id: 'divider:spine' } });
		expect(hit.depthMm[0]).toBeCloseTo(0.96, 9);
		expect(hit.controlMove).toMatchObject({ targetId: 'spine', targetKind: 'divider', sign: -1, steps: 1, toOffsetMm: 86 });
		expect(report.parts.find((p) => p.placementId === 'card')!.status).toBe('collides');
	});

	it('the support bar moved up one step hits the card; the fix is one step back down', () => {
		const scene = demoScene();
		const report = checkScene({ ...scene, bracketOffsets: { bar: 10 } });
		const [hit] = report.overlaps;
		expect(hit).toMatchObject({ a: { id: 'bracket:bar' }, b: { id: 'card/body' }, kind: 'collides' });
		expect(hit.depthMm[1]).toBe(10);
		expect(hit.clearingMove).toMatchObject({ targetId: 'card', axis: 'y', sign: 1, distanceMm: 10 });
		expect(hit.controlMove).toMatchObject({ targetId: 'bar', axis: 'y', sign: -1, distanceMm: 10, steps: 1, toOffsetMm: 0 });
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
