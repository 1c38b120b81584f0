/**
 * Where new parts land. `freeSpot` is checked against a brute-force search (every grid position,
 * in the same lowest / front-most / left-most order); landings on the demo enclosure are checked
 * with three.js Box3 as an independent box library and with the engine's own fit report.
 */
import fc from 'fast-check';
import { Vector3 } from 'three';
import { toBox3 } from '$lib/server/testing/engine-box3';
import { describe, expect, it } from 'vitest';
import {
	allowedPositions,
	checkScene,
	placePart,
	resolveScene,
	sceneSchema,
	type Box,
	type BracketDef,
	type DividerDef,
	type PartDef,
	type Placement,
	type ResolvedScene,
	type Vec3
} from '$lib/geometry';
import {
	DEMO_SPINE_OFFSETS,
	demoEnclosure,
	demoScene,
	demoSceneInput,
	standardPart
} from '$lib/geometry/standard-library';
import { blockPart, demoPart } from '$lib/server/testing/engine-factories';
import {
	allowedTurns,
	freeSpot,
	landInRoom,
	landOnMount,
	largestFreeBox,
	nextPlacementId,
	placeInRoom,
	placedBounds,
	snapToAllowed,
	stepAllowed,
	flatAlong,
	turnWords
} from './placement';

/** Shared volume by three.js Box3 (touching faces share none). */
function sharedVolume(a: Box, b: Box): number {
	const i = toBox3(a).intersect(toBox3(b));
	if (i.isEmpty()) return 0;
	const s = i.getSize(new Vector3());
	return s.x * s.y * s.z;
}

function boxAt(p: Vec3, size: Vec3): Box {
	return { min: [...p], max: [p[0] + size[0], p[1] + size[1], p[2] + size[2]] };
}

/** Every grid position of the room, lowest Y first, then front-most Z, then left-most X. */
function bruteForceSpot(room: Box, size: Vec3, blocked: Box[], stepMm: number): Vec3 | null {
	const range = (a: number) => {
		const out: number[] = [];
		for (let v = room.min[a]; v + size[a] <= room.max[a] + 1e-9; v += stepMm) out.push(v);
		return out;
	};
	for (const y of range(1)) {
		for (const z of range(2)) {
			for (const x of range(0)) {
				const c = boxAt([x, y, z], size);
				if (blocked.every((b) => sharedVolume(b, c) === 0)) return [x, y, z];
			}
		}
	}
	return null;
}

describe('freeSpot', () => {
	// Integer rooms, sizes and obstacles (obstacles may reach outside the room): the corner-point
	// candidates are then integers too, so a search over every integer position is a complete oracle.
	const int = (min: number, max: number) => fc.integer({ min, max });
	const caseArb = fc.record({
		roomMin: fc.tuple(int(-3, 3), int(-3, 3), int(-3, 3)),
		roomSize: fc.tuple(int(1, 9), int(1, 9), int(1, 9)),
		size: fc.tuple(int(1, 5), int(1, 5), int(1, 5)),
		obstacles: fc.array(
			fc.tuple(int(-5, 12), int(-5, 12), int(-5, 12), int(1, 7), int(1, 7), int(1, 7)),
			{ maxLength: 7 }
		)
	});

	it('finds exactly the spot a brute-force search over every position finds (or none when it finds none)', () => {
		fc.assert(
			fc.property(caseArb, ({ roomMin, roomSize, size, obstacles }) => {
				const room: Box = {
					min: roomMin as Vec3,
					max: [roomMin[0] + roomSize[0], roomMin[1] + roomSize[1], roomMin[2] + roomSize[2]]
				};
				const blocked = obstacles.map(([x, y, z, w, h, d]) => boxAt([x, y, z], [w, h, d]));
				const expected = bruteForceSpot(room, size as Vec3, blocked, 1);
				expect(freeSpot(room, size as Vec3, blocked)).toEqual(expected);
			}),
			{ numRuns: 400 }
		);
	});

	it('on a half-millimetre grid too', () => {
		const half = (min: number, max: number) =>
			fc.integer({ min: min * 2, max: max * 2 }).map((v) => v / 2);
		fc.assert(
			fc.property(
				fc.tuple(half(1, 5), half(1, 5), half(1, 5)),
				fc.array(
					fc.tuple(half(-2, 7), half(-2, 7), half(-2, 7), half(0.5, 4), half(0.5, 4), half(0.5, 4)),
					{ maxLength: 6 }
				),
				(size, obstacles) => {
					const room: Box = { min: [0, 0, 0], max: [7, 6, 6] };
					const blocked = obstacles.map(([x, y, z, w, h, d]) => boxAt([x, y, z], [w, h, d]));
					expect(freeSpot(room, size, blocked)).toEqual(bruteForceSpot(room, size, blocked, 0.5));
				}
			),
			{ numRuns: 200 }
		);
	});

	it.each([
		[
			'an empty room: its corner',
			{ min: [0, 0, 0], max: [10, 10, 10] } as Box,
			[4, 4, 4] as Vec3,
			[] as Box[],
			[0, 0, 0]
		],
		[
			'touching faces are free: right against the obstacle',
			{ min: [0, 0, 0], max: [10, 10, 10] } as Box,
			[5, 10, 10] as Vec3,
			[boxAt([0, 0, 0], [5, 10, 10])],
			[5, 0, 0]
		],
		[
			'a room filled exactly: nowhere',
			{ min: [0, 0, 0], max: [10, 10, 10] } as Box,
			[1, 1, 1] as Vec3,
			[boxAt([0, 0, 0], [10, 10, 10])],
			null
		],
		[
			'bigger than the room: nowhere',
			{ min: [0, 0, 0], max: [10, 10, 10] } as Box,
			[11, 1, 1] as Vec3,
			[],
			null
		]
	])('%s', (_name, room, size, blocked, expected) => {
		expect(freeSpot(room, size, blocked)).toEqual(expected);
	});
});

