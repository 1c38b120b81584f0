/**
 * Gaps, worst cases and the interference total against oracles written here: a brute-force
 * nearest-box search over every body, face and obstacle, and an exact union volume by coordinate
 * compression over every collision region (a plain full grid, not the engine's grouping).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { EPSILON_MM, FACES, panelOf } from './box';
import { checkScene } from './check';
import { innerSizeMm } from './enclosure';
import {
	blockPart,
	eachCheckedScene,
	makeScene,
	plainEnclosure,
	sceneArb,
	sharedAlong,
	worldBoxesOf
} from '../server/testing/engine-factories';
import { pairKind } from './pairs';
import { resolveScene } from './resolve';
import type { Box, Scene } from './schema';
import type { WorldBox } from './types';

/** Random scenes whose parts carry tolerances (0, 0.2 or 0.5 mm, as datasheets and calipers give). */
const tolerancedArb = fc
	.tuple(sceneArb, fc.array(fc.constantFrom(0, 0.2, 0.5), { minLength: 4, maxLength: 4 }))
	.map(([scene, tol]): Scene => ({
		...scene,
		parts: scene.parts.map((p, i) => ({ ...p, toleranceMm: tol[i] }))
	}));

/**
 * The oracle's gap of one face: over the part's bodies and every obstacle (not a keep-out, not the
 * part's own) that shares area with the body seen along the axis. A wall bounds only the face
 * toward it, measured to the inside; another box is ahead of +a when it reaches past the face, or
 * lies within the body's span on the +a side of its centre.
 */
function oracleGap(
	scene: Scene,
	placementId: string,
	face: (typeof FACES)[number]
): { gap: number; ahead: WorldBox[] } | null {
	const all = worldBoxesOf(scene);
	const inner = resolveScene(scene).innerBox;
	const a = 'xyz'.indexOf(face[1]);
	const high = face[0] === '+';
	const bodies = all.filter((b) => b.ownerId === placementId && b.kind === 'body');
	let best: number | null = null;
	const found: { gap: number; box: WorldBox }[] = [];
	for (const body of bodies) {
		for (const o of all) {
			if (o.ownerId === placementId || o.kind === 'keepout') continue;
			const shares = [0, 1, 2].every(
				(k) => k === a || sharedAlong(body.box, o.box, k) > EPSILON_MM
			);
			if (!shares) continue;
			let gap: number | null = null;
			if (o.kind === 'wall') {
				const wallAxis = { left: 0, right: 0, bottom: 1, top: 1, front: 2, back: 2 }[o.face!];
				const wallHigh = o.face === 'right' || o.face === 'top' || o.face === 'back';
				if (wallAxis === a && wallHigh === high) {
					gap = high ? inner.max[a] - body.box.max[a] : body.box.min[a] - inner.min[a];
				}
			} else {
				const pastHigh = o.box.max[a] > body.box.max[a] + EPSILON_MM;
				const pastLow = o.box.min[a] < body.box.min[a] - EPSILON_MM;
				const side = o.box.min[a] + o.box.max[a] - (body.box.min[a] + body.box.max[a]);
				const ahead = high
					? pastHigh || (!pastLow && side >= 0)
					: pastLow || (!pastHigh && side <= 0);
				if (ahead) gap = high ? o.box.min[a] - body.box.max[a] : body.box.min[a] - o.box.max[a];
			}
			if (gap === null) continue;
			found.push({ gap, box: o });
			if (best === null || gap < best) best = gap;
		}
	}
	if (best === null) return null;
	return {
		gap: best,
		ahead: found.filter((f) => Math.abs(f.gap - best!) <= 1e-9).map((f) => f.box)
	};
}

describe('gaps against a brute-force nearest-box search (1,000 random scenes)', () => {
	it(
		'each face reports the nearest box ahead of it, and its worst case takes both tolerances off',
		{ timeout: 120_000 },
		() => {
			eachCheckedScene(tolerancedArb, 1000, (scene, report) => {
				const tolerance = new Map(
					scene.placements.map((p) => [
						p.id,
						scene.parts.find((q) => q.id === p.partId)!.toleranceMm
					])
				);
				for (const part of report.parts) {
					for (const face of FACES) {
						const g = part.gaps[face];
						const expected = oracleGap(scene, part.placementId, face);
						if (!expected) {
							expect(g.gapMm).toBeNull();
							expect(g.worstCaseMm).toBeNull();
							continue;
						}
						expect(g.gapMm).toBeCloseTo(expected.gap, 9);
						// The reported box is one of those ahead at that distance: never a wall behind the face.
						expect(expected.ahead.map((b) => b.id)).toContain(g.against!.id);
						const otherTol = g.against!.placementId ? tolerance.get(g.against!.placementId)! : 0;
						expect(g.worstCaseMm).toBeCloseTo(
							expected.gap - tolerance.get(part.placementId)! - otherTol,
							9
						);
					}
				}
			});
		}
	);

	it('a face crossing a wall reports its overshoot: the crossing depth past the inside, against that wall', () => {
		eachCheckedScene(sceneArb, 1000, (scene, report) => {
			const resolved = resolveScene(scene);
			for (const rp of resolved.placements) {
				const part = report.parts.find((p) => p.placementId === rp.placement.id)!;
				for (const face of part.outsideFaces) {
					const g = part.gaps[face];
					const a = 'xyz'.indexOf(face[1]);
					const wall = resolved.walls.find((w) => w.face === panelOf(face));
					if (!wall || g.against?.kind !== 'wall') continue;
					expect(g.against.id).toBe(wall.id);
					// Depth past the inner face of the deepest body that meets the wall.
					const meeting = rp.bodies.filter((b) =>
						[0, 1, 2].every((k) => k === a || sharedAlong(b.box, wall.box, k) > EPSILON_MM)
					);
					const depth = Math.max(
						...meeting.map((b) =>
							face[0] === '+'
								? b.box.max[a] - resolved.innerBox.max[a]
								: resolved.innerBox.min[a] - b.box.min[a]
						)
					);
					expect(g.gapMm).toBeCloseTo(-depth, 9);
				}
			}
		});
	});
});

