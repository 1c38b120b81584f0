/**
 * Shared data: a read-only library of standard form factors (published standards, not products)
 * and an invented demo — a compact sandwich enclosure with eight generic parts. The demo seed and
 * tests reuse them; each call returns fresh objects, so callers may change what they get.
 *
 * Part frames: X width, Y height, Z depth, as the world. Boards and fans lie flat (thickness along
 * Y for boards, Z for fans); power supplies stand as their design guides draw them.
 */

import {
	SLOT_PITCH_MM,
	sceneSchema,
	type Box,
	type CableDef,
	type EnclosureDef,
	type KeepoutDef,
	type MountDef,
	type PartDef,
	type PortDef,
	type Scene,
	type SceneInput,
	type Vec3,
	type WallSpec
} from './schema';
import { PANELS, type Face, type PanelName } from './box';

export function box(min: Vec3, max: Vec3): Box {
	return { min: [...min], max: [...max] };
}

function solidPart(
	id: string,
	name: string,
	category: PartDef['category'],
	sizeMm: Vec3,
	rest: Partial<PartDef> = {}
): PartDef {
	return {
		id,
		name,
		category,
		bodies: [{ id: 'body', label: 'body', box: box([0, 0, 0], sizeMm) }],
		keepouts: [],
		ports: [],
		specs: {},
		provenance: 'standard',
		toleranceMm: 0,
		...rest
	};
}

/** A mount row: most mounts sit flush (no standoff) on the standard slot pitch. */
function mount(
	id: string,
	label: string,
	kind: MountDef['kind'],
	face: MountDef['face'],
	accepts: string[],
	{
		region,
		...rest
	}: Pick<MountDef, 'region'> &
		Partial<Pick<MountDef, 'budgetMm' | 'plateMm' | 'plateFor' | 'standoffMm' | 'slotCount'>>
): MountDef {
	return {
		standoffMm: 0,
		slotPitchMm: SLOT_PITCH_MM,
		id,
		label,
		kind,
		face,
		region,
		accepts,
		...rest
	};
}

/** Six 2 mm solid panels, with whatever a design changes on some of them. */
export function panelWalls(
	changes: Partial<Record<PanelName, Partial<WallSpec>>> = {}
): Record<PanelName, WallSpec> {
	const walls = PANELS.map((name) => [
		name,
		{ thicknessMm: 2, kind: 'solid' as const, offsetMm: 0, ...changes[name] }
	]);
	return Object.fromEntries(walls) as Record<PanelName, WallSpec>;
}

/** A placement row: quarter turns about x, y and z, and the mount it sits on if any. */
function placed(
	id: string,
	partId: string,
	position: Vec3,
	[x, y, z]: Vec3,
	mountId?: string
): NonNullable<SceneInput['placements']>[number] {
	const row = { id, partId, position, rotation: { x, y, z } };
	return mountId === undefined ? row : { ...row, mountId };
}

/** The room fittings need over a part's coolant ports (a hard error when something is in it). */
function fittingsKeepout(min: Vec3, max: Vec3): KeepoutDef {
	return {
		id: 'fittings',
		label: 'fittings',
		kind: 'fitting',
		severity: 'error',
		box: box(min, max)
	};
}

/** A G 1/4 coolant port facing up (+y), the common thread for fittings (common practice). */
function portUp(id: string, position: Vec3): PortDef {
	return { id, position, direction: '+y', thread: 'G 1/4' };
}

/** Board thickness of 1.6 mm (0.062 in) is common practice, not part of the form factor. */
export const BOARD_THICKNESS_MM = 1.6;

/** The read-only library of standard form factors, each with the document its size comes from. */
export function standardParts(): PartDef[] {
	const fan = (size: 120 | 140, thickness: 25 | 15): PartDef =>
		solidPart(
			`std-fan-${size}-${thickness}`,
			`${size} mm fan, ${thickness} mm`,
			'fan',
			[size, size, thickness],
			{
				specs: { fanSizeMm: size, fanThicknessMm: thickness },
				source: `Common practice: ${size} mm square frame, ${thickness === 25 ? '25 mm standard' : 'about 15 mm slim'} thickness`
			}
		);
	return [
		solidPart('std-mini-itx', 'Mini-ITX board', 'board', [170, BOARD_THICKNESS_MM, 170], {
			specs: { boardFormFactor: 'Mini-ITX' },
			source:
				'Mini-ITX form factor addendum to the microATX specification (2001): 170 × 170 mm; 1.6 mm thickness is common practice'
		}),
		solidPart('std-sfx', 'SFX power supply', 'psu', [125, 63.5, 100], {
			specs: { psuFormFactor: 'SFX' },
			source: 'SFX12V Power Supply Design Guide: 125 W × 63.5 H × 100 D mm'
		}),
		solidPart('std-sfx-l', 'SFX-L power supply', 'psu', [125, 63.5, 130], {
			specs: { psuFormFactor: 'SFX-L' },
			source:
				'Common practice: a longer SFX body, 125 × 63.5 × 130 mm (not in the SFX12V design guide)'
		}),
		solidPart('std-atx-psu', 'ATX power supply', 'psu', [150, 86, 140], {
			specs: { psuFormFactor: 'ATX' },
			source:
				"ATX12V Power Supply Design Guide: 150 W × 86 H × 140 D mm (the guide's nominal depth)"
		}),
		fan(120, 25),
		fan(120, 15),
		fan(140, 25),
		fan(140, 15)
	];
}