function demoResolved(
	placements: Placement[],
	spine: number = DEMO_SPINE_OFFSETS['3 slots']
): ResolvedScene {
	const input = demoSceneInput();
	return resolveScene(
		sceneSchema.parse({
			...input,
			placements,
			dividerPositions: { ...input.dividerPositions, spine }
		})
	);
}

/** Placement `id` of `part` where a landing puts it. */
const placementAt = (
	id: string,
	part: PartDef,
	landing: Pick<Placement, 'position' | 'rotation'>
): Placement => ({ id, partId: part.id, position: landing.position, rotation: landing.rotation });

describe('landOnMount on the demo enclosure', () => {
	const enclosure = demoEnclosure();
	const mount = enclosure.mounts.find((m) => m.id === 'radiator')!;
	const radiator = demoPart('demo-radiator-280');
	const fan = standardPart('std-fan-140-25');

	/** Lands parts one after another on the front mount, as the editor adds them. */
	function landAll(parts: PartDef[]) {
		const placements: Placement[] = [];
		for (const p of parts) {
			const landing = landOnMount(demoResolved(placements), mount, p);
			if ('reason' in landing) throw new Error(landing.reason);
			placements.push({
				...placementAt(nextPlacementId(placements), p, landing),
				mountId: mount.id
			});
		}
		return placements;
	}

	it('puts a 280 radiator flat against the front panel (its 30 mm thickness along the depth)', () => {
		const [r] = landAll([radiator]);
		const b = placedBounds(radiator, r);
		// Flat: the thinnest side (30 mm) along Z, the mount's normal; 143 × 315 face on the panel.
		expect([b.max[0] - b.min[0], b.max[1] - b.min[1], b.max[2] - b.min[2]]).toEqual([143, 315, 30]);
		// The mount's adapter plate is for 240 radiators only (plateFor), so a 280 sits on the panel.
		expect(b.min[2]).toBe(0);
		expect(checkScene(sceneOf([r])).mounts.find((m) => m.mountId === 'radiator')).toMatchObject({
			plateMm: 0,
			usedMm: 30
		});
	});

	it('puts two 140 fans side by side on it, each against the radiator and inside its face', () => {
		const placed = landAll([radiator, fan, fan]);
		const [rb, f1, f2] = placed.map((p, i) => placedBounds([radiator, fan, fan][i], p));
		for (const f of [f1, f2]) {
			expect(f.max[2] - f.min[2], 'fan thickness along the normal').toBe(25);
			expect(f.min[2], 'against the radiator').toBe(rb.max[2]);
			// Inside the radiator's face in X and Y.
			for (const a of [0, 1]) {
				expect(f.min[a]).toBeGreaterThanOrEqual(rb.min[a]);
				expect(f.max[a]).toBeLessThanOrEqual(rb.max[a]);
			}
		}
		// Side by side in one layer: same depth, no shared volume, not one on top of the other.
		expect(f2.min[2]).toBe(f1.min[2]);
		expect(sharedVolume(f1, f2)).toBe(0);
		const report = checkScene(sceneOf(placed));
		expect(report.overlaps.filter((o) => o.kind === 'collides')).toEqual([]);
		// Stack: radiator 30 + one layer of 25 mm fans = 55 mm of the 64 mm budget.
		expect(report.mounts.find((m) => m.mountId === 'radiator')).toMatchObject({
			usedMm: 55,
			spareMm: 9
		});
	});

	it('refuses a part the mount does not take', () => {
		const landing = landOnMount(demoResolved([]), mount, standardPart('std-sfx'));
		expect(landing).toHaveProperty('reason');
	});
});

