import { describe, expect, it } from 'vitest';
import { checkScene, resolveScene, sceneSchema, type Box, type Scene } from '$lib/geometry';
import { routeEach } from '$lib/geometry/route';
import { demoCables, demoSceneInput } from '$lib/geometry/standard-library';
import type { VariantSettings } from '$lib/builds/settings';
import { cableWords } from '$lib/words/sheet';
import { addCable, CABLE_PRESETS, cableFromDraft, powerPortOptions, removeCable } from './cables';
import { acceptCableRoute, cableRouteRequest } from './suggest';
import { CARD_CABLE_DRAFT } from '../server/testing/cables';

const demo = (cables = demoCables()) => sceneSchema.parse({ ...demoSceneInput(), cables });
const settingsOf = (scene: Scene): VariantSettings => ({
	dividerPositions: scene.dividerPositions,
	bracketOffsets: scene.bracketOffsets,
	placements: scene.placements,
	marginMm: scene.marginMm,
	budgets: scene.budgets,
	cables: scene.cables
});

describe('power cables in the editor', () => {
	it('offers every power port of the placed parts, and only those', () => {
		const options = powerPortOptions(resolveScene(demo()));
		expect(options.map((o) => `${o.placementId}/${o.portId}`).sort()).toEqual([
			'board/atx24',
			'board/eps8',
			'card/power',
			'psu/atx24',
			'psu/eps8',
			'psu/pcie'
		]);
		expect(options.find((o) => o.placementId === 'card')!.label).toBe(
			'Compact graphics card, two slots, 185 mm · power'
		);
	});

	it('makes a cable from a preset with an id of its own, and removes it again', () => {
		const settings = settingsOf(demo());
		const cable = cableFromDraft(settings, {
			from: { placementId: 'psu', portId: 'pcie' },
			to: { placementId: 'card', portId: 'power' },
			presetId: 'card8',
			label: '  ',
			where: ' across '
		})!;
		// The preset's section; four times the 5 mm thickness for the bend (common practice).
		expect(cable).toMatchObject({
			id: 'cable-1',
			label: 'Card power',
			widthMm: 10,
			thicknessMm: 5,
			minBendRadiusMm: 20,
			where: 'across',
			waypoints: []
		});
		for (const p of CABLE_PRESETS) expect(p.minBendRadiusMm).toBe(4 * p.thicknessMm);
		const two = addCable(addCable(settings, cable), { ...cable, id: 'cable-2' });
		expect(cableFromDraft(two, { ...cable, presetId: 'eps8' })!.id).toBe('cable-3');
		const none = removeCable(removeCable({ ...settings, cables: [cable] }, 'cable-1'), 'x');
		expect('cables' in none).toBe(false);
		expect(cableFromDraft(settings, { ...cable, presetId: 'nope' as never })).toBeNull();
	});

	it('routes a cable added from the form, and the accepted route is clear (brute-force box check)', () => {
		// The demo's card cable taken out, then added back from the form's preset (its own 20 mm bend).
		const base = settingsOf(demo(demoCables().filter((c) => c.id !== 'cable-card')));
		const cable = cableFromDraft(base, CARD_CABLE_DRAFT)!;
		const settings = addCable(base, cable);
		const scene = demo(settings.cables);
		const resolved = resolveScene(scene);
		const i = scene.cables!.findIndex((c) => c.id === cable.id);
		const req = cableRouteRequest(scene, resolved, [], [i]);
		if (!req.ok) throw new Error(req.message);
		const { results } = routeEach(req.runs, { ...req.shared, maxAlternatives: 1 });
		const res = results[cable.id];
		if (!res.ok) throw new Error(res.reason);
		const accepted = acceptCableRoute(settings, cable.id, res.routes[0].waypoints);
		const report = checkScene(demo(accepted.cables)).cables!.find((c) => c.cableId === cable.id)!;
		expect(report.status).toBe('clear');
		expect(report.problems).toEqual([]);
		// Its own check of every piece against every body and wall: no shared volume.
		const solid: Box[] = [
			...resolved.walls.map((w) => w.box),
			...resolved.placements.flatMap((p) => p.bodies.map((b) => b.box))
		];
		for (const piece of report.pieces) {
			for (const b of solid) {
				const shared = [0, 1, 2].every(
					(a) => Math.min(piece.max[a], b.max[a]) - Math.max(piece.min[a], b.min[a]) > 1e-6
				);
				expect(shared).toBe(false);
			}
		}
		expect(cableWords(report.label, report.lengthMm + report.plugReachMm, report.where)).toMatch(
			/^Card power: about \d+0\u2009mm, across to the card side$/
		);
	});

	it('refuses a second cable with the same id, naming the field', () => {
		const [a] = demoCables();
		const res = sceneSchema.safeParse({
			...demoSceneInput(),
			cables: [
				a,
				{
					...a,
					from: { placementId: 'psu', portId: 'eps8' },
					to: { placementId: 'board', portId: 'eps8' }
				}
			]
		});
		expect(res.success).toBe(false);
		expect(res.error?.issues).toContainEqual(
			expect.objectContaining({ path: ['cables', 1, 'id'], message: 'Duplicate id' })
		);
	});
});
