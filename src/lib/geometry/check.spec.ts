/** The fit report against three.js Box3, its invariants, and the edge cases of status and moves. */
import fc from 'fast-check';
import { Vector3 } from 'three';
import { fromBox3, toBox3 } from '../server/testing/engine-box3';
import { describe, expect, it } from 'vitest';
import { EPSILON_MM, boxSize } from './box';
import { checkScene } from './check';
import {
	blockPart,
	eachCheckedScene,
	makeScene,
	plainEnclosure,
	sceneArb,
	worldBoxesOf
} from '../server/testing/engine-factories';
import { pairKind } from './pairs';
import { resolveScene } from './resolve';
import type { PartDef, Scene, Vec3 } from './schema';
import type { WorldBox } from './types';

// Without mount plates: the Box3 oracle below counts the pairs the scene's own boxes make.
const worldBoxes = (scene: Scene): WorldBox[] => worldBoxesOf(scene, { plates: false });

const pairKey = (a: string, b: string) => (a < b ? `${a}|${b}` : `${b}|${a}`);

describe('fit report against three.js Box3 (1,000 random scenes)', () => {
	it('reports exactly the overlapping pairs, with three.js overlap boxes, volumes and depths', () => {
		fc.assert(
			fc.property(sceneArb, (scene) => {
				const boxes = worldBoxes(scene);
				const expected = new Map<string, { box: ReturnType<typeof fromBox3>; volume: number }>();
				for (let i = 0; i < boxes.length; i++) {
					for (let j = i + 1; j < boxes.length; j++) {
						if (!pairKind(boxes[i], boxes[j])) continue;
						const A = toBox3(boxes[i].box);
						const B = toBox3(boxes[j].box);
						if (!A.intersectsBox(B)) continue;
						const shared = A.clone().intersect(B);
						const s = shared.getSize(new Vector3());
						if (s.x > EPSILON_MM && s.y > EPSILON_MM && s.z > EPSILON_MM) {
							expected.set(pairKey(boxes[i].id, boxes[j].id), {
								box: fromBox3(shared),
								volume: s.x * s.y * s.z
							});
						}
					}
				}
				const report = checkScene(scene);
				expect(report.overlaps.map((o) => pairKey(o.a.id, o.b.id)).sort()).toEqual(
					[...expected.keys()].sort()
				);
				for (const o of report.overlaps) {
					const e = expected.get(pairKey(o.a.id, o.b.id))!;
					expect(o.box).toEqual(e.box);
					expect(o.volumeMm3).toBeCloseTo(e.volume, 6);
					expect(o.depthMm).toEqual(boxSize(e.box));
				}
			}),
			{ numRuns: 1000 }
		);
	});

	it('marks a part outside exactly when the inner box does not containsBox one of its bodies', () => {
		eachCheckedScene(sceneArb, 1000, (scene, report) => {
			const resolved = resolveScene(scene);
			const inner = toBox3(resolved.innerBox);
			for (const rp of resolved.placements) {
				const part = report.parts.find((p) => p.placementId === rp.placement.id)!;
				const contained = rp.bodies.every((b) => inner.containsBox(toBox3(b.box)));
				expect(part.outsideFaces.length === 0).toBe(contained);
				if (!contained && part.status !== 'collides' && part.status !== 'blocked') {
					expect(part.status).toBe('outside');
				}
			}
		});
	});
});

