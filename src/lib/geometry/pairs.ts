/** Which pairs of world boxes the fit report cares about, and what an overlap between them means. */

import type { OverlapKind, WorldBox } from './types';

/**
 * The meaning of a positive-volume overlap between two world boxes, or null when it means nothing:
 * boxes of one placement, walls against walls or dividers (they meet at the shell), dividers
 * against dividers (shelves cross), keep-outs against keep-outs (two clearances may share room).
 *
 * - body against body, wall, divider or bracket: 'collides';
 * - bracket against wall, divider or bracket: 'collides' (a bar slid into the divider);
 * - a body or a solid fixed box in a keep-out: 'blocked' for an error keep-out, else 'warning';
 *   an airflow keep-out passes through a mesh panel and through a mount's plate or standoffs
 *   (they are open where the fans blow);
 * - a mount's plate or standoffs: like a panel (a body or bracket in it collides).
 */
export function pairKind(a: WorldBox, b: WorldBox): OverlapKind | null {
	if (a.ownerId === b.ownerId) {
		return null;
	}
	if (a.kind === 'keepout' || b.kind === 'keepout') {
		return keepoutPairKind(a, b);
	}
	if (a.kind === 'body' || b.kind === 'body') {
		return 'collides';
	}
	if (a.kind === 'bracket' || b.kind === 'bracket') {
		return 'collides';
	}
	return null;
}

function keepoutPairKind(a: WorldBox, b: WorldBox): OverlapKind | null {
	const keepout = a.kind === 'keepout' ? a : b;
	const other = keepout === a ? b : a;
	if (other.kind === 'keepout') {
		return null;
	}
	if (
		keepout.keepoutKind === 'airflow' &&
		((other.kind === 'wall' && other.wallKind === 'mesh') || other.kind === 'plate')
	) {
		return null;
	}
	return keepout.severity === 'warning' ? 'warning' : 'blocked';
}

/** The box that counts as an obstacle for gaps: bodies and fixed boxes, not keep-outs. */
export function isObstacle(box: WorldBox): boolean {
	return box.kind !== 'keepout';
}
