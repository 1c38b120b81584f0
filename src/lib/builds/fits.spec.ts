/**
 * What fits here, checked against the engine's full report: every listed part, placed where the
 * list says, checks clear or tight in checkScene; every part left out, placed, does not (random
 * catalogues, fast-check). Radiator + fan combinations against hand arithmetic.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import {
	checkScene,
	sceneSchema,
	type FitStatus,
	type PartDef,
	type Scene,
	type SceneInput
} from '$lib/geometry';
import { blockPart, demoPart, makeScene } from '$lib/server/testing/engine-factories';
import {
	demoEnclosure,
	demoScene,
	demoSceneInput,
	standardPart
} from '$lib/geometry/standard-library';
import {
	partsByPositions,
	radiatorCombinations,
	whatFits,
	type FitCandidate,
	type FitTarget
} from './fits';

/**
 * The candidate placed as the row says, checked by the whole engine: the status checkScene gives
 * its placement (its own overlaps and gaps, and the mount problems that mark it).
 */
function engineStatus(
	scene: Scene,
	part: PartDef,
	placement: NonNullable<ReturnType<typeof whatFits>['fits'][number]['placement']>,
	replaces: string | null
): FitStatus {
	const input = {
		...scene,
		parts: [...scene.parts.filter((p) => p.id !== part.id), part],
		placements: [...scene.placements.filter((p) => p.id !== replaces), placement]
	};
	const report = checkScene(sceneSchema.parse(input));
	return report.parts.find((p) => p.placementId === placement.id)!.status;
}

const partArb = (i: number) =>
	fc
		.record({
			size: fc.tuple(
				fc.integer({ min: 5, max: 200 }),
				fc.integer({ min: 5, max: 200 }),
				fc.integer({ min: 5, max: 80 })
			),
			kind: fc.constantFrom('radiator', 'fan', 'pump', 'other', 'gpu'),
			keepout: fc.option(
				fc.tuple(fc.integer({ min: 0, max: 40 }), fc.constantFrom('error', 'warning')),
				{ nil: null }
			),
			cls: fc.constantFrom(240, 280),
			tolerance: fc.constantFrom(0, 0.5)
		})
		.map(({ size, kind, keepout, cls, tolerance }) => {
			const specs: PartDef['specs'] =
				kind === 'radiator'
					? { radiatorClass: cls }
					: kind === 'fan'
						? { fanSizeMm: cls === 240 ? 120 : 140, fanThicknessMm: size[2] }
						: {};
			const keepouts: PartDef['keepouts'] = keepout
				? [
						{
							id: 'room',
							label: 'fitting room',
							kind: 'fitting',
							severity: keepout[1] as 'error' | 'warning',
							box: { min: [0, size[1], 0], max: [size[0], size[1] + keepout[0] + 1, size[2]] }
						}
					]
				: [];
			return blockPart(`c${i}`, size, {
				category: kind as PartDef['category'],
				specs,
				keepouts,
				toleranceMm: tolerance
			});
		});

const catalogueArb = fc
	.integer({ min: 1, max: 8 })
	.chain((n) => fc.tuple(...Array.from({ length: n }, (_, i) => partArb(i))));

/** The demo scene with a 10 mm SFX-class block on the front radiator mount, which takes 240 and 280. */
function withStray(): Scene {
	const input = demoSceneInput();
	const stray = blockPart('stray', [10, 10, 10], { specs: { psuFormFactor: 'SFX' } });
	return sceneSchema.parse({
		...input,
		parts: [...input.parts!, stray],
		placements: [
			...input.placements!,
			{ id: 'stray', partId: 'stray', position: [0, 0, 1], mountId: 'radiator' }
		]
	});
}

type TargetCase = { target: FitTarget; scene: () => Scene; replaces: string | null };

