/**
 * From a resolved scene to the route search's input: what a run must keep away from (walls,
 * dividers, brackets, plates, every body and every error keep-out; warning keep-outs are not
 * obstacles) and a port's end point pushed out by its fitting's or plug's reach. Millimetres.
 */

import { FACES, FACE_UNIT } from './box';
import type { ResolvedScene } from './types';
import type { RouteEnd, RouteObstacle } from './route';

/** Every box a run must clear, by its world-box id and label. */
export function routeObstacles(
	resolved: ResolvedScene,
	options: { skipKeepoutsOf?: readonly string[] } = {}
): RouteObstacle[] {
	const skip = new Set(options.skipKeepoutsOf ?? []);
	const out: RouteObstacle[] = [];
	for (const w of [...resolved.walls, ...resolved.dividerPieces, ...resolved.brackets]) {
		out.push({ box: w.box, id: w.id, label: w.label });
	}
	for (const p of resolved.plates) out.push({ box: p.box, id: p.id, label: p.label });
	for (const rp of resolved.placements) {
		for (const b of rp.bodies) out.push({ box: b.box, id: b.id, label: b.label });
		for (const k of rp.keepouts) {
			// A port's own fitting or plug room is where the run starts, not something to avoid.
			if (k.severity === 'warning' || (skip.has(rp.placement.id) && k.keepoutKind !== 'service')) {
				continue;
			}
			out.push({ box: k.box, id: k.id, label: k.label });
		}
	}
	return out;
}

/** Where a run leaves (or enters) a port: the port's point moved `reachMm` along its direction. */
export function portEnd(
	resolved: ResolvedScene,
	placementId: string,
	portId: string,
	reachMm: number
): RouteEnd | null {
	const rp = resolved.placements.find((p) => p.placement.id === placementId);
	const port = rp?.ports.find((p) => p.id === portId);
	if (!port || !FACES.includes(port.direction)) return null;
	const u = FACE_UNIT[port.direction];
	return {
		point: [
			port.position[0] + u[0] * reachMm,
			port.position[1] + u[1] * reachMm,
			port.position[2] + u[2] * reachMm
		],
		direction: port.direction
	};
}
