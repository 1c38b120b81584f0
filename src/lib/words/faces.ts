/**
 * Every word for a face, an axis and a kind of part, in one table each: pages, the build sheet,
 * the client page and the comparison take theirs from here (docs/look-and-words.md). Faces are
 * seen by someone standing in front of the enclosure (X right, Y up, Z away from them).
 */
import type { Axis, Face, PartCategory } from '$lib/geometry';

type FaceWords = {
	/** The side a gap is on: "2.0 mm left". */
	side: string;
	/** Where a gap lies from the part: "to the left". */
	toward: string;
	/** As a preposition before a part: "left of the pump". */
	beside: string;
	/** As a fuller preposition: "to the left of the pump". */
	besideFull: string;
	/** The enclosure's panel on that face. */
	panel: string;
	/** Which way a direction points. */
	points: string;
	/** Where a gap is from the part's point of view: "1.0 mm to the left panel, on its left". */
	ofIt: string;
	/** Where a part comes in from. */
	from: string;
	/** Which end of the inside a part reaches past: "at the bottom". */
	end: string;
};

export const FACE_TABLE: Record<Face, FaceWords> = {
	'-x': {
		side: 'left',
		toward: 'to the left',
		beside: 'left of',
		besideFull: 'to the left of',
		panel: 'left panel',
		points: 'left',
		ofIt: 'on its left',
		from: 'from the left',
		end: 'left'
	},
	'+x': {
		side: 'right',
		toward: 'to the right',
		beside: 'right of',
		besideFull: 'to the right of',
		panel: 'right panel',
		points: 'right',
		ofIt: 'on its right',
		from: 'from the right',
		end: 'right'
	},
	'-y': {
		side: 'below',
		toward: 'below',
		beside: 'below',
		besideFull: 'below',
		panel: 'bottom panel',
		points: 'down',
		ofIt: 'below it',
		from: 'from below',
		end: 'bottom'
	},
	'+y': {
		side: 'above',
		toward: 'above',
		beside: 'above',
		besideFull: 'above',
		panel: 'top panel',
		points: 'up',
		ofIt: 'above it',
		from: 'from above',
		end: 'top'
	},
	'-z': {
		side: 'front',
		toward: 'in front',
		beside: 'in front of',
		besideFull: 'in front of',
		panel: 'front panel',
		points: 'to the front',
		ofIt: 'in front of it',
		from: 'from the front',
		end: 'front'
	},
	'+z': {
		side: 'behind',
		toward: 'behind',
		beside: 'behind',
		besideFull: 'behind',
		panel: 'back panel',
		points: 'to the back',
		ofIt: 'behind it',
		from: 'from the back',
		end: 'back'
	}
};

/** One column of the face table as a face → word record. */
export function faceWords(kind: keyof FaceWords): Record<Face, string> {
	const out = {} as Record<Face, string>;
	for (const face of Object.keys(FACE_TABLE) as Face[]) out[face] = FACE_TABLE[face][kind];
	return out;
}

type AxisWords = {
	/** The size measured along it. */
	dimension: string;
	/** "across the width". */
	along: string;
	/** Moving towards the low end, then the high end. */
	moves: [string, string];
	/** The two ends of a travel, low end first. */
	ends: [string, string];
};

export const AXIS_TABLE: Record<Axis, AxisWords> = {
	x: {
		dimension: 'width',
		along: 'across the width',
		moves: ['left', 'right'],
		ends: ['left', 'right']
	},
	y: { dimension: 'height', along: 'in height', moves: ['down', 'up'], ends: ['bottom', 'top'] },
	z: { dimension: 'depth', along: 'in depth', moves: ['forward', 'back'], ends: ['front', 'back'] }
};

/** Kinds of part in a sentence ("the radiator"); 'other' is "other" in a list. */
export const CATEGORY_WORDS: Record<PartCategory, string> = {
	board: 'board',
	'cpu-block': 'CPU block',
	gpu: 'graphics card',
	pump: 'pump',
	reservoir: 'reservoir',
	'pump-reservoir': 'pump-reservoir',
	radiator: 'radiator',
	fan: 'fan',
	psu: 'power supply',
	fitting: 'fitting',
	drive: 'drive',
	other: 'other'
};

/** The same kinds as a label at the start of a line or a table cell ("Graphics card"). */
export const CATEGORY_LABELS = Object.fromEntries(
	Object.entries(CATEGORY_WORDS).map(([k, w]) => [k, w[0].toUpperCase() + w.slice(1)])
) as Record<PartCategory, string>;

/** In a sentence where "other" would read badly: "the part". */
export const CATEGORY_NOUNS: Record<PartCategory, string> = { ...CATEGORY_WORDS, other: 'part' };