const targets: TargetCase[] = [
	{
		target: { kind: 'mount', mountId: 'radiator' },
		scene: () =>
			sceneSchema.parse({
				...demoSceneInput(),
				placements: demoSceneInput().placements!.filter((p) => p.mountId !== 'radiator')
			}),
		replaces: null
	},
	{ target: { kind: 'mount', mountId: 'radiator' }, scene: demoScene, replaces: null },
	{
		target: { kind: 'compartment', compartmentId: 'bulkhead.high+spine.high' },
		scene: demoScene,
		replaces: null
	},
	{
		target: { kind: 'compartment', compartmentId: 'bulkhead.high+spine.low' },
		scene: demoScene,
		replaces: null
	},
	{
		// A part the mount does not take sits on it: its problem marks it alone, not a candidate.
		target: { kind: 'mount', mountId: 'radiator' },
		scene: withStray,
		replaces: null
	},
	{ target: { kind: 'replace', placementId: 'card' }, scene: demoScene, replaces: 'card' },
	{ target: { kind: 'replace', placementId: 'radiator' }, scene: demoScene, replaces: 'radiator' },
	{
		target: { kind: 'space', box: { min: [88, 195, 66], max: [150, 340, 240] } },
		scene: demoScene,
		replaces: null
	}
];

/**
 * A random catalogue (`parts`, and as `candidates`) against one of `list`'s targets, whose scene
 * has one of `margins` mm of margin.
 */
const catalogueAtTarget = (list: TargetCase[], margins: number[]) =>
	fc
		.tuple(catalogueArb, fc.integer({ min: 0, max: list.length - 1 }), fc.constantFrom(...margins))
		.map(([parts, t, marginMm]) => ({
			parts,
			candidates: parts.map((part) => ({ part })),
			target: list[t].target,
			replaces: list[t].replaces,
			scene: { ...list[t].scene(), marginMm }
		}));

describe('what fits here against checkScene', () => {
	it('lists exactly the candidates the full engine passes, with the same status (random catalogues, every kind of target)', () => {
		fc.assert(
			fc.property(
				catalogueAtTarget(targets, [0, 2, 5]),
				({ parts, candidates, target, replaces, scene }) => {
					const result = whatFits(scene, target, candidates);
					expect(result.fits.length + result.left.length).toBe(parts.length);
					for (const row of result.fits) {
						const part = parts.find((p) => p.id === row.partId)!;
						expect(['clear', 'tight']).toContain(
							engineStatus(scene, part, row.placement!, replaces)
						);
						expect(engineStatus(scene, part, row.placement!, replaces)).toBe(row.status);
					}
					for (const row of result.left) {
						expect(row.reason).toBeTruthy();
						if (!row.placement) continue;
						const part = parts.find((p) => p.id === row.partId)!;
						const status = engineStatus(scene, part, row.placement, replaces);
						expect(['clear', 'tight']).not.toContain(status);
						expect(status).toBe(row.status);
					}
				}
			),
			{ numRuns: 150 }
		);
	});

	it('ranks by spare room, clear before tight; by price and by name on request', () => {
		const scene = demoScene();
		const parts = [
			blockPart('small', [20, 20, 20]),
			blockPart('mid', [40, 40, 40]),
			blockPart('big', [61, 60, 60])
		];
		const cands: FitCandidate[] = parts.map((part, i) => ({
			part,
			priceMinor: [300, 100, 200][i]
		}));
		const target: FitTarget = { kind: 'compartment', compartmentId: 'bulkhead.high+spine.high' };
		const bySpare = whatFits(scene, target, cands).fits;
		expect(bySpare.map((r) => r.status)).toEqual(
			[...bySpare.map((r) => r.status)].sort((a, b) => (a === b ? 0 : a === 'clear' ? -1 : 1))
		);
		// In a compartment the list ranks by the room each part has to move where it lands (it
		// is dropped into a corner, touching panels, so its own spare says nothing).
		const clear = bySpare.filter((r) => r.status === 'clear');
		const fitting = bySpare.filter((r) => r.status === bySpare[0].status);
		expect(fitting.map((r) => r.roomToMoveMm)).toEqual(
			[...fitting.map((r) => r.roomToMoveMm)].sort((a, b) => b! - a!)
		);
		for (const r of fitting) expect(r.roomToMoveMm).toBeGreaterThanOrEqual(0);
		expect(
			whatFits(scene, target, cands, 'name')
				.fits.filter((r) => r.status === 'clear')
				.map((r) => r.name)
		).toEqual(clear.map((r) => r.name).sort());
	});

	it('names the field for an unknown id or a box outside', () => {
		const scene = demoScene();
		expect(() => whatFits(scene, { kind: 'mount', mountId: 'nope' }, [])).toThrow(
			expect.objectContaining({ path: 'target.mountId' })
		);
		expect(() => whatFits(scene, { kind: 'compartment', compartmentId: 'nope' }, [])).toThrow(
			expect.objectContaining({ path: 'target.compartmentId' })
		);
		expect(() => whatFits(scene, { kind: 'replace', placementId: 'nope' }, [])).toThrow(
			expect.objectContaining({ path: 'target.placementId' })
		);
		expect(() =>
			whatFits(scene, { kind: 'space', box: { min: [0, 0, 0], max: [151, 10, 10] } }, [])
		).toThrow(expect.objectContaining({ path: 'target.box' }));
	});

	it('ports: the demo pump-reservoir keeps its three ports in its place (its fill plug needs 10 mm of the 13 under the top panel)', () => {
		const scene = demoScene();
		const pump = demoPart('demo-pump-res');
		const row = whatFits(scene, { kind: 'replace', placementId: 'pump-res' }, [{ part: pump }])
			.fits[0];
		expect(row.ports.map((p) => [p.id, p.usable])).toEqual([
			['in', true],
			['out', true],
			['fill', true]
		]);
		// Flush against the top panel the upward fill port has no room: 227 + 13 = 240 → body top at
		// 340; the inlet and outlet face the front and keep theirs.
		const flush = sceneSchema.parse({
			...demoSceneInput(),
			placements: demoSceneInput().placements!.map((p) =>
				p.id === 'pump-res' ? { ...p, position: [90, 240, 150] } : p
			)
		});
		const high = whatFits(flush, { kind: 'replace', placementId: 'pump-res' }, [{ part: pump }]);
		const rows = [...high.fits, ...high.left];
		expect(rows[0].ports.map((p) => [p.id, p.usable, p.blockedBy])).toEqual([
			['in', true, null],
			['out', true, null],
			['fill', false, 'Top panel']
		]);
	});
});

