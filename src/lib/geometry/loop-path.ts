/**
 * The coolant loop's geometry that needs no fit report: where ports are in the enclosure, what a
 * fitting adds at a port, a run's centre line with its bends and its length, and the structural
 * and geometric checks that refuse a scene (a missing port, a port used twice, a waypoint outside,
 * a bend tighter than the tube allows). Millimetres, inner coordinates, Y up.
 */

import { EPSILON_MM, boundsOf } from './box';
import { rotateBox, rotateDirection, rotatePoint, rotationMap, type Direction } from './rotation';
import type {
	EnclosureDef,
	LoopDef,
	PartDef,
	Placement,
	PortRef,
	RunDef,
	Scene,
	TubeKindDef,
	Vec3
} from './schema';

/** G 1/4 (ISO 228-1 parallel pipe thread) is the usual loop thread: a port without one has it. */
export const DEFAULT_THREAD = 'G 1/4';

/** Directions of the first segment that are taken as the fitting's own, in degrees (0.5°). */
const ANGLE_TOLERANCE_RAD = (0.5 * Math.PI) / 180;

export function directionVector(direction: Direction): Vec3 {
	const v: Vec3 = [0, 0, 0];
	v['xyz'.indexOf(direction[1])] = direction[0] === '+' ? 1 : -1;
	return v;
}

export function sub(a: Vec3, b: Vec3): Vec3 {
	return [a[0] - b[0], a[1] - b[1], a[2] - b[2]];
}
export function add(a: Vec3, b: Vec3, scale = 1): Vec3 {
	return [a[0] + b[0] * scale, a[1] + b[1] * scale, a[2] + b[2] * scale];
}
export function norm(a: Vec3): number {
	return Math.hypot(a[0], a[1], a[2]);
}
export function dot(a: Vec3, b: Vec3): number {
	return a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
}

export interface PortAt {
	position: Vec3;
	direction: Direction;
	thread: string;
}

/** A port's position and direction in inner coordinates, as placePart turns and moves it. */
export function portOf(part: PartDef, placement: Placement, portId: string): PortAt | null {
	const port = part.ports.find((p) => p.id === portId);
	if (!port) return null;
	const map = rotationMap(placement.rotation);
	const turned = boundsOf(part.bodies.map((b) => rotateBox(map, b.box)));
	const p = rotatePoint(map, port.position);
	return {
		position: [
			p[0] + placement.position[0] - turned.min[0],
			p[1] + placement.position[1] - turned.min[1],
			p[2] + placement.position[2] - turned.min[2]
		],
		direction: rotateDirection(map, port.direction),
		thread: port.thread || DEFAULT_THREAD
	};
}

/** Ports r17's power connectors may carry `kind: 'power'`; those are never coolant ports. */
export function isCoolantPort(port: PartDef['ports'][number]): boolean {
	return (port as { kind?: string }).kind !== 'power';
}

export interface FittingGeometry {
	partId: string | null;
	name: string;
	kind: NonNullable<PartDef['specs']['fittingKind']>;
	/** Angle between the port's direction and the direction the tube leaves in: 0, 45 or 90°. */
	turnDeg: 0 | 45 | 90;
	/** Length beyond the port face (the part's height in its own frame, its +y from the thread). */
	reachMm: number;
	/** Across the fitting (the larger of its own x and z): a rotary fitting may turn either way. */
	widthMm: number;
	insertionDepthMm: number;
	thread: string;
}

/**
 * A fitting part's geometry at a port. Part frame: the thread face at y = 0, the fitting growing
 * along +y away from the port (as the catalogue's fittings are drawn). No part: the tube goes onto
 * the port bare (reach, width and insertion 0, straight on).
 */
export function fittingGeometry(part: PartDef | null | undefined): FittingGeometry {
	if (!part) {
		return {
			partId: null,
			name: 'no fitting',
			kind: 'straight',
			turnDeg: 0,
			reachMm: 0,
			widthMm: 0,
			insertionDepthMm: 0,
			thread: DEFAULT_THREAD
		};
	}
	const b = boundsOf(part.bodies.map((x) => x.box));
	const kind = part.specs.fittingKind ?? 'straight';
	return {
		partId: part.id,
		name: part.name,
		kind,
		turnDeg: kind === '45' ? 45 : kind === '90' || kind === 'rotary' ? 90 : 0,
		reachMm: b.max[1] - b.min[1],
		widthMm: Math.max(b.max[0] - b.min[0], b.max[2] - b.min[2]),
		insertionDepthMm: part.specs.insertionDepthMm ?? 0,
		thread: part.ports[0]?.thread || DEFAULT_THREAD
	};
}

