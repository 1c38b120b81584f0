/**
 * Openings in dividers: the solid pieces cover exactly the slab minus its openings (volumes add up,
 * no two pieces share a point, three.js Box3 as an independent oracle for which sample points lie
 * in a piece), the schema refuses openings outside the divider or on top of each other, and the
 * demo build's loop pump → CPU block → radiator → pump-reservoir is drawn through the cut-outs.
 */
import fc from 'fast-check';
import { Box3, Vector3 } from 'three';
import { toBox3 } from '../server/testing/engine-box3';
import { describe, expect, it } from 'vitest';
import { boxVolume, intersectBoxes } from './box';
import { checkScene } from './check';
import { runDef } from '../server/testing/engine-factories';
import { dividerBoxAt, dividerOpeningBoxes, dividerPiecesAt, subtractBox } from './enclosure';
import { checkLoops } from './loop';
import { defaultTubeKinds } from './loop-library';
import { resolveScene } from './resolve';
import {
	enclosureDefSchema,
	sceneSchema,
	type Box,
	type DividerDef,
	type EnclosureDef,
	type Vec3
} from './schema';
import { demoEnclosure, demoSceneInput } from './standard-library';

/** Strictly inside a box (Box3.containsPoint counts the faces; a shared face is no overlap). */
const strictlyIn = (b: Box3, p: Vector3) =>
	p.x > b.min.x &&
	p.x < b.max.x &&
	p.y > b.min.y &&
	p.y < b.max.y &&
	p.z > b.min.z &&
	p.z < b.max.z;

function enclosureWith(divider: DividerDef): EnclosureDef {
	return { ...demoEnclosure(), dividers: [divider] };
}

const spineAt = (openings: DividerDef['openings']): DividerDef => ({
	id: 'spine',
	label: 'Spine',
	axis: 'x',
	thicknessMm: 2,
	positions: { kind: 'list', options: [{ label: 'only', offsetMm: 86 }] },
	span: { z: { minMm: 66, maxMm: 240 } },
	openings
});

/** Up to four openings on a 1 mm grid inside a 340 × 174 mm spine, none overlapping an earlier one. */
const openingsArb = fc
	.array(
		fc.record({
			u: fc.integer({ min: 0, max: 330 }),
			v: fc.integer({ min: 0, max: 164 }),
			w: fc.integer({ min: 1, max: 120 }),
			h: fc.integer({ min: 1, max: 80 })
		}),
		{ maxLength: 4 }
	)
	.map((list) => {
		const kept: { id: string; at: [number, number]; size: [number, number] }[] = [];
		for (const o of list) {
			const at: [number, number] = [o.u, o.v];
			const size: [number, number] = [Math.min(o.w, 340 - o.u), Math.min(o.h, 174 - o.v)];
			const clash = kept.some((k) =>
				[0, 1].every((j) => at[j] < k.at[j] + k.size[j] && k.at[j] < at[j] + size[j])
			);
			if (!clash) kept.push({ id: `o${kept.length}`, at, size });
		}
		return kept;
	});

