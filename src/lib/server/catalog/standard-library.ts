/**
 * The read-only standard library: form factors that published standards fix, shared by every
 * studio (studio_id null). The fit engine's fixture supplies the core entries (their ids are what
 * demo builds place); the rest are added here. Each entry names its source; values a standard does
 * not fix are marked "typical" (common practice) or "from memory". No keep-outs: standards do not
 * fix them, so a studio copies an entry and adds its own. Part frame: X width, Y height, Z depth, mm.
 */
import { SLOT_PITCH_MM, type PartDef } from '$lib/geometry';
import { BOARD_THICKNESS_MM, standardParts } from '$lib/geometry/standard-library';
import { oneBody } from '$lib/catalog/part-shape';

const PCB_MM = BOARD_THICKNESS_MM;

type Entry = Omit<PartDef, 'bodies' | 'keepouts' | 'ports' | 'provenance'> & {
	sizeMm: [number, number, number];
};

/** A full-length, full-height add-in card `slots` slots thick (the CEM slot pitch apart). */
function fullLengthCard(slots: 2 | 3, word: string, idWord: string): Entry {
	return {
		id: `std-card-${idWord}-slot`,
		name: `Add-in card, full length, ${word} slots`,
		category: 'gpu',
		sizeMm: [312, 111.15, slots * SLOT_PITCH_MM],
		specs: { cardLengthMm: 312, cardSlots: slots },
		toleranceMm: 0,
		source: `PCI Express CEM spec: slot pitch 20.32 mm (${word} slots = ${(slots * SLOT_PITCH_MM).toFixed(2)} mm); full length 312 mm and full height 111.15 mm (from memory)`
	};
}

const ENTRIES: Entry[] = [
	{
		id: 'std-micro-atx',
		name: 'microATX board (largest)',
		category: 'board',
		sizeMm: [244, PCB_MM, 244],
		specs: { boardFormFactor: 'microATX' },
		toleranceMm: 0,
		source:
			'microATX Motherboard Interface Specification 1.2: at most 244 × 244 mm; 1.6 mm thickness is common practice'
	},
	{
		id: 'std-atx-board',
		name: 'ATX board',
		category: 'board',
		sizeMm: [305, PCB_MM, 244],
		specs: { boardFormFactor: 'ATX' },
		toleranceMm: 0,
		source: 'ATX Specification 2.2: 305 × 244 mm; 1.6 mm thickness is common practice'
	},
	{
		id: 'std-psu-tfx',
		name: 'TFX power supply',
		category: 'psu',
		sizeMm: [85, 64, 175],
		specs: { psuFormFactor: 'TFX' },
		toleranceMm: 0,
		source: 'TFX12V Power Supply Design Guide: 85 × 64 × 175 mm (from memory)'
	},
	fullLengthCard(2, 'two', 'dual'),
	fullLengthCard(3, 'three', 'triple'),
	...(
		[
			[240, 274, 120],
			[280, 315, 140],
			[360, 394, 120]
		] as const
	).map(([cls, length, width]): Entry => ({
		id: `std-radiator-${cls}`,
		name: `${cls} radiator, typical size`,
		category: 'radiator',
		sizeMm: [width, length, 30],
		specs: { radiatorClass: cls, radiatorThicknessMm: 30 },
		toleranceMm: 5,
		source: `Typical (common practice): a ${cls} class carries ${cls === 280 ? 'two 140' : cls === 360 ? 'three 120' : 'two 120'} mm fans; about ${width} × ${length} × 30 mm with end tanks`
	}))
];

export function standardLibrary(): PartDef[] {
	const added = ENTRIES.map(({ sizeMm, ...rest }): PartDef => ({
		...rest,
		bodies: oneBody(sizeMm),
		keepouts: [],
		ports: [],
		provenance: 'standard'
	}));
	return [...standardParts(), ...added];
}