function sceneOf(
	placements: Placement[],
	spine: number = DEMO_SPINE_OFFSETS['3 slots'],
	more: PartDef[] = []
) {
	const input = demoSceneInput();
	return sceneSchema.parse({
		...input,
		parts: [
			...(input.parts ?? []),
			...extraParts,
			...more.filter((m) => !extraParts.some((e) => e.id === m.id))
		],
		placements,
		dividerPositions: { ...input.dividerPositions, spine }
	});
}

/** A block with fitting room above it, as a pump or CPU block has. */
function blockWithRoom(id: string, size: Vec3, roomMm: number): PartDef {
	return blockPart(id, size, {
		keepouts: [
			{
				id: 'room',
				label: 'fitting room',
				kind: 'fitting',
				severity: 'error',
				box: { min: [0, size[1], 0], max: [size[0], size[1] + roomMm, size[2]] }
			}
		]
	});
}

/** Small generic blocks to drop into compartments. */
const extraParts: PartDef[] = [
	blockPart('block-a', [20, 30, 40]),
	blockPart('block-b', [40, 10, 10]),
	blockPart('block-c', [8, 8, 8]),
	blockWithRoom('block-k', [30, 20, 30], 25)
];

describe('landInRoom', () => {
	const spines = Object.values(DEMO_SPINE_OFFSETS);
	const base = demoScene().placements;

	/** Lands `p` in `room`; when it lands, checks it is inside the room and overlaps nothing. */
	function landAndCheck(
		spine: number,
		room: { id: string; box: Box },
		p: PartDef
	): 'landed' | 'full' {
		const resolved = resolveScene(sceneOf(base, spine, [p]));
		const landing = landInRoom(resolved, room.box, p);
		if ('reason' in landing) return 'full';
		const placement = placementAt('new', p, landing);
		const bounds = placedBounds(p, placement);
		for (let a = 0; a < 3; a++) {
			expect(bounds.min[a]).toBeGreaterThanOrEqual(room.box.min[a] - 1e-9);
			expect(bounds.max[a]).toBeLessThanOrEqual(room.box.max[a] + 1e-9);
		}
		// Overlaps no wall, divider, bracket or placed body (three.js Box3) …
		const others = [
			...resolved.walls,
			...resolved.dividers,
			...resolved.brackets,
			...resolved.placements.flatMap((rp) => rp.bodies)
		];
		for (const o of others) expect(sharedVolume(o.box, bounds), `${room.id} vs ${o.label}`).toBe(0);
		// … and the engine agrees: no overlap item (body or keep-out) names the new part.
		const report = checkScene(sceneOf([...base, placement], spine, [p]));
		expect(
			report.overlaps.filter((o) => o.a.placementId === 'new' || o.b.placementId === 'new'),
			room.id
		).toEqual([]);
		return 'landed';
	}

	it.each(spines.flatMap((spine) => extraParts.map((p) => [spine, p.id] as const)))(
		'with the spine at %s mm, %s lands in the CPU side and the card side and overlaps nothing',
		(spine, partId) => {
			const p = extraParts.find((q) => q.id === partId)!;
			const rooms = resolveScene(sceneOf(base, spine)).compartments;
			for (const id of ['bulkhead.high+spine.low', 'bulkhead.high+spine.high']) {
				const room = rooms.find((c) => c.id === id);
				expect(room, `compartment ${id} in ${rooms.map((c) => c.id).join(', ')}`).toBeDefined();
				expect(landAndCheck(spine, room!, p)).toBe('landed');
			}
		}
	);

	it('keeps out of the fitting room of parts already placed (a block 20 × 33 × 45 on the card side)', () => {
		const rooms = resolveScene(sceneOf(base)).compartments;
		const cardSide = rooms.find((c) => c.id === 'bulkhead.high+spine.high')!;
		expect(
			landAndCheck(
				DEMO_SPINE_OFFSETS['3 slots'],
				cardSide,
				blockPart('found-by-fast-check', [20, 33, 45])
			)
		).toBe('landed');
	});

	it('says so when the compartment is full instead of landing on top of something', () => {
		// The radiator bay holds a 30 mm radiator and 25 mm fans across nearly its whole face: the
		// free pockets are at most 30 mm (below the first fan, y 0–30) by 34 mm (z 30–64), so a
		// 40 mm cube fits there in no turn …
		const resolved = resolveScene(sceneOf(base));
		const bay = resolved.compartments.find((c) => c.id === 'bulkhead.low')!;
		const landing = landInRoom(resolved, bay.box, blockPart('cube-40', [40, 40, 40]), {
			roomLabel: bay.label
		});
		expect(landing).toHaveProperty('reason');
		expect((landing as { reason: string }).reason).toMatch(
			/largest free space in .* is .* mm; this part needs 40 × 40 × 40 mm/
		);
		// … while a 20 × 30 × 40 block, too deep upright, goes in lying down.
		expect(landAndCheck(DEMO_SPINE_OFFSETS['3 slots'], bay, extraParts[0])).toBe('landed');
	});

	it('random blocks, some with fitting room above, in every compartment: inside it and overlapping nothing (no body, no keep-out) whenever they land', () => {
		const rooms = resolveScene(sceneOf(base)).compartments;
		let landed = 0;
		fc.assert(
			fc.property(
				fc.tuple(
					fc.integer({ min: 1, max: 80 }),
					fc.integer({ min: 1, max: 80 }),
					fc.integer({ min: 1, max: 80 })
				),
				fc.integer({ min: 0, max: 30 }),
				fc.integer({ min: 0, max: rooms.length - 1 }),
				(size, roomMm, r) => {
					const p =
						roomMm === 0
							? blockPart('random-block', size as Vec3)
							: blockWithRoom('random-block', size as Vec3, roomMm);
					if (landAndCheck(DEMO_SPINE_OFFSETS['3 slots'], rooms[r], p) === 'landed') landed++;
				}
			),
			{ numRuns: 100 }
		);
		expect(landed, 'most random blocks find room').toBeGreaterThan(10);
	});
});

