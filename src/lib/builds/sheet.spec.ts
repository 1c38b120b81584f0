/**
 * The sheet's content on the demo sandwich (geometry/standard-library.ts), with the numbers worked out by hand:
 * slot pitch 20.32 mm (PCI Express CEM spec), board thickness 1.6 mm (common practice), the
 * cautions of docs/safety.md.
 */
import { describe, expect, it } from 'vitest';
import { checkScene, resolveScene, sceneSchema, type Scene } from '$lib/geometry';
import { DEMO_SPINE_OFFSETS, demoSceneInput } from '$lib/geometry/standard-library';
import { CAUTIONS } from './cautions';
import { buildSheet, checklistKeys, orientationText } from './sheet';

const THIN = '\u2009';

function sheetOf(change: (s: ReturnType<typeof demoSceneInput>) => void = () => {}) {
	const input = demoSceneInput();
	change(input);
	const scene: Scene = sceneSchema.parse(input);
	const resolved = resolveScene(scene);
	return buildSheet({
		buildName: 'Desk build',
		clientName: 'A client',
		variantName: 'Variant A',
		variantVersion: 3,
		scene,
		resolved,
		report: checkScene(scene)
	});
}

describe('enclosure settings in words and numbers', () => {
	it('names the divider position and where its face sits', () => {
		const spine = sheetOf().enclosure.settings.find((s) => s.id === 'spine')!;
		expect(spine).toMatchObject({ positionLabel: '3 slots', index: 1, count: 3, coordinateMm: 86 });
		expect(spine.text).toBe(`Spine at position 3 slots, x = 86.0${THIN}mm; 2.0${THIN}mm thick.`);
	});

	it('counts bracket steps from the low end of its travel', () => {
		// The bar travels 0–150 mm in 10 mm steps along Y; at 20 mm it is two steps up.
		const bar = sheetOf((s) => (s.bracketOffsets = { bar: 20 })).enclosure.settings.find(
			(s) => s.id === 'bar'
		)!;
		expect(bar.text).toBe(
			`Card support bar 2 steps from the bottom, y = 20.0${THIN}mm (steps of 10.0${THIN}mm).`
		);
		const low = sheetOf().enclosure.settings.find((s) => s.id === 'bar')!;
		expect(low.text).toContain('at the bottom of its travel');
		const high = sheetOf((s) => (s.bracketOffsets = { bar: 150 })).enclosure.settings.find(
			(s) => s.id === 'bar'
		)!;
		expect(high.text).toContain('at the top of its travel, 15 steps from the bottom');
	});

	it('gives the compartments the spine leaves: 86 mm on the CPU side, 150 − 88 = 62 mm on the card side', () => {
		const sizes = Object.fromEntries(
			sheetOf().enclosure.compartments.map((c) => [c.label, c.sizeText])
		);
		expect(sizes['CPU side']).toBe(`86.0 × 340.0 × 174.0${THIN}mm`);
		expect(sizes['card side']).toBe(`62.0 × 340.0 × 174.0${THIN}mm`);
	});
});

describe('the part list', () => {
	const parts = sheetOf().parts;
	const byId = Object.fromEntries(parts.map((p) => [p.placementId, p]));

	it('gives the size as placed and the min corner', () => {
		// Two slots deep (2 × 20.32 mm), turned to stand on the bar.
		expect(byId.card.sizeText).toBe(`40.64 × 185.0 × 120.0${THIN}mm`);
		expect(byId.card.positionText).toBe(`x 107.36${THIN}mm, y 10.0${THIN}mm, z 100.0${THIN}mm`);
	});

	it('names the nearest free gap with what it is against', () => {
		// The block's top (turned to face +x) at 11 + 1.6 + 26 = 38.6 mm; the spine at 86 mm; the
		// block is ±0.5 mm, the spine exact: 47.4 − 0.5 = 46.9 mm in the worst case.
		expect(byId['cpu-block'].smallestGap).toBe(
			`47.4${THIN}mm (46.9 worst case) to the right (Spine)`
		);
		// The card's far face at 107.36 + 2 × 20.32 = 148 mm; the right panel at 150 mm; ±1 mm.
		expect(byId.card.smallestGap).toBe(`2.0${THIN}mm (1.0 worst case) to the right (Right panel)`);
	});

	it.each([
		[{ x: 0, y: 0, z: 0 }, 'as drawn'],
		[{ x: 0, y: 0, z: 1 }, 'turned 90° about Z; its top points left, its front to the front'],
		// A right-handed quarter turn about X takes +Y to +Z and −Z to +Y.
		[{ x: 1, y: 0, z: 0 }, 'turned 90° about X; its top points to the back, its front up'],
		[{ x: 0, y: 2, z: 0 }, 'turned 180° about Y; its top points up, its front to the back']
	])('says the orientation %o as "%s"', (rotation, words) => {
		expect(orientationText(rotation)).toBe(words);
	});
});

