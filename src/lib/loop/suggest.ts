/**
 * "Suggest a route" for a loop's runs: from the scene and the loop to the route search's input
 * (each run's tube kind gives its section, bend radius, clearance and hard or soft; each fitting's
 * reach where the run starts), and from an accepted route back to the run's waypoints. Millimetres.
 */
import type {
	LoopDef,
	PartDef,
	ResolvedScene,
	RunDef,
	Scene,
	TubeKindDef,
	Vec3
} from '$lib/geometry';
import { loopLookup, runEnds } from '$lib/geometry/loop-path';
import { portEnd, routeObstacles } from '$lib/geometry/route-scene';
import { resolveScene } from '$lib/geometry/resolve';
import { sceneSchema } from '$lib/geometry/schema';
import { demoCables, demoSceneInput } from '$lib/geometry/standard-library';
import {
	routeEach,
	sectionHalfWidthMm,
	type ManyRun,
	type RouteInput,
	type RouteObstacle
} from '$lib/geometry/route';
import type { LoopReport } from '$lib/geometry/loop';
import type { VariantSettings } from '$lib/builds/settings';
import { updateRun } from './edit';

/** Fewest bends first: one bend costs as much as 100 mm of tube (the loop's `bendPenaltyMm`). */
export const DEFAULT_BEND_PENALTY_MM = 100;

export function bendPenaltyOf(loop: LoopDef | null | undefined): number {
	return loop?.bendPenaltyMm ?? DEFAULT_BEND_PENALTY_MM;
}

export type RouteRequest =
	| {
			ok: true;
			runs: ManyRun[];
			/** Per run id: mm to add to a route's length (the ends lifted off a bare port, see lift). */
			extraMm: Record<string, number>;
			shared: Omit<RouteInput, 'start' | 'end' | 'section' | 'bendRadiusMm' | 'mode'>;
	  }
	| { ok: false; message: string };

/**
 * The search input for runs `indexes` of loop `l` (one run, or all of them). Every other run of
 * the scene keeps its boxes (from the last check) and is an obstacle; the runs being routed are
 * not, and their ports' fitting room is where they start. Walls are the bounds' faces.
 */
export function routeRequest(
	scene: Scene,
	resolved: ResolvedScene,
	reports: readonly LoopReport[],
	l: number,
	indexes: readonly number[]
): RouteRequest {
	const loop = scene.loops?.[l];
	if (!loop) return { ok: false, message: 'There is no loop to route.' };
	const lookup = loopLookup(scene);
	const routed = new Set(indexes.map((i) => loop.runs[i]?.id));
	const runs: ManyRun[] = [];
	const reaches: [number, number][] = [];
	const ports = new Set<string>();
	let clearanceMm = 0;
	for (const i of indexes) {
		const run = loop.runs[i];
		if (!run) return { ok: false, message: `There is no run ${i + 1}.` };
		const tube = lookup.tubes.get(run.tube);
		const ends = runEnds(lookup, run);
		if (!tube || !ends) {
			return { ok: false, message: `Run ${i + 1} names a port or a tube kind the scene lacks.` };
		}
		const [start, end] = [ends.points[0], ends.points[ends.points.length - 1]];
		runs.push({
			id: run.id,
			start: { point: start, direction: ends.from.direction },
			end: { point: end, direction: ends.to.direction },
			section: { kind: 'round', outerDiameterMm: tube.outerMm },
			bendRadiusMm: tube.minBendRadiusMm,
			mode: tube.kind
		});
		ports.add(run.from.placementId).add(run.to.placementId);
		clearanceMm = Math.max(clearanceMm, tube.clearanceMm);
		reaches.push([ends.fittings.from.reachMm, ends.fittings.to.reachMm]);
	}
	const others: RouteObstacle[] = reports.flatMap((lr) =>
		lr.runs
			.filter((rr) => !routed.has(rr.runId))
			.flatMap((rr) => rr.pieces.map((p) => ({ box: p.tube, id: p.id, label: `${rr.label}` })))
	);
	return requestOf(resolved, runs, reaches, ports, clearanceMm, others, bendPenaltyOf(loop));
}

/**
 * The request once its runs are laid out: each run's ends lifted off bare ports (see lift), and as
 * obstacles the scene's boxes (less the routed ports' keep-outs and the walls, which are the
 * bounds' faces) with `tubes` beside them.
 */
