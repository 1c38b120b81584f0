/**
 * Scenes that cost a lot: `n` identical placements of one block piled in the same spot, the
 * shape that takes most work per box (every pair overlaps, in 3D and seen along every axis).
 * Plain JSON (SceneInput), so HTTP tests and the soak script can send them as they are.
 */
import { checkExcess } from '../../geometry/cost';
import { sceneSchema, type SceneInput } from '../../geometry/schema';

const panel = { thicknessMm: 2, kind: 'solid' as const, offsetMm: 0 };

export function pileSceneInput(n: number): SceneInput {
	return {
		format: 'interstice.scene',
		version: 1,
		enclosure: {
			name: 'Pile test enclosure',
			outerMm: [304, 304, 304],
			walls: { left: panel, right: panel, bottom: panel, top: panel, front: panel, back: panel },
			dividers: [
				{
					id: 'shelf',
					label: 'Shelf',
					axis: 'y',
					thicknessMm: 2,
					positions: { kind: 'range', minMm: 100, maxMm: 199, stepMm: 1 }
				}
			],
			brackets: [
				{
					id: 'bar',
					label: 'Bar',
					kind: 'other',
					box: { min: [0, 0, 280], max: [300, 8, 300] },
					axis: 'y',
					travel: { minMm: 0, maxMm: 99, stepMm: 1 }
				}
			],
			mounts: []
		},
		parts: [
			{
				id: 'block',
				name: 'Block',
				category: 'other',
				bodies: [{ id: 'body', label: 'body', box: { min: [0, 0, 0], max: [20, 20, 20] } }]
			}
		],
		dividerPositions: { shelf: 150 },
		placements: Array.from({ length: n }, (_, i) => ({
			id: `p${i}`,
			partId: 'block',
			position: [10, 10, 10]
		}))
	};
}

/** The pile's divider and bracket have 100 allowed positions each: a grid of 10,000 cells. */
export const PILE_CONTROL_POSITIONS = 100;

/** The largest pile the cost limits allow (found by bisection on the cost model itself). */
export function largestAllowedPile(): number {
	let lo = 1;
	let hi = 5_000;
	while (hi - lo > 1) {
		const mid = (lo + hi) >> 1;
		if (checkExcess(sceneSchema.parse(pileSceneInput(mid)))) hi = mid;
		else lo = mid;
	}
	return lo;
}
