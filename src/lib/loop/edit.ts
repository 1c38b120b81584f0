/**
 * Editing a variant's coolant loops: pure changes to its settings, used by the editor's loop
 * panel (the same scene schema then accepts or refuses the result, with the server's words).
 */
import type { LoopDef, PortRef, ResolvedScene, RunDef, Vec3 } from '$lib/geometry';
import type { VariantSettings } from '$lib/builds/settings';

/** Waypoints typed or dragged land on a 0.5 mm grid. */
export const WAYPOINT_GRID_MM = 0.5;

export function snapHalf(v: number): number {
	return Math.round(v / WAYPOINT_GRID_MM) * WAYPOINT_GRID_MM;
}

export interface PortOption extends PortRef {
	label: string;
	thread: string;
}

/** Every coolant port of the placed parts, "Compact CPU block · in", in placement order. */
export function portOptions(resolved: ResolvedScene): PortOption[] {
	return resolved.placements.flatMap((rp) =>
		rp.part.category === 'fitting'
			? []
			: rp.part.ports
					.filter((p) => (p as { kind?: string }).kind !== 'power')
					.map((p) => ({
						placementId: rp.placement.id,
						portId: p.id,
						label: `${rp.part.name} · ${p.id}`,
						thread: p.thread
					}))
	);
}

export const sameRef = (a: PortRef | undefined | null, b: PortRef | undefined | null) =>
	!!a && !!b && a.placementId === b.placementId && a.portId === b.portId;

function withLoops(settings: VariantSettings, loops: LoopDef[]): VariantSettings {
	return { ...settings, loops: loops.length ? loops : undefined };
}

function nextId(taken: Iterable<string>, prefix: string): string {
	const used = new Set(taken);
	let i = 1;
	while (used.has(`${prefix}${i}`)) i++;
	return `${prefix}${i}`;
}

/** A run added at the end of loop `l` (a first loop is started when there is none). */
export function addRun(
	settings: VariantSettings,
	l: number,
	run: Omit<RunDef, 'id'>
): VariantSettings {
	const loops = [...(settings.loops ?? [])];
	const ids = loops.flatMap((x) => [x.id, ...x.runs.map((r) => r.id)]);
	if (!loops[l]) {
		loops.push({ id: nextId(ids, 'loop-'), runs: [], plugs: [] });
		l = loops.length - 1;
	}
	const id = nextId(ids, 'run-');
	loops[l] = { ...loops[l], runs: [...loops[l].runs, { ...run, id }] };
	return withLoops(settings, loops);
}

export function updateRun(
	settings: VariantSettings,
	l: number,
	r: number,
	change: (run: RunDef) => RunDef
): VariantSettings {
	const loops = [...(settings.loops ?? [])];
	const loop = loops[l];
	if (!loop?.runs[r]) return settings;
	loops[l] = { ...loop, runs: loop.runs.map((run, i) => (i === r ? change(run) : run)) };
	return withLoops(settings, loops);
}

export function removeRun(settings: VariantSettings, l: number, r: number): VariantSettings {
	const loops = [...(settings.loops ?? [])];
	const loop = loops[l];
	if (!loop) return settings;
	const runs = loop.runs.filter((_, i) => i !== r);
	if (runs.length) loops[l] = { ...loop, runs };
	else loops.splice(l, 1);
	return withLoops(settings, loops);
}

/** Sets one coordinate of a waypoint, on the 0.5 mm grid. */
export function setWaypoint(
	settings: VariantSettings,
	l: number,
	r: number,
	k: number,
	axis: 0 | 1 | 2,
	valueMm: number
): VariantSettings {
	if (!Number.isFinite(valueMm)) return settings;
	return updateRun(settings, l, r, (run) => ({
		...run,
		waypoints: run.waypoints.map((w, i) => {
			if (i !== k) return w;
			const next = [...w] as Vec3;
			next[axis] = snapHalf(valueMm);
			return next;
		})
	}));
}

/**
 * A waypoint in the middle of segment `segment` of the run's centre line `points` (start,
 * waypoints, end): on the straight line, so the run stays what it was until the point is moved.
 */
export function splitSegment(
	settings: VariantSettings,
	l: number,
	r: number,
	points: readonly Vec3[],
	segment: number
): VariantSettings {
	const a = points[segment];
	const b = points[segment + 1];
	if (!a || !b) return settings;
	const mid = a.map((v, i) => snapHalf((v + b[i]) / 2)) as Vec3;
	return updateRun(settings, l, r, (run) => {
		const waypoints = [...run.waypoints];
		waypoints.splice(segment, 0, mid);
		return { ...run, waypoints };
	});
}

export function removeWaypoint(
	settings: VariantSettings,
	l: number,
	r: number,
	k: number
): VariantSettings {
	return updateRun(settings, l, r, (run) => ({
		...run,
		waypoints: run.waypoints.filter((_, i) => i !== k)
	}));
}

/** Closes a port with a stop plug, or opens it again (and stops it being the fill or drain). */
export function togglePlug(
	settings: VariantSettings,
	l: number,
	ref: PortRef,
	fitting: string | null = null
): VariantSettings {
	const loops = [...(settings.loops ?? [])];
	const loop = loops[l];
	if (!loop) return settings;
	const plugged = loop.plugs.some((p) => sameRef(p, ref));
	loops[l] = plugged
		? {
				...loop,
				plugs: loop.plugs.filter((p) => !sameRef(p, ref)),
				fill: sameRef(loop.fill, ref) ? undefined : loop.fill,
				drain: sameRef(loop.drain, ref) ? undefined : loop.drain
			}
		: { ...loop, plugs: [...loop.plugs, { ...ref, fitting }] };
	return withLoops(settings, loops);
}

export function setPortRole(
	settings: VariantSettings,
	l: number,
	role: 'fill' | 'drain',
	ref: PortRef | null
): VariantSettings {
	const loops = [...(settings.loops ?? [])];
	const loop = loops[l];
	if (!loop) return settings;
	loops[l] = { ...loop, [role]: ref ?? undefined };
	return withLoops(settings, loops);
}
