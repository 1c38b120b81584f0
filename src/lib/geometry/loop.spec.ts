import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import {
	blockPart,
	facingBlocksScene,
	makeScene,
	plainEnclosure,
	pumpLoopScene,
	withWaypoints
} from '../server/testing/engine-factories';
import { checkLoops, loopBill, runPieces, type RunCache, type LoopReport } from './loop';
import { defaultTubeKinds } from './loop-library';
import {
	add,
	bendsOf,
	centreLineLengthMm,
	fittingGeometry,
	norm,
	sub,
	type RunEnds
} from './loop-path';
import { resolveScene } from './resolve';
import {
	formatZodIssues,
	sceneSchema,
	type Box,
	type LoopDef,
	type PartDef,
	type SceneInput,
	type TubeKindDef,
	type Vec3
} from './schema';

const HARD16 = defaultTubeKinds().find((t) => t.id === 'hard-16')!;

function parse(input: SceneInput) {
	const parsed = sceneSchema.safeParse(input);
	if (!parsed.success) throw new Error(JSON.stringify(formatZodIssues(parsed.error)));
	return parsed.data;
}

function loopsOf(input: SceneInput): LoopReport[] {
	const scene = parse(input);
	return checkLoops(scene, resolveScene(scene));
}

function issuesOf(input: SceneInput) {
	const parsed = sceneSchema.safeParse(input);
	return parsed.success ? [] : formatZodIssues(parsed.error);
}

const checkOf = (report: LoopReport, id: string) => report.checks.find((c) => c.id === id)!;

describe('cut lengths, worked by hand', () => {
	it('a straight run is its length plus both insertion depths', () => {
		// Two ports facing each other 100 mm apart: (100, 50, 50) +x and (200, 50, 50) −x. Straight
		// fittings reach 24 mm each, so the tube's centre line runs 124 → 176 mm: 52 mm. Cut length
		// 52 + 10 + 10 = 72 mm.
		const input = facingBlocksScene(200);
		const [loop] = loopsOf(input);
		expect(loop.runs[0].lengthMm).toBeCloseTo(52, 9);
		expect(loop.runs[0].cutLengthMm).toBeCloseTo(72, 9);
		expect(loop.runs[0].bends).toEqual([]);
	});

	it('one 90° bend of radius r adds πr/2 and takes 2r of straight length away', () => {
		// (0,0,0) → (100,0,0) → (100,100,0) with r = 20: 200 − 2·20 + π·20/2 = 160 + 10π ≈ 191.416 mm.
		const pts: Vec3[] = [
			[0, 0, 0],
			[100, 0, 0],
			[100, 100, 0]
		];
		expect(centreLineLengthMm(pts, 20)).toBeCloseTo(160 + 10 * Math.PI, 9);
		expect(centreLineLengthMm(pts, 0)).toBeCloseTo(200, 9);
	});

	it('the loop scene: two bends and two insertion depths on run 1', () => {
		// Run 1: (220, 224, 75) → (220, 300, 75) → (65, 300, 75) → (65, 104, 75): 76 + 155 + 196 =
		// 427 mm of polyline; two 90° bends of r = 32: −4·32 + 2·(π·32/2) = −128 + 32π. Centre line
		// 299 + 32π ≈ 399.531 mm; cut 319 + 32π ≈ 419.531 mm with 10 mm in each fitting.
		const [loop] = loopsOf(pumpLoopScene());
		const run = loop.runs[0];
		expect(run.lengthMm).toBeCloseTo(299 + 32 * Math.PI, 9);
		expect(run.cutLengthMm).toBeCloseTo(319 + 32 * Math.PI, 9);
		// Bend middles from the reservoir end: 10 in the fitting + 76 − 32 straight + half the arc
		// (π·32/2 / 2 = 8π); then the other half arc, 155 − 64 straight and half the next: + 91 + 16π.
		expect(run.bends.map((b) => b.atMm)).toEqual([
			expect.closeTo(54 + 8 * Math.PI, 9),
			expect.closeTo(145 + 24 * Math.PI, 9)
		]);
		expect(run.bends.map((b) => b.angleDeg)).toEqual([
			expect.closeTo(90, 9),
			expect.closeTo(90, 9)
		]);
	});
});

