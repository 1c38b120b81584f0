/**
 * Power cables through the server, against the real PostgreSQL: a cable added in the editor is
 * saved with the variant (checked, on the sheet with its length), a bad one is refused with the
 * field's path and nothing is written, and a save over someone else's is a conflict (409).
 */
import { describe, expect, it } from 'vitest';
import type { VariantSettings } from '$lib/builds/settings';
import { addCable, cableFromDraft, removeCable } from '$lib/loop/cables';
import {
	demoBuildIn,
	loadedVariant,
	saveOver as save,
	sceneRefusal as refusal,
	sheetOf,
	storedVariant
} from './testing/builds';
import { CARD_CABLE_DRAFT } from './testing/cables';
import { studioWithMembers } from './testing/factories';

async function fixture() {
	const f = await studioWithMembers();
	return demoBuildIn(f.studio.id, f.owner.id);
}

/** The card's power cable as the form makes it: supply pcie socket → card power, "Card power". */
function withCardCable(settings: VariantSettings): VariantSettings {
	return addCable(settings, cableFromDraft(settings, CARD_CABLE_DRAFT)!);
}

describe('power cables on a saved variant', () => {
	it('saves a cable added in the form, checks it and puts its length on the sheet; removing it saves too', async () => {
		const build = await fixture();
		const settings = withCardCable(build.settings);
		const saved = await save(build, build.version, settings);
		expect(saved.ok).toBe(true);
		if (!saved.ok) return;
		const { scene } = await loadedVariant(build);
		expect(scene.cables).toEqual([
			expect.objectContaining({ id: 'cable-1', label: 'Card power', widthMm: 10, waypoints: [] })
		]);
		const sheet = sheetOf(scene);
		const group = sheet.checklist.find((g) => g.id === 'cables')!;
		expect(group.items.map((i) => i.text)).toEqual([
			expect.stringMatching(/^Card power: about \d+0\u2009mm, across to the card side\.$/)
		]);
		const removed = await save(build, saved.version, removeCable(settings, 'cable-1'));
		expect(removed.ok).toBe(true);
		expect(((await storedVariant(build.variantId)).settings as VariantSettings).cables).toBe(
			undefined
		);
	});

	const bad: [string, (s: VariantSettings) => VariantSettings, string, string][] = [
		[
			'a negative width',
			(s) => ({ ...s, cables: s.cables!.map((c) => ({ ...c, widthMm: -4 })) }),
			'settings.cables[0].widthMm',
			'Must be greater than 0'
		],
		[
			'a cable on a coolant port',
			(s) => ({
				...s,
				cables: s.cables!.map((c) => ({ ...c, to: { placementId: 'cpu-block', portId: 'in' } }))
			}),
			'settings.cables[0].to.portId',
			'A cable joins power ports; this one is a coolant port'
		],
		[
			'a port that does not exist',
			(s) => ({
				...s,
				cables: s.cables!.map((c) => ({ ...c, from: { placementId: 'psu', portId: 'nope' } }))
			}),
			'settings.cables[0].from.portId',
			'No port with this id on that part'
		],
		[
			'a second cable on the same socket',
			(s) => ({ ...s, cables: [...s.cables!, { ...s.cables![0], id: 'cable-2' }] }),
			'settings.cables[1].from.portId',
			'This port already takes cable 1'
		],
		[
			'a cable from a port to itself',
			(s) => ({ ...s, cables: s.cables!.map((c) => ({ ...c, to: { ...c.from } })) }),
			'settings.cables[0].to.portId',
			'A cable joins two different ports; this is the port it starts at'
		]
	];
	for (const [what, edit, path, message] of bad) {
		it(`refuses ${what} with the path and saves nothing`, async () => {
			const build = await fixture();
			const refused = await refusal(
				save(build, build.version, edit(withCardCable(build.settings)))
			);
			expect(refused.status).toBe(400);
			expect(refused.issues).toContainEqual({ path, message });
			const stored = await storedVariant(build.variantId);
			expect(stored.version).toBe(build.version);
			expect((stored.settings as VariantSettings).cables).toBeUndefined();
		});
	}

	it('detects a stale save: the second editor to save over the same version gets the stored one back', async () => {
		const build = await fixture();
		const first = await save(build, build.version, withCardCable(build.settings));
		expect(first.ok).toBe(true);
		const stale = await save(build, build.version, build.settings);
		expect(stale.ok).toBe(false);
		if (stale.ok) return;
		expect(stale.conflict.version).toBe(build.version + 1);
		expect(stale.conflict.settings.cables?.map((c) => c.id)).toEqual(['cable-1']);
	});
});
