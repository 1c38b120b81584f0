/**
 * Worked examples of the fit report, each with its arithmetic: a card flush against a divider at
 * a slot offset (PCI Express CEM, 20.32 mm pitch), radiator stacks on a 64 mm mount with a 1 mm
 * adapter plate (common practice figures), and a body as deep as its space with a fitting keep-out.
 */
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import { blockPart, makeScene, plainEnclosure } from '../server/testing/engine-factories';
import { demoEnclosure, standardPart } from './standard-library';
import { SLOT_PITCH_MM, type DividerDef, type PartDef, type Vec3 } from './schema';

describe('a two-slot card flush against a divider at a slot offset (PCI Express CEM: 20.32 mm pitch)', () => {
	// A divider 2 mm thick, x-normal, at 40 + k × 20.32 mm; a card 2 × 20.32 = 40.64 mm thick.
	const card = blockPart('card', [2 * SLOT_PITCH_MM, 100, 150], { toleranceMm: 0 });
	const spine: DividerDef = {
		id: 'spine',
		label: 'Spine',
		axis: 'x',
		thicknessMm: 2,
		positions: { kind: 'range', minMm: 40, maxMm: 40 + 5 * SLOT_PITCH_MM, stepMm: SLOT_PITCH_MM }
	};
	const scene = (k: number) =>
		makeScene({
			enclosure: plainEnclosure([200, 150, 200], 2, { dividers: [spine] }),
			dividerPositions: { spine: 40 + k * SLOT_PITCH_MM },
			parts: [card],
			// Flush against the divider at its first slot offset: 40 + 20.32 + 2 = 62.32 mm.
			placements: [{ id: 'card', partId: 'card', position: [40 + SLOT_PITCH_MM + 2, 0, 20] }]
		});

	it('flush is contact, not a collision: a 0 mm gap against the divider despite the 20.32 sums', () => {
		const report = checkScene(scene(1));
		expect(report.overlaps).toEqual([]);
		const gap = report.parts[0].gaps['-x'];
		expect(gap).toMatchObject({ against: { id: 'divider:spine' }, held: false });
		expect(gap.gapMm).toBeCloseTo(0, 9);
		expect(report.parts[0].status).toBe('tight');
	});

	it('one slot further the divider runs through the card; the moves are the card one pitch right or the divider one step back', () => {
		// Divider at 40 + 2 × 20.32 = 80.64 … 82.64 mm, inside the card (62.32 … 102.96 mm).
		const report = checkScene(scene(2));
		// The one overlap: the divider through the card.
		expect(report.overlaps).toMatchObject([
			{ a: { id: 'card/body' }, b: { id: 'divider:spine' }, kind: 'collides', axis: 'x' }
		]);
		const [o] = report.overlaps;
		expect(o.depthMm[0]).toBeCloseTo(2, 9);
		// The card to just past the divider: 82.64 − 62.32 = 20.32 mm right (102.96 + 20.32 = 123.28 ≤ 200);
		// the divider back to 60.32: 20.32 mm, one step.
		expect(o.moves).toHaveLength(2);
		expect(o.moves[0]).toMatchObject({ targetId: 'card', targetKind: 'part', axis: 'x', sign: 1 });
		expect(o.moves[0].distanceMm).toBeCloseTo(SLOT_PITCH_MM, 9);
		expect(o.moves[1]).toMatchObject({
			targetId: 'spine',
			targetKind: 'divider',
			axis: 'x',
			sign: -1,
			steps: 1
		});
		expect(o.moves[1].toOffsetMm).toBeCloseTo(40 + SLOT_PITCH_MM, 9);
	});
});

/** The demo's front radiator mount: 64 mm budget, 1 mm adapter plate for 240 radiators (common practice). */
function stack(radiatorMm: number, fanMm: 15 | 25, marginMm: number) {
	const rad: PartDef = blockPart(`rad-240-${radiatorMm}`, [124, 275, radiatorMm], {
		category: 'radiator',
		specs: { radiatorClass: 240, radiatorThicknessMm: radiatorMm }
	});
	const fan = standardPart(`std-fan-120-${fanMm}`);
	return makeScene({
		enclosure: demoEnclosure(),
		parts: [rad, fan],
		placements: [
			// On the plate: 1 mm from the front panel.
			{ id: 'radiator', partId: rad.id, position: [5, 20, 1], mountId: 'radiator' },
			{ id: 'fan-1', partId: fan.id, position: [5, 20, 1 + radiatorMm], mountId: 'radiator' },
			{ id: 'fan-2', partId: fan.id, position: [5, 140, 1 + radiatorMm], mountId: 'radiator' }
		],
		marginMm
	});
}