export function standardPart(id: string): PartDef {
	const part = standardParts().find((p) => p.id === id);
	if (!part) throw new Error(`No standard part ${id}`);
	return part;
}

/**
 * Divider offsets of the demo's spine, named by the slots they leave on the card side: the card
 * side is n × 20.32 mm (PCI Express CEM spec slot pitch) plus 1.04 mm of slack, inside 150 mm of
 * width with a 2 mm spine.
 */
export const DEMO_SPINE_OFFSETS = { '4 slots': 65.68, '3 slots': 86, '2 slots': 106.32 } as const;

/**
 * An invented compact sandwich enclosure, 154 × 344 × 244 mm outside, 2 mm panels (the front one
 * mesh), 150 × 340 × 240 mm (about 12.2 L) inside: a 64 mm radiator bay behind the front panel, a
 * fixed bulkhead, then a spine that moves between three slot positions, the board and power supply
 * on its left (CPU side), the card on its right standing on a sliding support bar.
 */
export function demoEnclosure(): EnclosureDef {
	return {
		name: 'Demo sandwich enclosure',
		outerMm: [154, 344, 244],
		walls: panelWalls({ front: { kind: 'mesh' } }),
		dividers: [
			{
				id: 'bulkhead',
				label: 'Bulkhead',
				axis: 'z',
				thicknessMm: 2,
				positions: { kind: 'list', options: [{ label: 'fixed', offsetMm: 64 }] },
				sides: { low: 'radiator bay', high: '' },
				// Over the radiator's end tank: its two ports' runs pass here (x 20–130, y 300–336 mm).
				openings: [{ id: 'tubes', label: 'tube cut-out', at: [20, 300], size: [110, 36] }]
			},
			{
				id: 'spine',
				label: 'Spine',
				axis: 'x',
				thicknessMm: 2,
				positions: {
					kind: 'list',
					options: Object.entries(DEMO_SPINE_OFFSETS).map(([label, offsetMm]) => ({
						label,
						offsetMm
					}))
				},
				span: { z: { minMm: 66, maxMm: 240 } },
				sides: { low: 'CPU side', high: 'card side' },
				// Above the card, in front of the pump-reservoir (y 200–335, z 75–140 mm), and a low one
				// in front of the card (y 100–190, z 70–95 mm); neither reaches the card's own room.
				openings: [
					{ id: 'tubes', label: 'tube cut-out', at: [200, 9], size: [135, 65] },
					{ id: 'low', label: 'low cut-out', at: [100, 4], size: [90, 25] }
				]
			}
		],
		brackets: [
			{
				id: 'bar',
				label: 'Card support bar',
				kind: 'card-support',
				box: box([108.32, 0, 150], [150, 10, 200]),
				axis: 'y',
				travel: { minMm: 0, maxMm: 150, stepMm: 10 }
			}
		],
		mounts: [
			mount('radiator', 'Front radiator mount', 'radiator', 'front', ['240', '280'], {
				region: box([0, 0, 0], [150, 340, 64]),
				budgetMm: 64,
				plateMm: 1,
				plateFor: ['240']
			}),
			// A raised tray: the board sits 11 mm off the left panel, which leaves about 53 mm over it
			// with the spine at '4 slots' (65.68 − 11 − 1.6 = 53.08 mm; common practice).
			mount('tray', 'Board tray', 'board-tray', 'left', ['Mini-ITX'], {
				region: box([0, 150, 68], [40, 320, 238]),
				standoffMm: 11
			}),
			mount('psu', 'SFX bay', 'psu-bay', 'left', ['SFX'], {
				region: box([0, 0, 70], [63.5, 125, 170])
			})
		]
	};
}

