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

function fitting(
	id: string,
	name: string,
	kind: NonNullable<PartDef['specs']['fittingKind']>,
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

/** Generic G 1/4 fittings: boxes across the hex, height from the thread face; depths from memory. */
export function defaultFittings(): PartDef[] {
	return [
		fitting(
			'fit-straight-16',
			'Straight compression fitting, 16 mm hard tube',
			'straight',
			[22, 24, 22],
			10
		),
		fitting(
			'fit-straight-soft',
			'Straight compression fitting, 10/13 soft tube',
			'straight',
			[20, 26, 20],
			12
		),
		fitting('fit-45-16', '45° fitting, 16 mm hard tube', '45', [22, 30, 22], 10),
		fitting('fit-rotary-16', 'Rotary 90° fitting, 16 mm hard tube', 'rotary', [22, 30, 22], 10),
		fitting(
			'fit-extension-10',
			'Extension, 10 mm, with 16 mm compression',
			'extension',
			[22, 34, 22],
			10
		),
		fitting(
			'fit-qd',
			'Quick-disconnect pair, 16 mm hard tube',
			'quick-disconnect',
			[22, 62, 22],
			10
		),
		fitting('plug-g14', 'Stop plug, G 1/4', 'plug', [18, 5, 18], 0)
	];
}
