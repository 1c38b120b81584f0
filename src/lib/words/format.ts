import { EPSILON_MM, formatMm, type Vec3 } from '$lib/geometry';

/**
 * Counts and dates in words, through the platform's Intl: "1 part collides", "3 parts collide",
 * "1,250 cm³"; dates with the month in words ("1 Dec 2026"), which no reader takes for January.
 * The locale defaults to en-GB so the server's page and the browser's hydration agree; a caller
 * that knows the viewer's locale passes it.
 */
const DEFAULT_LOCALE = 'en-GB';

/** "1 part" / "3 parts": the noun's form chosen by Intl.PluralRules, the number by NumberFormat. */
export function countWords(
	n: number,
	forms: { one: string; other: string },
	locale: string = DEFAULT_LOCALE
): string {
	const form = new Intl.PluralRules(locale).select(n) === 'one' ? forms.one : forms.other;
	return `${new Intl.NumberFormat(locale).format(n)} ${form}`;
}

/** A number as the locale writes it: "1,250.5" in en-GB. */
export function numberWords(n: number, locale: string = DEFAULT_LOCALE, digits?: number): string {
	return new Intl.NumberFormat(locale, {
		minimumFractionDigits: digits,
		maximumFractionDigits: digits ?? 3
	}).format(n);
}

/** "1 Dec 2026". */
export function formatDate(d: Date | string | number, locale: string = DEFAULT_LOCALE): string {
	return new Intl.DateTimeFormat(locale, {
		day: 'numeric',
		month: 'short',
		year: 'numeric'
	}).format(new Date(d));
}

/** "1 Dec 2026, 14:05". */
export function formatDateTime(d: Date | string | number, locale: string = DEFAULT_LOCALE): string {
	return new Intl.DateTimeFormat(locale, {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		hour: '2-digit',
		minute: '2-digit'
	}).format(new Date(d));
}

/* Millimetres, sizes and volumes with one decimal and a thin space, for the client page. */

const THIN = '\u2009';

export const mm = formatMm;

/** As formatMm without the unit: one decimal, two when the value needs them (a 40.64 mm card). */
const number = (v: number) => v.toFixed(Math.abs(Math.round(v * 10) / 10 - v) > EPSILON_MM ? 2 : 1);

/** Width × height × depth, as seen from the front. */
export const sizeWords = (s: Vec3) =>
	`${number(s[0])} × ${number(s[1])} × ${number(s[2])}${THIN}mm`;

export const litres = (v: number) => `${v.toFixed(1)}${THIN}L`;

/** "1 Dec 2026, 14:05" (the client page's name for formatDateTime). */
export const dateTime = (d: Date | string) => formatDateTime(d);

/** "1 December 2026". */
export function date(d: Date | string) {
	return new Intl.DateTimeFormat(DEFAULT_LOCALE, {
		day: 'numeric',
		month: 'long',
		year: 'numeric'
	}).format(new Date(d));
}