describe('snapping and stepping over allowed positions', () => {
	const spine = demoEnclosure().dividers.find((d) => d.id === 'spine') as DividerDef;
	const bar = demoEnclosure().brackets.find((b) => b.id === 'bar') as BracketDef;

	it.each([
		[70, 65.68],
		[75.8, 65.68],
		[75.9, 86],
		[100, 106.32],
		[-500, 65.68],
		[500, 106.32]
	])('a spine dragged to %s mm snaps to %s mm', (free, snapped) => {
		// Midpoint between 65.68 and 86 is 75.84 mm.
		expect(snapToAllowed(spine, free).offsetMm).toBe(snapped);
	});

	it('a bracket range snaps to its 10 mm steps, within its 0–150 mm travel', () => {
		fc.assert(
			fc.property(fc.double({ min: -50, max: 250, noNaN: true }), (free) => {
				const { offsetMm } = snapToAllowed(bar, free);
				const clamped = Math.min(150, Math.max(0, free));
				expect(allowedPositions(bar).map((p) => p.offsetMm)).toContain(offsetMm);
				expect(Math.abs(offsetMm - clamped)).toBeLessThanOrEqual(5 + 1e-9);
			})
		);
	});

	it.each([
		[DEMO_SPINE_OFFSETS['3 slots'], 1, DEMO_SPINE_OFFSETS['2 slots']],
		[DEMO_SPINE_OFFSETS['3 slots'], -1, DEMO_SPINE_OFFSETS['4 slots']],
		[DEMO_SPINE_OFFSETS['2 slots'], 1, DEMO_SPINE_OFFSETS['2 slots']],
		[DEMO_SPINE_OFFSETS['4 slots'], -1, DEMO_SPINE_OFFSETS['4 slots']],
		[DEMO_SPINE_OFFSETS['4 slots'], 5, DEMO_SPINE_OFFSETS['2 slots']]
	])('stepping the spine from %s mm by %s is %s mm (held at the ends)', (from, delta, to) => {
		expect(stepAllowed(spine, from, delta)).toBe(to);
	});

	it('flatAlong lays a 140 × 140 × 25 fan thin along each axis', () => {
		const fan = standardPart('std-fan-140-25');
		for (const axis of [0, 1, 2] as const) {
			const b = placedBounds(fan, {
				id: 'f',
				partId: fan.id,
				position: [0, 0, 0],
				rotation: flatAlong(fan, axis)
			});
			expect(b.max[axis] - b.min[axis]).toBe(25);
		}
	});
});

