import { describe, expect, it } from 'vitest';
import { checkScene, sceneSchema } from '$lib/geometry';
import { facingBlocksScene } from '$lib/server/testing/engine-factories';
import { compareVariants } from '$lib/builds/compare';

/** {@link facingBlocksScene}: with b at x = 200 the run's cut is 72 mm, at x = 250 it is 122 mm. */
function scene(bx: number) {
	return checkScene(sceneSchema.parse(facingBlocksScene(bx)));
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