describe('parts × positions', () => {
	it('every cell is the status checkScene gives the part placed there at that position (random catalogues)', () => {
		const tables: TargetCase[] = [targets[0], targets[2], targets[3], targets[5]];
		fc.assert(
			fc.property(
				catalogueAtTarget(tables, [0, 2]),
				({ parts, candidates, target, replaces, scene }) => {
					const table = partsByPositions(scene, target, candidates, {
						kind: 'divider',
						id: 'spine'
					});
					table.positions.forEach((position, k) => {
						const at: Scene = {
							...scene,
							dividerPositions: { ...scene.dividerPositions, spine: position.offsetMm }
						};
						const listed = whatFits(at, target, candidates);
						for (const row of [...listed.fits, ...listed.left]) {
							const cell = table.rows.find((r) => r.partId === row.partId)!.cells[k];
							expect(cell.fits).toBe(row.fits);
							if (!row.placement) continue;
							const part = parts.find((p) => p.id === row.partId)!;
							expect(cell.status).toBe(engineStatus(at, part, row.placement, replaces));
						}
					});
				}
			),
			{ numRuns: 40 }
		);
	});

	it('the demo card fits at 4 and 3 slots and collides at 2; a 3-slot card only at 4 slots', () => {
		const scene = demoScene();
		const card = demoPart('demo-card');
		const thick = {
			...card,
			id: 'thick-card',
			name: 'Three-slot card',
			bodies: [{ ...card.bodies[0], box: { min: [0, 0, 0], max: [185, 120, 3 * 20.32] } }],
			keepouts: []
		} as PartDef;
		const table = partsByPositions(
			scene,
			{ kind: 'replace', placementId: 'card' },
			[{ part: card }, { part: thick }],
			{ kind: 'divider', id: 'spine' }
		);
		expect(table.positions.map((p) => p.label)).toEqual(['4 slots', '3 slots', '2 slots']);
		// The card stands at x 107.36 → 148 (its corner kept): at '3 slots' the spine's right face is at
		// 88, 19.36 mm away; the right panel is 2 mm away on the other side: the spare is 2. The card
		// is ±1 mm, so the worst case is 1 mm, under the 2 mm margin: tight, as checkScene says.
		expect(table.rows[0].cells.map((c) => c.status)).toEqual(['tight', 'tight', 'collides']);
		expect(table.rows[0].cells[1].spareMm).toBeCloseTo(2, 9);
		// 3 × 20.32 = 60.96 mm from x 107.36 reaches 168.32, past the right panel at 150: outside everywhere.
		expect(table.rows[1].cells.every((c) => !c.fits)).toBe(true);
	});
});

