/**
 * The assembly order and the fittings count, on scenes whose answer is worked out by hand in the
 * comments (the rules are in assembly.ts). Slot pitch 20.32 mm is the PCI Express CEM spec's; the
 * G 1/4 and G 3/8 threads are ISO 228-1 sizes (their use for fittings is common practice).
 */
import { describe, expect, it } from 'vitest';
import { checkScene, resolveScene, type PartDef, type Scene } from '$lib/geometry';
import { blockPart, makeScene, plainEnclosure } from '$lib/server/testing/engine-factories';
import { demoScene } from '$lib/geometry/standard-library';
import { assemblyPlan, fittingsByThread, pathBox } from './assembly';

function plan(scene: Scene) {
	const resolved = resolveScene(scene);
	return { resolved, plan: assemblyPlan(scene, resolved, checkScene(scene)) };
}

const order = (scene: Scene) => plan(scene).plan.steps.map((s) => s.placementId);

describe('the demo sandwich (geometry/standard-library.ts), worked by hand', () => {
	/*
	 * Board on the left tray: its way in is the room to its right up to the spine (x 12.6 → 86),
	 * over its own height and depth; the CPU block sits there, so the board goes first. The
	 * radiator on the front mount comes in from behind (z 30 → 64, the bulkhead): both fans are in
	 * that room, so it goes before them; fan 2 rests on fan 1. The card and the pump-reservoir
	 * stand free on the card side and come in through the right panel, 2 mm away, with nothing in
	 * the way; nothing else orders them, so the common-practice sequence does:
	 * board, CPU block, supply, card, radiator, fans, pump-reservoir.
	 */
	const { plan: p } = plan(demoScene());

	it('orders the parts', () => {
		expect(p.steps.map((s) => s.placementId)).toEqual([
			'board',
			'cpu-block',
			'psu',
			'card',
			'radiator',
			'fan-1',
			'fan-2',
			'pump-res'
		]);
	});

	it('gives the reasons it found, and no others', () => {
		expect(p.edges.map((e) => `${e.before}>${e.after}:${e.reason.kind}`)).toEqual([
			'board>cpu-block:path',
			'fan-1>fan-2:rests',
			'radiator>fan-1:path',
			'radiator>fan-2:path'
		]);
		expect(p.steps.every((s) => s.conflicts.length === 0)).toBe(true);
	});

	it('brings mounted parts in along their mount and free parts through the nearest panel', () => {
		const dir = Object.fromEntries(
			p.steps.map((s) => [s.placementId, `${s.direction}/${s.directionFrom}`])
		);
		expect(dir).toMatchObject({
			board: '+x/mount',
			psu: '+x/mount',
			radiator: '+z/mount',
			'fan-1': '+z/mount',
			card: '+x/free',
			'pump-res': '+x/free'
		});
	});

	it('counts the fittings per thread: two ports on the CPU block, three on the pump-reservoir, two on the radiator', () => {
		const [only, ...rest] = fittingsByThread(resolveScene(demoScene()));
		expect(rest).toEqual([]);
		expect(only).toEqual({
			thread: 'G 1/4',
			ports: 7,
			withPlacedFitting: 0,
			byPart: [
				{ placementId: 'cpu-block', name: 'Compact CPU block, 26 mm tall', ports: 2 },
				{ placementId: 'pump-res', name: 'Compact pump-reservoir, 58 mm thick', ports: 3 },
				{ placementId: 'radiator', name: 'Slim 280 radiator, 30 mm', ports: 2 }
			]
		});
	});
});

/** A 200 mm cube inside, a floor mount and a mount on each side panel. */
function bench(placements: Scene['placements'], parts: PartDef[]): Scene {
	const region = {
		min: [0, 0, 0] as [number, number, number],
		max: [200, 200, 200] as [number, number, number]
	};
	return makeScene({
		enclosure: plainEnclosure([200, 200, 200], 2, {
			mounts: [
				{
					id: 'floor',
					label: 'Floor mount',
					kind: 'radiator',
					face: 'bottom',
					region,
					accepts: [],
					standoffMm: 0,
					slotPitchMm: 20.32
				},
				{
					id: 'left',
					label: 'Left mount',
					kind: 'fan',
					face: 'left',
					region,
					accepts: [],
					standoffMm: 0,
					slotPitchMm: 20.32
				},
				{
					id: 'right',
					label: 'Right mount',
					kind: 'fan',
					face: 'right',
					region,
					accepts: [],
					standoffMm: 0,
					slotPitchMm: 20.32
				}
			]
		}),
		parts,
		placements
	});
}

const at = (id: string, partId: string, position: [number, number, number], mountId?: string) => ({
	id,
	partId,
	position,
	rotation: { x: 0, y: 0, z: 0 },
	...(mountId ? { mountId } : {})
});