describe('placeInRoom turns parts to fit', () => {
	/**
	 * The oracle: every one of the 4³ = 64 turn triples (which cover the 24 distinct orientations)
	 * at every 1 mm grid position of the room, checked with three.js Box3 for shared volume.
	 */
	function someTurnFits(room: Box, part: PartDef, blocked: Box[]): boolean {
		for (let x = 0; x < 4; x++) {
			for (let y = 0; y < 4; y++) {
				for (let z = 0; z < 4; z++) {
					if (bruteForceSpot(room, turnedFootprint(part, { x, y, z }).size, blocked, 1)) {
						return true;
					}
				}
			}
		}
		return false;
	}

	const int = (min: number, max: number) => fc.integer({ min, max });
	const caseArb = fc.record({
		roomSize: fc.tuple(int(2, 14), int(2, 14), int(2, 14)),
		body: fc.tuple(int(1, 12), int(1, 9), int(1, 6)),
		keepout: int(0, 4),
		obstacles: fc.array(
			fc.tuple(int(-3, 14), int(-3, 14), int(-3, 14), int(1, 8), int(1, 8), int(1, 8)),
			{ maxLength: 5 }
		)
	});

	it('whenever some orientation fits (brute force over the 24 turns and a 1 mm grid), it finds a landing that is inside and overlaps nothing', () => {
		let fitted = 0;
		let full = 0;
		fc.assert(
			fc.property(caseArb, ({ roomSize, body, keepout, obstacles }) => {
				const room: Box = { min: [0, 0, 0], max: roomSize as Vec3 };
				const part = keepout
					? blockWithRoom('turning', body as Vec3, keepout)
					: blockPart('turning', body as Vec3);
				const blocked = obstacles.map(([x, y, z, w, h, d]) => boxAt([x, y, z], [w, h, d]));
				const expected = someTurnFits(room, part, blocked);
				const landing = placeInRoom(room, blocked, part);
				if (!expected) {
					full++;
					expect(landing).toHaveProperty('reason');
					return;
				}
				fitted++;
				expect(landing, 'a turn fits, so placement must find one').not.toHaveProperty('reason');
				if ('reason' in landing) return;
				const placed = placePart(part, placementAt('n', part, landing));
				for (const b of [...placed.bodies, ...placed.keepouts]) {
					for (let a = 0; a < 3; a++) {
						expect(b.box.min[a]).toBeGreaterThanOrEqual(room.min[a] - 1e-9);
						expect(b.box.max[a]).toBeLessThanOrEqual(room.max[a] + 1e-9);
					}
					for (const o of blocked) expect(sharedVolume(o, b.box)).toBe(0);
				}
			}),
			{ numRuns: 150 }
		);
		expect(fitted, 'the cases include parts that fit').toBeGreaterThan(20);
		expect(full, 'and parts that fit nowhere').toBeGreaterThan(5);
	});

	it('a 185 mm card that fits only lying on its side is turned, and says so', () => {
		// A narrow bay 60 wide, 130 tall, 200 deep: upright (185 along X) it cannot go in.
		const card = demoPart('demo-card');
		const bare = { ...card, keepouts: [] };
		const room: Box = { min: [0, 0, 0], max: [60, 130, 200] };
		const landing = placeInRoom(room, [], bare);
		expect(landing).not.toHaveProperty('reason');
		if ('reason' in landing) return;
		const b = placedBounds(bare, placementAt('c', bare, landing));
		// 40.64 thick across X, 120 tall in Y, 185 long in Z: spare 19.36, 10 and 15 mm; the least is 10 mm.
		expect(boxSizeOf(b)).toEqual([40.64, 120, 185].map((v) => expect.closeTo(v, 6)));
		expect(landing.turn).not.toBe('as in the catalogue');
		expect(landing.turn).toMatch(/about/);
	});

	it('keeps the catalogue’s own turn when it fits with as much room as any other', () => {
		const cube = blockPart('cube', [10, 10, 10]);
		const landing = placeInRoom({ min: [0, 0, 0], max: [50, 50, 50] }, [], cube);
		expect(landing).toMatchObject({ rotation: { x: 0, y: 0, z: 0 }, turn: 'as in the catalogue' });
	});

	it('when nothing fits, names the largest free space and the closest turn (worked example)', () => {
		// Card side 150 × 330 × 40 mm free; the card (no keep-outs) is 185 × 120 × 40.64: no turn fits,
		// since its 185 mm length exceeds 150 and 40 on two axes and only 330 takes it, leaving 150 and 40
		// for 120 and 40.64 — 40.64 > 40 by 0.64 mm, the closest attempt.
		const card = { ...demoPart('demo-card'), keepouts: [] };
		const landing = placeInRoom({ min: [0, 0, 0], max: [150, 330, 40] }, [], card, {
			roomLabel: 'the card side'
		});
		expect(landing).toHaveProperty('reason');
		if (!('reason' in landing)) return;
		expect(landing.reason).toContain(
			'the largest free space in the card side is 150 × 330 × 40 mm'
		);
		expect(landing.reason).toMatch(
			/this card needs (120 × 185 × 40\.6|120 × 185 × 40\.6) mm turned/
		);
	});

	it('a card with a slot mount only takes turns that put its length along the mount’s normal and its thickness across the slots', () => {
		const card = demoPart('demo-card');
		const slots = {
			id: 'slots',
			label: 'Slots',
			kind: 'slots' as const,
			face: 'back' as const,
			region: { min: [0, 0, 230], max: [150, 60, 240] } as Box,
			accepts: [],
			standoffMm: 0,
			slotPitchMm: 20.32
		};
		const turns = allowedTurns(card, [slots]);
		expect(turns.length).toBe(4);
		for (const r of turns) {
			const s = boxSizeOf(
				placedBounds(
					{ ...card, keepouts: [] },
					{ id: 'c', partId: card.id, position: [0, 0, 0], rotation: r }
				)
			);
			expect(s[2]).toBeCloseTo(185, 6);
			expect(s[0]).toBeCloseTo(40.64, 6);
		}
		expect(allowedTurns(blockPart('b', [1, 2, 3]), [slots]).length).toBe(24);
		expect(allowedTurns(card, []).length).toBe(24);
	});

	it('largestFreeBox finds a box that is free, and the whole room when it is empty', () => {
		const room: Box = { min: [0, 0, 0], max: [100, 50, 40] };
		expect(largestFreeBox(room, [])).toEqual(room);
		const blocked = [boxAt([0, 0, 0], [60, 50, 40])];
		expect(largestFreeBox(room, blocked)).toEqual({ min: [60, 0, 0], max: [100, 50, 40] });
		expect(largestFreeBox(room, [room])).toBeNull();
	});

	it('turnWords says the turn in the engine’s order', () => {
		expect(turnWords({ x: 0, y: 0, z: 0 })).toBe('as in the catalogue');
		expect(turnWords({ x: 1, y: 0, z: 2 })).toBe(
			'a quarter turn about X, then a half turn about Z'
		);
	});
});

function boxSizeOf(b: Box): Vec3 {
	return [b.max[0] - b.min[0], b.max[1] - b.min[1], b.max[2] - b.min[2]];
}

/** A turned part's footprint (bodies and keep-outs) size, through the engine's own placePart. */
function turnedFootprint(part: PartDef, rotation: Placement['rotation']): { size: Vec3 } {
	const rp = placePart(part, { id: 't', partId: part.id, position: [0, 0, 0], rotation });
	const all = [...rp.bodies, ...rp.keepouts].map((b) => b.box);
	const min = [0, 1, 2].map((a) => Math.min(...all.map((b) => b.min[a])));
	const max = [0, 1, 2].map((a) => Math.max(...all.map((b) => b.max[a])));
	return { size: [max[0] - min[0], max[1] - min[1], max[2] - min[2]] };
}
