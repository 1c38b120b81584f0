/**
 * Clearance tables of the two demo enclosures, against values worked by hand (arithmetic in the
 * comments). The sandwich's figures are the common-practice ones for this layout: about 53 mm over
 * the board with the spine at '4 slots', 86 mm on the pump (CPU) side at '3 slots', 330 mm of card
 * with the support bar at its lowest, 64 mm on the mount for a 280 and 63 mm for a 240. Slot pitch
 * 20.32 mm from the PCI Express CEM spec; board thickness 1.6 mm from memory.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_SPINE_OFFSETS, demoEnclosure, demoTowerEnclosure } from './standard-library';
import { roomTable, type RoomRow } from './room';
import type { EnclosureDef } from './schema';
import { listPositions } from '../server/testing/engine-factories';

const rowOf = (rows: RoomRow[], offsets: Record<string, number>) =>
	rows.find((r) =>
		Object.entries(offsets).every(([id, v]) => r.settings.find((s) => s.id === id)?.offsetMm === v)
	)!;
const fig = (row: RoomRow, id: string) => {
	const f = row.figures.find((x) => x.id === id);
	if (!f) throw new Error(`no figure ${id} in ${row.figures.map((x) => x.id).join(', ')}`);
	return f;
};
/** The row's figures named in `expected`, each matched against what it should hold. */
const expectFigures = (row: RoomRow, expected: Record<string, object>) =>
	expect(Object.fromEntries(Object.keys(expected).map((id) => [id, fig(row, id)]))).toMatchObject(
		expected
	);

describe('the demo sandwich (150 × 340 × 240 mm inside)', () => {
	const table = roomTable(demoEnclosure());
	const at = (spine: keyof typeof DEMO_SPINE_OFFSETS, bar = 0) =>
		rowOf(table.rows, { spine: DEMO_SPINE_OFFSETS[spine], bar });

	it('has a row for every combination of the two moving controls: 3 spine positions × 16 bar offsets', () => {
		// The bulkhead has one position (fixed); the bar travels 0…150 mm in 10 mm steps: 16.
		expect(table.moving).toEqual([
			{ kind: 'divider', id: 'spine' },
			{ kind: 'bracket', id: 'bar' }
		]);
		expect(table.rows).toHaveLength(48);
		expect(table.note).toBeNull();
	});

	it('about 53 mm over the board with the spine at 4 slots (common practice)', () => {
		// Spine's low face at 65.68; the board's top at 11 (raised standoffs) + 1.6 (board) = 12.6:
		// 65.68 − 12.6 = 53.08 mm.
		const over = fig(at('4 slots'), 'over-board:tray');
		expect(over.valueMm).toBeCloseTo(53.08, 9);
		expect(over.boundedBy).toBe('to the Spine');
		// 86 − 12.6 = 73.4; 106.32 − 12.6 = 93.72.
		expect(fig(at('3 slots'), 'over-board:tray').valueMm).toBeCloseTo(73.4, 9);
		expect(fig(at('2 slots'), 'over-board:tray').valueMm).toBeCloseTo(93.72, 9);
	});

	it('86 mm for a pump on the CPU side at 3 slots (common practice)', () => {
		// Left panel (x 0) to the spine at 86: below the board (y 0…150), the whole depth 66…240.
		const pump = fig(at('3 slots'), 'pump:bulkhead.high+spine.low:left');
		expect(pump.valueMm).toBeCloseTo(86, 9);
		expect(pump.boundedBy).toBe('to the Spine');
		expect(pump.box).toEqual({ min: [0, 0, 66], max: [86, 150, 240] });
	});

	it('330 mm of card on the support bar at its lowest, 180 mm at its highest (common practice)', () => {
		// Bar 10 mm tall at offset 0: its top at 10; top panel at 340: 340 − 10 = 330.
		const low = fig(at('3 slots', 0), 'card-length:bar');
		expect(low.valueMm).toBeCloseTo(330, 9);
		expect(low.boundedBy).toBe('from the Card support bar at 0.0\u2009mm to the Top panel');
		// At 150 mm its top is at 160: 340 − 160 = 180.
		expect(fig(at('3 slots', 150), 'card-length:bar').valueMm).toBeCloseTo(180, 9);
	});

	it.each([
		// Card side = 150 − (offset + 2 mm spine); slots = floor(width / 20.32).
		['4 slots', 82.32, 4], // 82.32 / 20.32 = 4.05
		['3 slots', 62, 3], // 62 / 20.32 = 3.05
		['2 slots', 41.68, 2] // 41.68 / 20.32 = 2.05
	] as const)('at %s the card side is %f mm: %i slots of 20.32 mm', (spine, width, slots) => {
		const f = fig(at(spine), 'card-slots:bar');
		expect(f.valueMm).toBeCloseTo(width, 9);
		expect(f.slots).toBe(slots);
		expect(f.boundedBy).toBe('Spine to Right panel');
	});

	it('64 mm for radiator + fans on the 280 mount, 63 mm for a 240 after its 1 mm adapter plate (common practice)', () => {
		// Budget 64 mm, and the bulkhead's front face is at z 64 too; the plate is for 240s only.
		const budget = 'to the Bulkhead (the 64.0\u2009mm budget)';
		expectFigures(at('3 slots'), {
			'stack:radiator:280': { valueMm: 64, boundedBy: budget },
			'stack:radiator:240': {
				valueMm: 63,
				boundedBy: `${budget}, after the 1.0\u2009mm adapter plate`
			}
		});
	});

	it('free boxes of the three compartments', () => {
		const row = at('4 slots');
		// CPU side: from the board's top (12.6) to the spine (65.68) = 53.08, full height, 240 − 66 = 174 deep.
		const cpu = fig(row, 'free-box:bulkhead.high+spine.low').sizeMm!;
		expect(cpu[0]).toBeCloseTo(53.08, 9);
		expect(cpu.slice(1)).toEqual([340, 174]);
		// Card side: 82.32 wide, above the bar 340 − 10 = 330, 174 deep.
		const card = fig(row, 'free-box:bulkhead.high+spine.high').sizeMm!;
		expect(card[0]).toBeCloseTo(82.32, 9);
		expect(card.slice(1)).toEqual([330, 174]);
		// Radiator bay: the whole width and height, 64 deep to the bulkhead.
		expect(fig(row, 'free-box:bulkhead.low')).toMatchObject({
			sizeMm: [150, 340, 64],
			boundedBy: 'Left panel to Right panel, Bottom panel to Top panel, Front panel to Bulkhead'
		});
	});
});