export interface Bend {
	/** Index into the run's points of the corner. */
	point: number;
	angleRad: number;
	/** Straight tube each side of the corner the bend takes: r · tan(θ / 2). */
	tangentMm: number;
	/** r · θ. */
	arcMm: number;
}

/** The bends at every interior point of a centre line (a straight-through point is none). */
export function bendsOf(points: readonly Vec3[], radiusMm: number): Bend[] {
	const bends: Bend[] = [];
	for (let i = 1; i < points.length - 1; i++) {
		const a = sub(points[i], points[i - 1]);
		const b = sub(points[i + 1], points[i]);
		const la = norm(a);
		const lb = norm(b);
		if (la <= EPSILON_MM || lb <= EPSILON_MM) continue;
		const cos = Math.max(-1, Math.min(1, dot(a, b) / (la * lb)));
		const angleRad = Math.acos(cos);
		if (angleRad < 1e-9) continue;
		bends.push({
			point: i,
			angleRad,
			tangentMm: radiusMm * Math.tan(angleRad / 2),
			arcMm: radiusMm * angleRad
		});
	}
	return bends;
}

/** Straight length of the polyline, segment by segment. */
export function polylineLengthMm(points: readonly Vec3[]): number {
	let total = 0;
	for (let i = 1; i < points.length; i++) total += norm(sub(points[i], points[i - 1]));
	return total;
}

/**
 * Length of the tube's centre line when every corner is a bend of radius r: the polyline's straight
 * length, minus 2 r tan(θ/2) and plus r θ per bend of angle θ. For a 90° bend that is −2r + πr/2.
 */
export function centreLineLengthMm(points: readonly Vec3[], bendRadiusMm: number): number {
	let total = polylineLengthMm(points);
	for (const b of bendsOf(points, bendRadiusMm)) total += b.arcMm - 2 * b.tangentMm;
	return total;
}

export interface RunEnds {
	from: PortAt;
	to: PortAt;
	fittings: { from: FittingGeometry; to: FittingGeometry };
	/** [start, ...waypoints, end]: the ports pushed out along their direction by the fitting's reach. */
	points: Vec3[];
}

export interface LoopLookup {
	parts: Map<string, PartDef>;
	placements: Map<string, Placement>;
	tubes: Map<string, TubeKindDef>;
}

export function loopLookup(scene: Pick<Scene, 'parts' | 'placements' | 'tubeKinds'>): LoopLookup {
	return {
		parts: new Map(scene.parts.map((p) => [p.id, p])),
		placements: new Map(scene.placements.map((p) => [p.id, p])),
		tubes: new Map((scene.tubeKinds ?? []).map((t) => [t.id, t]))
	};
}

export function portAt(lookup: LoopLookup, ref: PortRef): PortAt | null {
	const placement = lookup.placements.get(ref.placementId);
	const part = placement && lookup.parts.get(placement.partId);
	return part && placement ? portOf(part, placement, ref.portId) : null;
}

/** The run's ends and centre line, or null when a port it names does not exist. */
export function runEnds(lookup: LoopLookup, run: RunDef): RunEnds | null {
	const from = portAt(lookup, run.from);
	const to = portAt(lookup, run.to);
	if (!from || !to) return null;
	const fittings = {
		from: fittingGeometry(run.fittings.from ? lookup.parts.get(run.fittings.from) : null),
		to: fittingGeometry(run.fittings.to ? lookup.parts.get(run.fittings.to) : null)
	};
	const start = add(from.position, directionVector(from.direction), fittings.from.reachMm);
	const end = add(to.position, directionVector(to.direction), fittings.to.reachMm);
	return { from, to, fittings, points: [start, ...run.waypoints, end] };
}

const ORDINALS = [
	'first',
	'second',
	'third',
	'fourth',
	'fifth',
	'sixth',
	'seventh',
	'eighth',
	'ninth',
	'tenth'
];
/** "second segment", "segment 12". */
export function segmentWord(index: number): string {
	return index < ORDINALS.length ? `${ORDINALS[index]} segment` : `segment ${index + 1}`;
}

export function mm(value: number): string {
	return `${value.toFixed(1)} mm`;
}

/** Segments of all runs of a scene together (a real loop has tens). */
export const MAX_LOOP_SEGMENTS = 1_000;

type Path = (string | number)[];
export interface LoopIssue {
	path: Path;
	message: string;
}

