import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { Box3, Vector3 } from 'three';
import {
	centreLineLengthMm,
	findRoute,
	routeBoxes,
	routeMany,
	type RouteInput,
	type RouteObstacle
} from './route';
import { FACE_UNIT, type Face } from './box';
import type { Box, Vec3 } from './schema';

const FACES: Face[] = ['-x', '+x', '-y', '+y', '-z', '+z'];
/** A run's end point well inside the random scenes' 20 × 12 × 12 bounds. */
const endPointArb = fc.tuple(
	fc.integer({ min: 2, max: 18 }),
	fc.integer({ min: 2, max: 10 }),
	fc.integer({ min: 2, max: 10 })
);

/**
 * Independent oracle: Dijkstra over every integer point of the bounds (a 1-unit grid, finer than
 * or equal to the engine's candidate planes when all inputs are integers), written here from the
 * problem's rules and not from the engine's code. The tube occupies its straight pieces grown by
 * the half-width across their axis and each bend's tangent points and corner grown by the half-width; a bend needs r of straight
 * leg on both sides (so 2r between two bends, r after the start and before the end); the route
 * leaves the start along its port and arrives against the end's port. Cost = polyline length +
 * penalty × bends. Answers Infinity when nothing connects.
 */
function bruteForce(input: RouteInput): number {
	const half = input.section.kind === 'round' ? input.section.outerDiameterMm / 2 : 0;
	const { clearanceMm: c, bendRadiusMm: r, bendPenaltyMm: B } = input;
	const obstacles = input.obstacles.map((o) => ('box' in o ? o.box : o));
	const lo = input.bounds.min.map((v) => v + c);
	const hi = input.bounds.max.map((v) => v - c);
	const free = (min: number[], max: number[]) => {
		for (let a = 0; a < 3; a++) {
			if (min[a] < lo[a] - 1e-9 || max[a] > hi[a] + 1e-9) return false;
		}
		return obstacles.every((o) =>
			[0, 1, 2].some((a) => Math.min(max[a], o.max[a] + c) - Math.max(min[a], o.min[a] - c) <= 1e-9)
		);
	};
	/** Tube from p to q (one axis): grown by half across; `back`/`front` grow it along. */
	const piece = (p: Vec3, q: Vec3, back: number, front: number) => {
		const min: number[] = [];
		const max: number[] = [];
		for (let a = 0; a < 3; a++) {
			if (p[a] === q[a]) {
				min.push(p[a] - half);
				max.push(p[a] + half);
			} else if (q[a] > p[a]) {
				min.push(p[a] - back);
				max.push(q[a] + front);
			} else {
				min.push(q[a] - front);
				max.push(p[a] + back);
			}
		}
		return free(min, max);
	};
	/** A 90° bend at p from unit u to unit v: the box of its tangent points and corner, grown. */
	const bend = (p: Vec3, u: Vec3, v: Vec3) => {
		const min = [p[0] - half, p[1] - half, p[2] - half];
		const max = [p[0] + half, p[1] + half, p[2] + half];
		for (let a = 0; a < 3; a++) {
			// The tangent points grown by the half-width every way (the loop checker's bend box).
			if (u[a] > 0) min[a] = p[a] - r - half;
			if (u[a] < 0) max[a] = p[a] + r + half;
			if (v[a] > 0) max[a] = p[a] + r + half;
			if (v[a] < 0) min[a] = p[a] - r - half;
		}
		return free(min, max);
	};
	const add = (p: Vec3, u: Vec3, k: number): Vec3 => [
		p[0] + u[0] * k,
		p[1] + u[1] * k,
		p[2] + u[2] * k
	];
	const S = input.start.point;
	const E = input.end.point;
	const sd = FACES.indexOf(input.start.direction);
	const ed = FACES.indexOf(input.end.direction) ^ 1;
	const key = (p: Vec3, d: number) => ((p[0] * 64 + p[1]) * 64 + p[2]) * 6 + d;
	const dist = new Map<number, number>();
	// Every cost is a whole number here (unit steps, whole penalties): one bucket per cost value.
	const buckets: { p: Vec3; d: number }[][] = [];
	let best = Infinity;
	const push = (p: Vec3, d: number, g: number) => {
		for (let a = 0; a < 3; a++) {
			if (p[a] < lo[a] + half - 1e-9 || p[a] > hi[a] - half + 1e-9) return;
		}
		const k = key(p, d);
		if ((dist.get(k) ?? Infinity) <= g) return;
		dist.set(k, g);
		(buckets[g] ??= []).push({ p, d });
	};
	/** Distance from p to E straight along u, or -1 when E is not on that ray. */
	const ahead = (p: Vec3, u: Vec3) => {
		let k = -1;
		for (let a = 0; a < 3; a++) {
			if (u[a] === 0 && p[a] !== E[a]) return -1;
			if (u[a] !== 0) k = (E[a] - p[a]) * u[a];
		}
		return k;
	};
	const su = FACE_UNIT[FACES[sd]];
	if (sd === ed && ahead(S, su) > 0 && piece(S, E, 0, 0)) best = ahead(S, su);
	const first = Math.max(r, 1);
	const L = add(S, su, first);
	if (piece(S, L, 0, half)) push(L, sd, first);
	for (let g = 0; g < buckets.length && g < best; g++) {
		for (const { p, d } of buckets[g] ?? []) {
			if (g > (dist.get(key(p, d)) ?? Infinity)) continue;
			const u = FACE_UNIT[FACES[d]];
			const q = add(p, u, 1);
			if (d === ed && ahead(p, u) === 1 && piece(p, q, half, 0)) best = Math.min(best, g + 1);
			if (piece(p, q, half, half)) push(q, d, g + 1);
			for (let d2 = 0; d2 < 6; d2++) {
				if (d2 >> 1 === d >> 1) continue;
				const v = FACE_UNIT[FACES[d2]];
				if (!bend(p, u, v)) continue;
				const k = ahead(p, v);
				if (d2 === ed && k >= r && k > 0 && piece(p, E, half, 0)) best = Math.min(best, g + B + k);
				const jump = Math.max(2 * r, 1);
				const j = add(p, v, jump);
				if (piece(p, j, half, half)) push(j, d2, g + B + jump);
			}
		}
	}
	return best;
}

