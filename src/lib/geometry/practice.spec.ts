/**
 * A practitioner's measurements of one compact enclosure, as check values (common practice), on
 * the demo enclosure: its front radiator mount has a 64 mm budget and a 1 mm adapter plate for
 * 240 radiators; its CPU side is 86 mm wide at '3 slots'; its card side is 330 mm tall above the
 * support bar at its lowest.
 */
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import { blockPart, demoPart, makeScene } from '../server/testing/engine-factories';
import {
	DEMO_SPINE_OFFSETS,
	demoEnclosure,
	demoSceneInput,
	standardPart
} from './standard-library';
import type { PartDef, SceneInput, Vec3 } from './schema';

function radiator(cls: 240 | 280, thicknessMm: number): PartDef {
	const size: Vec3 = cls === 240 ? [124, 275, thicknessMm] : [143, 315, thicknessMm];
	return blockPart(`rad-${cls}-${thicknessMm}`, size, {
		category: 'radiator',
		specs: { radiatorClass: cls, radiatorThicknessMm: thicknessMm }
	});
}

/** A radiator on the front mount (sitting on the plate when it needs one) and two fans on it. */
function stackScene(cls: 240 | 280, radiatorMm: number, fanMm: 15 | 25 | null, marginMm: number) {
	const fanSize = cls === 240 ? 120 : 140;
	const plate = cls === 240 ? 1 : 0;
	const rad = radiator(cls, radiatorMm);
	const fan = fanMm === null ? null : standardPart(`std-fan-${fanSize}-${fanMm}`);
	const placements: SceneInput['placements'] = [
		{ id: 'radiator', partId: rad.id, position: [5, 20, plate], mountId: 'radiator' }
	];
	if (fan) {
		placements.push(
			{ id: 'fan-1', partId: fan.id, position: [5, 20, plate + radiatorMm], mountId: 'radiator' },
			{
				id: 'fan-2',
				partId: fan.id,
				position: [5, 20 + fanSize, plate + radiatorMm],
				mountId: 'radiator'
			}
		);
	}
	return makeScene({
		enclosure: demoEnclosure(),
		parts: fan ? [rad, fan] : [rad],
		placements,
		marginMm
	});
}

const mountOf = (scene: ReturnType<typeof stackScene>) =>
	checkScene(scene).mounts.find((m) => m.mountId === 'radiator')!;

describe('radiator stacks on the front mount (common practice)', () => {
	it('a 280 radiator mounted directly on the panel has 64 mm for radiator + fans', () => {
		const mount = mountOf(stackScene(280, 30, null, 2));
		expect(mount.plateMm).toBe(0);
		expect(mount.availableMm).toBe(64);
	});

	it('a 240 loses about 1 mm to its adapter plate: 63 mm', () => {
		const mount = mountOf(stackScene(240, 30, null, 2));
		expect(mount.plateMm).toBe(1);
		expect(mount.availableMm).toBe(63);
	});

	it.each([
		['45 mm radiator + 15 mm slim fans', 3, 3, 'clear', 45, 15],
		['36 mm radiator + 25 mm fans', 3, 2, 'tight', 36, 25],
		['45 mm radiator + 25 mm fans', 3, -7, 'collides', 45, 25]
	] as const)(
		'240 with %s under a %i mm margin: %i mm spare, %s',
		(_name, margin, spare, status, radiatorMm, fanMm) => {
			const scene = stackScene(240, radiatorMm, fanMm, margin);
			const mount = mountOf(scene);
			expect(mount.usedMm).toBe(1 + radiatorMm + fanMm);
			expect(mount.spareMm).toBe(spare);
			expect(mount.status).toBe(status);
			expect(mount.stack.map((e) => e.layer)).toEqual([0, 1, 1]);
			// The geometry agrees: the fans' room to the bulkhead is the spare, and 7 over is a 7 mm collision.
			const report = checkScene(scene);
			const fan = report.parts.find((p) => p.placementId === 'fan-1')!;
			expect(fan.gaps['+z'].gapMm).toBeCloseTo(spare, 9);
			// The radiator rests on the 1 mm plate, a box in the scene: held contact, not a 1 mm gap.
			const rad = report.parts.find((p) => p.placementId === 'radiator')!;
			expect(rad.gaps['-z']).toMatchObject({
				gapMm: 0,
				held: true,
				against: { id: 'plate:radiator', kind: 'plate' }
			});
			// The stack's status reaches every part on it, naming the mount.
			for (const p of report.parts) {
				expect(p.status).toBe(status);
				if (status !== 'clear') {
					expect(p.mountProblems[0]).toMatchObject({
						mountId: 'radiator',
						label: 'Front radiator mount',
						status
					});
				}
			}
			if (spare < 0) {
				// Pulling the fan 7 mm forward would push it into the radiator: no single move clears it.
				const hit = report.overlaps.find(
					(o) => o.a.id === 'divider:bulkhead' && o.b.id === 'fan-1/body'
				)!;
				expect(hit.moves).toEqual([]);
				expect(hit.noMove).toBe(
					'No move along depth or any other single axis clears this without running into something else.'
				);
			}
		}
	);
});

