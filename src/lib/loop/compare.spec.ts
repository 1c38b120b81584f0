import { describe, expect, it } from 'vitest';
import { checkScene, sceneSchema, type PartDef, type SceneInput } from '$lib/geometry';
import { defaultFittings, defaultTubeKinds } from '$lib/geometry/loop-library';
import { compareVariants } from '$lib/builds/compare';

/**
 * Two blocks with ports facing each other along x, joined by one straight 16 mm hard run with
 * straight fittings (reach 24 mm, insertion 10 mm): with b at x = 200 the centre line is
 * 200 − 100 − 2·24 = 52 mm and the cut 72 mm; at x = 250 it is 102 and 122 mm.
 */
function scene(bx: number) {
	const block = (id: string, x: number, dir: '+x' | '-x'): PartDef => ({
		id,
		name: id,
		category: 'other',
		bodies: [{ id: 'body', label: 'body', box: { min: [0, 0, 0], max: [100, 100, 100] } }],
		keepouts: [],
		ports: [{ id: 'p', position: [x, 50, 50], direction: dir, thread: 'G 1/4' }],
		specs: {},
		provenance: 'estimate',
		toleranceMm: 0
	});
	const input: SceneInput = {
		format: 'interstice.scene',
		version: 1,
		enclosure: {
			name: 'Box',
			outerMm: [404, 204, 204],
			walls: Object.fromEntries(
				['left', 'right', 'bottom', 'top', 'front', 'back'].map((f) => [
					f,
					{ thicknessMm: 2, kind: 'solid', offsetMm: 0 }
				])
			) as SceneInput['enclosure']['walls']
		},
		parts: [block('a', 100, '+x'), block('b', 0, '-x'), ...defaultFittings()],
		placements: [
			{ id: 'a1', partId: 'a', position: [0, 0, 0] },
			{ id: 'b1', partId: 'b', position: [bx, 0, 0] }
		],
		tubeKinds: defaultTubeKinds(),
		loops: [
			{
				id: 'l',
				runs: [
					{
						id: 'r',
						from: { placementId: 'a1', portId: 'p' },
						to: { placementId: 'b1', portId: 'p' },
						tube: 'hard-16',
						fittings: { from: 'fit-straight-16', to: 'fit-straight-16' },
						waypoints: []
					}
				]
			}
		]
	};
	return checkScene(sceneSchema.parse(input));
}

describe('the difference table with loops', () => {
	it('gains tube per kind, fittings, bends, run problems and loop checks', () => {
		const rows = compareVariants([
			{ id: 'a', name: 'A', report: scene(200), marginMm: 2 },
			{ id: 'b', name: 'B', report: scene(250), marginMm: 2 }
		]).filter((r) => r.group === 'loop');
		const byKey = Object.fromEntries(rows.map((r) => [r.key, r.cells.map((c) => c.value)]));
		expect(byKey['loop:tube:hard-16']).toEqual([expect.closeTo(72, 9), expect.closeTo(122, 9)]);
		expect(byKey['loop:fittings']).toEqual([2, 2]);
		expect(byKey['loop:bends']).toEqual([0, 0]);
		expect(byKey['loop:problems']).toEqual([0, 0]);
		// One run from a1 to b1 does not close the loop and nothing is a pump or reservoir: 2 fails.
		expect(byKey['loop:checks-failed']).toEqual([2, 2]);
		expect(rows.find((r) => r.key === 'loop:tube:hard-16')!.differs).toBe(true);
	});

	it('adds nothing when no variant has a loop', () => {
		const plain = { ...scene(200), loops: undefined };
		expect(
			compareVariants([{ id: 'a', name: 'A', report: plain, marginMm: 2 }]).some(
				(r) => r.group === 'loop'
			)
		).toBe(false);
	});
});
