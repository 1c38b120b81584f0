/** Pure catalogue helpers: slot positions, category templates, form ↔ engine mapping, version changes. */
import { describe, expect, it } from 'vitest';
import { Box3, Vector3 } from 'three';
import {
	SLOT_PITCH_MM,
	allowedPositions,
	compartmentsFor,
	enclosureDefSchema
} from '$lib/geometry';
import { demoEnclosure } from '$lib/geometry/standard-library';
import { slotPositions } from './features';
import { bodySizeMm, categoryTemplate, FITTING_ROOM_MM } from './part-shape';
import { enclosureToForm, formFieldFor, formToEnclosure } from './schemas';
import { formToPart, partToForm } from './part-form';
import { enclosureChanges } from './enclosure-diff';

describe('divider positions by slots', () => {
	it('leaves n × 20.32 mm on the high side (PCI Express CEM spec slot pitch)', () => {
		const positions = slotPositions({ axis: 'x', thicknessMm: 2 }, [176, 316, 236], [2, 3], true);
		expect(positions.map((p) => p.label)).toEqual(['2 slots', '3 slots']);
		// Worked example: 176 − 2 − 2 × 20.32 = 133.36 mm; 176 − 2 − 3 × 20.32 = 113.04 mm.
		expect(positions.map((p) => p.offsetMm)).toEqual([133.36, 113.04]);
		const def = enclosureDefSchema.parse({
			...demoEnclosure(),
			outerMm: [180, 320, 240],
			walls: Object.fromEntries(
				['left', 'right', 'bottom', 'top', 'front', 'back'].map((f) => [f, { thicknessMm: 2 }])
			),
			dividers: [
				{
					id: 'd',
					label: 'Spine',
					axis: 'x',
					thicknessMm: 2,
					positions: { kind: 'list', options: positions }
				}
			],
			brackets: [],
			mounts: []
		});
		const high = compartmentsFor(def, { d: 113.04 }).find((c) => c.id === 'd.high')!;
		expect(high.sizeMm[0]).toBeCloseTo(3 * SLOT_PITCH_MM, 9);
	});

	it('leaves n slots on the low side when asked, and drops positions that do not fit', () => {
		const low = slotPositions({ axis: 'x', thicknessMm: 2 }, [100, 100, 100], [1, 2, 5], false);
		expect(low.map((p) => p.offsetMm)).toEqual([20.32, 40.64]);
	});
});

describe('category templates (common practice room, resized by the user)', () => {
	it.each([
		['pump', 'fitting', [0, 50, 0], [62, 50 + FITTING_ROOM_MM, 62]],
		['fan', 'airflow', [0, 0, -15], [120, 120, 0]],
		['psu', 'cable', [0, 0, 100], [125, 63.5, 130]]
	] as const)('a %s gets its %s keep-out against the right face', (category, kind, min, max) => {
		const size =
			category === 'pump' ? [62, 50, 62] : category === 'fan' ? [120, 120, 25] : [125, 63.5, 100];
		const { keepouts } = categoryTemplate(category, size as [number, number, number]);
		expect(keepouts[0].kind).toBe(kind);
		expect(keepouts[0].box).toEqual({ min, max });
	});

	it('puts G 1/4 ports on the top face of a pump (ISO 228-1 thread, common practice for fittings)', () => {
		const { ports } = categoryTemplate('pump', [62, 50, 62]);
		expect(ports.map((p) => [p.direction, p.thread, p.position[1]])).toEqual([
			['+y', 'G 1/4', 50],
			['+y', 'G 1/4', 50]
		]);
	});

	it('measures a part by its bodies only, as three.js Box3 does', () => {
		const bodies = [
			{
				id: 'a',
				label: '',
				box: {
					min: [0, 0, 0] as [number, number, number],
					max: [80, 40, 80] as [number, number, number]
				}
			},
			{
				id: 'b',
				label: '',
				box: {
					min: [10, 40, 10] as [number, number, number],
					max: [70, 160, 70] as [number, number, number]
				}
			}
		];
		const b3 = new Box3();
		for (const b of bodies) {
			b3.union(new Box3(new Vector3(...b.box.min), new Vector3(...b.box.max)));
		}
		const size = b3.getSize(new Vector3());
		expect(bodySizeMm({ bodies })).toEqual([size.x, size.y, size.z]);
	});
});

describe('forms and the engine', () => {
	it('an enclosure survives form → definition → form unchanged', () => {
		const def = enclosureDefSchema.parse(demoEnclosure());
		const form = enclosureToForm(def, { revision: 3, description: 'x' });
		expect(enclosureDefSchema.parse(formToEnclosure(form).raw)).toEqual(def);
		expect(allowedPositions(def.dividers[1]).length).toBe(3);
	});

	it.each([
		['outerMm[0]', 'outerX'],
		['outerMm[2]', 'outerZ'],
		['walls.top.thicknessMm', 'topMm'],
		['walls.front.offsetMm', 'frontOffsetMm'],
		['dividers[0].positions.options[1].offsetMm', 'features']
	])('engine path %s lands on form field %s', (path, field) => {
		expect(formFieldFor(path)).toBe(field);
	});

	it('a one-box part with the template keeps its keep-outs through the form', () => {
		const form = partToForm(
			{
				id: 'p',
				name: 'Pump',
				category: 'pump',
				bodies: [{ id: 'body', label: 'Body', box: { min: [0, 0, 0], max: [62, 50, 62] } }],
				keepouts: [],
				ports: [],
				specs: { powerDrawW: 18 },
				provenance: 'measured',
				toleranceMm: 0.5
			},
			{ priceMinor: 9400, currency: 'EUR', supplierNote: '', revision: 1 }
		);
		const { input } = formToPart({ ...form, applyTemplate: true });
		expect(input?.keepouts[0].kind).toBe('fitting');
		expect(input?.priceMinor).toBe(9400);
		expect(input?.specs).toEqual({ powerDrawW: 18 });
	});
});

describe('what changed between versions', () => {
	it('names size, panel and divider changes', () => {
		const a = enclosureDefSchema.parse(demoEnclosure());
		const b = structuredClone(a);
		b.outerMm[0] = 160;
		b.walls.left.kind = 'mesh';
		b.dividers[1].thicknessMm = 3;
		b.mounts = b.mounts.slice(1);
		expect(enclosureChanges(a, b)).toEqual([
			'Outer width 154.0\u2009mm → 160.0\u2009mm',
			'Left panel solid → mesh',
			'Divider changed: Spine',
			'Mount removed: Front radiator mount'
		]);
		expect(enclosureChanges(a, a)).toEqual([]);
	});
});
