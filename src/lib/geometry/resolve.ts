/** Scene → world boxes in inner coordinates (millimetres, Y up). */

import { boundsOf, compareText, translateBox } from './box';
import {
	bracketWorldBox,
	compartmentsFor,
	controlOffset,
	dividerWorldBox,
	dividerWorldBoxes,
	innerBoxOf,
	wallBoxes
} from './enclosure';
import { SceneError } from './errors';
import { mountPlates } from './mounts';
import { rotateBox, rotateDirection, rotatePoint, rotationMap } from './rotation';
import {
	formatPath,
	type Box,
	type PartDef,
	type Placement,
	type Scene,
	type Vec3
} from './schema';
import type { ResolvedPlacement, ResolvedScene, WorldBox } from './types';

/**
 * Turns the part (X, then Y, then Z quarter turns), then moves it so the min corner of its turned
 * bodies' bounding box lands on `placement.position`. Keep-outs and ports move with the bodies.
 */
export function placePart(part: PartDef, placement: Placement): ResolvedPlacement {
	const map = rotationMap(placement.rotation);
	const turnedBodies = part.bodies.map((b) => rotateBox(map, b.box));
	const turnedBounds = boundsOf(turnedBodies);
	const shift: Vec3 = [
		placement.position[0] - turnedBounds.min[0],
		placement.position[1] - turnedBounds.min[1],
		placement.position[2] - turnedBounds.min[2]
	];
	const bodies: WorldBox[] = [];
	for (let i = 0; i < part.bodies.length; i++) {
		const b = part.bodies[i];
		bodies.push({
			id: `${placement.id}/${b.id}`,
			kind: 'body',
			label: `${part.name} · ${b.label}`,
			box: translateBox(turnedBodies[i], shift),
			ownerId: placement.id,
			placementId: placement.id,
			partId: part.id,
			toleranceMm: part.toleranceMm
		});
	}
	const keepouts: WorldBox[] = [];
	for (const k of part.keepouts) {
		keepouts.push({
			id: `${placement.id}/${k.id}`,
			kind: 'keepout',
			label: `${part.name} · ${k.label}`,
			box: translateBox(rotateBox(map, k.box), shift),
			ownerId: placement.id,
			placementId: placement.id,
			partId: part.id,
			toleranceMm: part.toleranceMm,
			keepoutKind: k.kind,
			severity: k.severity
		});
	}
	const ports = part.ports.map((p) => {
		const turned = rotatePoint(map, p.position);
		return {
			id: p.id,
			position: [turned[0] + shift[0], turned[1] + shift[1], turned[2] + shift[2]] as Vec3,
			direction: rotateDirection(map, p.direction),
			thread: p.thread,
			...(p.kind === 'power' ? { kind: 'power' as const } : {})
		};
	});
	const bounds: Box = { min: [...turnedBounds.min], max: [...turnedBounds.max] };
	for (let i = 0; i < 3; i++) {
		bounds.min[i] += shift[i];
		bounds.max[i] += shift[i];
	}
	return { placement, part, bodies, keepouts, ports, bounds };
}

/**
 * Resolves every box of a parsed scene. Throws SceneError (with the scene path) for a divider or
 * bracket position that is not allowed, or a placement whose part or mount does not exist.
 */
export function resolveScene(scene: Scene): ResolvedScene {
	const enclosure = scene.enclosure;
	const dividerPositions: Record<string, number> = {};
	const bracketOffsets: Record<string, number> = {};
	const dividers = enclosure.dividers.map((d) => {
		dividerPositions[d.id] = controlOffset(d, scene.dividerPositions, 'dividerPositions');
		return dividerWorldBox(enclosure, d, dividerPositions[d.id]);
	});
	const dividerPieces = enclosure.dividers.flatMap((d) =>
		dividerWorldBoxes(enclosure, d, dividerPositions[d.id])
	);
	const brackets = enclosure.brackets.map((b) => {
		bracketOffsets[b.id] = controlOffset(b, scene.bracketOffsets, 'bracketOffsets');
		return bracketWorldBox(b, bracketOffsets[b.id]);
	});
	for (const key of ['dividerPositions', 'bracketOffsets'] as const) {
		const known = key === 'dividerPositions' ? dividerPositions : bracketOffsets;
		for (const id of Object.keys(scene[key])) {
			if (!(id in known)) {
				throw new SceneError(formatPath([key, id]), 'No such control in this enclosure');
			}
		}
	}
	const parts = new Map(scene.parts.map((p) => [p.id, p]));
	const mounts = new Set(enclosure.mounts.map((m) => m.id));
	const placements = scene.placements.map((placement, i) => {
		const part = parts.get(placement.partId);
		if (!part) {
			throw new SceneError(`placements[${i}].partId`, `No part with id ${placement.partId}`);
		}
		if (placement.mountId !== undefined && !mounts.has(placement.mountId)) {
			throw new SceneError(`placements[${i}].mountId`, `No mount with id ${placement.mountId}`);
		}
		return placePart(part, placement);
	});
	placements.sort((a, b) => compareText(a.placement.id, b.placement.id));
	const innerBox = innerBoxOf(enclosure);
	return {
		innerBox,
		walls: wallBoxes(enclosure),
		dividers,
		dividerPieces,
		brackets,
		plates: mountPlates(enclosure, innerBox, placements),
		placements,
		compartments: compartmentsFor(enclosure, dividerPositions),
		dividerPositions,
		bracketOffsets
	};
}
