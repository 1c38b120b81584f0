/** Display helpers for the client page: millimetres with one decimal and a thin space, dates in words. */
import { EPSILON_MM, formatMm, type Vec3 } from '$lib/geometry';

const THIN = '\u2009';

export const mm = formatMm;

/** As formatMm without the unit: one decimal, two when the value needs them (a 40.64 mm card). */
const number = (v: number) => v.toFixed(Math.abs(Math.round(v * 10) / 10 - v) > EPSILON_MM ? 2 : 1);

/** Width × height × depth, as seen from the front. */
export const sizeWords = (s: Vec3) =>
	`${number(s[0])} × ${number(s[1])} × ${number(s[2])}${THIN}mm`;

export const litres = (v: number) => `${v.toFixed(1)}${THIN}L`;

export function dateTime(d: Date | string) {
	return new Date(d).toLocaleString('en-GB', {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit'
	});
}

export function date(d: Date | string) {
	return new Date(d).toLocaleDateString('en-GB', {
		day: 'numeric',
		month: 'long',
		year: 'numeric'
	});
}