function innerSize(enclosure: EnclosureDef): Vec3 {
	const w = enclosure.walls;
	const pairs = [
		['left', 'right'],
		['bottom', 'top'],
		['front', 'back']
	] as const;
	return pairs.map(
		([lo, hi], i) =>
			enclosure.outerMm[i] - w[lo].thicknessMm - w[hi].thicknessMm + w[lo].offsetMm + w[hi].offsetMm
	) as Vec3;
}

const AXIS_WORDS = ['x', 'y', 'z'];

/** The path of the point at index i of a run's centre line (0 = start, last = end). */
function pointPath(base: Path, run: RunDef, i: number): Path {
	if (i === 0) return [...base, 'from'];
	if (i === run.waypoints.length + 1) return [...base, 'to'];
	return [...base, 'waypoints', i - 1];
}

/**
 * Geometric problems of one run whose ports exist: zero-length segments, hard tube off its axes,
 * a first or last segment that does not leave the way its fitting points, bends tighter than the
 * tube allows. The same words refuse the scene (400) and stand in the loop check's bend item.
 */
export function runGeometryIssues(
	base: Path,
	run: RunDef,
	ends: RunEnds,
	tube: TubeKindDef
): LoopIssue[] {
	const issues: LoopIssue[] = [];
	const pts = ends.points;
	for (let i = 1; i < pts.length; i++) {
		const d = sub(pts[i], pts[i - 1]);
		if (norm(d) <= EPSILON_MM) {
			issues.push({
				path: pointPath(base, run, i === pts.length - 1 ? i - 1 : i),
				message: 'Repeats the point before it: every segment needs a length above 0 mm'
			});
			return issues;
		}
		if (tube.kind === 'hard') {
			const moving = d.map((v) => Math.abs(v) > EPSILON_MM);
			if (moving.filter(Boolean).length > 1) {
				const axes = AXIS_WORDS.filter((_, a) => moving[a]).join(' and ');
				issues.push({
					path: pointPath(base, run, i === pts.length - 1 && i > 1 ? i - 1 : i),
					message: `Hard tube runs along one axis at a time: the ${segmentWord(i - 1)} moves along ${axes}`
				});
			}
		}
	}
	if (issues.length) return issues;
	// The tube leaves each fitting the way the fitting points it: straight on, or turned 45° or 90°.
	const ends2 = [
		{ key: 'from' as const, port: ends.from, seg: sub(pts[1], pts[0]) },
		{ key: 'to' as const, port: ends.to, seg: sub(pts[pts.length - 2], pts[pts.length - 1]) }
	];
	for (const { key, port, seg } of ends2) {
		const fitting = ends.fittings[key];
		const angle = Math.acos(
			Math.max(-1, Math.min(1, dot(seg, directionVector(port.direction)) / norm(seg)))
		);
		const want = (fitting.turnDeg * Math.PI) / 180;
		if (Math.abs(angle - want) > ANGLE_TOLERANCE_RAD) {
			const what = fitting.partId ? `The ${fitting.name}` : 'A port without a fitting';
			const turn = fitting.turnDeg === 0 ? 'straight out along' : `at ${fitting.turnDeg}° to`;
			issues.push({
				path: [...base, 'fittings', key],
				message: `${what} sends the tube ${turn} ${port.direction}; the ${key === 'from' ? 'first' : 'last'} segment leaves at ${((angle * 180) / Math.PI).toFixed(0)}°`
			});
		}
	}
	const bends = bendsOf(pts, tube.minBendRadiusMm);
	const tangentAt = new Map(bends.map((b) => [b.point, b.tangentMm]));
	for (let i = 1; i < pts.length; i++) {
		const need = (tangentAt.get(i - 1) ?? 0) + (tangentAt.get(i) ?? 0);
		const have = norm(sub(pts[i], pts[i - 1]));
		if (need > have + EPSILON_MM) {
			const at = tangentAt.has(i) && i < pts.length - 1 ? i : i - 1;
			issues.push({
				path: pointPath(base, run, at),
				message: `Bend tighter than the tube allows: the ${segmentWord(i - 1)} is ${mm(have)} long and its bends need ${mm(need)} at a ${mm(tube.minBendRadiusMm)} bend radius`
			});
		}
	}
	return issues;
}

/**
 * Everything about the loops that refuses a scene, with paths like `loops[0].runs[2].waypoints[1]`.
 * Robust to the rest of the scene being wrong (its own issues are reported elsewhere).
 */
