/** Test data: small factories and fast-check arbitraries for enclosures, parts and scenes. */

import fc from 'fast-check';
import {
	SLOT_PITCH_MM,
	enclosureDefSchema,
	sceneSchema,
	type Box,
	type DividerDef,
	type EnclosureDef,
	type EnclosureInput,
	type LoopDef,
	type PartDef,
	type PortDef,
	type RunDef,
	type Scene,
	type SceneInput,
	type Vec3
} from '../../geometry/schema';
import { resolveScene } from '../../geometry/resolve';
import { checkScene } from '../../geometry/check';
import { defaultFittings, defaultTubeKinds } from '../../geometry/loop-library';
import { demoParts } from '../../geometry/standard-library';
import type { FitReport, WorldBox } from '../../geometry/types';

/** A plain enclosure: `innerMm` inside, every panel `wallMm` thick and solid. */
export function plainEnclosure(
	innerMm: Vec3,
	wallMm = 2,
	extra: Partial<EnclosureInput> = {}
): EnclosureDef {
	const panel = () => ({ thicknessMm: wallMm, kind: 'solid' as const, offsetMm: 0 });
	return enclosureDefSchema.parse({
		name: 'Test enclosure',
		outerMm: [innerMm[0] + 2 * wallMm, innerMm[1] + 2 * wallMm, innerMm[2] + 2 * wallMm],
		walls: {
			left: panel(),
			right: panel(),
			bottom: panel(),
			top: panel(),
			front: panel(),
			back: panel()
		},
		dividers: [],
		brackets: [],
		mounts: [],
		...extra
	});
}

export function blockPart(id: string, sizeMm: Vec3, extra: Partial<PartDef> = {}): PartDef {
	return {
		id,
		name: id,
		category: 'other',
		bodies: [{ id: 'body', label: 'body', box: { min: [0, 0, 0], max: sizeMm } }],
		keepouts: [],
		ports: [],
		specs: {},
		provenance: 'estimate',
		toleranceMm: 0,
		...extra
	};
}

/** One part of the demo catalogue by id (throws when there is none). */
export function demoPart(id: string): PartDef {
	const part = demoParts().find((p) => p.id === id);
	if (!part) {
		throw new Error(`no demo part ${id}`);
	}
	return part;
}

/** A divider's list of allowed positions, `{ label: offsetMm }` in the order given. */
export const listPositions = (offsets: Record<string, number>): DividerDef['positions'] => ({
	kind: 'list',
	options: Object.entries(offsets).map(([label, offsetMm]) => ({ label, offsetMm }))
});

/** Parses through sceneSchema so defaults are filled in exactly as the API would. */
export function makeScene(input: Partial<SceneInput> & Pick<SceneInput, 'enclosure'>): Scene {
	return sceneSchema.parse({ format: 'interstice.scene', version: 1, ...input });
}

/** Straight 16 mm fittings at both ends of a run. */
export const STRAIGHT_16: [string, string] = ['fit-straight-16', 'fit-straight-16'];

/**
 * One run of a loop from `from` to `to`, each a `[placementId, portId]` pair; `fittings` are the
 * fitting part ids at the from and to ends (null: bare port).
 */
export function runDef(
	id: string,
	from: [string, string],
	to: [string, string],
	tube: string,
	fittings: [string | null, string | null] = [null, null],
	waypoints: Vec3[] = []
): RunDef {
	return {
		id,
		from: { placementId: from[0], portId: from[1] },
		to: { placementId: to[0], portId: to[1] },
		tube,
		fittings: { from: fittings[0], to: fittings[1] },
		waypoints
	};
}

/**
 * Two 100 mm blocks with ports facing each other along x (a's at x 100 +x, b's at b's x 0 −x),
 * a at the origin and b at `bx`, joined by one straight 16 mm hard run `r` (loop `l`) with
 * straight fittings (reach 24 mm, insertion 10 mm), in a 400 × 200 × 200 mm enclosure. With
 * bx = 200 the centre line is 200 − 100 − 2·24 = 52 mm and the cut 72 mm.
 */