describe('divider openings: the solid pieces', () => {
	it('a worked example: a 100 × 50 mm hole in the middle of a 340 × 174 × 2 mm spine', () => {
		const d = spineAt([{ id: 'hole', at: [120, 60], size: [100, 50] }]);
		const enc = enclosureWith(d);
		const pieces = dividerPiecesAt(enc, d, 86);
		// 340 × 174 × 2 = 118,320 mm³; the hole 100 × 50 × 2 = 10,000 mm³; 108,320 mm³ left.
		expect(pieces.reduce((s, p) => s + boxVolume(p), 0)).toBeCloseTo(108_320, 6);
		// Below and above the hole on y, then before and behind it on z: four pieces.
		expect(pieces).toHaveLength(4);
		expect(dividerOpeningBoxes(enc, d, 86)).toEqual([{ min: [86, 120, 126], max: [88, 220, 176] }]);
	});

	it('cover exactly the slab minus its openings (volumes, no shared point, sample points against Box3)', () => {
		fc.assert(
			fc.property(
				openingsArb,
				fc.array(
					fc.tuple(
						fc.double({ min: 0, max: 1, noNaN: true }),
						fc.double({ min: 0, max: 1, noNaN: true }),
						fc.double({ min: 0, max: 1, noNaN: true })
					),
					{ minLength: 40, maxLength: 40 }
				),
				(openings, samples) => {
					const d = spineAt(openings);
					const enc = enclosureWith(d);
					expect(enclosureDefSchema.safeParse(enc).success).toBe(true);
					const slab = dividerBoxAt(enc, d, 86);
					const holes = dividerOpeningBoxes(enc, d, 86);
					const pieces = dividerPiecesAt(enc, d, 86);
					const volume = pieces.reduce((s, p) => s + boxVolume(p), 0);
					const holeVolume = holes.reduce((s, h) => s + boxVolume(h), 0);
					expect(volume).toBeCloseTo(boxVolume(slab) - holeVolume, 6);
					for (let i = 0; i < pieces.length; i++) {
						expect(
							boxVolume(intersectBoxes(pieces[i], slab) ?? { min: [0, 0, 0], max: [0, 0, 0] })
						).toBeCloseTo(boxVolume(pieces[i]), 9);
						for (let j = 0; j < i; j++) {
							const both = toBox3(pieces[i]).intersect(toBox3(pieces[j]));
							const size = both.getSize(new Vector3());
							expect(both.isEmpty() || size.x * size.y * size.z === 0).toBe(true);
						}
					}
					const pieces3 = pieces.map(toBox3);
					const holes3 = holes.map(toBox3);
					// Points strictly inside a hole hit no piece; points of the slab in no hole hit one.
					for (const [a, b, c] of samples) {
						const p = new Vector3(
							slab.min[0] + a * (slab.max[0] - slab.min[0]),
							slab.min[1] + b * (slab.max[1] - slab.min[1]),
							slab.min[2] + c * (slab.max[2] - slab.min[2])
						);
						const inHole = holes3.some((h) => strictlyIn(h, p));
						const onHoleFace = holes3.some((h) => h.containsPoint(p)) && !inHole;
						const hits = pieces3.filter((q) => strictlyIn(q, p)).length;
						if (inHole) expect(hits).toBe(0);
						else if (!onHoleFace && hits === 0) {
							// On a face between two pieces: then it is on the boundary of some piece.
							expect(pieces3.some((q) => q.containsPoint(p))).toBe(true);
						} else if (!onHoleFace) expect(hits).toBe(1);
					}
					for (const h of holes3) {
						const centre = h.getCenter(new Vector3());
						expect(pieces3.some((q) => strictlyIn(q, centre))).toBe(false);
					}
				}
			),
			{ numRuns: 200 }
		);
	});

	it('subtractBox leaves a box the hole misses whole and removes all of a box the hole covers', () => {
		const box: Box = { min: [0, 0, 0], max: [10, 10, 10] };
		expect(subtractBox(box, { min: [20, 0, 0], max: [30, 10, 10] })).toEqual([box]);
		expect(subtractBox(box, { min: [-1, -1, -1], max: [11, 11, 11] })).toEqual([]);
	});
});

describe('divider openings: the schema', () => {
	const parse = (openings: DividerDef['openings']) =>
		enclosureDefSchema.safeParse(enclosureWith(spineAt(openings)));
	const paths = (r: ReturnType<typeof parse>) =>
		r.success ? [] : r.error.issues.map((i) => [i.path.join('.'), i.message]);

	/** An opening `id` at `at` (mm from the spine's low corner) of `size`, on the plane's two axes. */
	const opening = (id: string, at: [number, number], size: [number, number]) => ({ id, at, size });

	it.each<[string, DividerDef['openings'], string[][]]>([
		[
			'an opening reaching past the divider',
			[opening('a', [300, 0], [50, 10])],
			[['dividers.0.openings.0.size.0', 'Reaches past the divider (340 mm on this axis)']]
		],
		// The spine spans z 66–240: 174 mm on its second plane axis.
		[
			'an opening reaching past it on its second axis',
			[opening('a', [0, 170], [10, 10])],
			[['dividers.0.openings.0.size.1', 'Reaches past the divider (174 mm on this axis)']]
		],
		[
			'an opening at a negative place',
			[opening('a', [-1, 0], [10, 10])],
			[['dividers.0.openings.0.at.0', 'Must not be negative']]
		],
		[
			'two openings that overlap',
			[opening('a', [0, 0], [20, 20]), opening('b', [10, 10], [20, 20])],
			[['dividers.0.openings.1.at', 'Overlaps opening a']]
		],
		[
			'two openings with one id',
			[opening('a', [0, 0], [20, 20]), opening('a', [20, 0], [20, 20])],
			[['dividers.0.openings.1.id', 'Duplicate id']]
		]
	])('refuses %s', (_, openings, issues) => {
		expect(paths(parse(openings))).toEqual(issues);
	});

	it('takes two openings whose edges touch (not an overlap)', () => {
		expect(parse([opening('a', [0, 0], [20, 20]), opening('b', [20, 0], [20, 20])]).success).toBe(
			true
		);
	});
});

