/** Published standards as fixtures; each test names the document its numbers come from. */
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import { compartmentsFor } from './enclosure';
import { makeScene, plainEnclosure } from '../server/testing/engine-factories';
import {
	DEMO_SPINE_OFFSETS,
	demoEnclosure,
	demoSceneInput,
	standardPart
} from './standard-library';
import { SLOT_PITCH_MM, type EnclosureDef, type Vec3 } from './schema';

const sizeOf = (enclosure: EnclosureDef, positions: Record<string, number>, id: string) =>
	compartmentsFor(enclosure, positions).find((c) => c.id === id)!.sizeMm;

describe('expansion-slot pitch 20.32 mm (PCI Express CEM spec; 0.8 in, inch = 25.4 mm per NIST SP 811)', () => {
	it('is 0.8 in', () => {
		expect(SLOT_PITCH_MM).toBeCloseTo(0.8 * 25.4, 12);
	});

	it.each([
		['4 slots', '3 slots'],
		['3 slots', '2 slots']
	] as const)(
		'moving the demo spine from %s to %s changes the two compartments by ±20.32 mm',
		(from, to) => {
			const e = demoEnclosure();
			const at = (label: keyof typeof DEMO_SPINE_OFFSETS) => ({
				bulkhead: 64,
				spine: DEMO_SPINE_OFFSETS[label]
			});
			const cpu = (l: keyof typeof DEMO_SPINE_OFFSETS) =>
				sizeOf(e, at(l), 'bulkhead.high+spine.low')[0];
			const card = (l: keyof typeof DEMO_SPINE_OFFSETS) =>
				sizeOf(e, at(l), 'bulkhead.high+spine.high')[0];
			expect(cpu(to) - cpu(from)).toBeCloseTo(SLOT_PITCH_MM, 9);
			expect(card(to) - card(from)).toBeCloseTo(-SLOT_PITCH_MM, 9);
		}
	);

	it('a range divider stepping one slot at a time moves exactly one pitch per step', () => {
		const e = plainEnclosure([200, 300, 200], 2, {
			dividers: [
				{
					id: 'd',
					label: 'D',
					axis: 'x',
					thicknessMm: 1.6,
					positions: {
						kind: 'range',
						minMm: 20,
						maxMm: 20 + 6 * SLOT_PITCH_MM,
						stepMm: SLOT_PITCH_MM
					}
				}
			]
		});
		for (let k = 0; k < 6; k++) {
			const low = (o: number) => sizeOf(e, { d: o }, 'd.low')[0];
			const high = (o: number) => sizeOf(e, { d: o }, 'd.high')[0];
			const a = 20 + k * SLOT_PITCH_MM;
			const b = 20 + (k + 1) * SLOT_PITCH_MM;
			expect(low(b) - low(a)).toBeCloseTo(SLOT_PITCH_MM, 9);
			expect(high(b) - high(a)).toBeCloseTo(-SLOT_PITCH_MM, 9);
		}
	});
});

describe('Mini-ITX board, 170 × 170 mm (Mini-ITX form factor addendum to the microATX specification, 2001)', () => {
	const trayScene = (marginMm: number) =>
		makeScene({
			enclosure: plainEnclosure([170, 40, 170], 2, {
				mounts: [
					{
						id: 'tray',
						label: 'Tray',
						kind: 'board-tray',
						face: 'bottom',
						region: { min: [0, 0, 0], max: [170, 40, 170] },
						accepts: ['Mini-ITX']
					}
				]
			}),
			parts: [standardPart('std-mini-itx')],
			placements: [{ id: 'board', partId: 'std-mini-itx', position: [0, 0, 0], mountId: 'tray' }],
			marginMm
		});

	it('on a 170 mm tray fits flush: gap 0 on all four edges, tight under a positive margin, no collision', () => {
		const report = checkScene(trayScene(2));
		expect(report.overlaps).toEqual([]);
		const [board] = report.parts;
		for (const face of ['-x', '+x', '-z', '+z'] as const) expect(board.gaps[face].gapMm).toBe(0);
		expect(board.status).toBe('tight');
		expect(report.mounts[0]).toMatchObject({ status: 'clear', unaccepted: [], overflow: [] });
	});

	it('with no margin the flush board is clear', () => {
		expect(checkScene(trayScene(0)).parts[0].status).toBe('clear');
	});
});