export function facingBlocksScene(bx = 200): SceneInput {
	const block = (id: string, x: number, direction: '+x' | '-x'): PartDef => ({
		...blockPart(id, [100, 100, 100]),
		ports: [{ id: 'p', position: [x, 50, 50], direction, thread: 'G 1/4' }]
	});
	return {
		format: 'interstice.scene',
		version: 1,
		enclosure: plainEnclosure([400, 200, 200]),
		parts: [block('a', 100, '+x'), block('b', 0, '-x'), ...defaultFittings()],
		placements: [
			{ id: 'a1', partId: 'a', position: [0, 0, 0] },
			{ id: 'b1', partId: 'b', position: [bx, 0, 0] }
		],
		tubeKinds: defaultTubeKinds(),
		loops: [
			{
				id: 'l',
				runs: [runDef('r', ['a1', 'p'], ['b1', 'p'], 'hard-16', STRAIGHT_16)]
			}
		]
	};
}

/** Millimetres on a 0.5 mm grid, so faces often touch exactly and sums stay exact in doubles. */
export const gridMm = (min: number, max: number) =>
	fc.integer({ min: Math.round(min * 2), max: Math.round(max * 2) }).map((v) => v / 2);

export const boxArb = (lo = -20, hi = 150, maxSize = 80): fc.Arbitrary<Box> =>
	fc
		.tuple(
			gridMm(lo, hi),
			gridMm(lo, hi),
			gridMm(lo, hi),
			gridMm(0.5, maxSize),
			gridMm(0.5, maxSize),
			gridMm(0.5, maxSize)
		)
		.map(([x, y, z, w, h, d]) => ({ min: [x, y, z] as Vec3, max: [x + w, y + h, z + d] as Vec3 }));

const rotationArb = fc.record({
	x: fc.integer({ min: 0, max: 3 }),
	y: fc.integer({ min: 0, max: 3 }),
	z: fc.integer({ min: 0, max: 3 })
});

const partArb = (id: string): fc.Arbitrary<PartDef> =>
	fc
		.record({
			bodies: fc.array(boxArb(-10, 60, 60), { minLength: 1, maxLength: 3 }),
			keepouts: fc.array(
				fc.record({
					box: boxArb(-10, 80, 40),
					kind: fc.constantFrom('fitting', 'airflow', 'cable', 'service'),
					severity: fc.constantFrom('error', 'warning')
				}),
				{ maxLength: 2 }
			)
		})
		.map(({ bodies, keepouts }) => ({
			...blockPart(id, [1, 1, 1]),
			bodies: bodies.map((box, i) => ({ id: `b${i}`, label: `body ${i}`, box })),
			keepouts: keepouts.map((k, i) => ({ id: `k${i}`, label: `keep-out ${i}`, ...k }))
		}));

/**
 * Random valid scenes: an enclosure with solid or mesh panels, up to two dividers (list or range
 * positions, partial spans), up to one bracket, up to four parts and eight placements.
 */
