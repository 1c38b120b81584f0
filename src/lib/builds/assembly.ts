/**
 * The order parts go into the enclosure, and the fittings a loop needs, worked out from the
 * placements alone. Pure: no framework, no server. Millimetres, Y up, inner coordinates.
 *
 * How the order is worked out. Every part comes in along one way:
 *
 * - a part on a mount comes in along the mount's normal, towards its panel (a board onto its tray,
 *   a radiator onto its panel, fans onto the radiator);
 * - any other part comes in from a panel side of its compartment (not through a divider), on a
 *   side whose path crosses no bracket or short divider: the one with the fewest other parts in
 *   the way, then the shortest way in; ties go above, front, back, left, right, below.
 *
 * Its path is the room its outline sweeps from the edge of its compartment to its place: what sits
 * beyond a divider is never in its way.
 * Part A goes in before part B when, with B already in, A could not go in or be worked on:
 *
 * 1. B's body lies in A's path ("B would cover A's way in");
 * 2. B's body lies in a keep-out of A that is needed while building (fitting, cable or service
 *    room; not airflow);
 * 3. B rests on A (B's bottom face sits on A's body);
 * 4. B is a fitting on one of A's ports.
 *
 * Parts that none of these rules order go in a fixed sequence, common practice for compact
 * builds: board, CPU block, power supply, graphics card, radiator, fans, pump and reservoir,
 * drives, other parts, fittings last. When two parts stand in each other's way the order cannot
 * satisfy both; the sheet then says so on the step instead of hiding it.
 */

import { EPSILON_MM, boxesOverlap, compareText, type Face } from '$lib/geometry';
import type {
	Box,
	FitReport,
	PartCategory,
	ResolvedPlacement,
	ResolvedScene,
	Scene
} from '$lib/geometry';
import { faceWords } from '$lib/words/faces';

/** Tie-break when geometry leaves parts unordered (common practice, see the module comment). */
const CATEGORY_RANK: Record<PartCategory, number> = {
	board: 0,
	'cpu-block': 1,
	psu: 2,
	gpu: 3,
	radiator: 4,
	fan: 5,
	'pump-reservoir': 6,
	pump: 6,
	reservoir: 7,
	drive: 8,
	other: 9,
	fitting: 10
};

/** Directions tried for a part without a mount, first preferred: lowered in from above first. */
const FREE_DIRECTIONS: readonly Face[] = ['+y', '-z', '+z', '-x', '+x', '-y'];

/** Keep-outs a builder needs while assembling; airflow matters only once it runs. */
const ACCESS_KINDS = new Set(['fitting', 'cable', 'service']);

/** Where a part comes in from, in words: the side of the enclosure its path opens to. */
export const FROM_WORDS = faceWords('from');

export type OrderReason =
	| { kind: 'path'; direction: Face }
	| { kind: 'access'; keepoutLabel: string; keepoutKind: string }
	| { kind: 'rests' }
	| { kind: 'port'; portId: string };

/** `before` must go in before `after`. */
export interface OrderEdge {
	before: string;
	after: string;
	reason: OrderReason;
}

export interface AssemblyStep {
	/** 1-based. */
	order: number;
	placementId: string;
	name: string;
	category: PartCategory;
	mountId: string | null;
	/** The side of the enclosure the part's path opens to: '+x' comes in from the right. */
	direction: Face;
	/** How the direction was chosen. */
	directionFrom: 'mount' | 'free' | 'fallback';
	/** Edges into this step: what must already be in, and why. */
	after: OrderEdge[];
	/** Edges out of this step: what must wait for it. */
	before: OrderEdge[];
	/** Parts that must go in before this one by the rules but could not (they stand in each other's way). */
	conflicts: string[];
}

export interface AssemblyPlan {
	steps: AssemblyStep[];
	edges: OrderEdge[];
}

const axisOf = (face: Face) => 'xyz'.indexOf(face[1]) as 0 | 1 | 2;
const signOf = (face: Face) => (face[0] === '+' ? 1 : -1);

/**
 * The room a box sweeps from its place out to the edge of `room` on one side. Null when the box
 * already reaches that edge.
 */
export function pathBox(bounds: Box, room: Box, direction: Face): Box | null {
	const a = axisOf(direction);
	const min = [...bounds.min] as Box['min'];
	const max = [...bounds.max] as Box['max'];
	if (signOf(direction) > 0) {
		min[a] = bounds.max[a];
		max[a] = Math.max(room.max[a], bounds.max[a]);
	} else {
		max[a] = bounds.min[a];
		min[a] = Math.min(room.min[a], bounds.min[a]);
	}
	return max[a] - min[a] > EPSILON_MM ? { min, max } : null;
}