/** Exact union volume by coordinate compression over all boxes at once (the test's own oracle). */
function unionByGrid(boxes: readonly Box[]): number {
	const cuts = [0, 1, 2].map((k) =>
		[...new Set(boxes.flatMap((b) => [b.min[k], b.max[k]]))].sort((p, q) => p - q)
	);
	let total = 0;
	for (let i = 0; i + 1 < cuts[0].length; i++) {
		for (let j = 0; j + 1 < cuts[1].length; j++) {
			for (let k = 0; k + 1 < cuts[2].length; k++) {
				const c = [
					(cuts[0][i] + cuts[0][i + 1]) / 2,
					(cuts[1][j] + cuts[1][j + 1]) / 2,
					(cuts[2][k] + cuts[2][k + 1]) / 2
				];
				if (boxes.some((b) => [0, 1, 2].every((a) => b.min[a] < c[a] && c[a] < b.max[a]))) {
					total +=
						(cuts[0][i + 1] - cuts[0][i]) *
						(cuts[1][j + 1] - cuts[1][j]) *
						(cuts[2][k + 1] - cuts[2][k]);
				}
			}
		}
	}
	return total;
}

describe('interference total against an exact union (1,000 random scenes)', () => {
	it('is the volume of the union of every collision region, however many obstacles overlap a point', () => {
		fc.assert(
			fc.property(sceneArb, (scene) => {
				const boxes = worldBoxesOf(scene);
				const regions: Box[] = [];
				for (let i = 0; i < boxes.length; i++) {
					for (let j = i + 1; j < boxes.length; j++) {
						if (pairKind(boxes[i], boxes[j]) !== 'collides') continue;
						const d = [0, 1, 2].map((k) => sharedAlong(boxes[i].box, boxes[j].box, k));
						if (!d.every((v) => v > EPSILON_MM)) continue;
						regions.push({
							min: [0, 1, 2].map((k) =>
								Math.max(boxes[i].box.min[k], boxes[j].box.min[k])
							) as Box['min'],
							max: [0, 1, 2].map((k) =>
								Math.min(boxes[i].box.max[k], boxes[j].box.max[k])
							) as Box['max']
						});
					}
				}
				const report = checkScene(scene);
				const expected = unionByGrid(regions);
				expect(report.totals.interferenceVolumeMm3).toBeCloseTo(expected, 6);
				// Per-pair volumes stay pairwise: their sum is at least the union.
				const pairwise = report.overlaps
					.filter((o) => o.kind === 'collides')
					.reduce((s, o) => s + o.volumeMm3, 0);
				expect(pairwise).toBeGreaterThanOrEqual(expected - 1e-6);
			}),
			{ numRuns: 1000 }
		);
	});

	it('walls share no volume, and together fill the shell exactly (outer box minus inner box)', () => {
		fc.assert(
			fc.property(sceneArb, (scene) => {
				const walls = resolveScene(scene).walls.map((w) => w.box);
				for (let i = 0; i < walls.length; i++) {
					for (let j = i + 1; j < walls.length; j++) {
						expect([0, 1, 2].every((k) => sharedAlong(walls[i], walls[j], k) > EPSILON_MM)).toBe(
							false
						);
					}
				}
				const w = scene.enclosure.walls;
				const inner = innerSizeMm(scene.enclosure);
				const outer = [
					inner[0] + w.left.thicknessMm + w.right.thicknessMm,
					inner[1] + w.bottom.thicknessMm + w.top.thicknessMm,
					inner[2] + w.front.thicknessMm + w.back.thicknessMm
				];
				const shell = outer[0] * outer[1] * outer[2] - inner[0] * inner[1] * inner[2];
				expect(
					walls.reduce(
						(s, b) => s + (b.max[0] - b.min[0]) * (b.max[1] - b.min[1]) * (b.max[2] - b.min[2]),
						0
					)
				).toBeCloseTo(shell, 6);
			}),
			{ numRuns: 1000 }
		);
	});

	it('a part through a shell corner counts the corner once: 10 mm into three 2 mm walls', () => {
		const report = checkScene(cornerScene());
		// The block reaches 2 mm past the inside on x, y and z (−2 … 8 mm), so 2 mm into each of the
		// left, bottom and front panels: the part of it outside the inside is 10³ − 8³ = 488 mm³.
		expect(report.totals.interferenceVolumeMm3).toBeCloseTo(1000 - 512, 9);
		const pairs = report.overlaps.filter((o) => o.kind === 'collides');
		expect(pairs.map((o) => o.b.id).sort()).toEqual(['wall:bottom', 'wall:front', 'wall:left']);
	});
});

/** A 100 mm cube inside 2 mm walls, with a 10 mm block pushed 2 mm into its front-bottom-left corner. */
function cornerScene(): Scene {
	return makeScene({
		enclosure: plainEnclosure([100, 100, 100], 2),
		parts: [blockPart('cube', [10, 10, 10])],
		placements: [
			{ id: 'cube', partId: 'cube', position: [-2, -2, -2], rotation: { x: 0, y: 0, z: 0 } }
		],
		marginMm: 2,
		budgets: { wattsPer120mm: 100, psuHeadroomPct: 30 }
	});
}