describe('the demo small tower (205 × 376 × 236 mm inside)', () => {
	const table = roomTable(demoTowerEnclosure());
	const at = (shroud: number, pump = 0) => rowOf(table.rows, { shroud, 'pump-bracket': pump });

	it('has 4 shroud positions × 7 pump-bracket offsets = 28 rows', () => {
		// Shroud 90…120 step 10: 4. Bracket −60…0 step 10: 7.
		expect(table.rows).toHaveLength(28);
	});

	it('board, cards and stacks', () => {
		const row = at(90);
		// Tray on the right panel (x 205): 205 − 6 standoffs − 1.6 board = 197.4 to the left panel.
		expect(fig(row, 'over-board:tray').valueMm).toBeCloseTo(197.4, 9);
		expectFigures(row, {
			'over-board:tray': { boundedBy: 'to the Left panel' },
			// Cards from the back panel (z 236) forward to the front fans' 30 mm stack: 236 − 30 = 206.
			'card-length:slots': {
				valueMm: 206,
				boundedBy: 'from the Back panel to the Front fans stack'
			},
			// The slots' region is 165 − 80 = 85 mm across (85 / 20.32 = 4.18); the mount has 4 slots.
			'card-slots:slots': { slots: 4, boundedBy: '4 slots on the mount' },
			// Top radiator: the room down to the pump bracket (376 − 125 = 251) exceeds the 50 mm budget.
			'stack:top-radiator:280': { valueMm: 50, boundedBy: 'the 50.0\u2009mm stack budget' },
			'stack:front-fans:140': { valueMm: 30, boundedBy: 'the 30.0\u2009mm stack budget' }
		});
	});

	it('the main chamber’s free box stands on the pump bracket', () => {
		// x 0 → 197.4 (the board on its tray), y 125 (bracket top) → 376, z 0 → 236: 197.4 × 251 × 236,
		// larger than the strip under the bracket across the full width (205 × 30 × 236).
		const box = fig(at(90), 'free-box:shroud.high');
		expect(box.sizeMm![0]).toBeCloseTo(197.4, 9);
		expect(box.sizeMm!.slice(1)).toEqual([251, 236]);
		expect(box.boundedBy).toBe(
			'Left panel to board on the Board tray, Pump bracket at 0.0\u2009mm to Top panel, Front panel to Back panel'
		);
		// The supply chamber under the shroud at 100: 205 × 100 × 236, nothing in it.
		expect(fig(at(100), 'free-box:shroud.low').sizeMm).toEqual([205, 100, 236]);
	});
});

describe('tables that cannot be made', () => {
	it('an enclosure whose control has no allowed position says so and lists nothing', () => {
		const e: EnclosureDef = demoEnclosure();
		e.dividers[1] = { ...e.dividers[1], positions: listPositions({}) };
		const table = roomTable(e);
		expect(table.rows).toEqual([]);
		expect(table.note).toBe('Spine has no allowed position, so there is no room to list.');
	});

	it('more than two moving controls: one at a time, the others at their first position', () => {
		const e = demoEnclosure();
		e.dividers[0] = { ...e.dividers[0], positions: listPositions({ a: 64, b: 60 }) };
		const table = roomTable(e);
		// 1 base row + 1 more bulkhead + 2 more spine + 15 more bar positions.
		expect(table.rows).toHaveLength(1 + 1 + 2 + 15);
		expect(table.note).toMatch(/3 controls move/);
	});
});