/** The direction a mount's parts travel out along: its normal, from the panel into the inside. */
export function mountDirection(face: Scene['enclosure']['mounts'][number]['face']): Face {
	switch (face) {
		case 'left':
			return '+x';
		case 'right':
			return '-x';
		case 'bottom':
			return '+y';
		case 'top':
			return '-y';
		case 'front':
			return '+z';
		default:
			return '-z';
	}
}

function bodiesIn(rp: ResolvedPlacement, box: Box): boolean {
	return rp.bodies.some((b) => boxesOverlap(b.box, box));
}

function chooseDirection(
	rp: ResolvedPlacement,
	scene: Scene,
	resolved: ResolvedScene,
	room: Box
): { direction: Face; from: AssemblyStep['directionFrom'] } {
	const mount =
		rp.placement.mountId === undefined
			? undefined
			: scene.enclosure.mounts.find((m) => m.id === rp.placement.mountId);
	if (mount) return { direction: mountDirection(mount.face), from: 'mount' };
	const fixed = [...resolved.dividers, ...resolved.brackets];
	const inner = resolved.innerBox;
	const opensToPanel = (d: Face) => {
		const a = axisOf(d);
		return signOf(d) > 0
			? room.max[a] >= inner.max[a] - EPSILON_MM
			: room.min[a] <= inner.min[a] + EPSILON_MM;
	};
	let best: { direction: Face; score: [number, number, number] } | null = null;
	for (const direction of FREE_DIRECTIONS) {
		const path = pathBox(rp.bounds, room, direction);
		if (path && fixed.some((f) => boxesOverlap(f.box, path))) continue;
		const crossed = path
			? resolved.placements.filter((o) => o !== rp && bodiesIn(o, path)).length
			: 0;
		const a = axisOf(direction);
		const travel = path ? path.max[a] - path.min[a] : 0;
		// Through a panel before through a divider, then fewest parts in the way, then the shortest way.
		const score: [number, number, number] = [opensToPanel(direction) ? 0 : 1, crossed, travel];
		if (!best || lexLess(score, best.score)) best = { direction, score };
	}
	return best ? { direction: best.direction, from: 'free' } : { direction: '+y', from: 'fallback' };
}

function lexLess(a: readonly number[], b: readonly number[]): boolean {
	for (let i = 0; i < a.length; i++) {
		if (a[i] < b[i] - EPSILON_MM) return true;
		if (a[i] > b[i] + EPSILON_MM) return false;
	}
	return false;
}

/** The room a part moves in: its compartment, or the whole inside when it is in none. */
function roomOf(rp: ResolvedPlacement, resolved: ResolvedScene, report: FitReport): Box {
	const id = report.parts.find((p) => p.placementId === rp.placement.id)?.compartmentId;
	return resolved.compartments.find((c) => c.id === id)?.box ?? resolved.innerBox;
}

function pointIn(box: Box, p: readonly number[]): boolean {
	return [0, 1, 2].every((i) => p[i] >= box.min[i] - EPSILON_MM && p[i] <= box.max[i] + EPSILON_MM);
}

function edgesFor(
	resolved: ResolvedScene,
	report: FitReport,
	directions: Map<string, Face>,
	rooms: Map<string, Box>
): OrderEdge[] {
	const edges: OrderEdge[] = [];
	const seen = new Set<string>();
	const add = (before: string, after: string, reason: OrderReason) => {
		if (before === after || seen.has(`${before}>${after}`)) return;
		seen.add(`${before}>${after}`);
		edges.push({ before, after, reason });
	};
	for (const a of resolved.placements) {
		const direction = directions.get(a.placement.id)!;
		const path = pathBox(a.bounds, rooms.get(a.placement.id)!, direction);
		for (const b of resolved.placements) {
			if (b === a) continue;
			if (path && bodiesIn(b, path)) {
				add(a.placement.id, b.placement.id, { kind: 'path', direction });
			}
		}
		for (const k of a.keepouts) {
			if (!ACCESS_KINDS.has(k.keepoutKind ?? '')) continue;
			const label =
				a.part.keepouts.find((d) => k.id === `${a.placement.id}/${d.id}`)?.label ?? k.label;
			for (const b of resolved.placements) {
				if (b !== a && bodiesIn(b, k.box)) {
					add(a.placement.id, b.placement.id, {
						kind: 'access',
						keepoutLabel: label,
						keepoutKind: k.keepoutKind!
					});
				}
			}
		}
	}
	for (const f of resolved.placements.filter((rp) => rp.part.category === 'fitting')) {
		for (const host of resolved.placements) {
			if (host === f || host.part.category === 'fitting') continue;
			const port = host.ports.find((p) => pointIn(f.bounds, p.position));
			if (port) add(host.placement.id, f.placement.id, { kind: 'port', portId: port.id });
		}
	}
	for (const part of report.parts) {
		const below = part.gaps['-y'];
		const under = below.against?.placementId;
		if (under && below.gapMm !== null && Math.abs(below.gapMm) <= EPSILON_MM) {
			add(under, part.placementId, { kind: 'rests' });
		}
	}
	return edges.sort((x, y) => compareText(x.before, y.before) || compareText(x.after, y.after));
}

