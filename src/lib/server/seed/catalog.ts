/**
 * Demo catalogue: the standard library for every studio, and for the demo studio two invented
 * enclosures and about thirty invented parts with generic names. Fixed ids keep it idempotent;
 * demo rows a user has changed are left alone, standard-library rows follow the code.
 */
import {
	SLOT_PITCH_MM,
	innerVolumeLitres,
	type EnclosureDef,
	type PartDef,
	type Vec3
} from '$lib/geometry';
import { demoEnclosure, demoParts, demoTowerEnclosure } from '$lib/geometry/standard-library';
import { categoryTemplate, oneBody } from '$lib/catalog/part-shape';
import { checkEnclosure, checkPart, type PartExtras } from '$lib/catalog/schemas';
import { db } from '../db';
import { enclosures, enclosureVersions, parts } from '../db/schema';
import { partColumns } from '../catalog/parts';
import { standardLibrary } from '../catalog/standard-library';
import { DEMO_STUDIO } from './accounts';

type DemoPart = PartDef & Partial<PartExtras>;

function part(
	id: string,
	name: string,
	category: PartDef['category'],
	sizeMm: Vec3,
	rest: Partial<DemoPart> & { template?: boolean } = {}
): DemoPart {
	const { template, ...more } = rest;
	const usual = template ? categoryTemplate(category, sizeMm) : { keepouts: [], ports: [] };
	return {
		id,
		name,
		category,
		bodies: oneBody(sizeMm),
		...usual,
		specs: {},
		provenance: 'estimate',
		toleranceMm: 0.5,
		...more
	};
}

const b = (id: string, label: string, min: Vec3, max: Vec3) => ({ id, label, box: { min, max } });