const intBox = (x: number[], y: number[], z: number[]): Box => ({
	min: [x[0], y[0], z[0]],
	max: [x[1], y[1], z[1]]
});

/**
 * A run between two ports (each `[point, direction]`) in a box from the origin to `max`: a hard
 * 10 mm round tube, 2 mm clearance, 20 mm bends at 50 mm each and nothing in the way, unless
 * `over` says otherwise.
 */
const request = (
	start: [Vec3, Face],
	end: [Vec3, Face],
	max: Vec3,
	over: Partial<RouteInput> = {}
): RouteInput => ({
	start: { point: start[0], direction: start[1] },
	end: { point: end[0], direction: end[1] },
	bounds: { min: [0, 0, 0], max },
	obstacles: [],
	section: { kind: 'round', outerDiameterMm: 10 },
	clearanceMm: 2,
	bendRadiusMm: 20,
	bendPenaltyMm: 50,
	mode: 'hard',
	...over
});

/** Random small scenes on integer coordinates: a 20 × 12 × 12 room, up to five blocks. */
const sceneArb = fc
	.record({
		blocks: fc.array(
			fc.record({
				x: fc.integer({ min: 0, max: 18 }),
				y: fc.integer({ min: 0, max: 10 }),
				z: fc.integer({ min: 0, max: 10 }),
				w: fc.integer({ min: 1, max: 10 }),
				h: fc.integer({ min: 1, max: 12 }),
				d: fc.integer({ min: 1, max: 12 })
			}),
			{ maxLength: 5 }
		),
		s: endPointArb,
		e: endPointArb,
		sd: fc.constantFrom(...FACES),
		ed: fc.constantFrom(...FACES),
		// A bend radius below the half-width is no tube; the oracle takes r ≥ 1 = the half-width.
		r: fc.integer({ min: 1, max: 3 }),
		c: fc.integer({ min: 0, max: 1 }),
		B: fc.constantFrom(0, 3, 10)
	})
	.filter((s) => s.s.join() !== s.e.join())
	.map((s) =>
		request([s.s as Vec3, s.sd], [s.e as Vec3, s.ed], [20, 12, 12], {
			obstacles: s.blocks.map((b, i) => ({
				id: `b${i}`,
				box: intBox([b.x, Math.min(20, b.x + b.w)], [b.y, b.y + b.h], [b.z, b.z + b.d])
			})),
			section: { kind: 'round', outerDiameterMm: 2 },
			clearanceMm: s.c,
			bendRadiusMm: s.r,
			bendPenaltyMm: s.B,
			maxAlternatives: 3
		})
	);

