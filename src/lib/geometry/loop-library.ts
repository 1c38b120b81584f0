/**
 * Invented, generic tube kinds and fittings for the coolant loop (seed, tests, bench). Bend radii
 * and insertion depths are from memory, not any maker's figures; a studio sets its own.
 */

import type { PartDef, TubeKindDef } from './schema';

/** Bend radii to the centre line, from memory: hard tube about 2 × its outer diameter, soft more. */
export function defaultTubeKinds(): TubeKindDef[] {
	const source = 'From memory: a typical figure, not a measurement';
	return [
		{
			id: 'soft-10-13',
			name: 'Soft tube 10/13 mm',
			kind: 'soft',
			innerMm: 10,
			outerMm: 13,
			minBendRadiusMm: 40,
			clearanceMm: 2,
			source
		},
		{
			id: 'soft-10-16',
			name: 'Soft tube 10/16 mm',
			kind: 'soft',
			innerMm: 10,
			outerMm: 16,
			minBendRadiusMm: 45,
			clearanceMm: 2,
			source
		},
		{
			id: 'hard-12',
			name: 'Hard tube 12 mm',
			kind: 'hard',
			innerMm: 10,
			outerMm: 12,
			minBendRadiusMm: 24,
			clearanceMm: 2,
			source
		},
		{
			id: 'hard-14',
			name: 'Hard tube 14 mm',
			kind: 'hard',
			innerMm: 10,
			outerMm: 14,
			minBendRadiusMm: 28,
			clearanceMm: 2,
			source
		},
		{
			id: 'hard-16',
			name: 'Hard tube 16 mm',
			kind: 'hard',
			innerMm: 12,
			outerMm: 16,
			minBendRadiusMm: 32,
			clearanceMm: 2,
			source
		}
	];
}

type FittingKind = NonNullable<PartDef['specs']['fittingKind']>;

function fitting(
	id: string,
	name: string,
	kind: FittingKind,
	sizeMm: [number, number, number],
	insertionDepthMm: number
): PartDef {
	return {
		id,
		name,
		category: 'fitting',
		bodies: [{ id: 'body', label: 'body', box: { min: [0, 0, 0], max: sizeMm } }],
		keepouts: [],
		// The thread at the bottom face, pointing down into the port it screws into.
		ports: [
			{
				id: 'thread',
				position: [sizeMm[0] / 2, 0, sizeMm[2] / 2],
				direction: '-y',
				thread: 'G 1/4'
			}
		],
		specs: { fittingKind: kind, insertionDepthMm },
		provenance: 'estimate',
		toleranceMm: 0.1,
		source: 'From memory: a typical G 1/4 fitting of this kind, not a measurement'
	};
}

/**
 * Generic G 1/4 fittings, a row each: id, kind, across the hex (the box is square seen from the
 * port), height from the thread face, insertion depth (from memory), name.
 */
const FITTINGS: readonly (readonly [string, FittingKind, number, number, number, string])[] = [
	['fit-straight-16', 'straight', 22, 24, 10, 'Straight compression fitting, 16 mm hard tube'],
	['fit-straight-soft', 'straight', 20, 26, 12, 'Straight compression fitting, 10/13 soft tube'],
	['fit-45-16', '45', 22, 30, 10, '45° fitting, 16 mm hard tube'],
	['fit-rotary-16', 'rotary', 22, 30, 10, 'Rotary 90° fitting, 16 mm hard tube'],
	['fit-extension-10', 'extension', 22, 34, 10, 'Extension, 10 mm, with 16 mm compression'],
	['fit-qd', 'quick-disconnect', 22, 62, 10, 'Quick-disconnect pair, 16 mm hard tube'],
	['plug-g14', 'plug', 18, 5, 0, 'Stop plug, G 1/4']
];

export function defaultFittings(): PartDef[] {
	return FITTINGS.map(([id, kind, acrossMm, heightMm, depthMm, name]) =>
		fitting(id, name, kind, [acrossMm, heightMm, acrossMm], depthMm)
	);
}
