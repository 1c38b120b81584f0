/**
 * People read words, not the schema's keys: every spec key and every category has its words, and
 * none of those words is itself a key ("heatW", "cpu-block").
 */
import { describe, expect, it } from 'vitest';
import { partCategorySchema, partSpecsSchema } from '$lib/geometry';
import { CATEGORY_LABELS } from './faces';
import { DIMENSIONS_FROM_WORDS, SPEC_WORDS, categoryLabel, specLine } from './specs';

const looksLikeKey = (s: string) => /^[a-z]+[A-Z]\w*$|^[a-z]+-[a-z-]+$/.test(s);

describe('spec and category words', () => {
	it('every spec key of the part schema has a label that is not a key', () => {
		const keys = Object.keys(partSpecsSchema.shape).sort();
		expect(Object.keys(SPEC_WORDS).sort()).toEqual(keys);
		for (const k of keys) {
			const w = SPEC_WORDS[k as keyof typeof SPEC_WORDS].word;
			expect(w, k).not.toBe(k);
			expect(looksLikeKey(w), w).toBe(false);
		}
		expect(specLine('heatW', 95)).toBe('Heat into the loop: 95\u2009W');
		expect(specLine('psuFormFactor', 'SFX')).toBe('Supply form factor: SFX');
	});

	it('every category has a label; an unknown one reads "Other", never the raw key', () => {
		for (const c of partCategorySchema.options) {
			expect(looksLikeKey(CATEGORY_LABELS[c]), c).toBe(false);
			expect(categoryLabel(c)).toBe(CATEGORY_LABELS[c]);
		}
		expect(categoryLabel('cpu-block')).toBe('CPU block');
		expect(categoryLabel('no-such-kind')).toBe('Other');
		expect(Object.keys(DIMENSIONS_FROM_WORDS).sort()).toEqual(
			['datasheet', 'estimate', 'measured', 'standard'].sort()
		);
	});
});