describe('the bill', () => {
	it('lists the cut, the tube to buy with the allowance and the fittings per thread', () => {
		const input = pumpLoopScene();
		const scene = parse(input);
		const loops = checkLoops(scene, resolveScene(scene));
		const bill = loopBill(scene, loops, 10);
		expect(bill.cutList[0].text).toBe(
			`Run 1: ${(319 + 32 * Math.PI).toFixed(1)} mm of 16 mm hard tube, bends at ${(54 + 8 * Math.PI).toFixed(1)} and ${(145 + 24 * Math.PI).toFixed(1)} mm from the reservoir end`
		);
		const total = loops[0].runs[0].cutLengthMm + loops[0].runs[1].cutLengthMm;
		expect(bill.tubes).toEqual([
			expect.objectContaining({ tubeKindId: 'hard-16', cutMm: total, runs: 2 })
		]);
		expect(bill.tubes[0].withAllowanceMm).toBeCloseTo(total * 1.1, 9);
		expect(bill.fittings).toEqual([
			expect.objectContaining({ partId: null, name: 'Stop plug', thread: 'G 1/4', count: 1 }),
			expect.objectContaining({ partId: 'plug-g14', thread: 'G 1/4', count: 1 }),
			expect.objectContaining({ partId: 'fit-straight-16', thread: 'G 1/4', count: 4 })
		]);
		expect(bill.bends).toBe(4);
	});
});

describe('loop checks', () => {
	it('the loop scene passes every check but the drain advice', () => {
		const [loop] = loopsOf(pumpLoopScene());
		expect(loop.checks.map((c) => [c.id, c.status])).toEqual([
			['closed', 'pass'],
			['reservoir', 'pass'],
			['fill', 'pass'],
			['drain', 'advice'],
			['bends', 'pass'],
			['ports', 'pass'],
			['threads', 'pass'],
			['fit', 'pass']
		]);
		expect(loop.status).toBe('pass');
		expect(checkOf(loop, 'fill').reason).toContain(
			'on the reservoir top, reachable through the top panel'
		);
	});

	it('a reservoir below the pump inlet fails', () => {
		// Raise the pump 200 mm: its inlet at y 280 is 80 mm above the reservoir's outlet at 200.
		const input = pumpLoopScene(({ input, loop }) => {
			input.placements![0].position = [50, 220, 45];
			loop.runs[0].waypoints = [
				[220, 350, 75],
				[65, 350, 75]
			];
			loop.runs[1].waypoints = [
				[350, 250, 75],
				[350, 170, 75]
			];
		});
		const [loop] = loopsOf(input);
		expect(checkOf(loop, 'reservoir')).toMatchObject({ status: 'fail' });
		expect(checkOf(loop, 'reservoir').reason).toContain('80.0 mm below the pump inlet');
		expect(loop.status).toBe('fail');
	});

	it('a pump fed by anything but a reservoir fails', () => {
		const input = pumpLoopScene(({ input }) => {
			(input.parts![1] as PartDef).category = 'other';
		});
		expect(checkOf(loopsOf(input)[0], 'reservoir').status).toBe('fail');
	});

	it('a port left open fails until it is plugged', () => {
		const open = pumpLoopScene(({ loop }) => {
			loop.plugs = loop.plugs.filter((p) => p.portId !== 'side');
		});
		const [loop] = loopsOf(open);
		expect(checkOf(loop, 'ports').status).toBe('fail');
		expect(loop.needsPlug).toEqual([
			{ placementId: 'res-1', portId: 'side', label: 'Reservoir · side', thread: 'G 1/4' }
		]);
		expect(checkOf(loopsOf(pumpLoopScene())[0], 'ports').status).toBe('pass');
	});

	const checkCases: {
		what: string;
		edit: Parameters<typeof pumpLoopScene>[0];
		check: string;
		status: string;
		reason: string;
	}[] = [
		{
			// The side port is at y 120; run 1 reaches y 300: 180 mm below.
			what: 'a fill port below the top of the loop warns',
			edit: ({ loop }) => (loop.fill = { placementId: 'res-1', portId: 'side' }),
			check: 'fill',
			status: 'warn',
			reason: '180.0 mm below the loop'
		},
		{
			what: 'a fill port with a part over it warns that it is not reachable',
			edit: ({ input }) => {
				input.parts!.push(blockPart('shelf', [40, 10, 20]));
				input.placements!.push({ id: 'shelf-1', partId: 'shelf', position: [220, 350, 45] });
			},
			check: 'fill',
			status: 'warn',
			reason: 'not reachable: the shelf · body is in the way'
		},
		{
			what: 'a fitting of another thread fails',
			edit: ({ input }) => ((input.parts![0] as PartDef).ports[0].thread = 'G 3/8'),
			check: 'threads',
			status: 'fail',
			reason: 'is G 1/4, Pump · in is G 3/8'
		},
		{
			what: 'an open chain says where it breaks',
			edit: ({ loop }) => (loop.runs = [loop.runs[0]]),
			check: 'closed',
			status: 'fail',
			reason: 'Run 1 ends on Pump · in but Run 1 starts on Reservoir · out'
		},
		{
			// Lowest point: run 2 at y 50; the side port at y 120 is 70 mm above it.
			what: 'a drain near the lowest point passes, one high up is advice',
			edit: ({ loop }) => (loop.drain = { placementId: 'res-1', portId: 'side' }),
			check: 'drain',
			status: 'advice',
			reason: '70.0 mm above the lowest point'
		}
	];
	for (const { what, edit, check, status, reason } of checkCases) {
		it(what, () => {
			const found = checkOf(loopsOf(pumpLoopScene(edit))[0], check);
			expect(found.status).toBe(status);
			expect(found.reason).toContain(reason);
		});
	}
});

