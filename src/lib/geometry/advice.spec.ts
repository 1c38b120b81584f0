/**
 * Clearing advice against the whole scene, checked two ways: every proposed move, applied and
 * re-checked with checkScene, clears its problem and makes nothing worse; and when the engine says
 * no move exists, a brute-force search written here (every 0.5 mm along each axis, every allowed
 * position of a control) finds none either.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { EPSILON_MM } from './box';
import { checkScene } from './check';
import {
	eachCheckedScene,
	sceneArb,
	sharedAlong,
	worldBoxesOf
} from '../server/testing/engine-factories';
import { pairKind } from './pairs';
import { allowedIndex, allowedPositions } from './positions';
import { resolveScene } from './resolve';
import type { Box, Scene, Vec3 } from './schema';
import type { ClearingMove, Overlap, WorldBox } from './types';

/** Random scenes where some placements are locked. */
const lockedSceneArb = fc
	.tuple(sceneArb, fc.array(fc.boolean(), { minLength: 8, maxLength: 8 }))
	.map(([scene, locks]) => ({
		...scene,
		placements: scene.placements.map((p, i) => (locks[i] ? { ...p, locked: true } : p))
	}));

const overlapVolume = (a: Box, b: Box) => {
	const d = [0, 1, 2].map((k) => sharedAlong(a, b, k));
	return d.every((v) => v > EPSILON_MM) ? d[0] * d[1] * d[2] : 0;
};
const key = (a: string, b: string) => (a < b ? `${a}|${b}` : `${b}|${a}`);

/**
 * Collisions and blocks (not warnings) as pair key → volume, by brute force over all pairs (only
 * those with a box of `owner` when given: a move changes no other pair).
 */
function problems(boxes: readonly WorldBox[], owner?: string): Map<string, number> {
	const out = new Map<string, number>();
	for (let i = 0; i < boxes.length; i++) {
		for (let j = i + 1; j < boxes.length; j++) {
			if (owner !== undefined && boxes[i].ownerId !== owner && boxes[j].ownerId !== owner) continue;
			const kind = pairKind(boxes[i], boxes[j]);
			if (kind !== 'collides' && kind !== 'blocked') continue;
			const v = overlapVolume(boxes[i].box, boxes[j].box);
			if (v > 0) out.set(key(boxes[i].id, boxes[j].id), v);
		}
	}
	return out;
}

function applyMove(scene: Scene, move: ClearingMove): Scene {
	if (move.targetKind === 'divider') {
		return {
			...scene,
			dividerPositions: { ...scene.dividerPositions, [move.targetId]: move.toOffsetMm! }
		};
	}
	if (move.targetKind === 'bracket') {
		return {
			...scene,
			bracketOffsets: { ...scene.bracketOffsets, [move.targetId]: move.toOffsetMm! }
		};
	}
	const a = 'xyz'.indexOf(move.axis);
	return {
		...scene,
		placements: scene.placements.map((p) => {
			if (p.id !== move.targetId) return p;
			const position = [...p.position] as Vec3;
			position[a] += move.sign * move.distanceMm;
			return { ...p, position };
		})
	};
}

function overlapsByKey(overlaps: readonly Overlap[]): Map<string, Overlap> {
	return new Map(overlaps.map((o) => [key(o.a.id, o.b.id), o]));
}

