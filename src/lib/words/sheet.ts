/**
 * Numbers and directions in the words of the build sheet and the fit report (docs/look-and-words.md): millimetres with one decimal and a thin space, cm³ for interference, litres for
 * enclosures. Pure, shared by the page and the PDF so both say exactly the same.
 */

import {
	formatMm,
	type Axis,
	type Face,
	type FitStatus,
	type PartCategory,
	type Vec3
} from '$lib/geometry';

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

export function litres(volumeL: number): string {
	return `${volumeL.toFixed(1)}${THIN}L`;
}

export const AXIS_WORDS: Record<Axis, string> = { x: 'width', y: 'height', z: 'depth' };

/** Where a gap on a face of a part lies. */
export const FACE_SIDE: Record<Face, string> = {
	'-x': 'to the left',
	'+x': 'to the right',
	'-y': 'below',
	'+y': 'above',
	'-z': 'in front',
	'+z': 'behind'
};

/** The inner-box face a part crosses, as the panel a builder sees there. */
export const FACE_PANEL: Record<Face, string> = {
	'-x': 'left panel',
	'+x': 'right panel',
	'-y': 'bottom panel',
	'+y': 'top panel',
	'-z': 'front panel',
	'+z': 'back panel'
};

/** Moving along an axis, in the builder's words. */
export function moveWord(axis: Axis, sign: 1 | -1): string {
	const words: Record<Axis, [string, string]> = {
		x: ['left', 'right'],
		y: ['down', 'up'],
		z: ['forward', 'back']
	};
	return words[axis][sign > 0 ? 1 : 0];
}

/** Which way a direction points, seen by someone in front of the enclosure. */
export const POINTS_WORDS: Record<Face, string> = {
	'-x': 'left',
	'+x': 'right',
	'-y': 'down',
	'+y': 'up',
	'-z': 'to the front',
	'+z': 'to the back'
};

/** The two ends of a travel along an axis, low end first. */
export const AXIS_ENDS: Record<Axis, [string, string]> = {
	x: ['left', 'right'],
	y: ['bottom', 'top'],
	z: ['front', 'back']
};

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