/** Invented parts, described by what they are; no maker or model names. Sizes are plausible, not any product's. */
function demoCatalogue(): DemoPart[] {
	const fromEngine = demoParts().filter((p) => !p.id.startsWith('std-'));
	const priced: Record<string, Partial<PartExtras>> = {
		'demo-psu': { priceMinor: 11900, supplierNote: 'Usual supplier, two weeks' },
		'demo-cpu-block': { priceMinor: 8900 },
		'demo-card': { priceMinor: 42900, supplierNote: 'Client supplies' },
		'demo-pump-res': { priceMinor: 13900 },
		'demo-radiator-280': { priceMinor: 7900 }
	};
	return [
		...fromEngine.map((p) => ({ ...p, ...priced[p.id] })),
		{
			...part('demo-board-itx', 'Mini-ITX board, low heatsinks', 'board', [170, 1.6, 170]),
			bodies: [
				b('pcb', 'Board', [0, 0, 0], [170, 1.6, 170]),
				b('io', 'Rear connector shroud', [0, 1.6, 0], [22, 38, 150]),
				b('vrm', 'Power-stage heatsink', [22, 1.6, 0], [60, 24, 30])
			],
			specs: { boardFormFactor: 'Mini-ITX', powerDrawW: 25 },
			provenance: 'measured',
			toleranceMm: 0.3,
			priceMinor: 21900
		},
		{
			...part('demo-board-matx', 'microATX board, two card slots', 'board', [244, 1.6, 244]),
			bodies: [
				b('pcb', 'Board', [0, 0, 0], [244, 1.6, 244]),
				b('io', 'Rear connector shroud', [0, 1.6, 0], [24, 42, 170])
			],
			specs: { boardFormFactor: 'microATX', powerDrawW: 30 },
			provenance: 'datasheet',
			priceMinor: 16900
		},
		part('demo-cpu-block-low', 'Low-profile CPU block, 18 mm', 'cpu-block', [55, 18, 55], {
			template: true,
			specs: { heatW: 105, powerDrawW: 105 },
			provenance: 'measured',
			toleranceMm: 0.2,
			priceMinor: 9900
		}),
		part(
			'demo-card-block',
			'Graphics card with full-cover block, one slot, 268 mm',
			'gpu',
			[268, 115, SLOT_PITCH_MM],
			{
				template: true,
				specs: { heatW: 285, powerDrawW: 300, cardLengthMm: 268, cardSlots: 1 },
				provenance: 'measured',
				toleranceMm: 0.5,
				priceMinor: 79900,
				supplierNote: 'Block fitted by the studio'
			}
		),
		part(
			'demo-card-air',
			'Air-cooled graphics card, three slots, 300 mm',
			'gpu',
			[300, 125, 3 * SLOT_PITCH_MM],
			{
				template: true,
				specs: { heatW: 250, powerDrawW: 260, cardLengthMm: 300, cardSlots: 3 },
				provenance: 'datasheet',
				toleranceMm: 1
			}
		),
		part('demo-pump-compact', 'Compact pump with top, 62 mm square', 'pump', [62, 50, 62], {
			template: true,
			specs: { powerDrawW: 18 },
			priceMinor: 9400
		}),
		part('demo-pump-inline', 'Inline pump, 40 mm body', 'pump', [40, 40, 95], {
			template: true,
			specs: { powerDrawW: 8 }
		}),
		part('demo-res-tube', 'Tube reservoir, 60 × 150 mm', 'reservoir', [60, 150, 60], {
			template: true,
			provenance: 'measured',
			toleranceMm: 0.3,
			priceMinor: 4900
		}),
		part('demo-res-plate', 'Flat distribution plate, 12 mm', 'reservoir', [120, 300, 12], {
			template: true,
			supplierNote: 'Cut to order; four weeks'
		}),
		part('demo-pump-res-tall', 'Pump-reservoir, 150 ml, tall', 'pump-reservoir', [80, 160, 80], {
			template: true,
			specs: { powerDrawW: 18 },
			priceMinor: 15900
		}),
		part('demo-radiator-240-40', '240 radiator, 40 mm thick', 'radiator', [124, 277, 40], {
			template: true,
			specs: { radiatorClass: 240, radiatorThicknessMm: 40 },
			provenance: 'datasheet',
			priceMinor: 8900
		}),
		part('demo-radiator-120', '120 radiator, 30 mm thick', 'radiator', [124, 157, 30], {
			template: true,
			specs: { radiatorClass: 120, radiatorThicknessMm: 30 },
			priceMinor: 4900
		}),
		part('demo-fan-120-quiet', '120 mm fan, quiet blades', 'fan', [120, 120, 25], {
			template: true,
			specs: { fanSizeMm: 120, fanThicknessMm: 25, powerDrawW: 2 },
			provenance: 'datasheet',
			toleranceMm: 0.2,
			priceMinor: 2400
		}),
		part('demo-fan-140-slim', '140 mm slim fan', 'fan', [140, 140, 15], {
			template: true,
			specs: { fanSizeMm: 140, fanThicknessMm: 15, powerDrawW: 2 },
			provenance: 'datasheet',
			toleranceMm: 0.2,
			priceMinor: 2600
		}),
		part('demo-psu-sfxl', 'SFX-L supply, 850 W', 'psu', [125, 63.5, 130], {
			template: true,
			specs: { psuFormFactor: 'SFX-L', psuRatingW: 850 },
			provenance: 'datasheet',
			priceMinor: 16900
		}),
		part('demo-psu-atx', 'ATX supply, 750 W, short body', 'psu', [150, 86, 140], {
			template: true,
			specs: { psuFormFactor: 'ATX', psuRatingW: 750 },
			provenance: 'datasheet',
			priceMinor: 10900
		}),
		part('demo-fitting-90', 'Rotary 90° fitting, G 1/4', 'fitting', [21, 30, 21], {
			ports: [{ id: 'thread', position: [10.5, 0, 10.5], direction: '-y', thread: 'G 1/4' }],
			provenance: 'measured',
			toleranceMm: 0.1,
			priceMinor: 900
		}),
		part('demo-fitting-16', 'Compression fitting for 16 mm tube', 'fitting', [22, 24, 22], {
			ports: [{ id: 'thread', position: [11, 0, 11], direction: '-y', thread: 'G 1/4' }],
			provenance: 'measured',
			toleranceMm: 0.1,
			priceMinor: 700
		}),
		part('demo-fitting-qd', 'Quick-disconnect pair', 'fitting', [22, 62, 22], { priceMinor: 2900 }),
		part('demo-drive-m2', 'M.2 drive with heatsink', 'drive', [22, 8, 80], {
			specs: { powerDrawW: 7 },
			priceMinor: 11900
		}),
		part('demo-drive-25', '2.5 in drive, 7 mm', 'drive', [69.85, 7, 100], {
			specs: { powerDrawW: 3 },
			provenance: 'datasheet',
			toleranceMm: 0.25
		}),
		part('demo-fan-hub', 'Fan hub, six headers', 'other', [60, 15, 40], {
			supplierNote: 'Stick-on pads included'
		}),
		part('demo-flow-sensor', 'Flow sensor, inline', 'other', [30, 25, 60], {
			ports: [
				{ id: 'in', position: [0, 12.5, 30], direction: '-x', thread: 'G 1/4' },
				{ id: 'out', position: [30, 12.5, 30], direction: '+x', thread: 'G 1/4' }
			]
		}),
		part('demo-riser', 'Riser cable, 200 mm', 'other', [60, 5, 200], {
			keepouts: [
				{
					id: 'bend',
					label: 'Cable bend',
					kind: 'cable',
					severity: 'warning',
					box: { min: [0, 5, 0], max: [60, 25, 200] }
				}
			],
			priceMinor: 5900
		})
	];
}

