/**
 * Fit-engine benchmark (`npm run bench`). Side by side, in one run, on the same seeded boxes:
 * the engine's overlap pairs + volumes, box-intersect's pair enumeration, and naive all pairs with
 * three.js Box3 (n ≤ 2,000); then checkScene on a 100-part enclosure, on a 100-part one with 20
 * problems (clearing advice included) and a 200-position sweep over 100 boxes. Medians after warm-up. Prints a table, then one JSON object as the last line.
 */
import boxIntersect from 'box-intersect';
import { loadavg } from 'node:os';
import { Box3, Vector3 } from 'three';
import {
	checkScene,
	overlapVolumes,
	resolveScene,
	sceneSchema,
	sweep,
	type Box,
	type Scene,
	type SceneInput,
	type Vec3
} from '../src/lib/geometry/index';
import { demoEnclosure } from '../src/lib/geometry/standard-library';
import { roomTable } from '../src/lib/geometry/room';
import { checkLoops, type RunCache } from '../src/lib/geometry/loop';
import { defaultFittings, defaultTubeKinds } from '../src/lib/geometry/loop-library';
import { bendsOf, norm, sub } from '../src/lib/geometry/loop-path';
import type { LoopDef } from '../src/lib/geometry/schema';
import { partsByPositions, type FitCandidate } from '../src/lib/builds/fits';
import { findRoute, routeMany, type ManyRun, type RouteInput } from '../src/lib/geometry/route';
import { routeObstacles } from '../src/lib/geometry/route-scene';
import { landOnMount } from '../src/lib/builds/placement';

const SEED = 20_240_601;