function requestOf(
	resolved: ResolvedScene,
	runs: ManyRun[],
	reaches: [number, number][],
	ports: Set<string>,
	clearanceMm: number,
	tubes: RouteObstacle[],
	bendPenaltyMm: number
): RouteRequest {
	const extraMm = lift(runs, reaches, clearanceMm);
	const obstacles = [...routeObstacles(resolved, { skipKeepoutsOf: [...ports] }), ...tubes].filter(
		(o) => !o.id?.startsWith('wall:')
	);
	return {
		ok: true,
		runs,
		extraMm,
		shared: {
			bounds: resolved.innerBox,
			obstacles,
			clearanceMm,
			bendPenaltyMm,
			maxAlternatives: 3
		}
	};
}

/** The id a run still being drafted has in its route request (it has none of its own yet). */
export const DRAFT_RUN_ID = 'draft';

/**
 * The search input for a run still being drafted (its two ports, tube kind and fittings chosen,
 * not yet part of the loop): the scene as it is, with the draft appended to loop `l` (or a new
 * loop) for the search only, so every run already drawn is an obstacle. `tubeKinds` and
 * `fittings` are the studio's (the scene holds only those its runs use). Accepting the route
 * creates the run with its waypoints (see the loop form).
 */
export function draftRouteRequest(
	scene: Scene,
	resolved: ResolvedScene,
	reports: readonly LoopReport[],
	l: number,
	draft: Omit<RunDef, 'id' | 'waypoints'>,
	catalogue: { tubeKinds: readonly TubeKindDef[]; fittings: readonly PartDef[] }
): RouteRequest {
	const tube = catalogue.tubeKinds.find((t) => t.id === draft.tube);
	if (!tube) return { ok: false, message: 'Pick a tube kind for the new run.' };
	const fittings = [draft.fittings.from, draft.fittings.to].flatMap((id) => {
		if (!id || scene.parts.some((p) => p.id === id)) return [];
		const f = catalogue.fittings.find((p) => p.id === id);
		return f ? [f] : [];
	});
	const loops = [...(scene.loops ?? [])];
	const at = loops[l] ? l : loops.length;
	const run: RunDef = { ...draft, id: DRAFT_RUN_ID, waypoints: [] };
	loops[at] = loops[at]
		? { ...loops[at], runs: [...loops[at].runs, run] }
		: { id: 'draft-loop', runs: [run], plugs: [] };
	const withDraft: Scene = {
		...scene,
		parts: [...scene.parts, ...fittings],
		tubeKinds: [...(scene.tubeKinds ?? []).filter((t) => t.id !== tube.id), tube],
		loops
	};
	return routeRequest(withDraft, resolved, reports, at, [loops[at].runs.length - 1]);
}

/**
 * The search input for the scene's power cables `indexes` (flat bundles, soft: their own bend
 * radius): clear of every coolant run (from the last check) and of the parts; the plugs' room at
 * their own ports is where they start. Each is routed on its own (routeEach): bundles may lie
 * together, and the checker does not hold one cable against another.
 */
export function cableRouteRequest(
	scene: Scene,
	resolved: ResolvedScene,
	reports: readonly LoopReport[],
	indexes: readonly number[]
): RouteRequest {
	const runs: ManyRun[] = [];
	const reaches: [number, number][] = [];
	const ports = new Set<string>();
	let clearanceMm = 0;
	for (const i of indexes) {
		const c = scene.cables?.[i];
		if (!c) return { ok: false, message: `There is no cable ${i + 1}.` };
		const reach = (placementId: string, portId: string) =>
			resolved.placements
				.find((p) => p.placement.id === placementId)
				?.part.ports.find((p) => p.id === portId)?.plugReachMm ?? 0;
		const start = portEnd(
			resolved,
			c.from.placementId,
			c.from.portId,
			reach(c.from.placementId, c.from.portId)
		);
		const end = portEnd(
			resolved,
			c.to.placementId,
			c.to.portId,
			reach(c.to.placementId, c.to.portId)
		);
		if (!start || !end) return { ok: false, message: `${c.label} names a port the scene lacks.` };
		const name = (placementId: string, portId: string) => {
			const part = resolved.placements.find((p) => p.placement.id === placementId)?.part.name;
			return `${part ?? placementId} · ${portId}`;
		};
		runs.push({
			id: c.id,
			start: { ...start, label: name(c.from.placementId, c.from.portId) },
			end: { ...end, label: name(c.to.placementId, c.to.portId) },
			section: { kind: 'flat', widthMm: c.widthMm, thicknessMm: c.thicknessMm },
			bendRadiusMm: c.minBendRadiusMm,
			mode: 'soft'
		});
		ports.add(c.from.placementId).add(c.to.placementId);
		clearanceMm = Math.max(clearanceMm, c.clearanceMm);
		reaches.push([reach(c.from.placementId, c.from.portId), reach(c.to.placementId, c.to.portId)]);
	}
	const tubes: RouteObstacle[] = reports.flatMap((lr) =>
		lr.runs.flatMap((rr) => rr.pieces.map((p) => ({ box: p.tube, id: p.id, label: rr.label })))
	);
	return requestOf(
		resolved,
		runs,
		reaches,
		ports,
		clearanceMm,
		tubes,
		bendPenaltyOf(scene.loops?.[0])
	);
}

