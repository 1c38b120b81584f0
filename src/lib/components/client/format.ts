/** Display helpers for the client page: millimetres with one decimal and a thin space, dates in words. */
import type { Vec3 } from '$lib/geometry';

const THIN = '\u2009';

export const mm = (v: number) => `${v.toFixed(1)}${THIN}mm`;

/** Width × height × depth, as seen from the front. */
export const sizeWords = (s: Vec3) => `${s[0].toFixed(1)} × ${s[1].toFixed(1)} × ${s[2].toFixed(1)}${THIN}mm`;

export const litres = (v: number) => `${v.toFixed(1)}${THIN}L`;

export function dateTime(d: Date | string) {
	return new Date(d).toLocaleString('en-GB', { day: 'numeric', month: 'short', year: 'numeric', hour: '2-digit', minute: '2-digit' });
}

export function date(d: Date | string) {
	return new Date(d).toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric' });
}
