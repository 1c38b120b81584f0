import { describe, expect, it } from 'vitest';
import { checkLoops } from '$lib/geometry/loop';
import { defaultFittings, defaultTubeKinds } from '$lib/geometry/loop-library';
import { routeMany } from '$lib/geometry/route';
import { resolveScene } from '$lib/geometry/resolve';
import { formatZodIssues, sceneSchema, type SceneInput } from '$lib/geometry/schema';
import { checkScene } from '$lib/geometry/check';
import { variantSettingsSchema } from '$lib/builds/settings';
import { pumpLoopScene } from '$lib/server/testing/engine-factories';
import { addRun } from './edit';
import {
	acceptRoute,
	bendPenaltyOf,
	DRAFT_RUN_ID,
	draftRouteRequest,
	routeRequest,
	setBendPenalty,
	type RouteRequest
} from './suggest';

/** The loop checker's pump-and-reservoir scene with a block across the first run's top segment. */
const scene = () => pumpLoopScene(() => {}, { block: true });

function parse(input: SceneInput) {
	const parsed = sceneSchema.safeParse(input);
	if (!parsed.success) throw new Error(JSON.stringify(formatZodIssues(parsed.error)));
	return parsed.data;
}

/** Routes every run of the request, expects each found, and accepts its best route into loop 0. */
function routeAndAccept(input: SceneInput, req: Extract<RouteRequest, { ok: true }>) {
	const { results } = routeMany(req.runs, req.shared);
	let settings = variantSettingsSchema.parse({ loops: input.loops });
	for (const run of req.runs) {
		const res = results[run.id];
		expect(res.ok).toBe(true);
		if (res.ok) settings = acceptRoute(settings, 0, run.id, res.routes[0].waypoints);
	}
	return { results, settings };
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
		const { settings } = routeAndAccept(input, req);
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
		const { results, settings } = routeAndAccept(input, req);
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
	it('suggests a route for a run still being drafted, the same one the saved run would get', () => {
		// The first run taken out of the loop and drafted again: its ports, tube and fittings only.
		const input = scene();
		const full = parse(input);
		const [first, second] = full.loops![0].runs;
		const withoutFirst = parse({
			...input,
			loops: [{ ...input.loops![0], runs: [second] }],
			tubeKinds: input.tubeKinds
		});
		const resolved = resolveScene(withoutFirst);
		const reports = checkLoops(withoutFirst, resolved);
		const catalogue = { tubeKinds: defaultTubeKinds(), fittings: defaultFittings() };
		const draft = { from: first.from, to: first.to, tube: first.tube, fittings: first.fittings };
		const req = draftRouteRequest(withoutFirst, resolved, reports, 0, draft, catalogue);
		if (!req.ok) throw new Error(req.message);
		expect(req.runs.map((r) => r.id)).toEqual([DRAFT_RUN_ID]);
		// Oracle: the saved run's own request (the run back in the loop, before run 2 as it was).
		const saved = routeRequest(
			full,
			resolveScene(full),
			checkLoops(full, resolveScene(full)),
			0,
			[0]
		);
		if (!saved.ok) throw new Error(saved.message);
		expect(req.runs[0]).toEqual({ ...saved.runs[0], id: DRAFT_RUN_ID });
		const answer = routeMany(req.runs, { ...req.shared, maxAlternatives: 1 });
		const res = answer.results[DRAFT_RUN_ID];
		if (!res.ok) throw new Error(res.reason);
		// Accepted: the run is created with the route's waypoints and the checker finds it clear.
		const settings = variantSettingsSchema.parse({
			placements: withoutFirst.placements,
			loops: withoutFirst.loops
		});
		const next = addRun(settings, 0, { ...draft, waypoints: res.routes[0].waypoints });
		const after = parse({ ...input, loops: next.loops });
		const run = after.loops![0].runs.at(-1)!;
		expect(run.waypoints).toEqual(res.routes[0].waypoints);
		const report = checkLoops(after, resolveScene(after))[0].runs.find((r) => r.runId === run.id)!;
		expect(report.problems).toEqual([]);
		// A tube kind the studio lacks is refused in words.
		const none = draftRouteRequest(
			withoutFirst,
			resolved,
			reports,
			0,
			{ ...draft, tube: 'x' },
			catalogue
		);
		expect(none).toEqual({ ok: false, message: 'Pick a tube kind for the new run.' });
	});
});
