/**
 * Power cable bundles checked like coolant runs: each bundle's room (the same boxes the route
 * search keeps clear: straight pieces grown by half the bundle's width, a flat bundle may twist,
 * and each bend's box) against every body, wall, divider, bracket, error keep-out and coolant run,
 * with its clearance; and its length for the sheet (centre line with its bends as arcs, plus both
 * plugs' reach). Millimetres, inner coordinates.
 */
import { EPSILON_MM } from './box';
import { centreLineLengthMm } from './loop-path';
import type { LoopReport } from './loop';
import { routeBoxes, type RouteSection } from './route';
import { portEnd, routeObstacles } from './route-scene';
import type { Box, CableDef, Scene, Vec3 } from './schema';
import type { FitStatus, ResolvedScene } from './types';

export interface CableProblem {
	kind: 'collides' | 'tight';
	against: { id: string; label: string };
	/** "24-pin runs into Mini-ITX board · body" */
	text: string;
}

export interface CableReport {
	cableId: string;
	label: string;
	where: string | null;
	fromLabel: string;
	toLabel: string;
	/** [start, ...waypoints, end]; null when a port it names is missing. */
	points: Vec3[] | null;
	/** The room the bundle takes. */
	pieces: Box[];
	/** Centre line with bends of the bundle's radius. */
	lengthMm: number;
	/** Both plugs' reach out of their port faces. */
	plugReachMm: number;
	problems: CableProblem[];
	status: FitStatus;
}

function sectionOf(c: CableDef): RouteSection {
	return { kind: 'flat', widthMm: c.widthMm, thicknessMm: c.thicknessMm };
}

function axisAligned(points: readonly Vec3[]): boolean {
	for (let i = 1; i < points.length; i++) {
		let moving = 0;
		for (let a = 0; a < 3; a++) {
			if (Math.abs(points[i][a] - points[i - 1][a]) > EPSILON_MM) moving++;
		}
		if (moving > 1) return false;
	}
	return true;
}

/**
 * The bundle's room: the route search's boxes for an axis-aligned centre line; for a slanted
 * segment (typed by hand) its bounding box grown by half the width, which holds it.
 */
export function cableBoxes(c: CableDef, points: readonly Vec3[]): Box[] {
	if (axisAligned(points)) return routeBoxes(points, sectionOf(c), c.minBendRadiusMm);
	const half = c.widthMm / 2;
	const out: Box[] = [];
	for (let i = 1; i < points.length; i++) {
		const a = points[i - 1];
		const b = points[i];
		out.push({
			min: [0, 1, 2].map((k) => Math.min(a[k], b[k]) - half) as Vec3,
			max: [0, 1, 2].map((k) => Math.max(a[k], b[k]) + half) as Vec3
		});
	}
	return out;
}

function gap(a: Box, b: Box): { overlaps: boolean; distance: number } {
	let s = 0;
	let overlaps = true;
	for (let k = 0; k < 3; k++) {
		const d = Math.max(a.min[k] - b.max[k], b.min[k] - a.max[k]);
		if (d > -EPSILON_MM) overlaps = false;
		if (d > 0) s += d * d;
	}
	return { overlaps, distance: Math.sqrt(s) };
}

function plugReach(resolved: ResolvedScene, placementId: string, portId: string): number {
	const rp = resolved.placements.find((p) => p.placement.id === placementId);
	return rp?.part.ports.find((p) => p.id === portId)?.plugReachMm ?? 0;
}

function portLabel(resolved: ResolvedScene, placementId: string, portId: string): string {
	const rp = resolved.placements.find((p) => p.placement.id === placementId);
	return rp ? `${rp.part.name} · ${portId}` : `${placementId} · ${portId}`;
}

/** Every cable of the scene checked; the loops' runs (when checked) count as obstacles. */
export function checkCables(
	scene: Scene,
	resolved: ResolvedScene,
	loops: readonly LoopReport[] = []
): CableReport[] {
	const runBoxes = loops.flatMap((l) =>
		l.runs.flatMap((r) => r.pieces.map((p) => ({ box: p.tube, id: p.id, label: r.label })))
	);
	return (scene.cables ?? []).map((c): CableReport => {
		const fromReach = plugReach(resolved, c.from.placementId, c.from.portId);
		const toReach = plugReach(resolved, c.to.placementId, c.to.portId);
		const start = portEnd(resolved, c.from.placementId, c.from.portId, fromReach);
		const end = portEnd(resolved, c.to.placementId, c.to.portId, toReach);
		const base = {
			cableId: c.id,
			label: c.label,
			where: c.where ?? null,
			fromLabel: portLabel(resolved, c.from.placementId, c.from.portId),
			toLabel: portLabel(resolved, c.to.placementId, c.to.portId),
			plugReachMm: fromReach + toReach
		};
		if (!start || !end) {
			return { ...base, points: null, pieces: [], lengthMm: 0, problems: [], status: 'clear' };
		}
		const points: Vec3[] = [start.point, ...c.waypoints, end.point];
		const pieces = cableBoxes(c, points);
		// The bundle's own plugs and their room at both ends are where it starts, not obstacles.
		const obstacles = [
			...routeObstacles(resolved, { skipKeepoutsOf: [c.from.placementId, c.to.placementId] }),
			...runBoxes
		];
		const worst = new Map<string, CableProblem>();
		for (const piece of pieces) {
			for (const o of obstacles) {
				const g = gap(piece, o.box);
				const kind = g.overlaps
					? 'collides'
					: g.distance < c.clearanceMm - EPSILON_MM
						? 'tight'
						: null;
				if (!kind) continue;
				const id = o.id ?? 'obstacle';
				const label = o.label ?? id;
				const had = worst.get(id);
				if (had && (had.kind === 'collides' || kind === 'tight')) continue;
				worst.set(id, {
					kind,
					against: { id, label },
					text:
						kind === 'collides'
							? `${c.label} runs into ${label}`
							: `${c.label} passes ${label} closer than its ${c.clearanceMm} mm clearance`
				});
			}
		}
		const problems = [...worst.values()].sort((a, b) =>
			a.kind === b.kind ? (a.against.id < b.against.id ? -1 : 1) : a.kind === 'collides' ? -1 : 1
		);
		return {
			...base,
			points,
			pieces,
			lengthMm: centreLineLengthMm(points, c.minBendRadiusMm),
			problems,
			status: problems.some((p) => p.kind === 'collides')
				? 'collides'
				: problems.length
					? 'tight'
					: 'clear'
		};
	});
}