/**
 * The assembly plan of a scene: one step per placed part, in an order that keeps every part's
 * way in and working room free while it goes in (see the module comment for the rules).
 */
export function assemblyPlan(
	scene: Scene,
	resolved: ResolvedScene,
	report: FitReport
): AssemblyPlan {
	const directions = new Map<string, Face>();
	const directionFrom = new Map<string, AssemblyStep['directionFrom']>();
	const rooms = new Map(
		resolved.placements.map((rp) => [rp.placement.id, roomOf(rp, resolved, report)])
	);
	for (const rp of resolved.placements) {
		const chosen = chooseDirection(rp, scene, resolved, rooms.get(rp.placement.id)!);
		directions.set(rp.placement.id, chosen.direction);
		directionFrom.set(rp.placement.id, chosen.from);
	}
	const edges = edgesFor(resolved, report, directions, rooms);
	const byId = new Map(resolved.placements.map((rp) => [rp.placement.id, rp]));
	const rank = (id: string) => CATEGORY_RANK[byId.get(id)!.part.category];
	const tieBreak = (x: string, y: string) => rank(x) - rank(y) || compareText(x, y);
	const placed = new Set<string>();
	const steps: AssemblyStep[] = [];
	const waitingOn = (id: string) => edges.filter((e) => e.after === id && !placed.has(e.before));
	while (placed.size < byId.size) {
		const remaining = [...byId.keys()].filter((id) => !placed.has(id));
		const ready = remaining.filter((id) => waitingOn(id).length === 0).sort(tieBreak);
		// Nothing is free: the parts left stand in each other's way. Take the one held by fewest.
		const next =
			ready[0] ??
			[...remaining].sort((x, y) => waitingOn(x).length - waitingOn(y).length || tieBreak(x, y))[0];
		const conflicts = waitingOn(next).map((e) => e.before);
		placed.add(next);
		const rp = byId.get(next)!;
		steps.push({
			order: steps.length + 1,
			placementId: next,
			name: rp.part.name,
			category: rp.part.category,
			mountId: rp.placement.mountId ?? null,
			direction: directions.get(next)!,
			directionFrom: directionFrom.get(next)!,
			after: edges.filter((e) => e.after === next),
			before: edges.filter((e) => e.before === next),
			conflicts: [...new Set(conflicts)].sort(compareText)
		});
	}
	return { steps, edges };
}

export interface ThreadCount {
	/** As the parts name it: 'G 1/4' (ISO 228-1). */
	thread: string;
	/** Ports of this thread on placed parts (fittings themselves not counted). */
	ports: number;
	/** Of those, ports that already have a placed fitting part on them. */
	withPlacedFitting: number;
	/** Per part, in part-list order. */
	byPart: { placementId: string; name: string; ports: number }[];
}

/**
 * Fittings needed per port thread: every port of a placed part takes one fitting or a stop plug.
 * Placed fitting parts are not ports themselves; a port they sit on counts as already fitted.
 */
export function fittingsByThread(resolved: ResolvedScene): ThreadCount[] {
	const fittings = resolved.placements.filter((rp) => rp.part.category === 'fitting');
	const counts = new Map<string, ThreadCount>();
	for (const rp of resolved.placements) {
		if (rp.part.category === 'fitting') continue;
		for (const port of rp.ports) {
			// A power port takes a cable's plug, not a fitting.
			if (port.kind === 'power') continue;
			let entry = counts.get(port.thread);
			if (!entry) {
				entry = { thread: port.thread, ports: 0, withPlacedFitting: 0, byPart: [] };
				counts.set(port.thread, entry);
			}
			entry.ports++;
			if (fittings.some((f) => pointIn(f.bounds, port.position))) entry.withPlacedFitting++;
			const row = entry.byPart.find((r) => r.placementId === rp.placement.id);
			if (row) row.ports++;
			else entry.byPart.push({ placementId: rp.placement.id, name: rp.part.name, ports: 1 });
		}
	}
	return [...counts.values()].sort((a, b) => b.ports - a.ports || compareText(a.thread, b.thread));
}