describe('runs checked like bodies', () => {
	it('names the run, the segment and what it meets', () => {
		const input = pumpLoopScene(({ input }) => {
			input.parts!.push({ ...blockPart('card', [50, 40, 70]), name: 'Card' });
			input.placements!.push({ id: 'card-1', partId: 'card', position: [120, 280, 40] });
		});
		const [loop] = loopsOf(input);
		expect(loop.runs[0].status).toBe('collides');
		expect(loop.runs[0].problems[0].text).toBe('Run 1, second segment, against the card · body');
		expect(checkOf(loop, 'fit').status).toBe('fail');
		// The fit report marks the card as it would for a part's body.
		const report = checkScene(parse(input));
		expect(report.loops?.[0].runs[0].status).toBe('collides');
		expect(report.parts.find((p) => p.placementId === 'card-1')!.status).toBe('collides');
		expect(report.totals.counts.collides).toBe(1);
	});

	it('closer than the clearance is tight, with the gap', () => {
		// Run 1's second segment is at y 300 ± 8; a box from y 309 leaves 1 mm, under 2 mm.
		const input = pumpLoopScene(({ input }) => {
			input.parts!.push(blockPart('lid', [50, 20, 70]));
			input.placements!.push({ id: 'lid-1', partId: 'lid', position: [120, 309, 40] });
		});
		const [loop] = loopsOf(input);
		expect(loop.runs[0].problems).toEqual([
			expect.objectContaining({ kind: 'tight', gapMm: expect.closeTo(1, 9) })
		]);
		expect(loop.runs[0].problems[0].text).toBe('Run 1, second segment, 1.0 mm from the lid · body');
	});

	it("a run's end fittings do not collide with the ports they screw into", () => {
		const [loop] = loopsOf(pumpLoopScene());
		expect(loop.runs.flatMap((r) => r.problems)).toEqual([]);
		expect(loop.runs[0].pieces.filter((p) => p.kind === 'fitting')).toHaveLength(2);
	});

	it('two runs that cross collide and name each other', () => {
		// Run 2 rises at x 180 through run 1's second segment (y 300, z 75), then goes round.
		const input = pumpLoopScene(
			withWaypoints(
				1,
				[180, 50, 75],
				[180, 300, 75],
				[180, 300, 150],
				[350, 300, 150],
				[350, 170, 150],
				[350, 170, 75]
			)
		);
		const [loop] = loopsOf(input);
		const texts = loop.runs.flatMap((r) => r.problems.map((p) => p.text));
		expect(texts).toContain('Run 1, second segment, against run 2, bend 2');
		expect(texts).toContain('Run 2, second segment, against run 1, bend 1');
	});

	it('a dragged waypoint re-checks only its run', () => {
		const scene = parse(pumpLoopScene());
		const resolved = resolveScene(scene);
		const cache: RunCache = new Map();
		checkLoops(scene, resolved, cache);
		const before = { r1: cache.get('r1'), r2: cache.get('r2') };
		const moved = parse(pumpLoopScene(withWaypoints(1, [340.5, 50, 75], [340.5, 170, 75])));
		const [loop] = checkLoops(moved, resolved, cache);
		expect(cache.get('r1')).toBe(before.r1);
		expect(cache.get('r2')).not.toBe(before.r2);
		expect(loop.runs[1].lengthMm).toBeLessThan(checkLoops(scene, resolved)[0].runs[1].lengthMm);
	});
});

