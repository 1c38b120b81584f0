/**
 * The coolant loop through the server, against the real PostgreSQL: a variant's loop is saved
 * with the scene it belongs to, the server recomposes it from the studio's own tube kinds and
 * parts and checks it; bad loops are refused with the path and nothing is written.
 */
import { describe, expect, it } from 'vitest';
import { checkScene, type LoopDef } from '$lib/geometry';
import {
	demoBuildIn,
	loadedVariant,
	saveOver as save,
	sceneRefusal as refusal,
	sheetOf
} from './testing/builds';
import { createTubeKind, tubeKindsForStudio } from './loop';
import { ensureQuote } from './sharing/quotes';
import { sceneSchema } from '$lib/geometry';
import { neutralScene } from './sharing/view';
import { studioWithMembers } from './testing/factories';

/** A studio's own thin tube with a small bend radius (its own figure): 6 mm outside, r = 4 mm. */
const THIN = {
	id: 'thin',
	name: 'Thin soft tube 4/6 mm',
	kind: 'soft' as const,
	innerMm: 4,
	outerMm: 6,
	minBendRadiusMm: 4,
	clearanceMm: 1
};

/**
 * One run in front of the demo pump-reservoir, from its out port (129, 320.5, 150) to its in port
 * (109, 320.5, 150), bare (no fittings): forwards 6 mm, across 20 mm, back 6 mm — clear of the
 * card below and of the top panel at 340 mm with the tube's 3 mm radius and 1 mm clearance.
 */
function loopOver(tube: string): LoopDef {
	return {
		id: 'main',
		runs: [
			{
				id: 'r1',
				from: { placementId: 'pump-res', portId: 'out' },
				to: { placementId: 'pump-res', portId: 'in' },
				tube,
				fittings: { from: null, to: null },
				waypoints: [
					[129, 320.5, 144],
					[109, 320.5, 144]
				]
			}
		],
		plugs: []
	};
}

async function fixture() {
	const f = await studioWithMembers();
	const build = await demoBuildIn(f.studio.id, f.owner.id);
	const created = await createTubeKind(f.studio.id, THIN, {
		pricePerMetreMinor: 300,
		currency: 'EUR'
	});
	if (!created.ok) throw new Error(JSON.stringify(created.issues));
	return { ...f, build, tubeId: created.id };
}

describe('a variant with a loop', () => {
	it('saves, loads and is checked with the studio’s own tube kind', async () => {
		const { build, tubeId } = await fixture();
		const saved = await save(build, build.version, {
			...build.settings,
			loops: [loopOver(tubeId)]
		});
		expect(saved.ok).toBe(true);
		const loaded = await loadedVariant(build);
		expect(loaded.scene.loops).toHaveLength(1);
		expect(loaded.scene.tubeKinds).toEqual([expect.objectContaining({ id: tubeId, outerMm: 6 })]);
		expect(loaded.tubeKinds[0].pricePerMetreMinor).toBe(300);
		const report = checkScene(loaded.scene);
		const run = report.loops![0].runs[0];
		// 6 + 20 + 6 = 32 mm of polyline, two 90° bends of r = 4: 32 − 16 + 4π.
		expect(run.lengthMm).toBeCloseTo(16 + 4 * Math.PI, 9);
		expect(report.loops![0].checks.find((c) => c.id === 'reservoir')!.status).toBe('pass');
	});

	const bad: [string, (l: LoopDef) => void, string, string][] = [
		[
			'a port that does not exist',
			(l) => (l.runs[0].to.portId = 'nowhere'),
			'settings.loops[0].runs[0].to.portId',
			'No port with this id on that part'
		],
		[
			'a waypoint outside the enclosure',
			(l) => (l.runs[0].waypoints[1] = [109, 345, 144]),
			'settings.loops[0].runs[0].waypoints[1][1]',
			'Outside the enclosure: 345.0 mm along y, the inside is 0 to 340.0 mm'
		],
		[
			'a bend tighter than the tube allows',
			(l) =>
				(l.runs[0].waypoints = [
					[129, 320.5, 147],
					[109, 320.5, 147]
				]),
			'settings.loops[0].runs[0].waypoints[0]',
			'Bend tighter than the tube allows: the first segment is 3.0 mm long and its bends need 4.0 mm at a 4.0 mm bend radius'
		]
	];
	for (const [what, edit, path, message] of bad) {
		it(`refuses ${what} with the path and saves nothing`, async () => {
			const { build, tubeId } = await fixture();
			const loop = loopOver(tubeId);
			edit(loop);
			const refused = await refusal(
				save(build, build.version, { ...build.settings, loops: [loop] })
			);
			expect(refused.status).toBe(400);
			expect(refused.issues).toContainEqual({ path, message });
			const loaded = await loadedVariant(build);
			expect(loaded.variant.version).toBe(build.version);
			expect(loaded.scene.loops).toBeUndefined();
		});
	}

	it('refuses a tube kind of another studio', async () => {
		const { build } = await fixture();
		const other = await fixture();
		const refused = await refusal(
			save(build, build.version, { ...build.settings, loops: [loopOver(other.tubeId)] })
		);
		expect(refused.issues).toContainEqual({
			path: 'settings.loops[0].runs[0].tube',
			message: 'No tube kind with this id'
		});
		expect(await tubeKindsForStudio(build.studioId, [other.tubeId])).toEqual([]);
	});
});