/** Hundredths of a millimetre: the search's planes are sums of sizes, with float noise. */
export function cleanWaypoints(waypoints: readonly Vec3[]): Vec3[] {
	return waypoints.map((w) => w.map((v) => Math.round(v * 100) / 100) as Vec3);
}

/** The cable's waypoints replaced by an accepted route's. */
export function acceptCableRoute(
	settings: VariantSettings,
	cableId: string,
	waypoints: readonly Vec3[]
): VariantSettings {
	if (!settings.cables?.some((c) => c.id === cableId)) return settings;
	const clean = cleanWaypoints(waypoints);
	return {
		...settings,
		cables: settings.cables.map((c) => (c.id === cableId ? { ...c, waypoints: clean } : c))
	};
}

/**
 * A run on a bare port (a fitting or plug reaching less than the clearance) would start inside the
 * clearance kept around its own part, and the search would find it shut in; and the loop check
 * holds a bend's box half the tube's width further along each leg than the search does. So each
 * end is moved out along its port's direction until it is half the width plus the clearance from
 * the port face. The moved piece is straight on the first and last leg, so the waypoints mean the
 * same; the lengths get the moved millimetres back.
 */
function lift(runs: ManyRun[], reaches: [number, number][], clearanceMm: number) {
	const extraMm: Record<string, number> = {};
	runs.forEach((run, i) => {
		const half = sectionHalfWidthMm(run.section);
		const [a, b] = reaches[i].map((r) => Math.max(0, clearanceMm + half - r));
		run.start = { ...run.start, point: push(run.start.point, run.start.direction, a) };
		run.end = { ...run.end, point: push(run.end.point, run.end.direction, b) };
		extraMm[run.id] = a + b;
	});
	return extraMm;
}

function push(p: Vec3, face: string, mm: number): Vec3 {
	const axis = 'xyz'.indexOf(face[1]);
	const out = [...p] as Vec3;
	out[axis] += face[0] === '+' ? mm : -mm;
	return out;
}

/** The run's waypoints replaced by an accepted route's (then an ordinary run: checked, priced). */
export function acceptRoute(
	settings: VariantSettings,
	l: number,
	runId: string,
	waypoints: readonly Vec3[]
): VariantSettings {
	const r = settings.loops?.[l]?.runs.findIndex((x) => x.id === runId) ?? -1;
	if (r < 0) return settings;
	const clean = cleanWaypoints(waypoints);
	return updateRun(settings, l, r, (run) => ({ ...run, waypoints: clean }));
}

/** The loop's bend penalty set (mm of tube one bend costs). */
export function setBendPenalty(settings: VariantSettings, l: number, mm: number): VariantSettings {
	const loops = [...(settings.loops ?? [])];
	if (!loops[l]) return settings;
	loops[l] = { ...loops[l], bendPenaltyMm: mm };
	return { ...settings, loops };
}

/**
 * The scene's power cables, each routed by the engine through the free space as "suggest cable
 * routes" would, the best route accepted; cables the search finds no route for are left out. The
 * demo seed uses it, so the demo opens with its cables laid as a builder would lay them, not drawn
 * straight through the parts.
 */
export function routedCables(scene: Scene): NonNullable<Scene['cables']> {
	const cables = scene.cables ?? [];
	if (!cables.length) return [];
	const request = cableRouteRequest(
		scene,
		resolveScene(scene),
		[],
		cables.map((_, i) => i)
	);
	if (!request.ok) return [];
	const { results } = routeEach(request.runs, request.shared);
	return cables.flatMap((c) => {
		const r = results[c.id];
		if (!r?.ok || !r.routes.length) return [];
		return [{ ...c, waypoints: cleanWaypoints(r.routes[0].waypoints) }];
	});
}

/** The demo variant's power cables as seeded: the standard library's, routed (routedCables). */
export function demoRoutedCables(): NonNullable<Scene['cables']> {
	return routedCables(sceneSchema.parse({ ...demoSceneInput(), cables: demoCables() }));
}
