/** The placement pass never lets two labels touch, keeps them in view, and skips what can't fit. */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { overlaps, placeLabels, type LabelRequest, type Rect } from './placement';

const view: Rect = { x: 0, y: 0, w: 800, h: 500 };

describe('label placement', () => {
	it('two labels on one anchor: both placed, one above and one below, with no overlap', () => {
		const reqs: LabelRequest[] = [
			{ id: 'a', anchor: { x: 400, y: 250 }, w: 200, h: 40 },
			{ id: 'b', anchor: { x: 400, y: 250 }, w: 200, h: 40 }
		];
		const { placed, unplaced } = placeLabels(reqs, view);
		expect(unplaced).toEqual([]);
		// a: centred above at 10 px (y = 250 − 10 − 40); b: the first free spot, below at 10 px.
		expect(placed[0].rect).toEqual({ x: 300, y: 200, w: 200, h: 40 });
		expect(placed[1].rect).toEqual({ x: 300, y: 260, w: 200, h: 40 });
		expect(placed[0].leaderTo).toEqual({ x: 400, y: 240 });
	});

	it('a label with no free spot left is left unplaced, not piled up', () => {
		const reqs: LabelRequest[] = [
			{ id: 'big', anchor: { x: 400, y: 250 }, w: 780, h: 235 },
			{ id: 'next', anchor: { x: 400, y: 250 }, w: 700, h: 300 }
		];
		const { placed, unplaced } = placeLabels(reqs, view);
		expect(placed.map((p) => p.id)).toEqual(['big']);
		expect(unplaced).toEqual(['next']);
	});

	it('reserved areas (toolbar, legend) are kept free', () => {
		const toolbar: Rect = { x: 0, y: 0, w: 800, h: 40 };
		const { placed } = placeLabels([{ id: 'a', anchor: { x: 400, y: 45 }, w: 100, h: 30 }], view, [
			toolbar
		]);
		expect(overlaps(placed[0].rect, toolbar)).toBe(false);
	});

	it('brute force: for random anchors and sizes no two placed labels overlap and all stay in view', () => {
		const req = fc.record({
			x: fc.integer({ min: -50, max: 850 }),
			y: fc.integer({ min: -50, max: 550 }),
			w: fc.integer({ min: 20, max: 300 }),
			h: fc.integer({ min: 12, max: 80 })
		});
		fc.assert(
			fc.property(fc.array(req, { maxLength: 12 }), (rs) => {
				const reqs = rs.map((r, i) => ({
					id: String(i),
					anchor: { x: r.x, y: r.y },
					w: r.w,
					h: r.h
				}));
				const { placed, unplaced } = placeLabels(reqs, view);
				expect(placed.length + unplaced.length).toBe(reqs.length);
				for (let i = 0; i < placed.length; i++) {
					const a = placed[i].rect;
					expect(a.x >= 0 && a.y >= 0 && a.x + a.w <= 800 && a.y + a.h <= 500).toBe(true);
					for (let j = i + 1; j < placed.length; j++) {
						expect(overlaps(a, placed[j].rect)).toBe(false);
					}
				}
			}),
			{ numRuns: 300 }
		);
	});
});