describe('invariants', () => {
	it('the same scene gives the same report; reordering parts and placements changes nothing', () => {
		eachCheckedScene(sceneArb, 300, (scene, report) => {
			expect(checkScene(structuredClone(scene))).toEqual(report);
			const reordered = {
				...scene,
				parts: [...scene.parts].reverse(),
				placements: [...scene.placements].reverse()
			};
			expect(checkScene(reordered)).toEqual(report);
		});
	});

	it('overlaps are symmetric: a before b by id, whichever was placed first', () => {
		fc.assert(
			fc.property(sceneArb, (scene) => {
				for (const o of checkScene(scene).overlaps) expect(o.a.id < o.b.id).toBe(true);
			}),
			{ numRuns: 300 }
		);
	});

	it('moving every part by the same step (far from the walls) keeps every part-to-part overlap', () => {
		const enclosure = plainEnclosure([4000, 4000, 4000]);
		const placed = fc.array(
			fc.record({
				size: fc.tuple(
					fc.integer({ min: 1, max: 80 }),
					fc.integer({ min: 1, max: 80 }),
					fc.integer({ min: 1, max: 80 })
				),
				at: fc.tuple(
					fc.integer({ min: 1000, max: 1150 }),
					fc.integer({ min: 1000, max: 1150 }),
					fc.integer({ min: 1000, max: 1150 })
				),
				turn: fc.integer({ min: 0, max: 3 })
			}),
			{ minLength: 1, maxLength: 10 }
		);
		fc.assert(
			fc.property(
				placed,
				fc.tuple(
					fc.integer({ min: -900, max: 900 }),
					fc.integer({ min: -900, max: 900 }),
					fc.integer({ min: -900, max: 900 })
				),
				(items, t) => {
					const parts: PartDef[] = items.map((it, i) => blockPart(`p${i}`, it.size as Vec3));
					const at = (shift: Vec3) =>
						makeScene({
							enclosure,
							parts,
							placements: items.map((it, i) => ({
								id: `pl${i}`,
								partId: `p${i}`,
								position: it.at.map((v, k) => v + shift[k]) as Vec3,
								rotation: { x: 0, y: it.turn, z: 0 }
							}))
						});
					const strip = (s: Scene) => checkScene(s).overlaps.map((o) => ({ ...o, box: undefined }));
					expect(strip(at(t as Vec3))).toEqual(strip(at([0, 0, 0])));
				}
			),
			{ numRuns: 300 }
		);
	});
});