describe('bad input, with the path', () => {
	const cases: [string, (s: { input: SceneInput; loop: LoopDef }) => void, string, string][] = [
		[
			'a run to a port that does not exist',
			({ loop }) => (loop.runs[1].to.portId = 'nowhere'),
			'loops[0].runs[1].to.portId',
			'No port with this id on that part'
		],
		[
			'a port used twice',
			({ loop }) => (loop.runs[1].to = { placementId: 'pump-1', portId: 'in' }),
			'loops[0].runs[1].to.portId',
			'Port used twice: Pump · in is already joined by run 1'
		],
		[
			'a waypoint outside the enclosure',
			({ loop }) => (loop.runs[0].waypoints[1] = [65, 412, 75]),
			'loops[0].runs[0].waypoints[1][1]',
			'Outside the enclosure: 412.0 mm along y, the inside is 0 to 400.0 mm'
		],
		[
			'a bend tighter than the tube allows',
			withWaypoints(1, [350, 50, 75], [350, 170, 75], [330, 170, 75]),
			'loops[0].runs[1].waypoints[1]',
			'Bend tighter than the tube allows: the third segment is 20.0 mm long and its bends need 32.0 mm at a 32.0 mm bend radius'
		],
		[
			'a hard tube off its axes',
			({ loop }) => (loop.runs[0].waypoints[1] = [65, 300, 90]),
			'loops[0].runs[0].waypoints[1]',
			'Hard tube runs along one axis at a time: the second segment moves along x and z'
		],
		[
			'a repeated point (a zero-length segment)',
			({ loop }) => loop.runs[0].waypoints.splice(1, 0, [220, 300, 75]),
			'loops[0].runs[0].waypoints[1]',
			'Repeats the point before it: every segment needs a length above 0 mm'
		],
		[
			'a negative outer diameter',
			({ input }) => (input.tubeKinds![4].outerMm = -16),
			'tubeKinds[4].outerMm',
			'Must be greater than 0'
		],
		[
			'a tube kind that does not exist',
			({ loop }) => (loop.runs[0].tube = 'hard-99'),
			'loops[0].runs[0].tube',
			'No tube kind with this id'
		],
		[
			'a fitting that is not a fitting',
			({ loop }) => (loop.runs[0].fittings.from = 'pump'),
			'loops[0].runs[0].fittings.from',
			'Pump is not a fitting'
		],
		[
			'a straight fitting with the tube turning off it',
			withWaypoints(0, [300, 224, 75], [300, 300, 75], [65, 300, 75]),
			'loops[0].runs[0].fittings.from',
			'The Straight compression fitting, 16 mm hard tube sends the tube straight out along +y; the first segment leaves at 90°'
		],
		[
			'a fill port that is not plugged',
			({ loop }) => (loop.fill = { placementId: 'pump-1', portId: 'in' }),
			'loops[0].fill',
			"The fill port must be one of this loop's plugged ports"
		]
	];
	for (const [what, edit, path, message] of cases) {
		it(`refuses ${what}`, () => {
			expect(issuesOf(pumpLoopScene(edit))).toContainEqual({ path, message });
		});
	}

	it('refuses more segments than the engine checks', () => {
		const input = pumpLoopScene(({ loop }) => {
			loop.runs[1].waypoints = Array.from({ length: 200 }, () => [350, 50, 75] as Vec3);
			for (let i = 0; i < 5; i++) loop.runs.push({ ...loop.runs[1], id: `extra-${i}` });
		});
		expect(issuesOf(input)).toEqual([
			{ path: 'loops', message: 'The loops have 1209 segments; at most 1000' }
		]);
	});

	it('a scene without loops means what it meant', () => {
		const plain = makeScene({ enclosure: plainEnclosure([100, 100, 100]) });
		expect(plain.loops).toBeUndefined();
		expect(checkScene(plain).loops).toBeUndefined();
	});
});

// ——— Properties ———

const R = HARD16.outerMm / 2;