/** About 18 L: a small tower with a supply chamber under a shroud, top radiator, front fans. */
export function demoTowerEnclosure(): EnclosureDef {
	return {
		name: 'Small tower with supply chamber',
		outerMm: [210, 380, 240],
		walls: panelWalls({
			right: { thicknessMm: 3 },
			top: { kind: 'mesh' },
			front: { kind: 'mesh' }
		}),
		dividers: [
			{
				id: 'shroud',
				label: 'Supply shroud',
				axis: 'y',
				thicknessMm: 2,
				positions: { kind: 'range', minMm: 90, maxMm: 120, stepMm: 10 },
				sides: { low: 'supply chamber', high: 'main chamber' }
			}
		],
		brackets: [
			{
				id: 'pump-bracket',
				label: 'Pump bracket',
				kind: 'pump',
				box: { min: [20, 122, 170], max: [100, 125, 230] },
				axis: 'z',
				travel: { minMm: -60, maxMm: 0, stepMm: 10 }
			}
		],
		mounts: [
			mount('top-radiator', 'Top radiator mount', 'radiator', 'top', ['240', '280'], {
				region: box([0, 325, 0], [205, 376, 236]),
				budgetMm: 50
			}),
			mount('front-fans', 'Front fans', 'fan', 'front', ['120', '140'], {
				region: box([0, 125, 0], [205, 376, 30]),
				budgetMm: 30
			}),
			mount('tray', 'Board tray', 'board-tray', 'right', ['Mini-ITX', 'microATX'], {
				region: box([165, 125, 0], [205, 376, 236]),
				standoffMm: 6
			}),
			mount('slots', 'Expansion slots', 'slots', 'back', [], {
				region: box([80, 125, 226], [165, 290, 236]),
				slotCount: 4
			}),
			mount('psu', 'Supply bay', 'psu-bay', 'bottom', ['SFX', 'SFX-L', 'ATX'], {
				region: box([0, 0, 0], [155, 88, 170])
			})
		]
	};
}

/** Invented generic parts for the demo; sizes are plausible, not any product's. */
export function demoParts(): PartDef[] {
	// Power ports (invented positions): a plug's reach is the plug plus the straight cable it needs
	// before its first bend, about 25 mm for a 24-pin or 8-pin (common practice, from memory).
	const power = (id: string, position: Vec3, direction: Face, plugReachMm: number) => ({
		id,
		position,
		direction,
		thread: 'none',
		kind: 'power' as const,
		plugReachMm
	});
	return [
		{
			...standardPart('std-mini-itx'),
			// The demo board's parts face its -y side (the tray holds it that way round).
			ports: [power('atx24', [120, 0, 140], '-y', 25), power('eps8', [160, 0, 30], '-y', 25)]
		},
		standardPart('std-fan-140-25'),
		solidPart('demo-psu', 'SFX supply, 600 W', 'psu', [125, 63.5, 100], {
			specs: { psuFormFactor: 'SFX', psuRatingW: 600 },
			provenance: 'estimate',
			// Modular sockets on its back face.
			ports: [
				power('atx24', [100, 30, 100], '+z', 20),
				power('eps8', [70, 30, 100], '+z', 20),
				power('pcie', [40, 30, 100], '+z', 20)
			]
		}),
		{
			...solidPart('demo-cpu-block', 'Compact CPU block, 26 mm tall', 'cpu-block', [60, 26, 60]),
			// 25 mm over the block for G 1/4 elbow fittings (common practice).
			keepouts: [fittingsKeepout([5, 26, 10], [55, 51, 50])],
			// Placed turned (z 3), the inlet is the lower port and the outlet the upper one.
			ports: [portUp('in', [40, 26, 30]), portUp('out', [20, 26, 30])],
			/** Heat and draw of the processor it cools. */
			specs: { heatW: 65, powerDrawW: 65 },
			provenance: 'estimate',
			toleranceMm: 0.5
		},
		{
			...solidPart('demo-card', 'Compact graphics card, two slots, 185 mm', 'gpu', [
				185,
				120,
				2 * SLOT_PITCH_MM
			]),
			keepouts: [
				{
					id: 'power',
					label: 'power cable bend',
					kind: 'cable',
					severity: 'error',
					box: box([185, 15, 0], [215, 55, 2 * SLOT_PITCH_MM])
				}
			],
			// At its end, 33 mm above its slot edge, into the "power cable bend" room: low enough that
			// the plug (20 mm), the bundle's 15 mm bend and its clearance pass under the
			// pump-reservoir, which sits 32 mm past the card's end higher up.
			ports: [power('power', [185, 33, SLOT_PITCH_MM], '+x', 20)],
			specs: { heatW: 160, powerDrawW: 170, cardLengthMm: 185, cardSlots: 2 },
			provenance: 'estimate',
			toleranceMm: 1
		},
		{
			...solidPart(
				'demo-pump-res',
				'Compact pump-reservoir, 58 mm thick',
				'pump-reservoir',
				[58, 100, 80]
			),
			keepouts: [
				fittingsKeepout([9, 83.5, -10], [49, 100, 0]),
				{
					id: 'fill',
					label: 'fill plug',
					kind: 'fitting',
					severity: 'error',
					box: box([19, 100, 30], [39, 110, 50])
				}
			],
			// Inlet and outlet on the front face near the top, the fill port on the top.
			ports: [
				{ id: 'in', position: [19, 93.5, 0], direction: '-z', thread: 'G 1/4' },
				{ id: 'out', position: [39, 93.5, 0], direction: '-z', thread: 'G 1/4' },
				portUp('fill', [29, 100, 40])
			],
			specs: { powerDrawW: 18 },
			provenance: 'estimate',
			toleranceMm: 0.5
		},
		{
			...solidPart('demo-radiator-280', 'Slim 280 radiator, 30 mm', 'radiator', [143, 315, 30]),
			keepouts: [fittingsKeepout([25, 301, 30], [118, 315, 40])],
			// The end tank's two ports face the back, above the fans (the upper fan ends 2 mm lower).
			ports: [
				{ id: 'in', position: [71.5, 308, 30], direction: '+z', thread: 'G 1/4' },
				{ id: 'out', position: [105.5, 308, 30], direction: '+z', thread: 'G 1/4' }
			],
			specs: { radiatorClass: 280, radiatorThicknessMm: 30 },
			provenance: 'estimate',
			toleranceMm: 0.5
		}
	];
}