describe('the 86 mm CPU-side compartment (common practice)', () => {
	const inCpuSide = (part: PartDef) =>
		checkScene(
			makeScene({
				enclosure: demoEnclosure(),
				dividerPositions: { spine: DEMO_SPINE_OFFSETS['3 slots'] },
				parts: [part],
				placements: [{ id: 'p', partId: part.id, position: [0, 100, 100] }],
				marginMm: 2
			})
		);

	it('a part as thick as its compartment (86 mm in 86 mm) fits flush', () => {
		const report = inCpuSide(blockPart('slab', [86, 50, 50]));
		expect(report.overlaps).toEqual([]);
		expect(report.parts[0].gaps['-x']).toMatchObject({ gapMm: 0, against: { id: 'wall:left' } });
		expect(report.parts[0].gaps['+x']).toMatchObject({
			gapMm: 0,
			against: { id: 'divider:spine' }
		});
		expect(report.parts[0].status).toBe('tight');
	});

	it('and a fitting keep-out on its outer face is blocked', () => {
		const report = inCpuSide(
			blockPart('slab', [86, 50, 50], {
				keepouts: [
					{
						id: 'fittings',
						label: 'fittings',
						kind: 'fitting',
						severity: 'error',
						box: { min: [86, 10, 10], max: [101, 40, 40] }
					}
				]
			})
		);
		expect(report.parts[0].status).toBe('blocked');
		expect(report.overlaps).toHaveLength(1);
		expect(report.overlaps[0]).toMatchObject({
			kind: 'blocked',
			a: { id: 'divider:spine' },
			b: { id: 'p/fittings' }
		});
	});

	it('a compact pump-reservoir 58 mm thick leaves 28 mm for fittings', () => {
		const pump = demoPart('demo-pump-res');
		const report = inCpuSide(pump);
		expect(report.parts[0].gaps['+x']).toMatchObject({
			gapMm: 28,
			against: { id: 'divider:spine' }
		});
		expect(report.overlaps).toEqual([]);
	});
});

describe('the card side (common practice)', () => {
	const cardScene = (lengthMm: number, withPump: boolean) => {
		const input = demoSceneInput();
		const card = demoPart('demo-card');
		card.bodies[0].box.max[0] = lengthMm;
		card.keepouts = [];
		input.parts = input.parts!.map((p) => (p.id === card.id ? card : p));
		if (!withPump) input.placements = input.placements!.filter((p) => p.id !== 'pump-res');
		return checkScene(makeScene(input));
	};

	it('takes a 330 mm card with the support bars at their lowest', () => {
		const report = cardScene(330, false);
		expect(report.overlaps).toEqual([]);
		const card = report.parts.find((p) => p.placementId === 'card')!;
		expect(card.gaps['+y']).toMatchObject({ gapMm: 0, against: { id: 'wall:top' } });
		expect(card.gaps['-y']).toMatchObject({ gapMm: 0, against: { id: 'bracket:bar' }, held: true });
		expect(cardScene(331, false).overlaps.map((o) => o.b.id)).toEqual(['wall:top']);
	});

	it('a 185 mm card leaves 145 mm above it for a pump-reservoir', () => {
		const card = cardScene(185, false).parts.find((p) => p.placementId === 'card')!;
		expect(card.gaps['+y']).toMatchObject({ gapMm: 145, against: { id: 'wall:top' } });
	});
});
