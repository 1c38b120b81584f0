import { describe, expect, it } from 'vitest';
import { checkLoops } from '$lib/geometry/loop';
import { defaultFittings, defaultTubeKinds } from '$lib/geometry/loop-library';
import { routeMany } from '$lib/geometry/route';
import { resolveScene } from '$lib/geometry/resolve';
import {
	formatZodIssues,
	sceneSchema,
	type LoopDef,
	type PartDef,
	type SceneInput
} from '$lib/geometry/schema';
import { checkScene } from '$lib/geometry/check';
import { variantSettingsSchema } from '$lib/builds/settings';
import { blockPart, plainEnclosure } from '$lib/server/testing/engine-factories';
import { acceptRoute, bendPenaltyOf, routeRequest, setBendPenalty } from './suggest';

/**
 * A 400 mm cube inside with a pump and a reservoir joined by two 16 mm hard runs; a block
 * (x 120–160, y 260–380, z 20–140) sits across the first run's top segment (y 300, z 75).
 */
function scene(): SceneInput {
	const pump: PartDef = {
		...blockPart('pump', [60, 60, 60]),
		name: 'Pump',
		category: 'pump',
		ports: [
			{ id: 'in', position: [15, 60, 30], direction: '+y', thread: 'G 1/4' },
			{ id: 'out', position: [60, 30, 30], direction: '+x', thread: 'G 1/4' }
		]
	};
	const res: PartDef = {
		...blockPart('res', [80, 100, 70]),
		name: 'Reservoir',
		category: 'reservoir',
		ports: [
			{ id: 'out', position: [20, 100, 35], direction: '+y', thread: 'G 1/4' },
			{ id: 'in', position: [80, 70, 35], direction: '+x', thread: 'G 1/4' }
		]
	};
	const loop: LoopDef = {
		id: 'main',
		runs: [
			{
				id: 'r1',
				from: { placementId: 'res-1', portId: 'out' },
				to: { placementId: 'pump-1', portId: 'in' },
				tube: 'hard-16',
				fittings: { from: 'fit-straight-16', to: 'fit-straight-16' },
				waypoints: [
					[220, 300, 75],
					[65, 300, 75]
				]
			},
			{
				id: 'r2',
				from: { placementId: 'pump-1', portId: 'out' },
				to: { placementId: 'res-1', portId: 'in' },
				tube: 'hard-16',
				fittings: { from: 'fit-straight-16', to: 'fit-straight-16' },
				waypoints: [
					[350, 50, 75],
					[350, 170, 75]
				]
			}
		],
		plugs: []
	};
	return {
		format: 'interstice.scene',
		version: 1,
		enclosure: plainEnclosure([400, 400, 400]),
		parts: [pump, res, blockPart('block', [40, 120, 120]), ...defaultFittings()],
		placements: [
			{ id: 'pump-1', partId: 'pump', position: [50, 20, 45] },
			{ id: 'res-1', partId: 'res', position: [200, 100, 40] },
			{ id: 'block-1', partId: 'block', position: [120, 260, 20] }
		],
		tubeKinds: defaultTubeKinds(),
		loops: [loop]
	};
}

function parse(input: SceneInput) {
	const parsed = sceneSchema.safeParse(input);
	if (!parsed.success) throw new Error(JSON.stringify(formatZodIssues(parsed.error)));
	return parsed.data;
}

describe('suggest a route for a loop', () => {
	it('routes every run, and the accepted routes are ordinary runs the checker finds clear', () => {
		const input = scene();
		const s = parse(input);
		const resolved = resolveScene(s);
		const before = checkLoops(s, resolved)[0].runs[0].problems;
		expect(before.some((p) => p.kind === 'collides')).toBe(true);
		const req = routeRequest(s, resolved, checkLoops(s, resolved), 0, [0, 1]);
		expect(req.ok).toBe(true);
		if (!req.ok) return;
		expect(req.runs.map((r) => r.mode)).toEqual(['hard', 'hard']);
		// The start is the port pushed out by the straight fitting's reach (24 mm): 200 + 20, 100 + 100 + 24.
		expect(req.runs[0].start).toEqual({ point: [220, 224, 75], direction: '+y' });
		const { results } = routeMany(req.runs, req.shared);
		let settings = variantSettingsSchema.parse({ loops: input.loops });
		for (const run of req.runs) {
			const res = results[run.id];
			expect(res.ok).toBe(true);
			if (res.ok) settings = acceptRoute(settings, 0, run.id, res.routes[0].waypoints);
		}
		const accepted = parse({ ...input, loops: settings.loops });
		const report = checkScene(accepted);
		for (const run of report.loops![0].runs) {
			expect(run.problems.filter((p) => p.kind !== 'warning')).toEqual([]);
			expect(run.cutLengthMm).toBeGreaterThan(0);
		}
		expect(report.overlaps.filter((o) => o.kind === 'collides')).toEqual([]);
	});

	it('routes runs on bare ports: their ends are lifted off the part, lengths kept', () => {
		const input = scene();
		for (const run of input.loops![0].runs) run.fittings = { from: null, to: null };
		const s = parse(input);
		const resolved = resolveScene(s);
		const req = routeRequest(s, resolved, checkLoops(s, resolved), 0, [0, 1]);
		if (!req.ok) throw new Error(req.message);
		// Reservoir out (220, 200, 75) +y, bare: the search starts 8 + 2 mm out (the 16 mm tube's
		// half-width plus its clearance), and so does it end.
		expect(req.runs[0].start.point).toEqual([220, 210, 75]);
		expect(req.extraMm.r1).toBe(20);
		const { results } = routeMany(req.runs, req.shared);
		let settings = variantSettingsSchema.parse({ loops: input.loops });
		for (const run of req.runs) {
			const res = results[run.id];
			expect(res.ok).toBe(true);
			if (res.ok) settings = acceptRoute(settings, 0, run.id, res.routes[0].waypoints);
		}
		const report = checkScene(parse({ ...input, loops: settings.loops }));
		for (const run of report.loops![0].runs) {
			expect(run.problems.filter((p) => p.kind !== 'warning')).toEqual([]);
			const res = results[run.runId];
			if (res.ok) {
				expect(run.lengthMm).toBeCloseTo(res.routes[0].lengthMm + req.extraMm[run.runId], 6);
			}
		}
	});

	it('keeps the other runs as obstacles when one run is routed', () => {
		const s = parse(scene());
		const resolved = resolveScene(s);
		const req = routeRequest(s, resolved, checkLoops(s, resolved), 0, [1]);
		expect(req.ok).toBe(true);
		if (!req.ok) return;
		expect(req.runs.map((r) => r.id)).toEqual(['r2']);
		expect(req.shared.obstacles.some((o) => 'id' in o && o.id?.startsWith('run:r1/'))).toBe(true);
		expect(req.shared.obstacles.some((o) => 'id' in o && o.id?.startsWith('run:r2/'))).toBe(false);
	});

	it('reads the loop bend penalty, 100 mm when none is set', () => {
		const settings = variantSettingsSchema.parse({ loops: scene().loops });
		expect(bendPenaltyOf(settings.loops![0])).toBe(100);
		expect(bendPenaltyOf(setBendPenalty(settings, 0, 40).loops![0])).toBe(40);
		expect(
			sceneSchema.safeParse({ ...scene(), loops: [{ ...scene().loops![0], bendPenaltyMm: -1 }] })
				.success
		).toBe(false);
	});
});