/** Points of the real tube's centre line (straights and arcs) with their unit directions. */
function centreSamples(points: Vec3[], radius: number, perPiece = 12): { p: Vec3; d: Vec3 }[] {
	const out: { p: Vec3; d: Vec3 }[] = [];
	const bends = bendsOf(points, radius);
	const t = new Map(bends.map((b) => [b.point, b]));
	for (let i = 1; i < points.length; i++) {
		const a = points[i - 1];
		const b = points[i];
		const d = sub(b, a);
		const len = norm(d);
		const u: Vec3 = [d[0] / len, d[1] / len, d[2] / len];
		const s0 = t.get(i - 1)?.tangentMm ?? 0;
		const s1 = t.get(i)?.tangentMm ?? 0;
		for (let k = 0; k <= perPiece; k++) {
			out.push({ p: add(a, u, s0 + ((len - s0 - s1) * k) / perPiece), d: u });
		}
	}
	for (const bend of bends) {
		const c = points[bend.point];
		const u = sub(c, points[bend.point - 1]);
		const v = sub(points[bend.point + 1], c);
		const un: Vec3 = u.map((x) => x / norm(u)) as Vec3;
		const vn: Vec3 = v.map((x) => x / norm(v)) as Vec3;
		const cos = Math.cos(bend.angleRad);
		const sin = Math.sin(bend.angleRad);
		// n: unit normal from the first tangent point toward the arc's centre.
		const n: Vec3 = [0, 1, 2].map((k) => (vn[k] - un[k] * cos) / sin) as Vec3;
		const t1 = add(c, un, -bend.tangentMm);
		const centre = add(t1, n, radius);
		for (let k = 0; k <= perPiece; k++) {
			const phi = (bend.angleRad * k) / perPiece;
			const p = [0, 1, 2].map(
				(j) => centre[j] + radius * (-n[j] * Math.cos(phi) + un[j] * Math.sin(phi))
			) as Vec3;
			const d = [0, 1, 2].map((j) => un[j] * Math.cos(phi) + n[j] * Math.sin(phi)) as Vec3;
			out.push({ p, d });
		}
	}
	return out;
}

/** Points of the circle of radius r around p, perpendicular to the unit direction d. */
function circle(p: Vec3, d: Vec3, r: number, n = 16): Vec3[] {
	const helper: Vec3 = Math.abs(d[0]) < 0.9 ? [1, 0, 0] : [0, 1, 0];
	const e1raw: Vec3 = [
		d[1] * helper[2] - d[2] * helper[1],
		d[2] * helper[0] - d[0] * helper[2],
		d[0] * helper[1] - d[1] * helper[0]
	];
	const e1 = e1raw.map((x) => x / norm(e1raw)) as Vec3;
	const e2: Vec3 = [
		d[1] * e1[2] - d[2] * e1[1],
		d[2] * e1[0] - d[0] * e1[2],
		d[0] * e1[1] - d[1] * e1[0]
	];
	return Array.from({ length: n }, (_, k) => {
		const a = (2 * Math.PI * k) / n;
		return [0, 1, 2].map((j) => p[j] + r * (Math.cos(a) * e1[j] + Math.sin(a) * e2[j])) as Vec3;
	});
}

const inBox = (b: Box, p: Vec3, eps = 1e-6) =>
	p.every((v, i) => v >= b.min[i] - eps && v <= b.max[i] + eps);

/** Random paths whose every segment leaves room for the bends at both its ends. */
function pathArb(kind: 'hard' | 'soft', tube: TubeKindDef) {
	const dir =
		kind === 'hard'
			? fc.constantFrom<Vec3>([1, 0, 0], [-1, 0, 0], [0, 1, 0], [0, -1, 0], [0, 0, 1], [0, 0, -1])
			: fc
					.tuple(
						fc.double({ min: -1, max: 1 }),
						fc.double({ min: -1, max: 1 }),
						fc.double({ min: -1, max: 1 })
					)
					.filter((v) => norm(v as Vec3) > 0.2)
					.map((v) => (v as Vec3).map((x) => x / norm(v as Vec3)) as Vec3);
	return fc
		.array(fc.tuple(dir, fc.double({ min: 0, max: 200, noNaN: true })), {
			minLength: 1,
			maxLength: 6
		})
		.map((steps) => {
			// No u-turns (a 180° bend has no tangent length) and, for hard tube, no straight-on repeats.
			const dirs: Vec3[] = [];
			const extras: number[] = [];
			for (const [d, extra] of steps) {
				const prev = dirs[dirs.length - 1];
				if (prev && norm(add(prev, d)) < 0.3) continue;
				if (prev && kind === 'hard' && norm(sub(prev, d)) < 1e-9) continue;
				dirs.push(d);
				extras.push(extra);
			}
			const tangent = (i: number) => {
				if (i <= 0 || i >= dirs.length) return 0;
				const c =
					dirs[i - 1][0] * dirs[i][0] + dirs[i - 1][1] * dirs[i][1] + dirs[i - 1][2] * dirs[i][2];
				return tube.minBendRadiusMm * Math.tan(Math.acos(Math.max(-1, Math.min(1, c))) / 2);
			};
			const pts: Vec3[] = [[0, 0, 0]];
			dirs.forEach((d, i) => {
				// Room for the bends at both ends of the segment, plus something.
				pts.push(add(pts[pts.length - 1], d, tangent(i) + tangent(i + 1) + extras[i] + 1));
			});
			return pts;
		})
		.filter((pts) => pts.length >= 2);
}