describe('clearing moves, applied and re-checked (1,000 random scenes)', () => {
	it(
		'clear their problem, create no collision or block, deepen none; never a locked part; controls land on allowed positions',
		{ timeout: 120_000 },
		() => {
			eachCheckedScene(lockedSceneArb, 1000, (scene, report) => {
				const before = overlapsByKey(report.overlaps);
				const locked = new Set(scene.placements.filter((p) => p.locked).map((p) => p.id));
				for (const o of report.overlaps) {
					expect(o.moves.length).toBeLessThanOrEqual(2);
					expect(o.clearingMove).toEqual(o.moves[0] ?? null);
					expect(o.moves.length === 0).toBe(o.noMove !== undefined);
					for (const move of o.moves) {
						expect(move.distanceMm).toBeGreaterThan(0);
						if (move.targetKind === 'part') {
							expect(locked.has(move.targetId)).toBe(false);
						} else {
							const defs: { id: string; axis: string }[] =
								move.targetKind === 'divider' ? scene.enclosure.dividers : scene.enclosure.brackets;
							const def = scene.enclosure[
								move.targetKind === 'divider' ? 'dividers' : 'brackets'
							].find((d) => d.id === move.targetId)!;
							expect(defs.some((d) => d.id === move.targetId)).toBe(true);
							expect(move.axis).toBe(def.axis);
							expect(allowedIndex(def, move.toOffsetMm!)).toBeGreaterThanOrEqual(0);
						}
						const after = checkScene(applyMove(scene, move));
						const now = overlapsByKey(after.overlaps);
						expect(now.has(key(o.a.id, o.b.id))).toBe(false);
						for (const [k, n] of now) {
							if (n.kind === 'warning') continue;
							const old = before.get(k);
							expect(old, `${k} is new after ${JSON.stringify(move)}`).toBeDefined();
							expect(n.volumeMm3).toBeLessThanOrEqual(old!.volumeMm3 + 1e-6);
						}
					}
				}
			});
		}
	);

	it('when the engine finds no move, a search every 0.5 mm along each axis and over every allowed position finds none', () => {
		let none = 0;
		eachCheckedScene(lockedSceneArb, 1000, (scene, report) => {
			const empty = report.overlaps.filter((o) => o.moves.length === 0);
			if (empty.length === 0) return;
			const resolved = resolveScene(scene);
			const boxes = worldBoxesOf(scene);
			const before = problems(boxes);
			const inner = resolved.innerBox;
			for (const o of empty) {
				none++;
				const pair = [boxes.find((b) => b.id === o.a.id)!, boxes.find((b) => b.id === o.b.id)!];
				for (const moving of pair) {
					const other = moving === pair[0] ? pair[1] : pair[0];
					const owner = moving.ownerId;
					const moves: { axis: number; shifted: (b: WorldBox) => Box }[] = [];
					if (moving.kind === 'body' || moving.kind === 'keepout') {
						const placement = scene.placements.find((p) => p.id === owner)!;
						if (placement.locked) continue;
						const bodies = resolved.placements
							.find((rp) => rp.placement.id === owner)!
							.bodies.map((b) => b.box);
						for (let a = 0; a < 3; a++) {
							const low = Math.min(...bodies.map((b) => b.min[a]));
							const high = Math.max(...bodies.map((b) => b.max[a]));
							const pastLow = Math.max(0, inner.min[a] - low);
							const pastHigh = Math.max(0, high - inner.max[a]);
							const span = inner.max[a] - inner.min[a] + (high - low) + 1;
							for (let t = -Math.ceil(span * 2) / 2; t <= span; t += 0.5) {
								if (t === 0) continue;
								// Within the enclosure: no further past the inside than the part is now.
								if (
									inner.min[a] - (low + t) > pastLow + EPSILON_MM ||
									high + t - inner.max[a] > pastHigh + EPSILON_MM
								) {
									continue;
								}
								moves.push({ axis: a, shifted: (b) => shift(b.box, a, t) });
							}
						}
					} else if (moving.kind === 'divider' || moving.kind === 'bracket') {
						const def =
							moving.kind === 'divider'
								? scene.enclosure.dividers.find((d) => d.id === owner)!
								: scene.enclosure.brackets.find((b) => b.id === owner)!;
						const a = 'xyz'.indexOf(def.axis);
						const current =
							moving.kind === 'divider'
								? resolved.dividerPositions[owner]
								: resolved.bracketOffsets[owner];
						for (const p of allowedPositions(def)) {
							if (Math.abs(p.offsetMm - current) <= EPSILON_MM) continue;
							moves.push({ axis: a, shifted: (b) => shift(b.box, a, p.offsetMm - current) });
						}
					} else {
						continue;
					}
					// Moving along one axis, only boxes that share area with a moved box seen along it
					// can ever meet it: the others are left out of the pair search for that axis.
					const own = boxes.filter((b) => b.ownerId === owner);
					const meets = [0, 1, 2].map((a) =>
						boxes.filter(
							(b) =>
								b.ownerId === owner ||
								own.some((m) =>
									[0, 1, 2].every((k) => k === a || sharedAlong(m.box, b.box, k) > EPSILON_MM)
								)
						)
					);
					for (const m of moves) {
						const moved = meets[m.axis].map((b) =>
							b.ownerId === owner ? { ...b, box: m.shifted(b) } : b
						);
						const movedTarget = moved.find((b) => b.id === moving.id)!;
						if (overlapVolume(movedTarget.box, other.box) > 0) continue;
						const after = problems(moved, owner);
						const worse = [...after].some(([k, v]) => !before.has(k) || v > before.get(k)! + 1e-6);
						expect(
							worse,
							`${moving.id} could move along ${'xyz'[m.axis]} to clear ${o.a.id}|${o.b.id}`
						).toBe(true);
					}
				}
			}
		});
		// The property means something only if the engine does say "no move" in some scenes.
		expect(none).toBeGreaterThan(20);
	}, 120_000);
});

function shift(box: Box, a: number, t: number): Box {
	const min = [...box.min] as Vec3;
	const max = [...box.max] as Vec3;
	min[a] += t;
	max[a] += t;
	return { min, max };
}
