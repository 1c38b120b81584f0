/**
 * Money in integer minor units (cents) with an ISO 4217 code; shared by the quote form and the
 * server so both round the same way. Never floats for amounts that are stored.
 */

/** Digits after the decimal point for a currency (2 for EUR, 0 for JPY), from the platform's ISO data. */
export function minorDigits(currency: string): number {
	try {
		return (
			new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions()
				.maximumFractionDigits ?? 2
		);
	} catch {
		return 2;
	}
}

let iso4217: Set<string> | undefined;

/**
 * An active ISO 4217 code, from the platform's list (`Intl.supportedValuesOf('currency')`, the
 * ICU data Node and browsers ship). A well-formed but unassigned code such as QQQ is refused:
 * Intl.NumberFormat would format it without complaint.
 */
export function isCurrencyCode(code: string): boolean {
	if (!/^[A-Z]{3}$/.test(code)) return false;
	iso4217 ??= new Set(Intl.supportedValuesOf('currency'));
	return iso4217.has(code);
}

export function formatMoney(minor: number, currency: string, locale = 'en-GB'): string {
	const digits = minorDigits(currency);
	return new Intl.NumberFormat(locale, {
		style: 'currency',
		currency,
		minimumFractionDigits: digits,
		maximumFractionDigits: digits
	}).format(minor / 10 ** digits);
}

/**
 * Parses what a person types ("1,250.50", "1250", "12.5") into minor units without floating
 * point. Returns null for anything that is not a plain non-negative amount with at most the
 * currency's digits.
 */
export function parseMoney(input: string, currency: string): number | null {
	const digits = minorDigits(currency);
	const s = input.trim().replace(/[\s\u00a0\u202f,]/g, '');
	const m = /^(\d{1,12})(?:\.(\d*))?$/.exec(s);
	if (!m) return null;
	const frac = m[2] ?? '';
	if (frac.length > digits) return null;
	const minor = Number(m[1]) * 10 ** digits + Number(frac.padEnd(digits, '0') || '0');
	return Number.isSafeInteger(minor) ? minor : null;
}

/** Minor units as the plain number a form field shows ("1250.50"). */
export function moneyInput(minor: number | null | undefined, currency: string): string {
	if (minor === null || minor === undefined) return '';
	const digits = minorDigits(currency);
	if (digits === 0) return String(minor);
	const whole = Math.floor(minor / 10 ** digits);
	const frac = String(minor % 10 ** digits).padStart(digits, '0');
	return `${whole}.${frac}`;
}

/** "20", "7.25" → basis points (2000, 725); at most two decimals, 0–100 %. */
export function parsePercent(input: string): number | null {
	const m = /^(\d{1,3})(?:\.(\d{0,2}))?$/.exec(input.trim().replace(/\s*%$/, ''));
	if (!m) return null;
	const bp = Number(m[1]) * 100 + Number((m[2] ?? '').padEnd(2, '0'));
	return bp <= 10_000 ? bp : null;
}

export function percentInput(bp: number): string {
	return bp % 100 === 0 ? String(bp / 100) : (bp / 100).toFixed(2).replace(/0$/, '');
}

/** Half-up rounding of amount × basis points / 10,000, in integers (no 0.1 + 0.2 surprises). */
export function applyBasisPoints(minor: number, bp: number): number {
	return Number((BigInt(minor) * BigInt(bp) + 5_000n) / 10_000n);
}
