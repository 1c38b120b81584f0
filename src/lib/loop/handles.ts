/**
 * What the 3D view shows of a loop to edit it: a marker per coolant port (free or used) and a handle
 * per waypoint, and how a dragged waypoint moves the run. Millimetres, inner coordinates.
 */
import type { LoopDef, ResolvedScene, RunCache, TubeKindDef, Vec3 } from '$lib/geometry';
import type { VariantSettings } from '$lib/builds/settings';
import { portOptions, sameRef, snapHalf, updateRun } from './edit';

export interface PortMarker {
	key: string;
	placementId: string;
	portId: string;
	label: string;
	thread: string;
	position: Vec3;
	/** Joined by a run or closed with a plug in one of the loops. */
	used: boolean;
}

export interface WaypointHandle {
	key: string;
	loop: number;
	run: number;
	index: number;
	position: Vec3;
	label: string;
}

export function portMarkers(resolved: ResolvedScene, loops: readonly LoopDef[] = []): PortMarker[] {
	const where = new Map<string, Vec3>(
		resolved.placements.flatMap((rp) =>
			rp.ports.map((p): [string, Vec3] => [`${rp.placement.id}/${p.id}`, p.position])
		)
	);
	const refs = loops.flatMap((l) => [...l.runs.flatMap((r) => [r.from, r.to]), ...l.plugs]);
	return portOptions(resolved).flatMap((p) => {
		const key = `${p.placementId}/${p.portId}`;
		const position = where.get(key);
		if (!position) return [];
		return [{ ...p, key, position, used: refs.some((r) => sameRef(r, p)) }];
	});
}

export function waypointHandles(loops: readonly LoopDef[] = []): WaypointHandle[] {
	return loops.flatMap((l, li) =>
		l.runs.flatMap((r, ri) =>
			r.waypoints.map((w, k) => ({
				key: `${li}:${ri}:${k}`,
				loop: li,
				run: ri,
				index: k,
				position: w,
				label: `Run ${ri + 1}, waypoint ${k + 1}`
			}))
		)
	);
}

const EPS = 1e-6;
const alongOnly = (a: Vec3, b: Vec3, axis: number) =>
	[0, 1, 2].every((i) => i === axis || Math.abs(a[i] - b[i]) <= EPS);

/**
 * Waypoint k of run r moved to `to` (snapped to 0.5 mm). A soft run just takes the point. A hard run
 * moves along one axis at a time (the axis `to` differs most on) and keeps its segments square: a
 * neighbouring waypoint joined by a segment across that axis moves with it, and so on, until a
 * segment along the axis takes up the change. A change that would have to move a port's end
 * point returns null (the run cannot follow).
 */
export function dragWaypoint(
	settings: VariantSettings,
	l: number,
	r: number,
	k: number,
	to: Vec3,
	tube: TubeKindDef | undefined,
	ends: { start: Vec3; end: Vec3 }
): VariantSettings | null {
	const run = settings.loops?.[l]?.runs[r];
	if (!run || !run.waypoints[k]) return null;
	const target = to.map(snapHalf) as Vec3;
	if (tube?.kind !== 'hard') {
		return updateRun(settings, l, r, (old) => ({
			...old,
			waypoints: old.waypoints.map((w, i) => (i === k ? target : w))
		}));
	}
	const from = run.waypoints[k];
	const deltas = target.map((v, i) => v - from[i]);
	const axis = deltas.reduce((best, d, i) => (Math.abs(d) > Math.abs(deltas[best]) ? i : best), 0);
	const d = deltas[axis];
	if (Math.abs(d) <= EPS) return settings;
	// The full centre line: start, waypoints, end; only waypoints (1 … n) may move.
	const pts: Vec3[] = [ends.start, ...run.waypoints, ends.end];
	const moved = new Set<number>([k + 1]);
	for (const step of [-1, 1]) {
		let j = k + 1;
		for (;;) {
			const next = j + step;
			if (alongOnly(pts[j], pts[next], axis)) break;
			if (next === 0 || next === pts.length - 1) return null;
			moved.add(next);
			j = next;
		}
	}
	return updateRun(settings, l, r, (old) => ({
		...old,
		waypoints: old.waypoints.map((w, i) => {
			if (!moved.has(i + 1)) return w;
			const n = [...w] as Vec3;
			n[axis] = snapHalf(w[axis] + d);
			return n;
		})
	}));
}

/** An empty run cache: plain, not reactive (the editor reads it only while it computes). */
export function newRunCache(): RunCache {
	return new Map();
}