describe('edge cases', () => {
	const enclosure = plainEnclosure([200, 200, 200]);
	const two = (
		a: Vec3,
		b: Vec3,
		sizeA: Vec3 = [50, 50, 50],
		sizeB: Vec3 = [50, 50, 50],
		rotB = { x: 0, y: 0, z: 0 }
	) =>
		checkScene(
			makeScene({
				enclosure,
				parts: [blockPart('A', sizeA), blockPart('B', sizeB)],
				placements: [
					{ id: 'a', partId: 'A', position: a },
					{ id: 'b', partId: 'B', position: b, rotation: rotB }
				],
				marginMm: 2
			})
		);

	it.each([
		['touching faces', [10, 10, 10], [60, 10, 10], 0, 'tight'],
		['1 mm apart (under a 2 mm margin)', [10, 10, 10], [61, 10, 10], 0, 'tight'],
		['touching edge only', [10, 10, 10], [60, 60, 10], 0, 'clear'],
		['overlap by 2.5 mm', [10, 10, 10], [57.5, 10, 10], 2.5 * 50 * 50, 'collides'],
		['nested', [10, 10, 10], [20, 20, 20], 30 * 30 * 30, 'collides']
	] as [string, Vec3, Vec3, number, string][])('%s', (_name, a, b, volume, status) => {
		const sizeB: Vec3 = _name === 'nested' ? [30, 30, 30] : [50, 50, 50];
		const report = two(a, b, [50, 50, 50], sizeB);
		expect(report.totals.interferenceVolumeMm3).toBeCloseTo(volume, 9);
		expect(report.parts.find((p) => p.placementId === 'a')!.status).toBe(status);
		expect(report.overlaps).toHaveLength(volume > 0 ? 1 : 0);
	});

	it.each([
		['no turn', { x: 0, y: 0, z: 0 }, [100, 20, 10], 0],
		['turned about z: 100 mm now along y', { x: 0, y: 0, z: 1 }, [100, 20, 10], 0],
		['turned about y: 100 mm now along z, reaching into a', { x: 0, y: 1, z: 0 }, [100, 20, 10], 1]
	] as const)('rotated part: %s', (_name, rot, size, overlaps) => {
		// b's min corner lands at [10, 60, 0] whatever the turn; a sits at [0, 60, 50].
		const report = two([0, 60, 50], [10, 60, 0], [50, 50, 50], [...size], rot);
		expect(report.overlaps).toHaveLength(overlaps);
	});

	it('zero-volume contact with a wall is a gap of 0, not a collision', () => {
		const report = two([0, 0, 0], [150, 150, 150]);
		const a = report.parts.find((p) => p.placementId === 'a')!;
		expect(report.overlaps).toEqual([]);
		expect(a.gaps['-x']).toMatchObject({ gapMm: 0, against: { id: 'wall:left' } });
		expect(a.gaps['-y']).toMatchObject({ gapMm: 0, held: true });
		expect(a.status).toBe('tight');
		const b = report.parts.find((p) => p.placementId === 'b')!;
		expect(b.gaps['+x']).toMatchObject({ gapMm: 0, against: { id: 'wall:right' } });
	});

	it('the clearing move is the smallest axis and moves the part, not the wall', () => {
		const report = two([-1.5, 20, 20], [120, 20, 20]);
		const [o] = report.overlaps;
		expect(o.a.id).toBe('a/body');
		expect(o.b.id).toBe('wall:left');
		expect(o.kind).toBe('collides');
		expect(o.depthMm).toEqual([1.5, 50, 50]);
		expect(o.clearingMove).toEqual({
			targetId: 'a',
			targetKind: 'part',
			axis: 'x',
			sign: 1,
			distanceMm: 1.5
		});
		expect(report.parts.find((p) => p.placementId === 'a')!.outsideFaces).toEqual(['-x']);
	});

	it('a locked part is not the one asked to move', () => {
		const scene = makeScene({
			enclosure,
			parts: [blockPart('A', [50, 50, 50])],
			placements: [
				{ id: 'a', partId: 'A', position: [10, 10, 10] },
				{ id: 'b', partId: 'A', position: [55, 10, 10], locked: true }
			]
		});
		const [o] = checkScene(scene).overlaps;
		expect(o.clearingMove).toMatchObject({ targetId: 'a', axis: 'x', sign: -1, distanceMm: 5 });
	});

	describe('keep-outs', () => {
		const fan = (kind: 'airflow' | 'fitting', severity: 'error' | 'warning' = 'error') =>
			blockPart('F', [120, 120, 25], {
				keepouts: [
					{ id: 'k', label: 'air', kind, severity, box: { min: [0, 0, -10], max: [120, 120, 0] } }
				]
			});
		const sceneWith = (frontKind: 'solid' | 'mesh', part: PartDef) => {
			const e = plainEnclosure([200, 200, 200]);
			e.walls.front.kind = frontKind;
			return makeScene({
				enclosure: e,
				parts: [part],
				placements: [{ id: 'fan', partId: 'F', position: [40, 40, 5] }]
			});
		};

		it.each([
			['airflow through a mesh panel', 'mesh', fan('airflow'), 'clear', 0],
			['airflow into a solid panel', 'solid', fan('airflow'), 'blocked', 1],
			['fitting room through a mesh panel', 'mesh', fan('fitting'), 'blocked', 1],
			['a warning keep-out in a solid panel', 'solid', fan('airflow', 'warning'), 'clear', 1]
		] as const)('%s', (_name, frontKind, part, status, overlaps) => {
			const report = checkScene(sceneWith(frontKind, part));
			expect(report.parts[0].status).toBe(status);
			expect(report.overlaps).toHaveLength(overlaps);
		});

		it('a body in another part’s keep-out blocks both; status precedence puts collides first', () => {
			const e = plainEnclosure([300, 200, 200]);
			const withKeepout = blockPart('K', [50, 50, 50], {
				keepouts: [
					{
						id: 'room',
						label: 'fittings',
						kind: 'fitting',
						severity: 'error',
						box: { min: [50, 0, 0], max: [80, 50, 50] }
					}
				]
			});
			const report = checkScene(
				makeScene({
					enclosure: e,
					parts: [withKeepout, blockPart('B', [40, 40, 40])],
					placements: [
						{ id: 'k', partId: 'K', position: [10, 10, 10] },
						{ id: 'intruder', partId: 'B', position: [70, 10, 10] },
						{ id: 'third', partId: 'B', position: [100, 10, 10] }
					],
					marginMm: 0
				})
			);
			const status = Object.fromEntries(report.parts.map((p) => [p.placementId, p.status]));
			expect(status).toEqual({ intruder: 'collides', k: 'blocked', third: 'collides' });
			// The intruder cannot back out of the keep-out without running into k's body, nor go
			// on without deepening its collision with the third; lifting k 40 mm clears both.
			const blocked = report.overlaps.find((o) => o.kind === 'blocked')!;
			expect(blocked.moves).toEqual([
				{ targetId: 'k', targetKind: 'part', axis: 'y', sign: 1, distanceMm: 40 },
				{ targetId: 'k', targetKind: 'part', axis: 'z', sign: 1, distanceMm: 40 }
			]);
		});
	});
});
