import { describe, expect, it } from 'vitest';
import { countWords, formatDate, formatDateTime, numberWords } from './format';

describe('counts and dates in words', () => {
	it('plural forms by Intl.PluralRules: 1 part, 0 and 3 parts', () => {
		const forms = { one: 'part collides', other: 'parts collide' };
		expect(countWords(1, forms)).toBe('1 part collides');
		expect(countWords(3, forms)).toBe('3 parts collide');
		expect(countWords(0, forms)).toBe('0 parts collide');
		expect(countWords(1250, { one: 'pair', other: 'pairs' })).toBe('1,250 pairs');
	});

	it('numbers by Intl.NumberFormat', () => {
		expect(numberWords(1250.5)).toBe('1,250.5');
		expect(numberWords(2, 'en-GB', 1)).toBe('2.0');
		expect(numberWords(1250.5, 'de-DE')).toBe('1.250,5');
	});

	it('dates with the month in words: 1 Dec 2026, never 01/12/2026', () => {
		const d = new Date(2026, 11, 1, 14, 5);
		expect(formatDate(d)).toBe('1 Dec 2026');
		expect(formatDateTime(d)).toBe('1 Dec 2026, 14:05');
		expect(formatDate(d, 'en-US')).toBe('Dec 1, 2026');
		expect(formatDate(d)).not.toMatch(/\d+\/\d+\/\d+/);
	});
});