describe('divider openings in the engine', () => {
	it('a run through the bulkhead cut-out meets nothing; without the cut-outs it hits the bulkhead; a part still counts the whole slab', () => {
		// The radiator's outlet (109, 320.5, 30) straight back to the pump-reservoir's inlet
		// (109, 320.5, 150): through the bulkhead's cut-out (x 20–130, y 300–336 mm).
		const loops = [
			{
				id: 'main',
				runs: [runDef('r1', ['radiator', 'out'], ['pump-res', 'in'], 'hard-12')],
				plugs: []
			}
		];
		const input = demoSceneInput();
		const withOpenings = sceneSchema.parse({ ...input, tubeKinds: defaultTubeKinds(), loops });
		const [open] = checkLoops(withOpenings, resolveScene(withOpenings));
		expect(open.runs[0].problems).toEqual([]);
		const enclosure = demoEnclosure();
		const solid = sceneSchema.parse({
			...input,
			enclosure: {
				...enclosure,
				dividers: enclosure.dividers.map(({ openings: _o, ...d }) => d)
			},
			tubeKinds: defaultTubeKinds(),
			loops
		});
		const [shut] = checkLoops(solid, resolveScene(solid));
		expect(shut.runs[0].problems.map((p) => p.text)).toContain(
			'Run 1, first segment, against the bulkhead'
		);
		// A 10 mm cube straddling the spine (x 82–92) inside its cut-out (y 200–335, z 75–140):
		// openings are for tubes and cables, a part is checked against the whole slab.
		const base = sceneSchema.parse(input);
		const cube = {
			id: 'probe-cube',
			name: 'Probe cube',
			category: 'other' as const,
			bodies: [
				{
					id: 'body',
					label: 'body',
					box: { min: [0, 0, 0] as Vec3, max: [10, 10, 10] as Vec3 }
				}
			]
		};
		const report = checkScene(
			sceneSchema.parse({
				...input,
				parts: [...base.parts, cube],
				placements: [
					...input.placements!,
					{
						id: 'probe',
						partId: 'probe-cube',
						position: [82, 260, 100],
						rotation: { x: 0, y: 0, z: 0 }
					}
				]
			})
		);
		expect(
			report.overlaps
				.filter((o) => o.kind === 'collides')
				.map((o) => [o.a.id, o.b.id].sort().join(' × '))
		).toContain('divider:spine × probe/body');
	});

	it('the demo loop is drawn through the cut-outs in 12 mm hard tube: every check passes', () => {
		// Waypoints by hand (bare ports, bend radius 24 mm: ≥ 24 mm at a run's ends, ≥ 48 mm between
		// two bends). Run 1 leaves the pump-reservoir's outlet (129, 320.5, 150) forwards, drops
		// above the card, crosses the spine's cut-out at y 225, z 100 and comes back to the block's
		// inlet (38.6, 225, 153); run 2 leaves the block's outlet (38.6, 245, 153), rises to the
		// bulkhead's cut-out and ends on the radiator's inlet (75, 320.5, 30); run 3 is straight, from
		// the radiator's outlet (109, 320.5, 30) through the bulkhead to the pump inlet (109, 320.5, 150).
		const hard = (id: string, from: [string, string], to: [string, string], waypoints: Vec3[]) =>
			runDef(id, from, to, 'hard-12', [null, null], waypoints);
		const scene = sceneSchema.parse({
			...demoSceneInput(),
			tubeKinds: defaultTubeKinds(),
			loops: [
				{
					id: 'main',
					runs: [
						hard(
							'r1',
							['pump-res', 'out'],
							['cpu-block', 'in'],
							[
								[129, 320.5, 100],
								[129, 225, 100],
								[75, 225, 100],
								[75, 225, 153]
							]
						),
						hard(
							'r2',
							['cpu-block', 'out'],
							['radiator', 'in'],
							[
								[75, 245, 153],
								[75, 320.5, 153]
							]
						),
						hard('r3', ['radiator', 'out'], ['pump-res', 'in'], [])
					],
					plugs: [{ placementId: 'pump-res', portId: 'fill' }],
					fill: { placementId: 'pump-res', portId: 'fill' }
				}
			]
		});
		const [loop] = checkLoops(scene, resolveScene(scene));
		expect(loop.checks.filter((c) => c.status === 'fail' || c.status === 'warn')).toEqual([]);
		expect(loop.runs.flatMap((r) => r.problems)).toEqual([]);
		// Run 3 is 120 mm of straight tube: from z 30 to z 150.
		expect(loop.runs[2].cutLengthMm).toBeCloseTo(120, 6);
	});

	it('the demo build itself still fits everywhere at its default positions', () => {
		const report = checkScene(sceneSchema.parse(demoSceneInput()));
		expect(report.overlaps.filter((o) => o.kind === 'collides')).toEqual([]);
	});
});