/** Everything fits at the default positions; with the spine at '2 slots' the card collides. */
export function demoSceneInput(): SceneInput {
	return {
		format: 'interstice.scene',
		version: 1,
		enclosure: demoEnclosure(),
		parts: demoParts(),
		dividerPositions: { bulkhead: 64, spine: DEMO_SPINE_OFFSETS['3 slots'] },
		bracketOffsets: { bar: 0 },
		placements: [
			placed('board', 'std-mini-itx', [11, 150, 68], [0, 0, 1], 'tray'),
			placed('cpu-block', 'demo-cpu-block', [11 + BOARD_THICKNESS_MM, 205, 123], [0, 0, 3], 'tray'),
			placed('psu', 'demo-psu', [0, 0, 70], [0, 0, 1], 'psu'),
			placed('card', 'demo-card', [107.36, 10, 100], [1, 0, 1]),
			placed('pump-res', 'demo-pump-res', [90, 227, 150], [0, 0, 0]),
			placed('radiator', 'demo-radiator-280', [3.5, 12.5, 0], [0, 0, 0], 'radiator'),
			placed('fan-1', 'std-fan-140-25', [5, 30, 30], [0, 0, 0], 'radiator'),
			placed('fan-2', 'std-fan-140-25', [5, 170, 30], [0, 0, 0], 'radiator')
		],
		marginMm: 2,
		budgets: { wattsPer120mm: 100, psuHeadroomPct: 30 }
	};
}

/**
 * The demo's power cable bundles, drawn straight from plug to plug (no waypoints yet: route them
 * with "suggest a route"). Flat bundles of insulated 18 AWG wires, about 2.2 mm a wire, in two
 * rows: 24-pin 12 wires wide, 26 × 5 mm; 8-pin 4 wide, 10 × 5 mm; bend radius about three times
 * the thickness, 15 mm (common practice, from memory).
 */
export function demoCables(): CableDef[] {
	const cable = (
		id: string,
		label: string,
		from: string,
		to: [string, string],
		widthMm: number,
		where: string
	): CableDef => ({
		id,
		label,
		from: { placementId: 'psu', portId: from },
		to: { placementId: to[0], portId: to[1] },
		widthMm,
		thicknessMm: 5,
		minBendRadiusMm: 15,
		clearanceMm: 2,
		where,
		waypoints: []
	});
	return [
		cable('cable-24', '24-pin', 'atx24', ['board', 'atx24'], 26, 'behind the supply, up the board'),
		cable('cable-eps', '8-pin processor', 'eps8', ['board', 'eps8'], 10, 'along the board top'),
		cable('cable-card', 'Card power', 'pcie', ['card', 'power'], 10, 'across to the card side')
	];
}

export function demoScene(): Scene {
	return sceneSchema.parse(demoSceneInput());
}