/** An enclosure whose inside is exactly an SFX bay, 125 × 63.5 × 100 mm, in 50 mm of solid material. */
function sfxBay(partId: string, mountId = 'bay') {
	return makeScene({
		enclosure: plainEnclosure([125, 63.5, 100], 50, {
			mounts: [
				{
					id: mountId,
					label: 'SFX bay',
					kind: 'psu-bay',
					face: 'bottom',
					region: { min: [0, 0, 0], max: [125, 63.5, 100] },
					accepts: ['SFX']
				}
			]
		}),
		parts: [standardPart(partId)],
		placements: [{ id: 'supply', partId, position: [0, 0, 0], mountId }],
		marginMm: 0
	});
}

describe('power supplies in an SFX bay', () => {
	it('an SFX supply, 125 W × 63.5 H × 100 D mm (SFX12V Power Supply Design Guide), fits', () => {
		const report = checkScene(sfxBay('std-sfx'));
		expect(report.overlaps).toEqual([]);
		expect(report.parts[0].status).toBe('clear');
		expect(report.mounts[0]).toMatchObject({ status: 'clear', unaccepted: [], overflow: [] });
	});

	it('an ATX supply, 150 W × 86 H × 140 D mm (ATX12V Power Supply Design Guide), overlaps by 25, 22.5 and 40 mm', () => {
		const report = checkScene(sfxBay('std-atx-psu'));
		const byWall = Object.fromEntries(report.overlaps.map((o) => [o.b.id, o]));
		expect(Object.keys(byWall).sort()).toEqual(['wall:back', 'wall:right', 'wall:top']);
		expect(byWall['wall:right'].depthMm[0]).toBe(25);
		expect(byWall['wall:top'].depthMm[1]).toBe(22.5);
		expect(byWall['wall:back'].depthMm[2]).toBe(40);
		// The supply already touches the left, bottom and front panels: no move clears it, the bay
		// is too small on every axis.
		expect(byWall['wall:right']).toMatchObject({
			moves: [],
			clearingMove: null,
			noMove:
				'No move along width clears this; the part is wider than the space (150.0\u2009mm with its keep-outs, 125.0\u2009mm between what bounds it).'
		});
		expect(byWall['wall:top'].noMove).toMatch(
			/^No move along height clears this; the part is taller than the space/
		);
		expect(byWall['wall:back'].noMove).toMatch(
			/^No move along depth clears this; the part is deeper than the space/
		);
		expect(report.parts[0]).toMatchObject({ status: 'collides', outsideFaces: ['+x', '+y', '+z'] });
		expect(report.mounts[0].overflow).toEqual([
			{ placementId: 'supply', overflowMm: { '+x': 25, '+y': 22.5, '+z': 40 } }
		]);
		expect(report.mounts[0].unaccepted).toEqual(['supply']);
	});

	it('an SFX-L body, 125 × 63.5 × 130 mm (common practice), overlaps by 30 mm in depth only', () => {
		const report = checkScene(sfxBay('std-sfx-l'));
		expect(report.overlaps).toHaveLength(1);
		expect(report.overlaps[0]).toMatchObject({ b: { id: 'wall:back' }, depthMm: [125, 63.5, 30] });
		// 30 mm forward would push it 30 mm through the front panel: no move clears it.
		expect(report.overlaps[0]).toMatchObject({
			clearingMove: null,
			noMove:
				'No move along depth clears this; the part is deeper than the space (130.0\u2009mm with its keep-outs, 100.0\u2009mm between what bounds it).'
		});
		expect(report.mounts[0].overflow).toEqual([
			{ placementId: 'supply', overflowMm: { '+z': 30 } }
		]);
	});

	it.each([
		['std-sfx', {}],
		['std-atx-psu', { '+x': 22.5, '+y': 25, '+z': 40 }],
		['std-sfx-l', { '+z': 30 }]
	] as const)(
		'in the demo’s bay, turned on its side: %s reaches past the bay by %o',
		(partId, overflow) => {
			const input = demoSceneInput();
			input.parts = [...input.parts!, standardPart(partId)];
			input.placements = input.placements!.map((p) => (p.id === 'psu' ? { ...p, partId } : p));
			const bay = checkScene(makeScene(input)).mounts.find((m) => m.mountId === 'psu')!;
			expect(bay.overflow).toEqual(
				Object.keys(overflow).length ? [{ placementId: 'psu', overflowMm: overflow }] : []
			);
		}
	);
});

describe('fans (common practice: 120 and 140 mm square, 25 mm standard, about 15 mm slim)', () => {
	it.each([
		['std-fan-120-25', [120, 120, 25]],
		['std-fan-120-15', [120, 120, 15]],
		['std-fan-140-25', [140, 140, 25]],
		['std-fan-140-15', [140, 140, 15]]
	] as [string, Vec3][])('%s is %o', (id, size) => {
		const part = standardPart(id);
		expect(part.bodies[0].box.max).toEqual(size);
		expect(part.source).toMatch(/common practice/i);
	});
});
