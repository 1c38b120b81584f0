import { describe, expect, it } from 'vitest';
import { toBox3 } from '../server/testing/engine-box3';
import { checkScene } from './check';
import { resolveScene } from './resolve';
import { routeEach } from './route';
import { sceneSchema, type SceneInput } from './schema';
import { demoCables, demoSceneInput } from './standard-library';
import { cableRouteRequest } from '../loop/suggest';
import { cableWords } from '../words/sheet';

const demo = (edit: (s: SceneInput) => void = () => {}) => {
	const input: SceneInput = { ...demoSceneInput(), cables: demoCables() };
	edit(input);
	return sceneSchema.parse(input);
};

describe('power cables', () => {
	it('measures a hand-drawn 24-pin bundle: centre line with arcs plus both plugs (worked example)', () => {
		// Supply socket (33.5, 100, 170) +z, plug reach 20 → start (33.5, 100, 190); board socket
		// (12.6, 270, 208) +x, reach 25 → end (37.6, 270, 208). Waypoints (33.5, 100, 208),
		// (63.5, 100, 208), (63.5, 270, 208): legs 18 + 30 + 170 + 25.9 = 243.9 mm, three 90° bends of
		// r = 15 mm, each −2r + πr/2 = −6.438 mm: 224.59 mm. Plus 45 mm of plugs: 269.6 → about 270 mm.
		const scene = demo((s) => {
			s.cables![0].waypoints = [
				[33.5, 100, 208],
				[63.5, 100, 208],
				[63.5, 270, 208]
			];
		});
		const c = checkScene(scene).cables![0];
		expect(c.points![0]).toEqual([33.5, 100, 190]);
		expect(c.points!.at(-1)![0]).toBeCloseTo(37.6, 9);
		expect(c.lengthMm).toBeCloseTo(243.9 - 3 * (30 - (Math.PI * 15) / 2), 6);
		expect(c.plugReachMm).toBe(45);
		expect(cableWords(c.label, c.lengthMm + c.plugReachMm, c.where)).toBe(
			'24-pin: about 270\u2009mm, behind the supply, up the board'
		);
		expect(c.problems).toEqual([]);
	});

	it('reports a straight bundle through the processor block, and routes all three clear (three.js Box3 as oracle)', () => {
		const scene = demo();
		const before = checkScene(scene).cables!;
		expect(before[0].status).toBe('collides');
		expect(before[0].problems.map((p) => p.against.id)).toContain('cpu-block/body');
		const resolved = resolveScene(scene);
		const req = cableRouteRequest(scene, resolved, [], [0, 1, 2]);
		if (!req.ok) throw new Error(req.message);
		const { results } = routeEach(req.runs, { ...req.shared, maxAlternatives: 1 });
		// The card's cable too: its plug sits low on the card's end, under the pump-reservoir.
		expect(Object.values(results).map((r) => r.ok)).toEqual([true, true, true]);
		const routed = demo((s) => {
			for (const c of s.cables!) {
				const res = results[c.id];
				if (res?.ok) c.waypoints = res.routes[0].waypoints;
			}
		});
		const after = checkScene(routed).cables!;
		const bodies = resolveScene(routed).placements.flatMap((p) => p.bodies.map((b) => b.box));
		expect(after).toHaveLength(3);
		for (const c of after) {
			expect(c.problems).toEqual([]);
			for (const piece of c.pieces) {
				for (const body of bodies) {
					// Open boxes: touching is clear, so shrink one by a hair before asking three.js.
					const inner = toBox3(piece).expandByScalar(-1e-6);
					expect(inner.intersectsBox(toBox3(body))).toBe(false);
				}
			}
		}
	});

	it('refuses a cable on a coolant port, naming the field', () => {
		const res = sceneSchema.safeParse({
			...demoSceneInput(),
			cables: [{ ...demoCables()[0], to: { placementId: 'cpu-block', portId: 'in' } }]
		});
		expect(res.success).toBe(false);
		expect(JSON.stringify(res.error?.issues)).toContain('A cable joins power ports');
	});
});