export function loopIssues(scene: Scene): LoopIssue[] {
	const loops = scene.loops ?? [];
	const issues: LoopIssue[] = [];
	const lookup = loopLookup(scene);
	const tubeIds = new Set<string>();
	(scene.tubeKinds ?? []).forEach((t, i) => {
		if (tubeIds.has(t.id)) issues.push({ path: ['tubeKinds', i, 'id'], message: 'Duplicate id' });
		tubeIds.add(t.id);
	});
	if (!loops.length) return issues;
	// Each segment is met against every box of the scene: bound the work like the boxes are.
	const waypoints = loops.reduce(
		(n, l) => n + l.runs.reduce((m, r) => m + r.waypoints.length + 1, 0),
		0
	);
	if (waypoints > MAX_LOOP_SEGMENTS) {
		issues.push({
			path: ['loops'],
			message: `The loops have ${waypoints} segments; at most ${MAX_LOOP_SEGMENTS}`
		});
		return issues;
	}
	const size = innerSize(scene.enclosure);
	const used = new Map<string, string>();
	const ids = new Set<string>();
	const usePort = (ref: PortRef, path: Path, what: string) => {
		const placement = lookup.placements.get(ref.placementId);
		if (!placement) {
			issues.push({ path: [...path, 'placementId'], message: 'No placement with this id' });
			return false;
		}
		const part = lookup.parts.get(placement.partId);
		const port = part?.ports.find((p) => p.id === ref.portId);
		if (!part || !port) {
			issues.push({ path: [...path, 'portId'], message: 'No port with this id on that part' });
			return false;
		}
		if (!isCoolantPort(port)) {
			issues.push({ path: [...path, 'portId'], message: 'A power port, not a coolant port' });
			return false;
		}
		const key = `${ref.placementId}/${ref.portId}`;
		const before = used.get(key);
		if (before !== undefined) {
			issues.push({
				path: [...path, 'portId'],
				message: `Port used twice: ${part.name} · ${ref.portId} is already ${before}`
			});
			return false;
		}
		used.set(key, what);
		return true;
	};
	const fittingRef = (id: string | null, path: Path, plug: boolean) => {
		if (id === null) return;
		const part = lookup.parts.get(id);
		if (!part) issues.push({ path, message: 'No part with this id' });
		else if (part.category !== 'fitting') {
			issues.push({ path, message: `${part.name} is not a fitting` });
		} else if (plug !== (part.specs.fittingKind === 'plug')) {
			issues.push({
				path,
				message: plug ? `${part.name} is not a stop plug` : `${part.name} is a stop plug`
			});
		}
	};
	loops.forEach((loop: LoopDef, l) => {
		if (ids.has(loop.id)) issues.push({ path: ['loops', l, 'id'], message: 'Duplicate id' });
		ids.add(loop.id);
		loop.runs.forEach((run, r) => {
			const base: Path = ['loops', l, 'runs', r];
			if (ids.has(run.id)) issues.push({ path: [...base, 'id'], message: 'Duplicate id' });
			ids.add(run.id);
			const okFrom = usePort(run.from, [...base, 'from'], `joined by run ${r + 1}`);
			const okTo = usePort(run.to, [...base, 'to'], `joined by run ${r + 1}`);
			fittingRef(run.fittings.from, [...base, 'fittings', 'from'], false);
			fittingRef(run.fittings.to, [...base, 'fittings', 'to'], false);
			const tube = lookup.tubes.get(run.tube);
			if (!tube) issues.push({ path: [...base, 'tube'], message: 'No tube kind with this id' });
			run.waypoints.forEach((w, k) => {
				for (let a = 0; a < 3; a++) {
					if (w[a] < -EPSILON_MM || w[a] > size[a] + EPSILON_MM) {
						issues.push({
							path: [...base, 'waypoints', k, a],
							message: `Outside the enclosure: ${mm(w[a])} along ${AXIS_WORDS[a]}, the inside is 0 to ${mm(size[a])}`
						});
					}
				}
			});
			const broken = issues.some((i) => i.path.length > 4 && i.path[1] === l && i.path[3] === r);
			if (okFrom && okTo && tube && !broken) {
				const ends = runEnds(lookup, run);
				if (ends) issues.push(...runGeometryIssues(base, run, ends, tube));
			}
		});
		const plugged = new Set<string>();
		loop.plugs.forEach((plug, k) => {
			const path: Path = ['loops', l, 'plugs', k];
			if (usePort(plug, path, `plugged in loop ${l + 1}`)) {
				plugged.add(`${plug.placementId}/${plug.portId}`);
			}
			fittingRef(plug.fitting, [...path, 'fitting'], true);
		});
		for (const key of ['fill', 'drain'] as const) {
			const ref = loop[key];
			if (ref && !plugged.has(`${ref.placementId}/${ref.portId}`)) {
				issues.push({
					path: ['loops', l, key],
					message: `The ${key} port must be one of this loop's plugged ports`
				});
			}
		}
	});
	return issues;
}
