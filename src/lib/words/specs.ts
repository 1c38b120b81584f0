/**
 * Words for a part's specs and for where its dimensions come from, as people read them: never the
 * schema's keys ("heatW") or values ("cpu-block") on a screen. docs/words.md names them.
 */
import type { PartCategory, PartSpecs } from '$lib/geometry';
import { CATEGORY_LABELS } from './faces';

/** Each spec's label and unit (the unit after the number; none for a choice or a kind). */
export const SPEC_WORDS: Record<keyof PartSpecs, { word: string; unit?: string }> = {
	heatW: { word: 'Heat into the loop', unit: 'W' },
	powerDrawW: { word: 'Power draw', unit: 'W' },
	radiatorClass: { word: 'Radiator class', unit: 'mm' },
	radiatorThicknessMm: { word: 'Radiator thickness', unit: 'mm' },
	fanSizeMm: { word: 'Fan size', unit: 'mm' },
	fanThicknessMm: { word: 'Fan thickness', unit: 'mm' },
	psuFormFactor: { word: 'Supply form factor' },
	psuRatingW: { word: 'Supply rating', unit: 'W' },
	boardFormFactor: { word: 'Board form factor' },
	cardLengthMm: { word: 'Card length', unit: 'mm' },
	cardSlots: { word: 'Slots taken', unit: 'slots' },
	fittingKind: { word: 'Fitting kind' },
	insertionDepthMm: { word: 'Tube insertion depth', unit: 'mm' }
};

/** "Heat into the loop: 95 W" — a spec as a line of words. */
export function specLine(key: keyof PartSpecs, value: unknown): string {
	const w = SPEC_WORDS[key];
	if (!w) return String(value);
	return `${w.word}: ${value}${w.unit && typeof value === 'number' ? `\u2009${w.unit}` : ''}`;
}

/** Where a part's dimensions come from: the label and each value's words. */
export const DIMENSIONS_FROM = 'Dimensions from';
export const DIMENSIONS_FROM_WORDS: Record<
	'datasheet' | 'measured' | 'estimate' | 'standard',
	string
> = {
	datasheet: 'datasheet',
	measured: 'measured',
	estimate: 'estimate',
	standard: 'published standard'
};

/** A category as a label; an unknown key (an old row) is shown as "Other", never raw. */
export function categoryLabel(category: string): string {
	return CATEGORY_LABELS[category as PartCategory] ?? CATEGORY_LABELS.other;
}
