/**
 * Numbers and directions in the words of the build sheet and the fit report (docs/look-and-words.md):
 * millimetres with one decimal and a thin space, cm³ for interference, litres for enclosures. Pure, shared by the page and the PDF so both say exactly the same.
 */

import { formatMm, type Axis, type FitStatus, type Vec3 } from '$lib/geometry';
import { AXIS_TABLE, CATEGORY_WORDS, faceWords } from './faces';

export const THIN = '\u2009';

export const mm = formatMm;

/** A number as formatMm writes it, without the unit: for `170.0 × 170.0 × 5.0 mm`. */
export function num(valueMm: number): string {
	return formatMm(valueMm).replace(/\u2009mm$/, '');
}

export function sizeText(size: Vec3): string {
	return `${size.map(num).join(' × ')}${THIN}mm`;
}

/** mm³ → cm³, two decimals under 1 cm³ so a small overlap does not read as nothing. */
export function cm3(volumeMm3: number): string {
	const v = volumeMm3 / 1000;
	return `${v.toFixed(v < 1 ? 2 : 1)}${THIN}cm³`;
}

/**
 * A power cable to order, rounded up to the next 10 mm: "24-pin: about 250 mm, behind the board
 * tray". `lengthMm` is the centre line plus both plugs' reach.
 */
export function cableWords(label: string, lengthMm: number, where?: string | null): string {
	const about = Math.ceil(lengthMm / 10) * 10;
	return `${label}: about ${about}${THIN}mm${where ? `, ${where}` : ''}`;
}

export function litres(volumeL: number): string {
	return `${volumeL.toFixed(1)}${THIN}L`;
}

export const AXIS_WORDS = {
	x: AXIS_TABLE.x.dimension,
	y: AXIS_TABLE.y.dimension,
	z: AXIS_TABLE.z.dimension
} satisfies Record<Axis, string>;

/** Where a gap on a face of a part lies. */
export const FACE_SIDE = faceWords('toward');

/** The inner-box face a part crosses, as the panel a builder sees there. */
export const FACE_PANEL = faceWords('panel');

/** Moving along an axis, in the builder's words. */
export function moveWord(axis: Axis, sign: 1 | -1): string {
	return AXIS_TABLE[axis].moves[sign > 0 ? 1 : 0];
}

/** Which way a direction points, seen by someone in front of the enclosure. */
export const POINTS_WORDS = faceWords('points');

/** The two ends of a travel along an axis, low end first. */
export const AXIS_ENDS = {
	x: AXIS_TABLE.x.ends,
	y: AXIS_TABLE.y.ends,
	z: AXIS_TABLE.z.ends
} satisfies Record<Axis, [string, string]>;

export { CATEGORY_WORDS };

export const STATUS_WORDS: Record<FitStatus, string> = {
	collides: 'collides',
	blocked: 'blocked',
	outside: 'outside',
	tight: 'tight',
	clear: 'clear'
};

export function plural(n: number, one: string, many = `${one}s`): string {
	return `${n} ${n === 1 ? one : many}`;
}