/** mulberry32: small, fast, and the same sequence on every machine. */
function rng(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

/**
 * n boxes 5–60 mm a side in a cube whose side grows with the cube root of n, so the density, and
 * with it the overlaps per box (about one), stays the same at every n, as in a real layout.
 */
function randomBoxes(n: number, seed: number): Box[] {
	const next = rng(seed);
	const side = 50 * Math.cbrt(n);
	const boxes: Box[] = [];
	for (let i = 0; i < n; i++) {
		const size = [5 + 55 * next(), 5 + 55 * next(), 5 + 55 * next()];
		const min: Vec3 = [next() * side, next() * side, next() * side];
		boxes.push({ min, max: [min[0] + size[0], min[1] + size[1], min[2] + size[2]] });
	}
	return boxes;
}

function median(values: number[]): number {
	const s = [...values].sort((a, b) => a - b);
	const m = s.length >> 1;
	return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/**
 * Median wall time (ms) of `runs` calls after `warmup` untimed ones, and the 10th percentile: on a
 * machine shared with other work the median carries the others' load, the low decile much less.
 */
function time<T>(
	fn: () => T,
	runs: number,
	warmup: number
): { ms: number; p10: number; result: T } {
	let result = fn();
	for (let i = 1; i < warmup; i++) result = fn();
	const samples: number[] = [];
	for (let i = 0; i < runs; i++) {
		const t0 = performance.now();
		result = fn();
		samples.push(performance.now() - t0);
	}
	const sorted = [...samples].sort((a, b) => a - b);
	return { ms: median(samples), p10: sorted[Math.floor(sorted.length / 10)], result };
}

/**
 * Median ms of each contender, the contenders taking turns within every round so that a busy
 * machine slows them alike and the ratios stay fair.
 */
function interleaved<T>(
	contenders: Record<string, () => T>,
	runs: number,
	warmup: number
): Record<string, { ms: number; result: T }> {
	const names = Object.keys(contenders);
	const samples: Record<string, number[]> = Object.fromEntries(names.map((k) => [k, []]));
	const results: Record<string, T> = {};
	for (let r = 0; r < warmup + runs; r++) {
		for (const name of names) {
			const t0 = performance.now();
			results[name] = contenders[name]();
			if (r >= warmup) samples[name].push(performance.now() - t0);
		}
	}
	return Object.fromEntries(names.map((k) => [k, { ms: median(samples[k]), result: results[k] }]));
}

const pairKey = (i: number, j: number) => (i < j ? i * 1_000_003 + j : j * 1_000_003 + i);

function enginePairs(boxes: Box[]): Set<number> {
	const { pairs, count } = overlapVolumes(boxes);
	const out = new Set<number>();
	for (let k = 0; k < count; k++) out.add(pairKey(pairs[2 * k], pairs[2 * k + 1]));
	return out;
}

function sameSet(a: Set<number>, b: Set<number>): boolean {
	if (a.size !== b.size) return false;
	for (const x of a) if (!b.has(x)) return false;
	return true;
}

interface Row {
	n: number;
	pairs: number;
	engineMs: number;
	boxIntersectMs: number;
	naiveMs: number | null;
}

function broadphaseRow(n: number): Row {
	const boxes = randomBoxes(n, SEED + n);
	const arrays = boxes.map((b) => [...b.min, ...b.max]);
	const box3s = boxes.map((b) => new Box3(new Vector3(...b.min), new Vector3(...b.max)));
	const runs = n <= 200 ? 101 : n <= 2000 ? 21 : 9;
	const warmup = n <= 200 ? 300 : n <= 2000 ? 20 : 4;

	const contenders: Record<string, () => number[] | ReturnType<typeof overlapVolumes>> = {
		engine: () => overlapVolumes(boxes),
		boxIntersect: () => {
			const out: number[] = [];
			boxIntersect(arrays, (i, j) => {
				out.push(i, j);
			});
			return out;
		}
	};
	if (n <= 2000) {
		contenders.naive = () => {
			const out: number[] = [];
			const shared = new Box3();
			const size = new Vector3();
			for (let i = 0; i < n; i++) {
				for (let j = i + 1; j < n; j++) {
					if (!box3s[i].intersectsBox(box3s[j])) continue;
					shared.copy(box3s[i]).intersect(box3s[j]).getSize(size);
					out.push(i, j, size.x * size.y * size.z);
				}
			}
			return out;
		};
	}
	const timed = interleaved(contenders, runs, warmup);
	const engine = timed.engine;
	const bi = timed.boxIntersect as { ms: number; result: number[] };
	const naive = (timed.naive as { ms: number; result: number[] } | undefined) ?? null;

	// Every contender must have found the same pairs (random real coordinates never just touch).
	const mine = enginePairs(boxes);
	const theirs = new Set<number>();
	for (let k = 0; k < bi.result.length; k += 2) theirs.add(pairKey(bi.result[k], bi.result[k + 1]));
	if (!sameSet(mine, theirs)) {
		throw new Error(`n=${n}: engine and box-intersect disagree (${mine.size} vs ${theirs.size})`);
	}
	if (naive) {
		const plain = new Set<number>();
		for (let k = 0; k < naive.result.length; k += 3) {
			plain.add(pairKey(naive.result[k], naive.result[k + 1]));
		}
		if (!sameSet(mine, plain)) {
			throw new Error(`n=${n}: engine and naive Box3 disagree (${mine.size} vs ${plain.size})`);
		}
	}
	return {
		n,
		pairs: mine.size,
		engineMs: engine.ms,
		boxIntersectMs: bi.ms,
		naiveMs: naive ? naive.ms : null
	};
}

const panel = (kind: 'solid' | 'mesh' = 'solid') => ({ thicknessMm: 2, kind, offsetMm: 0 });

/**
 * A realistic large layout: 600 × 400 × 500 mm inside, a sliding divider and a bracket, 100 placed
 * parts of ten invented kinds (one or two bodies, one keep-out each) on a loose grid, a few of
 * them overlapping.
 */
function hundredPartScene(): Scene {
	const next = rng(SEED);
	const parts = Array.from({ length: 10 }, (_, k) => {
		const w = 20 + Math.round(next() * 40);
		const h = 15 + Math.round(next() * 30);
		const d = 20 + Math.round(next() * 40);
		const bodies = [
			{ id: 'body', label: 'body', box: { min: [0, 0, 0] as Vec3, max: [w, h, d] as Vec3 } }
		];
		if (k % 2 === 0) {
			bodies.push({ id: 'cap', label: 'cap', box: { min: [4, h, 4], max: [w - 4, h + 6, d - 4] } });
		}
		return {
			id: `kind-${k}`,
			name: `Generic part ${k}`,
			category: 'other' as const,
			bodies,
			keepouts: [
				{
					id: 'room',
					label: 'service room',
					kind: 'service' as const,
					severity: (k % 3 === 0 ? 'warning' : 'error') as 'warning' | 'error',
					box: { min: [0, -8, 0] as Vec3, max: [w, 0, d] as Vec3 }
				}
			]
		};
	});
	const placements = Array.from({ length: 100 }, (_, i) => {
		const col = i % 10;
		const row = Math.floor(i / 10) % 5;
		const layer = Math.floor(i / 50);
		return {
			id: `p${String(i).padStart(3, '0')}`,
			partId: `kind-${Math.floor(next() * 10)}`,
			position: [
				col * 58 + 4 + Math.round(next() * 10),
				10 + layer * 180 + Math.round(next() * 20),
				row * 96 + 4 + Math.round(next() * 20)
			] as Vec3,
			rotation: { x: 0, y: Math.floor(next() * 4), z: 0 }
		};
	});
	const input: SceneInput = {
		format: 'interstice.scene',
		version: 1,
		enclosure: {
			name: 'Benchmark enclosure',
			outerMm: [604, 404, 504],
			walls: {
				left: panel(),
				right: panel(),
				bottom: panel(),
				top: panel(),
				front: panel('mesh'),
				back: panel()
			},
			dividers: [
				{
					id: 'shelf',
					label: 'Shelf',
					axis: 'y',
					thicknessMm: 2,
					positions: { kind: 'range', minMm: 120, maxMm: 200, stepMm: 10 }
				}
			],
			brackets: [
				{
					id: 'bar',
					label: 'Bar',
					kind: 'other',
					box: { min: [0, 380, 0], max: [600, 390, 20] },
					axis: 'z',
					travel: { minMm: 0, maxMm: 400, stepMm: 20 }
				}
			],
			mounts: []
		},
		parts,
		dividerPositions: { shelf: 170 },
		placements
	};
	return sceneSchema.parse(input);
}

/**
 * 94 single-body parts + 6 walls = 100 boxes, and a divider with 200 allowed positions. The blocks
 * sit in distinct cells of a 50 mm grid, so they clear each other and the divider collides only
 * where it passes through one.
 */
function sweepScene(): Scene {
	const next = rng(SEED + 1);
	const cells = Array.from({ length: 20 * 6 * 6 }, (_, i) => i);
	for (let i = cells.length - 1; i > 0; i--) {
		const j = Math.floor(next() * (i + 1));
		[cells[i], cells[j]] = [cells[j], cells[i]];
	}
	const placements = cells.slice(0, 94).map((c, i) => ({
		id: `p${String(i).padStart(3, '0')}`,
		partId: 'block',
		position: [
			(c % 20) * 50 + 5,
			(Math.floor(c / 20) % 6) * 50 + 5,
			Math.floor(c / 120) * 50 + 5
		] as Vec3
	}));
	return sceneSchema.parse({
		format: 'interstice.scene',
		version: 1,
		enclosure: {
			name: 'Sweep enclosure',
			outerMm: [1004, 304, 304],
			walls: {
				left: panel(),
				right: panel(),
				bottom: panel(),
				top: panel(),
				front: panel(),
				back: panel()
			},
			dividers: [
				{
					id: 'wall',
					label: 'Divider',
					axis: 'x',
					thicknessMm: 2,
					positions: { kind: 'range', minMm: 100, maxMm: 896, stepMm: 4 }
				}
			]
		},
		parts: [
			{
				id: 'block',
				name: 'Block',
				category: 'other',
				bodies: [{ id: 'body', label: 'body', box: { min: [0, 0, 0], max: [40, 40, 40] } }]
			}
		],
		dividerPositions: { wall: 100 },
		placements
	} satisfies SceneInput);
}

/**
 * 100 blocks 40 mm a side in 50 mm cells (10 × 5 × 2), every fifth pushed 15 mm right: into its
 * neighbour (5 mm) or, at the end of a row, into the right panel. Exactly 20 problems, each
 * with its clearing search against the whole scene.
 */
function problemScene(): Scene {
	const placements = Array.from({ length: 100 }, (_, i) => {
		const col = i % 10;
		const row = Math.floor(i / 10) % 5;
		const layer = Math.floor(i / 50);
		const push = i % 5 === 0 ? 15 : 0;
		return {
			id: `p${String(i).padStart(3, '0')}`,
			partId: 'block',
			position: [col * 50 + 5 + push, row * 50 + 5, layer * 50 + 5] as Vec3
		};
	});
	return sceneSchema.parse({
		format: 'interstice.scene',
		version: 1,
		enclosure: {
			name: 'Problem enclosure',
			outerMm: [504, 254, 104],
			walls: {
				left: panel(),
				right: panel(),
				bottom: panel(),
				top: panel(),
				front: panel(),
				back: panel()
			}
		},
		parts: [
			{
				id: 'block',
				name: 'Block',
				category: 'other',
				bodies: [{ id: 'body', label: 'body', box: { min: [0, 0, 0], max: [40, 40, 40] } }]
			}
		],
		placements
	} satisfies SceneInput);
}

/** 5,000 invented one- or two-body parts, 10–150 mm a side, a third with a fitting keep-out on top. */
function catalogue(n: number): FitCandidate[] {
	const next = rng(SEED + 2);
	return Array.from({ length: n }, (_, i) => {
		const size: Vec3 = [
			10 + Math.round(next() * 140),
			10 + Math.round(next() * 140),
			5 + Math.round(next() * 60)
		];
		const bodies = [{ id: 'body', label: 'body', box: { min: [0, 0, 0] as Vec3, max: size } }];
		if (i % 4 === 0) {
			bodies.push({
				id: 'tab',
				label: 'tab',
				box: { min: [0, 0, size[2]], max: [size[0] / 2, size[1] / 2, size[2] + 5] }
			});
		}
		const keepouts =
			i % 3 === 0
				? [
						{
							id: 'fit',
							label: 'fitting room',
							kind: 'fitting' as const,
							severity: 'error' as const,
							box: { min: [0, size[1], 0] as Vec3, max: [size[0], size[1] + 20, size[2]] as Vec3 }
						}
					]
				: [];
		return {
			part: {
				id: `cat-${i}`,
				name: `Catalogue part ${i}`,
				category: 'other',
				bodies,
				keepouts,
				ports: [],
				specs: {},
				provenance: 'estimate',
				toleranceMm: 0
			}
		};
	});
}

/**
 * "What fits here" on one mount at every position of one control: the 100-part scene with a front
 * fan mount added (the shelf's 9 positions), against the naive way (compose the scene with the
 * candidate placed, run checkScene) timed on a sample and scaled to the same number of checks.
 */
function fitsRow() {
	const base = hundredPartScene();
	const scene = sceneSchema.parse({
		...base,
		enclosure: {
			...base.enclosure,
			mounts: [
				{
					id: 'front',
					label: 'Front mount',
					kind: 'fan',
					face: 'front',
					region: { min: [0, 0, 0], max: [600, 400, 60] },
					accepts: [],
					budgetMm: 60
				}
			]
		}
	});
	const cands = catalogue(5000);
	const control = { kind: 'divider' as const, id: 'shelf' };
	const fast = time(
		() => partsByPositions(scene, { kind: 'mount', mountId: 'front' }, cands, control),
		5,
		1
	);
	if (process.env.BENCH_ONLY === 'fits-fast') {
		return {
			ms: fast.ms,
			p10: fast.p10,
			cpuMs: cpuMedian(() =>
				partsByPositions(scene, { kind: 'mount', mountId: 'front' }, cands, control)
			),
			naiveMs: NaN,
			cells: cands.length * 9
		};
	}
	const positions = fast.result.positions;
	const sample = cands.slice(0, 40);
	const mount = scene.enclosure.mounts[0];
	const resolved = resolveScene(scene);
	const naive = time(
		() => {
			let fits = 0;
			for (const c of sample) {
				const landing = landOnMount(resolved, mount, c.part);
				if ('reason' in landing) continue;
				for (const p of positions) {
					const placed = sceneSchema.parse({
						...scene,
						dividerPositions: { shelf: p.offsetMm },
						parts: [...scene.parts, c.part],
						placements: [
							...scene.placements,
							{ id: 'cand', partId: c.part.id, ...landing, mountId: 'front' }
						]
					});
					const report = checkScene(placed);
					const status = report.parts.find((x) => x.placementId === 'cand')!.status;
					if (status === 'clear' || status === 'tight') fits++;
				}
			}
			return fits;
		},
		3,
		1
	);
	// The fast table must say what the naive way says for the sample, cell for cell in total.
	const fastFits = fast.result.rows
		.slice(0, sample.length)
		.reduce((n, r) => n + r.cells.filter((c) => c.fits).length, 0);
	if (fastFits !== naive.result) {
		throw new Error(`what fits here: ${fastFits} fitting cells, the naive way ${naive.result}`);
	}
	const perCheck = naive.ms / (sample.length * positions.length);
	const naiveMs = perCheck * cands.length * positions.length;
	return {
		ms: fast.ms,
		p10: fast.p10,
		cpuMs: cpuMedian(() =>
			partsByPositions(scene, { kind: 'mount', mountId: 'front' }, cands, control)
		),
		naiveMs,
		cells: cands.length * positions.length
	};
}

/**
 * Median CPU time (user + system, ms) of `runs` runs: on a shared machine the wall clock also counts
 * the time other processes held the cores, so this is printed beside it.
 */
function cpuMedian(fn: () => unknown, runs = 5): number {
	const samples: number[] = [];
	for (let i = 0; i < runs; i++) {
		const before = process.cpuUsage();
		fn();
		const used = process.cpuUsage(before);
		samples.push((used.user + used.system) / 1000);
	}
	return median(samples);
}

/**
 * The clearance table's time, once warm. Its calls alternate between about 1 ms and 5–10 ms for
 * the first hundred or so (the JIT's tiers and the young generation settling: measured here, 16 ms
 * for the first call, a median of 3.5–4.4 ms over calls 21–61, about 1 ms from call 200 on), so
 * 200 warm-up calls come first; the first call's time is printed beside it, as the cold cost an
 * enclosure page pays once.
 */
function roomRow() {
	const t0 = performance.now();
	roomTable(demoEnclosure());
	const firstMs = performance.now() - t0;
	return { ...time(() => roomTable(demoEnclosure()), 41, 200), firstMs };
}

/** BENCH_ONLY=fits runs only the what-fits and clearance-table rows (for profiling them). */
function fitsOnly(): void {
	const fits = fitsRow();
	const room = roomRow();
	const roomCpu = cpuMedian(() => roomTable(demoEnclosure()), 41);
	const round = (v: number) => Math.round(v * 10_000) / 10_000;
	console.log(
		JSON.stringify({
			fits5000_ms: round(fits.ms),
			fits5000_p10_ms: round(fits.p10),
			fits5000_cpu_ms: round(fits.cpuMs),
			fits5000_naive_ms: round(fits.naiveMs),
			fits5000_vs_naive: round(fits.ms / fits.naiveMs),
			room_table_ms: round(room.ms),
			room_table_cpu_ms: round(roomCpu)
		})
	);
}

/**
 * The 100-part scene with six hubs in a row near the back (x 20 + 95k, y 300, z 450) and a loop of
 * six 12 mm hard runs between their top ports, five segments each: 30 segments, 24 bends. `shift`
 * moves one waypoint of run 3 (a drag) along x.
 */
function loopBenchScene(shift = 0): Scene {
	const base = hundredPartScene();
	const hub = {
		id: 'hub',
		name: 'Generic hub',
		category: 'other' as const,
		bodies: [
			{ id: 'body', label: 'body', box: { min: [0, 0, 0] as Vec3, max: [30, 20, 30] as Vec3 } }
		],
		ports: [
			{ id: 'in', position: [5, 20, 15] as Vec3, direction: '+y' as const, thread: 'G 1/4' },
			{ id: 'out', position: [25, 20, 15] as Vec3, direction: '+y' as const, thread: 'G 1/4' }
		]
	};
	const hubs = Array.from({ length: 6 }, (_, k) => ({
		id: `hub-${k}`,
		partId: 'hub',
		position: [20 + 95 * k, 300, 450] as Vec3
	}));
	// Each run: up from the out port's fitting tip (y 344) to 370, back to z 410, along x, forward
	// to z 465 and down onto the next hub's in port.
	const runs = hubs.map((h, k) => {
		const next = hubs[(k + 1) % hubs.length];
		const sx = h.position[0] + 25;
		const ex = next.position[0] + 5;
		return {
			id: `run-${k}`,
			from: { placementId: h.id, portId: 'out' },
			to: { placementId: next.id, portId: 'in' },
			tube: 'hard-12',
			fittings: { from: 'fit-straight-16', to: 'fit-straight-16' },
			waypoints: [
				[sx, 370, 465],
				[sx, 370, 410],
				[ex, 370, 410],
				[ex, 370, 465]
			] as Vec3[]
		};
	});
	if (shift) {
		// A hard run's waypoint moves with its neighbour along one axis (the segment between them
		// slides), or the run would leave its axes: the third run's middle segment, back or forth.
		const w = runs[2].waypoints;
		w[1] = [w[1][0], 370, 410 + shift];
		w[2] = [w[2][0], 370, 410 + shift];
	}
	const loop: LoopDef = { id: 'bench', runs, plugs: [] };
	return sceneSchema.parse({
		...base,
		parts: [...base.parts, hub, ...defaultFittings()],
		placements: [...base.placements, ...hubs],
		tubeKinds: defaultTubeKinds(),
		loops: [loop]
	});
}

/** Reference: every run's centre line sampled each 1 mm, each point against every box of the scene. */
function naiveLoopCheck(scene: Scene, boxes: Box[]): number {
	let hits = 0;
	for (const run of scene.loops![0].runs) {
		const pts = run.waypoints;
		for (let i = 1; i < pts.length; i++) {
			const d = sub(pts[i], pts[i - 1]);
			const n = Math.ceil(norm(d));
			for (let k = 0; k <= n; k++) {
				const p = [0, 1, 2].map((a) => pts[i - 1][a] + (d[a] * k) / n);
				for (const b of boxes) {
					if (p.every((v, a) => v > b.min[a] - 8 && v < b.max[a] + 8)) hits++;
				}
			}
		}
		hits += bendsOf(pts, 24).length;
	}
	return hits;
}

function loopRow() {
	const scene = loopBenchScene();
	const resolved = resolveScene(scene);
	const segments = scene.loops![0].runs.reduce((n, r) => n + r.waypoints.length + 1, 0);
	const full = time(() => checkLoops(scene, resolved), 201, 50);
	const boxes = [
		...resolved.walls,
		...resolved.dividers,
		...resolved.brackets,
		...resolved.placements.flatMap((p) => [...p.bodies, ...p.keepouts])
	].map((b) => b.box);
	const naive = time(() => naiveLoopCheck(scene, boxes), 21, 5);
	// A drag: the same resolved scene, one run's waypoints 0.5 mm on each step, the cache warm.
	const steps = [0.5, 1, 1.5, 2].map((s) => loopBenchScene(s));
	const cache: RunCache = new Map();
	checkLoops(scene, resolved, cache);
	let i = 0;
	const drag = time(() => checkLoops(steps[i++ % steps.length], resolved, cache), 201, 50);
	return { full, drag, naive, segments, runs: scene.loops![0].runs.length };
}

/** Hard tube in the route figures: 12 mm outer diameter, 24 mm bend radius (two diameters), 2 mm clearance. */
const ROUTE_TUBE = { kind: 'round' as const, outerDiameterMm: 12 };
const ROUTE_R = 24;

/** Six runs through the 100-part scene, in both compartments (ports at the walls, invented). */
const LOOP_RUNS: [string, Vec3, Face, Vec3, Face][] = [
	['across', [10, 250, 250], '+x', [590, 300, 250], '-x'],
	['front-back', [300, 150, 10], '+z', [200, 90, 490], '-z'],
	['front-back-2', [150, 120, 10], '+z', [450, 120, 490], '-z'],
	['upper', [300, 350, 10], '+z', [400, 260, 490], '-z'],
	['back-right', [300, 120, 490], '-z', [590, 130, 250], '-x'],
	['front-left', [500, 100, 10], '+z', [10, 140, 250], '+x']
];
type Face = '-x' | '+x' | '-y' | '+y' | '-z' | '+z';

function routeShared(scene: Scene) {
	const resolved = resolveScene(scene);
	// The bounds are the inside: the walls are its faces, so they need not be obstacles too.
	const obstacles = routeObstacles(resolved).filter((o) => !o.id!.startsWith('wall:'));
	return { bounds: resolved.innerBox, obstacles, clearanceMm: 2, bendPenaltyMm: 60 };
}

/**
 * Reference for route_vs_dijkstra: plain Dijkstra (binary heap) over every 1 mm point of the
 * bounds with the same rules as the engine (tube boxes, bends with their box, 2r between bends,
 * r after the start and before the end). Blocked centre points are sampled every 0.5 mm into a
 * 3D prefix sum, so each box query is O(1): with whole-mm inputs a closed box meets an open
 * inflated obstacle exactly when it holds a blocked half-mm sample.
 */
function dijkstra1mm(input: RouteInput): number {
	const half = input.section.kind === 'round' ? input.section.outerDiameterMm / 2 : 0;
	const c = input.clearanceMm;
	const r = input.bendRadiusMm;
	const B = input.bendPenaltyMm;
	const lo = input.bounds.min.map((v) => v + c + half);
	const hi = input.bounds.max.map((v) => v - c - half);
	const n = [0, 1, 2].map((a) => Math.round(hi[a] - lo[a]) + 1);
	const m = n.map((k) => 2 * k);
	// Prefix sum over half-mm samples, one row of padding.
	const P = new Int32Array((m[0] + 1) * (m[1] + 1) * (m[2] + 1));
	const at = (i: number, j: number, k: number) => i + (m[0] + 1) * (j + (m[1] + 1) * k);
	for (const o of input.obstacles) {
		const b = 'box' in o ? o.box : o;
		const grow = half + c;
		const from = [0, 1, 2].map((a) => Math.max(0, Math.floor((b.min[a] - grow - lo[a]) * 2) + 1));
		const to = [0, 1, 2].map((a) =>
			Math.min(m[a] - 1, Math.ceil((b.max[a] + grow - lo[a]) * 2) - 1)
		);
		for (let k = from[2]; k <= to[2]; k++) {
			for (let j = from[1]; j <= to[1]; j++) {
				for (let i = from[0]; i <= to[0]; i++) P[at(i + 1, j + 1, k + 1)] = 1;
			}
		}
	}
	for (let k = 1; k <= m[2]; k++) {
		for (let j = 1; j <= m[1]; j++) {
			for (let i = 1; i <= m[0]; i++) {
				P[at(i, j, k)] +=
					P[at(i - 1, j, k)] +
					P[at(i, j - 1, k)] +
					P[at(i, j, k - 1)] -
					P[at(i - 1, j - 1, k)] -
					P[at(i - 1, j, k - 1)] -
					P[at(i, j - 1, k - 1)] +
					P[at(i - 1, j - 1, k - 1)];
			}
		}
	}
	/** Is any blocked sample in the centre-space box [a, b] (mm, inclusive)? */
	const blocked = (a: number[], b: number[]) => {
		const x0 = Math.max(0, Math.round((a[0] - lo[0]) * 2));
		const y0 = Math.max(0, Math.round((a[1] - lo[1]) * 2));
		const z0 = Math.max(0, Math.round((a[2] - lo[2]) * 2));
		const x1 = Math.round((b[0] - lo[0]) * 2) + 1;
		const y1 = Math.round((b[1] - lo[1]) * 2) + 1;
		const z1 = Math.round((b[2] - lo[2]) * 2) + 1;
		if (x1 > m[0] || y1 > m[1] || z1 > m[2] || x0 >= x1 || y0 >= y1 || z0 >= z1) return true;
		const sum =
			P[at(x1, y1, z1)] -
			P[at(x0, y1, z1)] -
			P[at(x1, y0, z1)] -
			P[at(x1, y1, z0)] +
			P[at(x0, y0, z1)] +
			P[at(x0, y1, z0)] +
			P[at(x1, y0, z0)] -
			P[at(x0, y0, z0)];
		return sum > 0;
	};
	const U = [
		[-1, 0, 0],
		[1, 0, 0],
		[0, -1, 0],
		[0, 1, 0],
		[0, 0, -1],
		[0, 0, 1]
	];
	const faces = ['-x', '+x', '-y', '+y', '-z', '+z'];
	const seg = (p: number[], q: number[]) =>
		blocked(
			[0, 1, 2].map((a) => Math.min(p[a], q[a])),
			[0, 1, 2].map((a) => Math.max(p[a], q[a]))
		);
	const S = input.start.point;
	const E = input.end.point;
	const sd = faces.indexOf(input.start.direction);
	const ed = faces.indexOf(input.end.direction) ^ 1;
	const total = n[0] * n[1] * n[2] * 6;
	const g = new Float64Array(total).fill(Infinity);
	const idx = (p: number[], d: number) =>
		((Math.round(p[2] - lo[2]) * n[1] + Math.round(p[1] - lo[1])) * n[0] +
			Math.round(p[0] - lo[0])) *
			6 +
		d;
	const inside = (p: number[]) =>
		[0, 1, 2].every((a) => p[a] >= lo[a] - 1e-9 && p[a] <= hi[a] + 1e-9);
	const heapF: number[] = [];
	const heapS: number[] = [];
	const push = (f: number, s: number) => {
		heapF.push(f);
		heapS.push(s);
		let i = heapF.length - 1;
		while (i > 0) {
			const p = (i - 1) >> 1;
			if (heapF[p] <= heapF[i]) break;
			[heapF[p], heapF[i]] = [heapF[i], heapF[p]];
			[heapS[p], heapS[i]] = [heapS[i], heapS[p]];
			i = p;
		}
	};
	const pop = () => {
		const f = heapF[0];
		const s = heapS[0];
		const lf = heapF.pop()!;
		const ls = heapS.pop()!;
		if (heapF.length) {
			heapF[0] = lf;
			heapS[0] = ls;
			let i = 0;
			for (;;) {
				const l = 2 * i + 1;
				let b = i;
				if (l < heapF.length && heapF[l] < heapF[b]) b = l;
				if (l + 1 < heapF.length && heapF[l + 1] < heapF[b]) b = l + 1;
				if (b === i) break;
				[heapF[b], heapF[i]] = [heapF[i], heapF[b]];
				[heapS[b], heapS[i]] = [heapS[i], heapS[b]];
				i = b;
			}
		}
		return { f, s };
	};
	const relax = (p: number[], d: number, v: number) => {
		if (!inside(p)) return;
		const s = idx(p, d);
		if (v < g[s]) {
			g[s] = v;
			push(v, s);
		}
	};
	const add = (p: number[], u: number[], k: number) => p.map((v, a) => v + u[a] * k);
	/** E straight ahead of p along u: its distance, else -1. */
	const ahead = (p: number[], u: number[]) => {
		let k = -1;
		for (let a = 0; a < 3; a++) {
			if (u[a] === 0 && p[a] !== E[a]) return -1;
			if (u[a] !== 0) k = (E[a] - p[a]) * u[a];
		}
		return k;
	};
	let best = Infinity;
	const su = U[sd];
	if (sd === ed && ahead(S, su) > 0 && !seg(add(S, su, half), add(E, su, -half))) {
		best = ahead(S, su);
	}
	const L = add(S, su, r);
	if (!seg(add(S, su, half), L)) relax(L, sd, r);
	while (heapF.length) {
		const { f, s } = pop();
		if (f >= best) break;
		if (f > g[s]) continue;
		const d = s % 6;
		const cell = (s - d) / 6;
		const p = [
			lo[0] + (cell % n[0]),
			lo[1] + (Math.floor(cell / n[0]) % n[1]),
			lo[2] + Math.floor(cell / (n[0] * n[1]))
		];
		const u = U[d];
		const q = add(p, u, 1);
		if (d === ed && ahead(p, u) === 1 && !seg(p, add(q, u, -half))) best = Math.min(best, f + 1);
		if (!seg(p, q)) relax(q, d, f + 1);
		for (let d2 = 0; d2 < 6; d2++) {
			if (d2 >> 1 === d >> 1) continue;
			const v = U[d2];
			// The bend's box less the half-width: back r − half along u, on r − half along v.
			const a = add(add(p, u, -(r - half)), v, 0);
			const b = add(p, v, r - half);
			if (
				seg(
					[0, 1, 2].map((k) => Math.min(a[k], b[k], p[k])),
					[0, 1, 2].map((k) => Math.max(a[k], b[k], p[k]))
				)
			) {
				continue;
			}
			const k = ahead(p, v);
			if (d2 === ed && k >= r && !seg(p, add(E, v, -half))) best = Math.min(best, f + B + k);
			const j = add(p, v, 2 * r);
			if (!seg(p, j)) relax(j, d2, f + B + 2 * r);
		}
	}
	return best;
}

function routeRows(withDijkstra = true) {
	const scene = hundredPartScene();
	const shared = routeShared(scene);
	const [, s, sd, e, ed] = LOOP_RUNS[0];
	const one: RouteInput = {
		...shared,
		start: { point: s, direction: sd },
		end: { point: e, direction: ed },
		section: ROUTE_TUBE,
		bendRadiusMm: ROUTE_R,
		mode: 'hard'
	};
	const single = time(() => findRoute(one), 21, 5);
	if (!single.result.ok) throw new Error(`route: ${single.result.reason}`);
	const runs: ManyRun[] = LOOP_RUNS.map(([id, s, sd, e, ed]) => ({
		id,
		start: { point: s, direction: sd },
		end: { point: e, direction: ed },
		section: ROUTE_TUBE,
		bendRadiusMm: ROUTE_R,
		mode: 'hard'
	}));
	const loop = time(() => routeMany(runs, shared), 5, 1);
	const loopCpu = cpuMedian(() => routeMany(runs, shared), 5);
	const routed = Object.values(loop.result.results).filter((x) => x.ok).length;
	const singleCpu = cpuMedian(() => findRoute(one), 21);
	const head = { single, singleCpu, bends: single.result.routes[0].bends, loop, loopCpu, routed };
	if (!withDijkstra) return { ...head, cropEngineMs: NaN, cropDijkstraMs: NaN, cropCost: NaN };
	// The same scene cropped to a 120 × 100 × 120 mm corner, small enough for a 1 mm grid.
	const crop: Box = { min: [0, 0, 0], max: [120, 100, 120] };
	const cropped: RouteInput = {
		...shared,
		bounds: crop,
		obstacles: shared.obstacles.filter((o) =>
			[0, 1, 2].every((a) => o.box.min[a] < crop.max[a] && o.box.max[a] > crop.min[a])
		),
		start: { point: [8, 92, 60], direction: '+x' },
		end: { point: [112, 60, 112], direction: '-x' },
		section: ROUTE_TUBE,
		bendRadiusMm: ROUTE_R,
		mode: 'hard'
	};
	// One timed run each: the 1 mm Dijkstra takes tens of seconds.
	const timed = interleaved<unknown>(
		{ engine: () => findRoute(cropped), dijkstra: () => dijkstra1mm(cropped) },
		1,
		0
	);
	const engineAnswer = timed.engine.result as ReturnType<typeof findRoute>;
	const cost = engineAnswer.ok ? engineAnswer.routes[0].cost : Infinity;
	const reference = timed.dijkstra.result as number;
	if (Math.abs(cost - reference) > 1e-6) {
		throw new Error(`route_vs_dijkstra: engine cost ${cost}, 1 mm Dijkstra ${reference}`);
	}
	return {
		...head,
		cropEngineMs: timed.engine.ms,
		cropDijkstraMs: timed.dijkstra.ms,
		cropCost: cost
	};
}

function main(): void {
	// The scene checks run first, before the 20,000-box sets have grown the heap.
	const big = hundredPartScene();
	const check = time(() => checkScene(big), 41, 20);
	const report = check.result;
	console.log(
		`checkScene, 100 parts (${report.parts.length} placements, ${report.overlaps.length} overlaps): ${check.ms.toFixed(3)} ms median, ${check.p10.toFixed(3)} ms low decile`
	);

	const loop = loopRow();
	console.log(
		`loop check, 100 parts + ${loop.runs} runs of ${loop.segments} segments: ${loop.full.ms.toFixed(3)} ms median, ${loop.full.p10.toFixed(3)} ms low decile; one waypoint dragged (cache warm): ${loop.drag.ms.toFixed(3)} ms median; reference (centre lines sampled per mm against every box): ${loop.naive.ms.toFixed(3)} ms`
	);

	const troubled = problemScene();
	const problems = time(() => checkScene(troubled), 41, 20);
	if (problems.result.overlaps.length !== 20) {
		throw new Error(`problem scene: ${problems.result.overlaps.length} overlaps, expected 20`);
	}
	const advised = problems.result.overlaps.filter((o) => o.moves.length > 0).length;
	console.log(
		`checkScene, 100 parts with 20 problems (${advised} with a checked move): ${problems.ms.toFixed(3)} ms median, ${problems.p10.toFixed(3)} ms low decile`
	);

	const swept = sweepScene();
	const control = { kind: 'divider' as const, id: 'wall' };
	const sw = time(
		() => sweep(swept, { control, gaps: [{ placementId: 'p000', face: '+x' }] }),
		31,
		10
	);
	console.log(
		`sweep, ${sw.result.points.length} positions over 100 boxes (${sw.result.feasibleIntervals.length} feasible runs): ${sw.ms.toFixed(3)} ms median, ${sw.p10.toFixed(3)} ms low decile`
	);

	const fits = fitsRow();
	console.log(
		`what fits here: 5,000 parts × ${fits.cells / 5000} positions on one mount: ${fits.ms.toFixed(1)} ms median, ${fits.p10.toFixed(1)} ms low decile; naive (checkScene per candidate, scaled from a sample) ${fits.naiveMs.toFixed(0)} ms`
	);
	const room = roomRow();
	const roomCpu = cpuMedian(() => roomTable(demoEnclosure()), 41);
	console.log(
		`clearance table, demo enclosure (${room.result.rows.length} rows): ${room.ms.toFixed(3)} ms median, ${room.p10.toFixed(3)} ms low decile; first call in this process ${room.firstMs.toFixed(1)} ms`
	);

	const route = routeRows();
	console.log(
		`route, one hard-tube run across the 100-part enclosure (${route.bends} bends): ${route.single.ms.toFixed(1)} ms median, ${route.single.p10.toFixed(1)} ms low decile`
	);
	console.log(
		`loop routes, six runs hardest first, each clear of the ones before (${route.routed} routed): ${route.loop.ms.toFixed(1)} ms median`
	);
	console.log(
		`route vs plain Dijkstra over a 1 mm grid (120 × 100 × 120 mm corner, same cost ${route.cropCost}): ${route.cropEngineMs.toFixed(1)} ms vs ${route.cropDijkstraMs.toFixed(0)} ms`
	);

	const rows = [50, 200, 2000, 20000].map(broadphaseRow);
	const fmt = (v: number | null) => (v === null ? '—' : v.toFixed(3));
	console.log('broadphase: overlap pairs + volumes, median ms (same boxes for every contender)');
	console.log(
		'n'.padStart(7),
		'pairs'.padStart(7),
		'engine'.padStart(9),
		'box-int'.padStart(9),
		'naive'.padStart(9),
		'÷box-int'.padStart(9),
		'÷naive'.padStart(9)
	);
	for (const r of rows) {
		console.log(
			String(r.n).padStart(7),
			String(r.pairs).padStart(7),
			fmt(r.engineMs).padStart(9),
			fmt(r.boxIntersectMs).padStart(9),
			fmt(r.naiveMs).padStart(9),
			fmt(r.engineMs / r.boxIntersectMs).padStart(9),
			fmt(r.naiveMs === null ? null : r.engineMs / r.naiveMs).padStart(9)
		);
	}

	const byN = (n: number) => rows.find((r) => r.n === n)!;
	const round = (v: number) => Math.round(v * 10_000) / 10_000;
	console.log(
		JSON.stringify({
			n2000_vs_box_intersect: round(byN(2000).engineMs / byN(2000).boxIntersectMs),
			n20000_vs_box_intersect: round(byN(20000).engineMs / byN(20000).boxIntersectMs),
			n2000_vs_naive: round(byN(2000).engineMs / byN(2000).naiveMs!),
			check100_ms: round(check.ms),
			sweep200x100_ms: round(sw.ms),
			check100_problems20_ms: round(problems.ms),
			check100_p10_ms: round(check.p10),
			sweep200x100_p10_ms: round(sw.p10),
			check100_problems20_p10_ms: round(problems.p10),
			fits5000_ms: round(fits.ms),
			fits5000_p10_ms: round(fits.p10),
			fits5000_cpu_ms: round(fits.cpuMs),
			fits5000_vs_naive: round(fits.ms / fits.naiveMs),
			room_table_ms: round(room.ms),
			loop_check_ms: round(loop.full.ms),
			loop_check_p10_ms: round(loop.full.p10),
			loop_drag_ms: round(loop.drag.ms),
			loop_check_vs_naive: round(loop.full.ms / loop.naive.ms),
			loop_drag_vs_check: round(loop.drag.ms / loop.full.ms),
			room_table_p10_ms: round(room.p10),
			room_table_cpu_ms: round(roomCpu),
			room_table_first_ms: round(room.firstMs),
			route_ms: round(route.single.ms),
			route_p10_ms: round(route.single.p10),
			loop_route_ms: round(route.loop.ms),
			route_vs_dijkstra: round(route.cropEngineMs / route.cropDijkstraMs),
			load_average_1min: round(loadavg()[0]),
			n50_vs_box_intersect: round(byN(50).engineMs / byN(50).boxIntersectMs),
			n200_vs_box_intersect: round(byN(200).engineMs / byN(200).boxIntersectMs),
			pairs_per_box_n20000: round(byN(20000).pairs / 20000)
		})
	);
}

/**
 * BENCH_ONLY=route runs only the route rows (for profiling them); BENCH_ONLY=route-fast leaves out
 * the 1 mm Dijkstra reference, which takes tens of seconds.
 */
function routeOnly(): void {
	const route = routeRows(process.env.BENCH_ONLY !== 'route-fast');
	const round = (v: number) => Math.round(v * 10_000) / 10_000;
	console.log(
		JSON.stringify({
			route_ms: round(route.single.ms),
			route_cpu_ms: round(route.singleCpu),
			loop_route_ms: round(route.loop.ms),
			loop_route_cpu_ms: round(route.loopCpu),
			loop_routed: route.routed,
			route_vs_dijkstra: round(route.cropEngineMs / route.cropDijkstraMs),
			route_crop_engine_ms: round(route.cropEngineMs),
			route_crop_dijkstra_ms: round(route.cropDijkstraMs)
		})
	);
}

if (process.env.BENCH_ONLY?.startsWith('fits')) fitsOnly();
else if (process.env.BENCH_ONLY?.startsWith('route')) routeOnly();
else main();