function endsFor(points: Vec3[]): RunEnds {
	const none = fittingGeometry(null);
	return {
		from: { position: points[0], direction: '+x', thread: 'G 1/4' },
		to: { position: points[points.length - 1], direction: '+x', thread: 'G 1/4' },
		fittings: { from: none, to: none },
		points
	};
}

describe('properties', () => {
	const soft = defaultTubeKinds().find((t) => t.id === 'soft-10-16')!;
	for (const [kind, tube] of [
		['hard', HARD16],
		['soft', soft]
	] as const) {
		it(`${kind} runs: the boxes hold the tube's circle at every sampled point of its path`, () => {
			fc.assert(
				fc.property(pathArb(kind, tube), (points) => {
					const run = {
						id: 'r',
						from: { placementId: 'a', portId: 'p' },
						to: { placementId: 'b', portId: 'p' }
					};
					const pieces = runPieces(run, endsFor(points), tube, { from: 'a', to: 'b' });
					for (const { p, d } of centreSamples(points, tube.minBendRadiusMm)) {
						for (const q of circle(p, d, tube.outerMm / 2)) {
							if (!pieces.some((piece) => inBox(piece.tube, q))) return false;
						}
						// And the boxes lie along the waypoints: each is within reach of the polyline's bounds.
					}
					const lo = [0, 1, 2].map((a) => Math.min(...points.map((p) => p[a])) - tube.outerMm);
					const hi = [0, 1, 2].map((a) => Math.max(...points.map((p) => p[a])) + tube.outerMm);
					return pieces.every((piece) =>
						[0, 1, 2].every((a) => piece.tube.min[a] >= lo[a] && piece.tube.max[a] <= hi[a])
					);
				}),
				{ numRuns: 200 }
			);
		});
	}

	it('a colliding run is reported for every box a brute-force sampling of its tube meets', () => {
		// Oracle: points of the real tube (circles along straights and arcs) tested against each of
		// the scene's bodies one by one. Every body a sampled point lies in must be reported against
		// the run; boxes are conservative, so the engine may also report near misses, never fewer.
		const obstacle = fc
			.tuple(
				fc.double({ min: 20, max: 360, noNaN: true }),
				fc.double({ min: 20, max: 360, noNaN: true }),
				fc.double({ min: 20, max: 360, noNaN: true }),
				fc.double({ min: 3, max: 60, noNaN: true })
			)
			.map(([x, y, z, s]) => ({ min: [x, y, z] as Vec3, max: [x + s, y + s, z + s] as Vec3 }));
		fc.assert(
			fc.property(fc.array(obstacle, { minLength: 1, maxLength: 8 }), (boxes) => {
				const input = pumpLoopScene(({ input }) => {
					boxes.forEach((b, i) => {
						input.parts!.push(
							blockPart(`ob${i}`, [b.max[0] - b.min[0], b.max[1] - b.min[1], b.max[2] - b.min[2]])
						);
						input.placements!.push({ id: `ob${i}-1`, partId: `ob${i}`, position: b.min });
					});
				});
				const scene = parse(input);
				const [loop] = checkLoops(scene, resolveScene(scene));
				for (const run of loop.runs) {
					const samples = centreSamples(run.points!, HARD16.minBendRadiusMm, 40).flatMap(
						({ p, d }) => [p, ...circle(p, d, R, 24)]
					);
					const reported = new Set(
						run.problems.filter((p) => p.kind === 'collides').map((p) => p.against.placementId)
					);
					boxes.forEach((b, i) => {
						const met = samples.some((q) => inBox(b, q, -1e-6));
						if (met && !reported.has(`ob${i}-1`)) throw new Error(`missed ob${i} on ${run.label}`);
					});
				}
				return true;
			}),
			{ numRuns: 150 }
		);
	});
});