/** Flood fill over unit steps: whether `to` is reached from `from` by steps that `free` allows. */
function floodReaches(from: Vec3, to: Vec3, free: (p: Vec3, q: Vec3) => boolean): boolean {
	const seen = new Set([from.join()]);
	const queue = [from];
	while (queue.length) {
		const p = queue.pop()!;
		if (p.join() === to.join()) return true;
		for (const u of Object.values(FACE_UNIT)) {
			const q: Vec3 = [p[0] + u[0], p[1] + u[1], p[2] + u[2]];
			if (!seen.has(q.join()) && free(p, q)) {
				seen.add(q.join());
				queue.push(q);
			}
		}
	}
	return false;
}

const fullPath = (input: RouteInput, waypoints: Vec3[]): Vec3[] => [
	input.start.point,
	...waypoints,
	input.end.point
];

function polylineMm(points: Vec3[]): number {
	return centreLineLengthMm(points, 0);
}

// Property runs search hundreds of scenes each; generous bounds for a slow shared machine.
describe('findRoute', { timeout: 180_000 }, () => {
	it('goes over a 40 mm block between two upward ports 100 mm apart with two bends (worked example)', () => {
		// Ports on the floor face up; their fittings reach 10 mm, so the route starts at y = 10 above
		// x = 10 and ends at y = 10 above x = 110. Tube 10 mm outer diameter (half-width 5), 2 mm
		// clearance, bend radius 20 mm (two diameters, common practice). The block between them is
		// 40 mm high and 60 mm deep, so going round it costs four bends; over it costs two.
		// Lowest the top run can be: 40 (block) + 2 (clearance) + 5 (half-width) = 47 mm.
		// Polyline: up 47 − 10 = 37, across 100, down 37 → 174 mm. Legs: 37 ≥ r = 20 after the start
		// and before the end, 100 ≥ 2r = 40 between the bends. With arcs: 174 − 2 × 2 × 20 + 2 × π ×
		// 20 / 2 = 94 + 20π = 156.83 mm. Cost with a 50 mm penalty per bend: 174 + 2 × 50 = 274.
		const res = findRoute(
			request([[10, 10, 50], '+y'], [[110, 10, 50], '+y'], [120, 100, 100], {
				obstacles: [{ box: { min: [40, 0, 20], max: [80, 40, 80] }, id: 'block' }]
			})
		);
		expect(res.ok).toBe(true);
		if (!res.ok) return;
		const [route] = res.routes;
		expect(route.waypoints).toEqual([
			[10, 47, 50],
			[110, 47, 50]
		]);
		expect(route.bends).toBe(2);
		expect(route.cost).toBeCloseTo(274, 9);
		expect(route.lengthMm).toBeCloseTo(94 + 20 * Math.PI, 9);
		expect(route.lengthMm).toBeCloseTo(156.83, 2);
	});

	it('says why when the only passage is narrower than the tube and names what closes it', () => {
		// A block 40 mm high under a 50 mm ceiling, wall to wall: 10 mm of gap, the tube needs
		// 10 + 2 × 2 = 14 mm.
		const res = findRoute(
			request([[10, 10, 50], '+y'], [[110, 10, 50], '+y'], [120, 50, 100], {
				obstacles: [{ box: { min: [40, 0, 0], max: [80, 40, 100] }, id: 'block', label: 'Block' }]
			})
		);
		expect(res.ok).toBe(false);
		if (res.ok) return;
		expect(res.narrowestGapMm).toBeGreaterThan(9.8);
		expect(res.narrowestGapMm).toBeLessThanOrEqual(10);
		expect(res.blockedBy).toEqual(['Block (block)']);
		expect(res.reason).toMatch(/narrowest gap .* 9\.\d mm.*needs 14\.0 mm/);
	});

	it('tells a bend radius that does not fit from a gap that is too narrow', () => {
		// A 30 mm high slot: wide enough for the 10 mm tube, but a 40 mm bend cannot turn into it.
		const res = findRoute(
			request([[10, 10, 20], '+y'], [[110, 10, 20], '+y'], [120, 30, 40], { bendRadiusMm: 40 })
		);
		expect(res.ok).toBe(false);
		if (res.ok) return;
		// The start's own room decides it, before any search: 10 + 40 (the straight leg before a
		// bend of radius 40) > 30 − 2 − 5 = 23 mm of room above it.
		expect(res.cause).toBe('disconnected');
		expect(res.reason).toMatch(
			/the start has no room to turn.* 40\.0 mm radius.*panels are in the way/
		);
	});

	it('finds the same optimum as a brute-force Dijkstra over the unit grid (random small scenes)', () => {
		fc.assert(
			fc.property(sceneArb, (input) => {
				const expected = bruteForce(input);
				const res = findRoute(input);
				if (expected === Infinity) {
					expect(res.ok).toBe(false);
				} else {
					expect(res.ok).toBe(true);
					if (res.ok) expect(res.routes[0].cost).toBeCloseTo(expected, 6);
				}
			}),
			{ numRuns: 120, seed: 17 }
		);
	});

	it('returns routes whose tube boxes clear every obstacle (three.js Box3 as the oracle) and whose bends have their room', () => {
		fc.assert(
			fc.property(sceneArb, (input) => {
				const res = findRoute(input);
				if (!res.ok) return;
				const r = input.bendRadiusMm;
				const c = input.clearanceMm;
				const room = new Box3(
					new Vector3(...input.bounds.min).addScalar(c),
					new Vector3(...input.bounds.max).subScalar(c)
				);
				const obstacles = input.obstacles.map((o) => {
					const b = 'box' in o ? o.box : o;
					return new Box3(new Vector3(...b.min).subScalar(c), new Vector3(...b.max).addScalar(c));
				});
				const size = new Vector3();
				for (const route of res.routes) {
					const pts = fullPath(input, route.waypoints);
					// Axis-aligned, each bend 90°, and bends no tighter than the tube allows.
					const corners = [pts[0]];
					for (let i = 1; i < pts.length; i++) {
						const moved = [0, 1, 2].filter((a) => pts[i][a] !== pts[i - 1][a]);
						expect(moved).toHaveLength(1);
						if (i + 1 < pts.length) corners.push(pts[i]);
					}
					corners.push(pts[pts.length - 1]);
					const legs = corners.slice(1).map((p, i) => polylineMm([corners[i], p]));
					legs.forEach((len, i) => {
						const bendsAtEnds = (i > 0 ? 1 : 0) + (i < legs.length - 1 ? 1 : 0);
						expect(len).toBeGreaterThanOrEqual(bendsAtEnds * r - 1e-9);
					});
					expect(route.bends).toBe(corners.length - 2);
					expect(route.cost).toBeCloseTo(polylineMm(pts) + input.bendPenaltyMm * route.bends, 6);
					for (const b of routeBoxes(pts, input.section, r)) {
						const tube = new Box3(new Vector3(...b.min), new Vector3(...b.max));
						expect(room.containsBox(tube.clone().expandByScalar(-1e-9))).toBe(true);
						for (const o of obstacles) {
							if (!tube.intersectsBox(o)) continue;
							tube.clone().intersect(o).getSize(size);
							expect(Math.min(size.x, size.y, size.z)).toBeLessThanOrEqual(1e-9);
						}
					}
				}
				// Alternatives are distinct and the first is the cheapest.
				const keys = res.routes.map((x) => JSON.stringify(x.waypoints));
				expect(new Set(keys).size).toBe(keys.length);
				for (const x of res.routes) expect(x.cost).toBeGreaterThanOrEqual(res.routes[0].cost);
			}),
			{ numRuns: 120, seed: 1717 }
		);
	});

	it('answers no route exactly when a flood fill finds the ports disconnected (no bend radius)', () => {
		fc.assert(
			fc.property(sceneArb, (raw) => {
				const input = { ...raw, bendRadiusMm: 0 };
				const half = 1;
				const c = input.clearanceMm;
				const obstacles = input.obstacles.map((o) => ('box' in o ? o.box : o));
				// Flood fill over unit points whose 2-unit cube around the centre-line is free.
				const cubeFree = (p: Vec3) =>
					[0, 1, 2].every(
						(a) => p[a] - half >= input.bounds.min[a] + c && p[a] + half <= input.bounds.max[a] - c
					) &&
					obstacles.every((o) =>
						[0, 1, 2].some((a) => p[a] + half <= o.min[a] - c || p[a] - half >= o.max[a] + c)
					);
				const S = input.start.point;
				const E = input.end.point;
				const su = FACE_UNIT[input.start.direction];
				const eu = FACE_UNIT[input.end.direction];
				const s1: Vec3 = [S[0] + su[0], S[1] + su[1], S[2] + su[2]];
				const e1: Vec3 = [E[0] + eu[0], E[1] + eu[1], E[2] + eu[2]];
				// The first unit out of each port is a piece of its own: free across, not behind.
				const leaves = (p: Vec3, u: Vec3) =>
					[0, 1, 2].every((a) => {
						const lo = u[a] === 0 ? p[a] - half : Math.min(p[a], p[a] + u[a]);
						const hi = u[a] === 0 ? p[a] + half : Math.max(p[a], p[a] + u[a]);
						return lo >= input.bounds.min[a] + c && hi <= input.bounds.max[a] - c;
					}) &&
					obstacles.every((o) =>
						[0, 1, 2].some((a) => {
							const lo = u[a] === 0 ? p[a] - half : Math.min(p[a], p[a] + u[a]);
							const hi = u[a] === 0 ? p[a] + half : Math.max(p[a], p[a] + u[a]);
							return hi <= o.min[a] - c || lo >= o.max[a] + c;
						})
					);
				const connected =
					leaves(S, su) &&
					leaves(E, eu) &&
					cubeFree(s1) &&
					cubeFree(e1) &&
					floodReaches(s1, e1, (_, q) => cubeFree(q));
				const res = findRoute(input);
				if (!connected) {
					// Only a straight run between facing ports one unit apart avoids both cubes.
					const straightOnly =
						res.ok && res.routes.every((x) => x.bends === 0 && polylineMm([S, E]) <= 1);
					expect(res.ok === false || straightOnly).toBe(true);
				} else {
					expect(res.ok).toBe(true);
				}
			}),
			{ numRuns: 150, seed: 4242 }
		);
	});

	it('tells "no route exists" from "the search gave up" when the step cap stops it (brute-force flood fill)', () => {
		fc.assert(
			fc.property(sceneArb, (input) => {
				// The relaxed question the engine proves: can the tube's square cross-section (2 units
				// wide) slide from the start to the end one unit at a step, each step's swept box clear
				// by the clearance and inside the bounds? Written here over every integer point.
				const half = 1;
				const c = input.clearanceMm;
				const obstacles = input.obstacles.map((o) => ('box' in o ? o.box : o));
				const sweepFree = (p: Vec3, q: Vec3) => {
					const min = [0, 1, 2].map((a) => (p[a] === q[a] ? p[a] - half : Math.min(p[a], q[a])));
					const max = [0, 1, 2].map((a) => (p[a] === q[a] ? p[a] + half : Math.max(p[a], q[a])));
					return (
						[0, 1, 2].every(
							(a) => min[a] >= input.bounds.min[a] + c && max[a] <= input.bounds.max[a] - c
						) &&
						obstacles.every((o) =>
							[0, 1, 2].some((a) => max[a] <= o.min[a] - c || min[a] >= o.max[a] + c)
						)
					);
				};
				const S = input.start.point;
				const E = input.end.point;
				const connected = floodReaches(S, E, sweepFree);
				// Five steps: far too few for most scenes, so the cap decides the answer's path.
				const res = findRoute({ ...input, maxExpansions: 5, maxAlternatives: 1 });
				if (!connected) {
					expect(res.ok).toBe(false);
					if (!res.ok) expect(res.cause).toBe('disconnected');
				}
				if (!res.ok && res.cause === 'capped') {
					expect(connected).toBe(true);
					expect(res.furthest).toBeDefined();
					expect(res.reason).toMatch(/^The search stopped after 5 steps .* got to \(/);
				}
			}),
			{ numRuns: 200, seed: 2024 }
		);
	});

	it('names what walls the ports off when the cap stops the search (worked example)', () => {
		// The start sits inside a closed shell of six 2 mm plates (an inner room 30 mm on a side);
		// the end is outside it. With a cap of 20 steps the search cannot exhaust the shell's inside,
		// so only the flood fill can say that no route exists.
		const plates: RouteObstacle[] = [
			{ id: 'left', label: 'Left plate', box: { min: [18, 18, 18], max: [20, 52, 52] } },
			{ id: 'right', label: 'Right plate', box: { min: [50, 18, 18], max: [52, 52, 52] } },
			{ id: 'floor', label: 'Floor plate', box: { min: [18, 18, 18], max: [52, 20, 52] } },
			{ id: 'roof', label: 'Roof plate', box: { min: [18, 50, 18], max: [52, 52, 52] } },
			{ id: 'back', label: 'Back plate', box: { min: [18, 18, 18], max: [52, 52, 20] } },
			{ id: 'front', label: 'Front plate', box: { min: [18, 18, 50], max: [52, 52, 52] } }
		];
		const input = request([[30, 30, 35], '+x'], [[80, 80, 80], '-y'], [100, 100, 100], {
			obstacles: plates,
			section: { kind: 'round', outerDiameterMm: 4 },
			clearanceMm: 1,
			bendRadiusMm: 4,
			bendPenaltyMm: 10,
			mode: 'soft',
			maxExpansions: 20
		});
		const res = findRoute(input);
		expect(res.ok).toBe(false);
		if (res.ok) return;
		expect(res.cause).toBe('disconnected');
		expect(res.reason).toMatch(/^No route exists: the start and the end are not connected/);
		// Every plate bounds the region the start can reach; all six are named.
		expect([...(res.blockedBy ?? [])].sort()).toEqual(
			plates.map((p) => `${p.label} (${p.id})`).sort()
		);
		// Open the right plate with a 10 mm window: now a route exists, so the same cap only gives up.
		const open: RouteObstacle[] = [
			...plates.filter((p) => p.id !== 'right'),
			{ id: 'right-a', label: 'Right plate', box: { min: [50, 18, 18], max: [52, 30, 52] } },
			{ id: 'right-b', label: 'Right plate', box: { min: [50, 40, 18], max: [52, 52, 52] } },
			{ id: 'right-c', label: 'Right plate', box: { min: [50, 30, 18], max: [52, 40, 30] } },
			{ id: 'right-d', label: 'Right plate', box: { min: [50, 30, 40], max: [52, 40, 52] } }
		];
		const gaveUp = findRoute({ ...input, obstacles: open });
		expect(gaveUp.ok).toBe(false);
		if (gaveUp.ok) return;
		expect(gaveUp.cause).toBe('capped');
		// The furthest point is named in mm, with what stops the search there.
		const [x, y, z] = gaveUp.furthest!;
		expect(gaveUp.reason).toContain(
			`got to (${Math.round(x)}, ${Math.round(y)}, ${Math.round(z)}) mm`
		);
		expect(gaveUp.reason).toMatch(/short of the end, where .*Right plate \(right-/);
		expect(gaveUp.reason).toMatch(/tightest spot is \d+\.\d mm from /);
		// And with no cap it finds the route through the window.
		const routed = findRoute({ ...input, obstacles: open, maxExpansions: undefined });
		expect(routed.ok).toBe(true);
	});

	it('proves at once that a port with no room for its first bend has no route, naming what is in the way', () => {
		// The end port faces up under a shelf 20 mm above it: the 10 mm bundle needs 15 mm straight
		// into the port and a 15 mm bend above that (15 + 5 + 2 = 22 mm > 20), so no corner fits.
		const res = findRoute(
			request([[20, 20, 50], '+y'], [[150, 20, 50], '+y'], [200, 200, 100], {
				obstacles: [
					{ id: 'shelf', label: 'Shelf', box: { min: [120, 40, 0], max: [200, 45, 100] } }
				],
				section: { kind: 'flat', widthMm: 10, thicknessMm: 5 },
				bendRadiusMm: 15,
				bendPenaltyMm: 100,
				mode: 'soft'
			})
		);
		expect(res.ok).toBe(false);
		if (res.ok) return;
		expect(res.cause).toBe('disconnected');
		expect(res.blockedBy).toEqual(['Shelf (shelf)']);
		expect(res.reason).toMatch(
			/^No route exists: the end has no room to turn\..* Shelf \(shelf\) is in the way/
		);
	});

	it('gives each run among several the optimum among the runs placed before it (brute-force Dijkstra)', () => {
		// routeMany keeps a run's own best route when it is still clear of the runs placed before;
		// the oracle searches again with those runs' boxes as obstacles.
		const second = fc.record({
			s: endPointArb,
			e: endPointArb,
			sd: fc.constantFrom(...FACES),
			ed: fc.constantFrom(...FACES)
		});
		fc.assert(
			fc.property(
				sceneArb,
				second.filter((t) => t.s.join() !== t.e.join()),
				(input, t) => {
					const shared = {
						bounds: input.bounds,
						obstacles: input.obstacles,
						clearanceMm: input.clearanceMm,
						bendPenaltyMm: input.bendPenaltyMm
					};
					const common = {
						section: input.section,
						bendRadiusMm: input.bendRadiusMm,
						mode: 'hard' as const
					};
					const runs = [
						{ id: 'a', start: input.start, end: input.end, ...common },
						{
							id: 'b',
							start: { point: t.s as Vec3, direction: t.sd },
							end: { point: t.e as Vec3, direction: t.ed },
							...common
						}
					];
					const { order, results } = routeMany(runs, shared);
					const before: Box[] = [];
					for (const id of order) {
						const run = runs.find((x) => x.id === id)!;
						const oracle = bruteForce({
							...input,
							...run,
							obstacles: [...input.obstacles, ...before]
						});
						const res = results[id];
						expect(res.ok).toBe(oracle !== Infinity);
						if (!res.ok) continue;
						expect(res.routes[0].cost).toBeCloseTo(oracle, 6);
						before.push(
							...routeBoxes(
								[run.start.point, ...res.routes[0].waypoints, run.end.point],
								run.section,
								run.bendRadiusMm
							)
						);
					}
				}
			),
			{ numRuns: 40, seed: 1717 }
		);
	});

	it('routes several runs hardest first, each clear of the ones before', () => {
		const shared = {
			bounds: { min: [0, 0, 0], max: [200, 120, 120] } as Box,
			obstacles: [{ box: { min: [80, 0, 0], max: [120, 60, 120] } as Box, id: 'block' }],
			clearanceMm: 2,
			bendPenaltyMm: 40
		};
		const tube = { kind: 'round' as const, outerDiameterMm: 10 };
		const runs = [10, 40, 70].map((z, i) => ({
			id: `run${i}`,
			start: { point: [20, 10, z + 10] as Vec3, direction: '+y' as Face },
			end: { point: [180, 10, z + 10] as Vec3, direction: '+y' as Face },
			section: tube,
			bendRadiusMm: 20,
			mode: 'hard' as const
		}));
		const { order, results } = routeMany(runs, shared);
		expect(order).toHaveLength(3);
		const boxes: Box[] = [];
		for (const run of runs) {
			const res = results[run.id];
			expect(res.ok).toBe(true);
			if (!res.ok) continue;
			const mine = routeBoxes(
				[run.start.point, ...res.routes[0].waypoints, run.end.point],
				tube,
				20
			);
			for (const b of mine) {
				for (const o of boxes) {
					const overlap = [0, 1, 2].every(
						(a) => Math.min(b.max[a], o.max[a] + 2) - Math.max(b.min[a], o.min[a] - 2) > 1e-9
					);
					expect(overlap).toBe(false);
				}
			}
			boxes.push(...mine);
		}
	});
});