/** About 12 L: the engine's demo sandwich (spine with three slot positions, support bar, 280 mount, ITX tray, SFX bay). */
function sandwich(): EnclosureDef {
	return { ...demoEnclosure(), name: 'Compact sandwich, three spine positions' };
}

/** About 18 L: the engine's demo small tower (supply chamber under a shroud, top radiator, front fans). */
function smallTower(): EnclosureDef {
	return demoTowerEnclosure();
}

export const DEMO_ENCLOSURES = [
	{
		id: 'demo-enc-sandwich',
		versionId: 'demo-enc-sandwich-v1',
		description:
			'Board and supply on the CPU side, the card behind the spine, a 280 radiator behind the mesh front.',
		def: sandwich
	},
	{
		id: 'demo-enc-tower',
		versionId: 'demo-enc-tower-v1',
		description: 'Room for a microATX board, a 240 or 280 radiator on top and two front fans.',
		def: smallTower
	}
];

function mustPart(p: DemoPart, allowStandard: boolean) {
	const checked = checkPart(p, p.id, allowStandard);
	if (!checked.ok) {
		throw new Error(
			`seed part ${p.id}: ${checked.issues.map((i) => `${i.path} ${i.message}`).join('; ')}`
		);
	}
	return checked;
}

export async function seedStandardLibrary() {
	for (const p of standardLibrary()) {
		const checked = mustPart(p, true);
		const columns = partColumns(checked.def, {
			priceMinor: null,
			currency: 'EUR',
			supplierNote: ''
		});
		await db
			.insert(parts)
			.values({ id: p.id, studioId: null, isStandard: true, ...columns })
			.onConflictDoUpdate({
				target: parts.id,
				set: { ...columns, isStandard: true, updatedAt: new Date() }
			});
	}
}

export async function seedCatalog() {
	await seedStandardLibrary();
	for (const p of demoCatalogue()) {
		const checked = mustPart(p, false);
		await db
			.insert(parts)
			.values({ id: p.id, studioId: DEMO_STUDIO.id, ...partColumns(checked.def, checked.extras) })
			.onConflictDoNothing();
	}
	for (const e of DEMO_ENCLOSURES) {
		const checked = checkEnclosure(e.def());
		if (!checked.ok) {
			throw new Error(
				`seed enclosure ${e.id}: ${checked.issues.map((i) => `${i.path} ${i.message}`).join('; ')}`
			);
		}
		const volumeLitres = innerVolumeLitres(checked.def);
		await db.transaction(async (tx) => {
			const inserted = await tx
				.insert(enclosures)
				.values({
					id: e.id,
					studioId: DEMO_STUDIO.id,
					name: checked.def.name,
					description: e.description,
					volumeLitres
				})
				.onConflictDoNothing()
				.returning({ id: enclosures.id });
			if (inserted.length) {
				await tx.insert(enclosureVersions).values({
					id: e.versionId,
					enclosureId: e.id,
					version: 1,
					definition: checked.def,
					volumeLitres,
					note: 'Demo'
				});
			}
		});
	}
}
