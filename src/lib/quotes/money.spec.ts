/**
 * Money in minor units. Minor-unit digits per currency are ISO 4217's (EUR 2, JPY 0, BHD 3);
 * the tax and deposit figures are worked by hand.
 */
import { describe, expect, it } from 'vitest';
import {
	applyBasisPoints,
	formatMoney,
	isCurrencyCode,
	minorDigits,
	moneyInput,
	parseMoney,
	parsePercent,
	percentInput
} from './money';
import { quoteTotals } from './quote-math';

describe('currencies (ISO 4217 minor units)', () => {
	it.each([
		['EUR', 2],
		['USD', 2],
		['JPY', 0],
		['BHD', 3]
	])('%s has %i digits after the point', (code, digits) => {
		expect(minorDigits(code)).toBe(digits);
	});

	it('accepts three-letter codes only', () => {
		expect(isCurrencyCode('EUR')).toBe(true);
		expect(isCurrencyCode('eur')).toBe(false);
		expect(isCurrencyCode('EURO')).toBe(false);
		expect(isCurrencyCode('')).toBe(false);
	});

	// ISO 4217 (list one, current codes): these are assigned; QQQ and ABC are not, XTS is the
	// testing code and DEM was withdrawn in 2002, so neither may price a quote.
	it('accepts assigned ISO 4217 codes and refuses well-formed codes that are not', () => {
		for (const code of ['EUR', 'GBP', 'USD', 'CHF', 'JPY', 'SEK', 'BHD', 'PLN']) {
			expect(isCurrencyCode(code), code).toBe(true);
		}
		for (const code of ['QQQ', 'ABC', 'XTS', 'DEM', 'EUX']) {
			expect(isCurrencyCode(code), code).toBe(false);
		}
	});
});

describe('parsing amounts people type', () => {
	it.each([
		['1250.50', 'EUR', 125050],
		['1,250.50', 'EUR', 125050],
		['12.5', 'EUR', 1250],
		['12', 'EUR', 1200],
		['0.01', 'EUR', 1],
		['1500', 'JPY', 1500],
		['1.234', 'BHD', 1234]
	])('%s %s → %i minor units', (input, currency, minor) => {
		expect(parseMoney(input, currency)).toBe(minor);
	});

	it.each([
		['12.505', 'EUR'],
		['15.5', 'JPY'],
		['-1', 'EUR'],
		['1e3', 'EUR'],
		['abc', 'EUR'],
		['', 'EUR'],
		['1.2.3', 'EUR'],
		['9999999999999', 'EUR']
	])('refuses %s in %s', (input, currency) => {
		expect(parseMoney(input, currency)).toBeNull();
	});

	it('round-trips through the form field', () => {
		for (const minor of [0, 1, 99, 100, 125050]) {
			expect(parseMoney(moneyInput(minor, 'EUR'), 'EUR')).toBe(minor);
		}
		expect(moneyInput(1500, 'JPY')).toBe('1500');
	});

	it('formats with the currency sign and its digits', () => {
		expect(formatMoney(125050, 'EUR')).toBe('€1,250.50');
		expect(formatMoney(1500, 'JPY')).toBe('JP¥1,500');
	});

	it.each([
		['20', 2000],
		['7.25', 725],
		['0', 0],
		['100', 10000],
		['12.5 %', 1250]
	])('percentage %s → %i basis points', (input, bp) => {
		expect(parsePercent(input)).toBe(bp);
		expect(parsePercent(percentInput(bp))).toBe(bp);
	});

	it.each(['100.01', '-5', '7.255', 'ten'])('refuses percentage %s', (input) => {
		expect(parsePercent(input)).toBeNull();
	});
});

describe('rounding and totals', () => {
	it('rounds half up, once', () => {
		// 20 % of 19.99 = 3.998 → 4.00; 10 % of 0.25 = 0.025 → 0.03; 10 % of 0.24 = 0.024 → 0.02.
		expect(applyBasisPoints(1999, 2000)).toBe(400);
		expect(applyBasisPoints(25, 1000)).toBe(3);
		expect(applyBasisPoints(24, 1000)).toBe(2);
		// Exact where floating point is not: 0.1 + 0.2 style sums never appear.
		expect(applyBasisPoints(9_007_199_254_740, 10_000)).toBe(9_007_199_254_740);
	});

	it('a worked quote: two fans, one card, labour, 20 % tax, 30 % deposit', () => {
		// Parts 2 × 18.50 + 420.00 = 457.00; + labour 150.00 = 607.00; tax 121.40; total 728.40;
		// deposit 30 % = 218.52.
		const t = quoteTotals(
			[
				{ quantity: 2, unitPriceMinor: 1850 },
				{ quantity: 1, unitPriceMinor: 42000 }
			],
			{ labourMinor: 15000, taxRateBp: 2000, depositKind: 'percent', depositValue: 3000 }
		);
		expect(t).toEqual({
			partsMinor: 45700,
			labourMinor: 15000,
			subtotalMinor: 60700,
			taxMinor: 12140,
			totalMinor: 72840,
			depositMinor: 21852,
			unpriced: 0
		});
	});

	it('a fixed deposit never exceeds the total; unpriced lines are counted, not guessed', () => {
		const t = quoteTotals(
			[
				{ quantity: 1, unitPriceMinor: 1000 },
				{ quantity: 3, unitPriceMinor: null }
			],
			{ labourMinor: 0, taxRateBp: 0, depositKind: 'amount', depositValue: 50_000 }
		);
		expect(t.totalMinor).toBe(1000);
		expect(t.depositMinor).toBe(1000);
		expect(t.unpriced).toBe(1);
	});
});
