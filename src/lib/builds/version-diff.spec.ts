/**
 * The version difference in words, on a worked example from the demo scene: version 1 as the demo
 * is; version 2 moves the spine from "3 slots" (86 mm) to "2 slots" (106.32 mm), lifts the card
 * support bar 0 → 20 mm, moves the pump-reservoir 10 mm to the left and adds a second 140 mm fan
 * elsewhere, and removes the CPU block. With the spine at 2 slots the card collides with it (the
 * demo's known collision: the card side is then 150 − 108.32 = 41.68 mm wide at the spine face,
 * and the card, placed at x = 107.36, starts 0.96 mm inside the spine).
 */
import { describe, expect, it } from 'vitest';
import { checkScene, sceneSchema } from '$lib/geometry';
import {
	DEMO_SPINE_OFFSETS,
	demoEnclosure,
	demoParts,
	demoSceneInput
} from '$lib/geometry/standard-library';
import { composeScene, type VariantSettings } from './settings';
import { versionChanges } from './version-diff';
import { demoPart } from '$lib/server/testing/engine-factories';

function side(settings: VariantSettings) {
	return {
		settings,
		report: checkScene(sceneSchema.parse(composeScene(demoEnclosure(), demoParts(), settings)))
	};
}

describe('versionChanges', () => {
	const input = demoSceneInput();
	const v1: VariantSettings = {
		dividerPositions: { ...input.dividerPositions },
		bracketOffsets: { ...input.bracketOffsets },
		placements: input.placements!.map((p) => ({ ...p })),
		marginMm: 2,
		budgets: input.budgets!
	} as VariantSettings;

	it('says nothing when nothing changed', () => {
		expect(versionChanges(demoEnclosure(), demoParts(), side(v1), side(v1))).toEqual([]);
	});

	it('names moved controls, added, removed and moved parts, and the fit items that changed', () => {
		const v2: VariantSettings = {
			...v1,
			dividerPositions: { ...v1.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] },
			bracketOffsets: { bar: 20 },
			placements: [
				...v1.placements
					.filter((p) => p.id !== 'cpu-block')
					.map((p) =>
						p.id === 'pump-res' ? { ...p, position: [80, 227, 150] as [number, number, number] } : p
					),
				{
					id: 'fan-3',
					partId: 'std-fan-140-25',
					position: [110, 0, 210],
					rotation: { x: 0, y: 0, z: 0 }
				}
			]
		};
		const words = versionChanges(demoEnclosure(), demoParts(), side(v1), side(v2));
		expect(words).toContain('Spine moved from 3 slots (86.0\u2009mm) to 2 slots (106.32\u2009mm).');
		expect(words).toContain('Card support bar moved from 0.0\u2009mm to 20.0\u2009mm.');
		expect(words).toContain(`Added: ${demoPart('std-fan-140-25').name}.`);
		expect(words).toContain('Removed: Compact CPU block, 26 mm tall.');
		expect(words).toContain('Compact pump-reservoir, 58 mm thick moved 10.0\u2009mm left.');
		// The card is tight in the first version: 2 mm from the right panel, 1 mm in the worst case (±1 mm).
		expect(words).toContain('Compact graphics card, two slots, 185 mm: now collides (was tight).');
		expect(
			words.some((w) => /^Interference: now [\d.]+\u2009cm³ \(was 0\.0\u2009cm³\)\.$/.test(w))
		).toBe(true);
	});
});