export const sceneArb: fc.Arbitrary<Scene> = fc
	.record({
		inner: fc.tuple(gridMm(60, 300), gridMm(60, 300), gridMm(60, 300)),
		walls: fc.array(fc.record({ t: gridMm(0, 4), mesh: fc.boolean() }), {
			minLength: 6,
			maxLength: 6
		}),
		dividers: fc.array(
			fc.record({
				axis: fc.constantFrom('x' as const, 'y' as const, 'z' as const),
				t: gridMm(0.5, 4),
				fractions: fc.array(fc.double({ min: 0.05, max: 0.85, noNaN: true }), {
					minLength: 1,
					maxLength: 3
				}),
				range: fc.boolean(),
				partial: fc.boolean(),
				pick: fc.nat()
			}),
			{ maxLength: 2 }
		),
		bracket: fc.option(
			fc.record({
				box: boxArb(0, 100, 40),
				axis: fc.constantFrom('x' as const, 'y' as const, 'z' as const),
				steps: fc.integer({ min: 1, max: 6 }),
				pick: fc.nat()
			})
		),
		parts: fc
			.integer({ min: 1, max: 4 })
			.chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => partArb(`part${i}`)))),
		placements: fc.array(
			fc.record({
				part: fc.nat(),
				position: fc.tuple(gridMm(-30, 260), gridMm(-30, 260), gridMm(-30, 260)),
				rotation: rotationArb,
				mesh: fc.boolean()
			}),
			{ maxLength: 8 }
		),
		margin: gridMm(0, 5)
	})
	.map((r) => {
		const faces = ['left', 'right', 'bottom', 'top', 'front', 'back'] as const;
		const walls = Object.fromEntries(
			faces.map((f, i) => [
				f,
				{ thicknessMm: r.walls[i].t, kind: r.walls[i].mesh ? 'mesh' : 'solid', offsetMm: 0 }
			])
		) as EnclosureDef['walls'];
		const outer: Vec3 = [
			r.inner[0] + r.walls[0].t + r.walls[1].t,
			r.inner[1] + r.walls[2].t + r.walls[3].t,
			r.inner[2] + r.walls[4].t + r.walls[5].t
		];
		const dividerPositions: Record<string, number> = {};
		const dividers = r.dividers.map((d, i) => {
			const a = 'xyz'.indexOf(d.axis);
			const offsets = d.fractions.map((f) => Math.round(f * r.inner[a] * 2) / 2);
			const id = `d${i}`;
			const positions = d.range
				? {
						kind: 'range' as const,
						minMm: offsets[0],
						maxMm: offsets[0] + 2 * SLOT_PITCH_MM,
						stepMm: SLOT_PITCH_MM
					}
				: {
						kind: 'list' as const,
						options: offsets.map((o, k) => ({ label: `p${k}`, offsetMm: o }))
					};
			dividerPositions[id] = d.range
				? offsets[0] + (d.pick % 3) * SLOT_PITCH_MM
				: offsets[d.pick % offsets.length];
			const other = (a + 1) % 3;
			const span = d.partial
				? { [('xyz' as const)[other]]: { minMm: 0, maxMm: r.inner[other] / 2 } }
				: undefined;
			return { id, label: `Divider ${i}`, axis: d.axis, thicknessMm: d.t, positions, span };
		});
		const bracketOffsets: Record<string, number> = {};
		const brackets = r.bracket
			? [
					{
						id: 'br',
						label: 'Bracket',
						kind: 'other' as const,
						box: r.bracket.box,
						axis: r.bracket.axis,
						travel: { minMm: -20, maxMm: -20 + 10 * r.bracket.steps, stepMm: 10 }
					}
				]
			: [];
		if (r.bracket) bracketOffsets.br = -20 + 10 * (r.bracket.pick % (r.bracket.steps + 1));
		const parts = r.parts as PartDef[];
		return sceneSchema.parse({
			format: 'interstice.scene',
			version: 1,
			enclosure: { name: 'Random', outerMm: outer, walls, dividers, brackets, mounts: [] },
			parts,
			dividerPositions,
			bracketOffsets,
			placements: r.placements.map((p, i) => ({
				id: `pl${i}`,
				partId: parts[p.part % parts.length].id,
				position: p.position,
				rotation: p.rotation
			})),
			marginMm: r.margin
		});
	});

/** Asserts `property` of `numRuns` random scenes from `arb`, each with its fit report. */
export function eachCheckedScene<S extends Scene>(
	arb: fc.Arbitrary<S>,
	numRuns: number,
	property: (scene: S, report: FitReport) => void
): void {
	fc.assert(
		fc.property(arb, (scene) => property(scene, checkScene(scene))),
		{ numRuns }
	);
}

/**
 * Every world box of a scene as the resolver makes it: walls, dividers, brackets, mount plates
 * (unless `plates` is false), then each placement's bodies and keep-outs.
 */
export function worldBoxesOf(scene: Scene, { plates = true } = {}): WorldBox[] {
	const r = resolveScene(scene);
	return [
		...r.walls,
		...r.dividers,
		...r.brackets,
		...(plates ? r.plates : []),
		...r.placements.flatMap((p) => [...p.bodies, ...p.keepouts])
	];
}

/** Oracle: how far two boxes share one axis (mm; ≤ 0 when apart or only touching). */
export const sharedAlong = (a: Box, b: Box, axis: number) =>
	Math.min(a.max[axis], b.max[axis]) - Math.max(a.min[axis], b.min[axis]);