describe('radiator + fans on the demo front mount (hand arithmetic)', () => {
	const radiator = (cls: 240 | 280, t: number) =>
		blockPart(`rad-${cls}-${t}`, cls === 240 ? [124, 275, t] : [143, 315, t], {
			category: 'radiator',
			specs: { radiatorClass: cls, radiatorThicknessMm: t }
		});
	const scene = (marginMm: number) => {
		const input: SceneInput = { ...demoSceneInput(), marginMm };
		return makeScene(input);
	};
	const cands: FitCandidate[] = [
		{ part: radiator(240, 45), priceMinor: 5000 },
		{ part: radiator(240, 36), priceMinor: 4000 },
		{ part: radiator(280, 30) },
		{ part: standardPart('std-fan-120-15'), priceMinor: 1000 },
		{ part: standardPart('std-fan-120-25'), priceMinor: 1000 },
		{ part: standardPart('std-fan-140-25') }
	];

	it('240s: 63 mm after the 1 mm plate; 45 + 15 leaves 3, 36 + 25 leaves 2, 45 + 25 is 7 over', () => {
		const combos = radiatorCombinations(scene(3), 'radiator', cands);
		const by = (k: string) => combos.find((c) => c.key === k)!;
		// 64 budget − 1 plate − 0 standoffs = 63 available.
		expect(by('rad-240-45+2xstd-fan-120-15')).toMatchObject({
			availableMm: 63,
			plateMm: 1,
			stackMm: 60,
			spareMm: 3,
			status: 'clear'
		});
		// Placed and checked: the radiator's front face sits on the 1 mm plate (z 1 → 46), held
		// contact, not a gap; the fans (0 mm tolerance) run z 46 → 61 and the bulkhead starts at
		// z 64: 64 − 61 = 3 mm, not under the 3 mm margin; sideways the fans have 13 and 17 mm
		// (x 13 → 133 of 150) and the radiator 13 and 32.5 mm; the stack uses 1 + 45 + 15 = 61 of 64,
		// 3 spare, not under the margin either. So the whole engine says clear.
		expect(by('rad-240-45+2xstd-fan-120-15').checkedStatus).toBe('clear');
		// 36 + 25 = 61: 2 spare, under the 3 mm margin.
		expect(by('rad-240-36+2xstd-fan-120-25')).toMatchObject({
			stackMm: 61,
			spareMm: 2,
			status: 'tight',
			checkedStatus: 'tight'
		});
		// 45 + 25 = 70: 7 over; the fans run into the bulkhead.
		expect(by('rad-240-45+2xstd-fan-120-25')).toMatchObject({
			stackMm: 70,
			spareMm: -7,
			status: 'collides',
			checkedStatus: 'collides'
		});
		// Heat estimate: 240 / 120 × 100 W = 200 W; price 5000 + 2 × 1000.
		expect(by('rad-240-45+2xstd-fan-120-15')).toMatchObject({
			heatCapacityW: 200,
			priceMinor: 7000
		});
		// Best spare first.
		expect(combos.map((c) => c.spareMm)).toEqual(
			[...combos.map((c) => c.spareMm)].sort((a, b) => b - a)
		);
	});

	it('the 280: 64 mm, no plate; 30 + 25 leaves 9; two 140 fans; it replaces what the mount holds', () => {
		const combos = radiatorCombinations(scene(2), 'radiator', cands);
		const c = combos.find((x) => x.key === 'rad-280-30+2xstd-fan-140-25')!;
		expect(c).toMatchObject({
			availableMm: 64,
			plateMm: 0,
			stackMm: 55,
			spareMm: 9,
			status: 'clear',
			checkedStatus: 'clear',
			heatCapacityW: (280 / 120) * 100
		});
		expect(c.fan.count).toBe(2);
		expect(c.replaces.sort()).toEqual(['fan-1', 'fan-2', 'radiator']);
		// No 120 fans on a 280, no 140 fans on a 240.
		expect(combos.some((x) => x.key.startsWith('rad-280') && x.fan.partId.includes('120'))).toBe(
			false
		);
		expect(combos.some((x) => x.key.startsWith('rad-240') && x.fan.partId.includes('140'))).toBe(
			false
		);
	});

	it('a mount that is not for radiators or fans has no combinations', () => {
		expect(radiatorCombinations(makeScene({ enclosure: demoEnclosure() }), 'tray', cands)).toEqual(
			[]
		);
	});
});
