import { describe, expect, it } from 'vitest';
import { checkScene, resolveScene, sceneSchema, type Scene } from '$lib/geometry';
import { demoScene } from '$lib/geometry/standard-library';
import { demoLoopBackRun } from '$lib/server/testing/engine-factories';
import { findRoute, routeBoxes } from '$lib/geometry/route';
import { cableLengthWords, routeInputFor, routeRunSchema } from './routes';

/** The routed tube as a placed part of its own, so checkScene judges its room like any body. */
function withTube(scene: Scene, boxes: { min: number[]; max: number[] }[]): Scene {
	return sceneSchema.parse({
		...scene,
		parts: [
			...scene.parts,
			{
				id: 'routed-tube',
				name: 'Routed tube',
				category: 'fitting',
				bodies: boxes.map((b, i) => ({ id: `piece-${i}`, label: `tube piece ${i + 1}`, box: b }))
			}
		],
		placements: [...scene.placements, { id: 'tube', partId: 'routed-tube', position: [0, 0, 0] }]
	});
}

describe('routes in the demo build', () => {
	it("routes a soft loop-back between the block's two ports clear of everything checkScene knows", () => {
		const scene = demoScene();
		// Soft tube: its ports sit 20 mm apart, room for two bends of 5 mm between them.
		const run = routeRunSchema.parse(demoLoopBackRun());
		const made = routeInputFor(scene, run);
		expect(made.ok).toBe(true);
		if (!made.ok) return;
		const res = findRoute(made.input);
		expect(res.ok).toBe(true);
		if (!res.ok) return;
		for (const route of res.routes) {
			const points = [made.input.start.point, ...route.waypoints, made.input.end.point];
			const boxes = routeBoxes(points, run.section, run.bendRadiusMm).map((b) => ({
				// The clearance is part of the room the route keeps: grow by it for the check.
				min: b.min.map((v) => v - run.clearanceMm + 1e-6),
				max: b.max.map((v) => v + run.clearanceMm - 1e-6)
			}));
			// Measured from the min corner of the tube's boxes: place the part there.
			const min = [0, 1, 2].map((a) => Math.min(...boxes.map((b) => b.min[a])));
			const local = boxes.map((b) => ({
				min: b.min.map((v, a) => v - min[a]),
				max: b.max.map((v, a) => v - min[a])
			}));
			const placed = withTube(scene, local);
			placed.placements[placed.placements.length - 1].position = min as [number, number, number];
			const report = checkScene(placed);
			const mine = report.overlaps.filter(
				(o) =>
					(o.a.placementId === 'tube' || o.b.placementId === 'tube') &&
					o.kind !== 'warning' &&
					// Its own ends sit in the two ports' fitting room, as they should.
					![o.a, o.b].some((x) => x.placementId === 'cpu-block' && x.keepoutKind === 'fitting')
			);
			expect(mine.map((o) => `${o.a.id} × ${o.b.id}`)).toEqual([]);
			expect(resolveScene(placed).placements.length).toBe(scene.placements.length + 1);
		}
	});

	it('names the field when a port does not exist', () => {
		const run = routeRunSchema.parse({
			from: { placementId: 'cpu-block', portId: 'nope' },
			to: { placementId: 'ghost', portId: 'in' },
			section: { kind: 'round', outerDiameterMm: 12 },
			bendRadiusMm: 24
		});
		const made = routeInputFor(demoScene(), run);
		expect(made.ok).toBe(false);
		if (!made.ok) expect(made.issue.path).toBe('run.from.portId');
	});
});

describe('cableLengthWords', () => {
	it('adds both plugs and rounds up to 10 mm: 231.4 + 2 × 8 = 247.4 → about 250 mm', () => {
		expect(cableLengthWords('24-pin', 231.4, 16, 'behind the board tray')).toBe(
			'24-pin: about 250 mm, behind the board tray'
		);
		expect(cableLengthWords('8-pin', 100, 0)).toBe('8-pin: about 100 mm');
	});
});
