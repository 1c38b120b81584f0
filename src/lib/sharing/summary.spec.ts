/**
 * The client page's plain words against worked examples computed by hand: a 100 mm cube inside
 * (104 mm outside, 2 mm walls) with one or two boxes in it. Margin 2 mm (common practice).
 */
import { describe, expect, it } from 'vitest';
import { checkScene, resolveScene, sceneSchema, type SceneInput } from '$lib/geometry';
import { fitSummary } from './summary';

type Position = [number, number, number];
const wall = { thicknessMm: 2 };
function scene(
	placements: { id: string; partId: string; position: Position }[],
	extra: Partial<SceneInput> = {}
) {
	return sceneSchema.parse({
		format: 'interstice.scene',
		version: 1,
		enclosure: {
			name: 'Cube',
			outerMm: [104, 104, 104],
			walls: { left: wall, right: wall, bottom: wall, top: wall, front: wall, back: wall }
		},
		parts: [
			{
				id: 'slab',
				name: 'Slab',
				category: 'other',
				bodies: [{ id: 'b', label: 'body', box: { min: [0, 0, 0], max: [50, 20, 50] } }]
			},
			{
				id: 'cube',
				name: 'Small cube',
				category: 'other',
				bodies: [{ id: 'b', label: 'body', box: { min: [0, 0, 0], max: [10, 10, 10] } }]
			}
		],
		placements,
		marginMm: 2,
		...extra
	});
}
const summaryOf = (s: ReturnType<typeof scene>) =>
	fitSummary(checkScene(s), resolveScene(s), s.marginMm);
/** Part 1, the 50 × 20 × 50 slab, and part 2, the 10 mm cube. */
const slab = (position: Position = [25, 0, 25]) => ({ id: 'a', partId: 'slab', position });
const cube = (position: Position) => ({ id: 'b', partId: 'cube', position });

describe('fit summary, worked examples', () => {
	it('one slab resting on the floor: 25 mm free on each side, 80 mm above', () => {
		// x: 25..75 of 0..100 → 25 mm left and right; y: 0..20 → resting, 80 mm above; z as x.
		const s = summaryOf(scene([slab()]));
		expect(s.verdict).toBe('fits');
		expect(s.headline).toBe(
			'Everything fits; the tightest gap is 25.0\u2009mm to the left of the part.'
		);
		expect(s.details).toEqual([]);
	});

	it('a small cube 1 mm beside the slab is tight on both of them', () => {
		// Slab max x = 75, cube min x = 76: 1.0 mm apart, under the 2 mm margin.
		const s = summaryOf(scene([slab(), cube([76, 0, 45])]));
		expect(s.verdict).toBe('tight');
		expect(s.headline).toBe(
			'Everything fits, but 2 places are closer than the 2.0\u2009mm of breathing room we aim for: 1.0\u2009mm to the right of part 1; 1.0\u2009mm to the left of part 2.'
		);
	});

	it('a cube pushed 5 mm into the slab: the smallest clearing move is 5 mm across the width', () => {
		// Cube x 70..80 against slab x 25..75: 5 mm deep in x (10 in y, 10 in z); moving it +x by 5 clears.
		const s = summaryOf(scene([slab(), cube([70, 0, 45])]));
		expect(s.verdict).toBe('problems');
		expect(s.headline).toBe(
			'Not everything fits yet: 2 parts need changes before this build can be made.'
		);
		expect(s.details).toEqual([
			'Part 1 and part 2 run into each other by 5.0\u2009mm across the width.'
		]);
	});

	it('a part reaching through the top panel is named as outside', () => {
		const s = summaryOf(scene([slab([25, 90, 25])]));
		expect(s.verdict).toBe('problems');
		expect(s.details).toContain('The part reaches outside the enclosure.');
	});

	it('an empty variant says so', () => {
		expect(summaryOf(scene([])).headline).toBe('No parts are placed yet.');
	});
});
