/**
 * Maximal empty boxes against a brute-force search on a 1 mm grid: in small random scenes with
 * integer coordinates every maximal empty box has integer faces (each face rests on the container
 * or an obstacle), so enumerating every integer box is a complete oracle.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { boxVolume } from './box';
import { demoScene } from './standard-library';
import { freeSpaceAround, freeSpaceAtMount, freeSpaceIn, maximalEmptyBoxes } from './free-space';
import { resolveScene } from './resolve';
import type { Box, Vec3 } from './schema';

const int = (min: number, max: number) => fc.integer({ min, max });
const caseArb = fc.record({
	size: fc.tuple(int(1, 7), int(1, 7), int(1, 7)),
	obstacles: fc.array(
		fc.tuple(int(-2, 7), int(-2, 7), int(-2, 7), int(1, 5), int(1, 5), int(1, 5)),
		{ maxLength: 6 }
	)
});

function shared(a: Box, b: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (Math.min(a.max[i], b.max[i]) - Math.max(a.min[i], b.min[i]) <= 0) return false;
	}
	return true;
}

/** Every integer box in the container that overlaps no obstacle, and whether it can grow 1 mm on some face. */
function bruteForce(container: Box, obstacles: Box[]) {
	const [X, Y, Z] = container.max;
	const empty: Box[] = [];
	for (let x0 = 0; x0 < X; x0++) {
		for (let x1 = x0 + 1; x1 <= X; x1++) {
			for (let y0 = 0; y0 < Y; y0++) {
				for (let y1 = y0 + 1; y1 <= Y; y1++) {
					for (let z0 = 0; z0 < Z; z0++) {
						for (let z1 = z0 + 1; z1 <= Z; z1++) {
							const b: Box = { min: [x0, y0, z0], max: [x1, y1, z1] };
							if (!obstacles.some((o) => shared(o, b))) empty.push(b);
						}
					}
				}
			}
		}
	}
	return empty;
}

function canGrow(b: Box, container: Box, obstacles: Box[]): boolean {
	for (let a = 0; a < 3; a++) {
		for (const high of [false, true]) {
			const g: Box = { min: [...b.min], max: [...b.max] };
			if (high) g.max[a] += 1;
			else g.min[a] -= 1;
			if (g.min[a] < container.min[a] || g.max[a] > container.max[a]) continue;
			if (!obstacles.some((o) => shared(o, g))) return true;
		}
	}
	return false;
}

const key = (b: Box) => `${b.min.join()}|${b.max.join()}`;

describe('maximalEmptyBoxes', () => {
	it('returns exactly the maximal empty boxes a 1 mm grid search finds: each empty, none can grow, none larger missed', () => {
		fc.assert(
			fc.property(caseArb, ({ size, obstacles }) => {
				const container: Box = { min: [0, 0, 0], max: size as Vec3 };
				const obs = obstacles.map(
					([x, y, z, w, h, d]) => ({ min: [x, y, z], max: [x + w, y + h, z + d] }) as Box
				);
				const { boxes, complete } = maximalEmptyBoxes(container, obs);
				expect(complete).toBe(true);
				const empty = bruteForce(container, obs);
				for (const b of boxes) {
					expect(obs.some((o) => shared(o, b))).toBe(false);
					expect(b.min.every((v, i) => v >= container.min[i] && b.max[i] <= container.max[i])).toBe(
						true
					);
					expect(canGrow(b, container, obs)).toBe(false);
				}
				const largest = Math.max(0, ...boxes.map(boxVolume));
				expect(Math.max(0, ...empty.map(boxVolume))).toBe(largest);
				// And nothing is missed: the grid's maximal boxes are the same set.
				const maximal = empty
					.filter((b) => !canGrow(b, container, obs))
					.map(key)
					.sort();
				expect(boxes.map(key).sort()).toEqual(maximal);
			}),
			{ numRuns: 300 }
		);
	});

	it('with nothing in the way, the container itself', () => {
		const c: Box = { min: [0, 0, 0], max: [10, 20, 30] };
		expect(maximalEmptyBoxes(c, []).boxes).toEqual([c]);
	});
});

describe('free space in the demo scene (keep-outs of placed parts count)', () => {
	const resolved = resolveScene(demoScene());

	it('around a point above the card: the largest box holding it, bounded by the pump-reservoir’s fittings', () => {
		// (120, 200, 180): on the card side (x 88 → 150 at 3 slots), above the card (y 195).
		const { boxes } = freeSpaceAround(resolved, [120, 200, 180]);
		expect(boxes.length).toBeGreaterThan(0);
		for (const b of boxes) {
			expect(
				b.box.min.every((v, i) => v <= [120, 200, 180][i] && [120, 200, 180][i] <= b.box.max[i])
			).toBe(true);
		}
		const all = resolved.placements.flatMap((p) => [...p.bodies, ...p.keepouts]).map((b) => b.box);
		for (const b of boxes) expect(all.some((o) => shared(o, b.box))).toBe(false);
		expect(boxes.map((b) => b.volumeMm3)).toEqual(
			[...boxes.map((b) => b.volumeMm3)].sort((a, b) => b - a)
		);
	});

	it('in a compartment: every box inside it and empty', () => {
		const cpu = resolved.compartments.find((c) => c.id === 'bulkhead.high+spine.low')!;
		const { boxes } = freeSpaceIn(resolved, cpu.box);
		const all = resolved.placements.flatMap((p) => [...p.bodies, ...p.keepouts]).map((b) => b.box);
		for (const b of boxes) {
			expect(
				b.box.min.every(
					(v, i) => v >= cpu.box.min[i] - 1e-9 && b.box.max[i] <= cpu.box.max[i] + 1e-9
				)
			).toBe(true);
			expect(all.some((o) => shared(o, b.box))).toBe(false);
		}
	});

	it('in front of the full radiator mount: only what the stack leaves, touching the front panel', () => {
		const mount = demoScene().enclosure.mounts.find((m) => m.id === 'radiator')!;
		const { boxes } = freeSpaceAtMount(resolved, mount);
		// The radiator spans x 3.5 → 146.5 and y 12.5 → 327.5 from z 0: what touches the panel is the rim around it.
		for (const b of boxes) expect(b.box.min[2]).toBe(0);
		expect(Math.max(...boxes.map((b) => Math.min(b.sizeMm[0], b.sizeMm[1])))).toBeLessThanOrEqual(
			12.5 + 1e-9
		);
	});
});