/**
 * A soft loop-back run between the demo CPU block's two ports, as a request sends it: the ports
 * sit 20 mm apart, room for two bends of 5 mm between them.
 */
export function demoLoopBackRun() {
	return {
		from: { placementId: 'cpu-block', portId: 'out', reachMm: 12 },
		to: { placementId: 'cpu-block', portId: 'in', reachMm: 12 },
		section: { kind: 'round' as const, outerDiameterMm: 10 },
		bendRadiusMm: 5,
		clearanceMm: 1,
		mode: 'soft' as const
	};
}

/** An edit for `pumpLoopScene`: run `run` (0 or 1) of its loop through `points` instead. */
export const withWaypoints =
	(run: number, ...points: Vec3[]) =>
	({ loop }: { loop: LoopDef }) => {
		loop.runs[run].waypoints = points;
	};

/**
 * A 400 mm cube inside; a pump (in on top, out on its +x side) and a reservoir (out and in, a
 * fill port on top), joined by two 16 mm hard runs with straight fittings (reach 24 mm, insertion
 * 10 mm). World ports: pump in (65, 80, 75) +y, pump out (110, 50, 75) +x; reservoir out
 * (220, 200, 75) +y, in (280, 170, 75) +x, fill (240, 200, 55) +y. With `block`, a 40 × 120 ×
 * 120 mm block (x 120–160, y 260–380, z 20–140) sits across the first run's top segment
 * (y 300, z 75). The loop checker's and the route suggestion's specs both start from it.
 */
export function pumpLoopScene(
	edit: (s: { input: SceneInput; loop: LoopDef }) => void = () => {},
	options: { block?: boolean } = {}
): SceneInput {
	/** A block part whose ports, each `[id, position, direction]`, all take G 1/4 fittings. */
	const ported = (
		part: Pick<PartDef, 'id' | 'name' | 'category'>,
		sizeMm: Vec3,
		ports: [string, Vec3, PortDef['direction']][]
	): PartDef => ({
		...blockPart(part.id, sizeMm),
		...part,
		ports: ports.map(([id, position, direction]) => ({ id, position, direction, thread: 'G 1/4' }))
	});
	const pump = ported(
		{ id: 'pump', name: 'Pump', category: 'pump' },
		[60, 60, 60],
		[
			['in', [15, 60, 30], '+y'],
			['out', [60, 30, 30], '+x']
		]
	);
	const res = ported(
		{ id: 'res', name: 'Reservoir', category: 'reservoir' },
		[80, 100, 70],
		[
			['out', [20, 100, 35], '+y'],
			['in', [80, 70, 35], '+x'],
			['fill', [40, 100, 15], '+y'],
			['side', [40, 20, 70], '+z']
		]
	);
	const loop: LoopDef = {
		id: 'main',
		label: 'Main loop',
		runs: [
			runDef('r1', ['res-1', 'out'], ['pump-1', 'in'], 'hard-16', STRAIGHT_16, [
				[220, 300, 75],
				[65, 300, 75]
			]),
			runDef('r2', ['pump-1', 'out'], ['res-1', 'in'], 'hard-16', STRAIGHT_16, [
				[350, 50, 75],
				[350, 170, 75]
			])
		],
		plugs: [
			{ placementId: 'res-1', portId: 'fill', fitting: 'plug-g14' },
			{ placementId: 'res-1', portId: 'side', fitting: null }
		],
		fill: { placementId: 'res-1', portId: 'fill' }
	};
	const input: SceneInput = {
		format: 'interstice.scene',
		version: 1,
		enclosure: plainEnclosure([400, 400, 400]),
		parts: [
			pump,
			res,
			...(options.block ? [blockPart('block', [40, 120, 120])] : []),
			...defaultFittings()
		],
		placements: [
			{ id: 'pump-1', partId: 'pump', position: [50, 20, 45] },
			{ id: 'res-1', partId: 'res', position: [200, 100, 40] },
			...(options.block
				? [{ id: 'block-1', partId: 'block', position: [120, 260, 20] as Vec3 }]
				: [])
		],
		tubeKinds: defaultTubeKinds(),
		loops: [loop]
	};
	edit({ input, loop });
	return input;
}