describe('a hand-made bench scene', () => {
	const radiator = blockPart('rad', [120, 30, 150], { name: 'Radiator', category: 'radiator' });
	const fan = blockPart('fan', [120, 25, 120], { name: 'Fan', category: 'fan' });
	const pump = blockPart('pump', [50, 50, 50], {
		name: 'Pump',
		category: 'pump',
		ports: [
			{ id: 'in', position: [10, 50, 25], direction: '+y', thread: 'G 1/4' },
			{ id: 'out', position: [40, 50, 25], direction: '+y', thread: 'G 1/4' },
			{ id: 'drain', position: [25, 0, 25], direction: '-y', thread: 'G 3/8' }
		]
	});
	const block = blockPart('block', [40, 20, 40], {
		name: 'CPU block',
		category: 'cpu-block',
		ports: [
			{ id: 'in', position: [10, 20, 20], direction: '+y', thread: 'G 1/4' },
			{ id: 'out', position: [30, 20, 20], direction: '+y', thread: 'G 1/4' }
		]
	});
	const fitting = blockPart('fit', [10, 15, 10], { name: 'Fitting', category: 'fitting' });
	const boardWithScrews = blockPart('panel-board', [5, 60, 60], {
		name: 'Side board',
		category: 'board',
		keepouts: [
			{
				id: 'screws',
				label: 'screw access',
				kind: 'service',
				severity: 'warning',
				box: { min: [0, 60, 0], max: [5, 70, 60] }
			}
		]
	});
	const cover = blockPart('cover', [8, 10, 30], { name: 'Cover', category: 'other' });

	/*
	 * Radiator on the floor (y 0–30), fan on it (y 30–55): the fan is in the radiator's way in
	 * (which also makes it rest on it: one reason is kept, the first found). The pump stands on
	 * the fan at x 10–60, in its way in, so the fan goes before it.
	 * The CPU block stands free at x 130–170 on the floor; a fitting sits on its "in" port
	 * (x 135–145, y 20–35, z 150–160), so the block goes before the fitting.
	 * A board on the left mount (x 0–5, y 120–180) has service room (screw access) above it,
	 * y 180–190; a cover part at y 181–191 sits in that room (not in the board's way in, which
	 * runs to its right), so the board goes first.
	 */
	const scene = bench(
		[
			at('rad', 'rad', [10, 0, 10], 'floor'),
			at('fan', 'fan', [10, 30, 10], 'floor'),
			at('pump', 'pump', [10, 55, 10]),
			at('block', 'block', [130, 0, 135]),
			at('fit', 'fit', [135, 20, 150]),
			at('board', 'panel-board', [0, 120, 120], 'left'),
			at('cover', 'cover', [0, 181, 130])
		],
		[radiator, fan, pump, block, fitting, boardWithScrews, cover]
	);

	it('finds every reason, by kind', () => {
		const edges = plan(scene).plan.edges.map((e) => `${e.before}>${e.after}:${e.reason.kind}`);
		expect(edges).toEqual(
			expect.arrayContaining([
				'rad>fan:path',
				'rad>pump:path',
				'fan>pump:path',
				'block>fit:port',
				'board>cover:access'
			])
		);
		expect(edges).toHaveLength(5);
	});

	it('keeps every part after what it needs', () => {
		const o = order(scene);
		const before = (a: string, b: string) => o.indexOf(a) < o.indexOf(b);
		expect(before('rad', 'fan')).toBe(true);
		expect(before('fan', 'pump')).toBe(true);
		expect(before('block', 'fit')).toBe(true);
		expect(before('board', 'cover')).toBe(true);
		// Unordered by geometry: board first, fittings last (common practice).
		expect(o[0]).toBe('board');
		expect(o.at(-1)).toBe('fit');
	});

	it('counts fittings per thread, with the placed fitting on its port', () => {
		const counts = fittingsByThread(resolveScene(scene));
		expect(counts.map((c) => [c.thread, c.ports, c.withPlacedFitting])).toEqual([
			['G 1/4', 4, 1],
			['G 3/8', 1, 0]
		]);
		expect(counts[0].byPart).toEqual([
			{ placementId: 'block', name: 'CPU block', ports: 2 },
			{ placementId: 'pump', name: 'Pump', ports: 2 }
		]);
	});
});

describe('parts in each other’s way', () => {
	/*
	 * Two plates on opposite side mounts, facing each other at the same height and depth: each is
	 * in the other's way in. The order cannot keep both free; the second says so.
	 */
	const plate = blockPart('plate', [10, 80, 80], { name: 'Plate', category: 'other' });
	const scene = bench(
		[at('a', 'plate', [0, 50, 50], 'left'), at('b', 'plate', [190, 50, 50], 'right')],
		[plate]
	);

	it('flags the conflict on the step that breaks a rule', () => {
		const steps = plan(scene).plan.steps;
		expect(steps.map((s) => s.placementId)).toEqual(['a', 'b']);
		expect(steps[0].conflicts).toEqual(['b']);
		expect(steps[1].conflicts).toEqual([]);
	});
});

describe('pathBox', () => {
	const room = {
		min: [0, 0, 0] as [number, number, number],
		max: [100, 100, 100] as [number, number, number]
	};
	const part = {
		min: [10, 20, 30] as [number, number, number],
		max: [20, 40, 60] as [number, number, number]
	};

	it.each([
		['+x', { min: [20, 20, 30], max: [100, 40, 60] }],
		['-x', { min: [0, 20, 30], max: [10, 40, 60] }],
		['+y', { min: [10, 40, 30], max: [20, 100, 60] }],
		['-z', { min: [10, 20, 0], max: [20, 40, 30] }]
	] as const)('sweeps %s to the edge of the room', (face, expected) => {
		expect(pathBox(part, room, face)).toEqual(expected);
	});

	it('is empty when the part already touches that edge', () => {
		expect(pathBox({ min: [0, 0, 0], max: [10, 10, 10] }, room, '-x')).toBeNull();
	});
});