describe('the fit report', () => {
	it('says everything fits at three slots, with the heat budget marked as an estimate', () => {
		const fit = sheetOf().fit;
		// The card (±1 mm) and the pump-reservoir (±0.5 mm) are 2 mm from the right panel: under
		// the 2 mm margin in the worst case of their tolerances.
		expect(fit.summary).toBe('Everything fits; 2 parts are tight.');
		expect(fit.items.map((i) => [i.key, i.status])).toEqual([
			['gap:card:+x', 'tight'],
			['gap:pump-res:-x', 'tight'],
			['gap:pump-res:+x', 'tight']
		]);
		const heat = fit.budgets.find((b) => b.key === 'heat')!;
		// 65 W + 160 W against 280 mm of radiator at 100 W per 120 mm = 233 W.
		expect(heat.text).toContain(`225${THIN}W of heat against about 233${THIN}W`);
		expect(heat.estimateNote).toMatch(/^Estimate:/);
	});

	it('lists the collision at two slots with its overlap and a move that clears it', () => {
		// The spine at 106.32–108.32 mm reaches 108.32 − 107.36 = 0.96 mm into the card.
		const fit = sheetOf(
			(s) => (s.dividerPositions = { ...s.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] })
		).fit;
		expect(fit.summary).toMatch(/^Not ready to build: /);
		const hit = fit.items.find((i) => i.status === 'collides')!;
		expect(hit.title).toContain('collides with');
		expect(hit.detail).toContain(`0.96${THIN}mm`);
		expect(hit.detail).toMatch(/to clear it, move .+/);
		expect(fit.items[0].status).toBe('collides');
	});

	it('reports a tight gap with how far under the margin it is', () => {
		// Margin 3 mm: the card's 2 mm to the right panel is 1 mm short, 2 mm in the worst case of
		// its ±1 mm tolerance (the panel has none).
		const item = sheetOf((s) => (s.marginMm = 3)).fit.items.find((i) => i.key === 'gap:card:+x')!;
		expect(item.status).toBe('tight');
		expect(item.title).toBe(
			`Compact graphics card, two slots, 185 mm: 2.0${THIN}mm (1.0 worst case) to the right (Right panel)`
		);
		expect(item.detail).toBe(
			`Under the 3.0${THIN}mm margin by 2.0${THIN}mm in the worst case of the tolerances.`
		);
	});
});

describe('the checklist', () => {
	const sheet = sheetOf();

	it('holds the settings, every part in order, the fittings per thread and every caution', () => {
		const groups = Object.fromEntries(sheet.checklist.map((g) => [g.id, g.items]));
		expect(groups.settings.map((i) => i.key)).toEqual([
			'setting:divider:bulkhead',
			'setting:divider:spine',
			'setting:bracket:bar'
		]);
		expect(groups.order.map((i) => i.key)).toEqual(
			['board', 'cpu-block', 'psu', 'card', 'radiator', 'fan-1', 'fan-2', 'pump-res'].map(
				(id) => `part:${id}`
			)
		);
		expect(groups.fittings.map((i) => i.text)).toEqual([
			'7 × G 1/4 fittings or stop plugs: 2 on Compact CPU block, 26 mm tall; 3 on Compact pump-reservoir, 58 mm thick; 2 on Slim 280 radiator, 30 mm.'
		]);
		expect(groups.cautions.map((i) => i.key)).toEqual(CAUTIONS.map((c) => `caution:${c.id}`));
		expect(checklistKeys(sheet).size).toBe(3 + 8 + 1 + CAUTIONS.length);
	});

	it('carries the cautions the trade asks for (docs/safety.md)', () => {
		const text = sheet.checklist
			.find((g) => g.id === 'cautions')!
			.items.map((i) => i.text)
			.join(' ');
		expect(text).toMatch(/only the pump powered/);
		expect(text).toMatch(/Unplug from the mains/);
		expect(text).toMatch(/glycol/);
		expect(text).toMatch(/heat guns burn/i);
		expect(sheet.planningNote).toMatch(
			/manufacturers’ instructions, local codes or licensed practice/
		);
	});

	it('says why a step comes where it does', () => {
		const block = sheet.checklist
			.find((g) => g.id === 'order')!
			.items.find((i) => i.key === 'part:cpu-block')!;
		expect(block.text).toBe(
			'2. Compact CPU block, 26 mm tall — onto Board tray, moving it towards the left panel.'
		);
		expect(block.detail).toBe(
			'After Mini-ITX board: this part would be in its way in (from the right).'
		);
	});
});

describe('an empty variant', () => {
	it('still has the enclosure settings and the cautions, and no empty groups', () => {
		const sheet = sheetOf((s) => (s.placements = []));
		expect(sheet.parts).toEqual([]);
		expect(sheet.checklist.map((g) => g.id)).toEqual(['settings', 'cautions']);
		expect(sheet.fit.summary).toBe('Everything fits with the margin to spare.');
		expect(sheet.fit.budgets.map((b) => b.status)).toEqual(['unknown', 'unknown']);
	});
});