describe('the loop on the quote and the sheet', () => {
	it('adds a loop group to the quote and a cut list to the sheet', async () => {
		const { build, tubeId } = await fixture();
		const settings = { ...build.settings, loops: [loopOver(tubeId)] };
		const saved = await save(build, build.version, settings);
		expect(saved.ok).toBe(true);
		const quote = await ensureQuote({
			studioId: build.studioId,
			buildId: build.buildId,
			variantId: build.variantId,
			settings,
			currency: 'EUR'
		});
		const tube = quote.lines.filter((l) => l.loopKey !== null);
		// 16 + 4π ≈ 28.57 mm cut, + 10 % ≈ 31.4 mm: one whole metre at 3.00 a metre.
		expect(tube).toEqual([
			expect.objectContaining({
				loopKey: `tube:${tubeId}`,
				description: 'Loop · Thin soft tube 4/6 mm: 0.03 m cut + 10 % allowance, in whole metres',
				quantity: 1,
				unitPriceMinor: 300
			})
		]);
		const loaded = await loadedVariant(build);
		const sheet = sheetOf(loaded.scene);
		// Bend middles: 6 − 4 straight + half of the π·4/2 arc = 2 + π; then π + (20 − 8) + π more.
		expect(sheet.loop!.cutList[0].text).toBe(
			`Run 1: ${(16 + 4 * Math.PI).toFixed(1)} mm of 4/6 mm soft tube, bends at ${(2 + Math.PI).toFixed(1)} and ${(14 + 3 * Math.PI).toFixed(1)} mm from the pump end.`
		);
		const group = sheet.checklist.find((g) => g.id === 'loop')!;
		expect(group.items.map((i) => i.text)).toContain(sheet.loop!.cutList[0].text);
		expect(group.items.map((i) => i.text)).toContain(
			'Passes: The reservoir feeds the pump inlet from at or above it.'
		);
	});
});

describe('the loop on the client page', () => {
	it('keeps its loop under the neutral ids the client sees', async () => {
		const { build, tubeId } = await fixture();
		const settings = { ...build.settings, loops: [loopOver(tubeId)] };
		expect((await save(build, build.version, settings)).ok).toBe(true);
		const loaded = await loadedVariant(build);
		const neutral = neutralScene(loaded.scene);
		const run = neutral.scene.loops![0].runs[0];
		expect(run.from.placementId).toMatch(/^part-\d{3}$/);
		expect(neutral.placementIds.get(run.from.placementId)).toBe('pump-res');
		// Still a scene the engine accepts, and the same run.
		const reparsed = sceneSchema.parse(neutral.scene);
		expect(checkScene(reparsed).loops![0].runs[0].cutLengthMm).toBeCloseTo(
			checkScene(loaded.scene).loops![0].runs[0].cutLengthMm,
			9
		);
	});
});