describe('radiator stacks on a 64 mm mount with a 1 mm plate (common practice figures)', () => {
	it('36 mm radiator + 25 mm fans: 64 − 1 − 36 − 25 = 2 mm spare; the plate is a box the radiator rests on', () => {
		const report = checkScene(stack(36, 25, 2));
		const mount = report.mounts.find((m) => m.mountId === 'radiator')!;
		expect(mount).toMatchObject({
			plateMm: 1,
			usedMm: 62,
			spareMm: 2,
			status: 'clear',
			problems: []
		});
		expect(report.overlaps).toEqual([]);
		const rad = report.parts.find((p) => p.placementId === 'radiator')!;
		expect(rad.gaps['-z']).toMatchObject({
			gapMm: 0,
			held: true,
			against: { id: 'plate:radiator' }
		});
		// The fans' room to the bulkhead is the spare: 64 − (1 + 36 + 25) = 2 mm.
		const fan = report.parts.find((p) => p.placementId === 'fan-1')!;
		expect(fan.gaps['+z']).toMatchObject({ against: { id: 'divider:bulkhead' } });
		expect(fan.gaps['+z'].gapMm).toBeCloseTo(2, 9);
		expect(report.parts.map((p) => p.status)).toEqual(['clear', 'clear', 'clear']);
	});

	it('45 mm radiator + 25 mm fans: 1 + 45 + 25 = 71 mm in 64, 7 mm over, and every part on it is marked', () => {
		const report = checkScene(stack(45, 25, 2));
		const mount = report.mounts.find((m) => m.mountId === 'radiator')!;
		expect(mount).toMatchObject({ usedMm: 71, spareMm: -7, status: 'collides' });
		expect(mount.problems).toEqual([
			{
				mountId: 'radiator',
				label: 'Front radiator mount',
				kind: 'over-budget',
				status: 'collides',
				placementIds: ['fan-1', 'fan-2', 'radiator'],
				amountMm: 7
			}
		]);
		for (const p of report.parts) {
			expect(p.status).toBe('collides');
			expect(p.mountProblems.map((m) => m.kind)).toEqual(['over-budget']);
		}
		// The radiator itself overlaps nothing, yet counts as colliding: the stack is one problem.
		expect(report.totals.counts.collides).toBe(3);
		const fan = report.parts.find((p) => p.placementId === 'fan-1')!;
		expect(fan.gaps['+z'].gapMm).toBeCloseTo(-7, 9);
	});
});

describe('a body 86 mm deep flush in an 86 mm space with a 20 mm fitting keep-out', () => {
	const body = blockPart('block', [60, 50, 86], {
		keepouts: [
			{
				id: 'fittings',
				label: 'fittings',
				kind: 'fitting',
				severity: 'error',
				box: { min: [10, 10, 86], max: [50, 40, 106] }
			}
		]
	});
	const scene = makeScene({
		enclosure: plainEnclosure([120, 100, 86] as Vec3),
		parts: [body],
		placements: [{ id: 'block', partId: 'block', position: [30, 0, 0] }]
	});

	it('is blocked, and no move along depth clears it: 86 + 20 = 106 mm in 86 mm', () => {
		const report = checkScene(scene);
		expect(report.parts[0].status).toBe('blocked');
		// The one overlap: the keep-out reaches 20 mm past the inside, into the 2 mm back panel.
		expect(report.overlaps).toMatchObject([
			{
				a: { id: 'block/fittings' },
				b: { id: 'wall:back' },
				kind: 'blocked',
				axis: 'z',
				moves: [],
				clearingMove: null
			}
		]);
		const [o] = report.overlaps;
		expect(o.noMove).toBe(
			'No move along depth clears this; the part is deeper than the space (106.0\u2009mm with its keep-outs, 86.0\u2009mm between what bounds it).'
		);
	});
});
