import { describe, expect, it } from 'vitest';
import type { Overlap } from '$lib/geometry';
import { copyName, overlapSentence } from './builds';
import { formatPrice } from '$lib/catalog/part-shape';
import { formatMoney } from '$lib/quotes/money';
import { placementNames } from '$lib/sharing/summary';

describe('copyName', () => {
	it('names copies "— copy", then "— copy 2", "— copy 3", unique in the build', () => {
		const taken = ['Tall loop'];
		const first = copyName('Tall loop', taken);
		expect(first).toBe('Tall loop — copy');
		taken.push(first);
		const second = copyName('Tall loop', taken);
		expect(second).toBe('Tall loop — copy 2');
		taken.push(second);
		// A copy of a copy counts on from the source's name instead of stacking suffixes.
		expect(copyName('Tall loop — copy 2', taken)).toBe('Tall loop — copy 3');
		expect(new Set([...taken, copyName('Tall loop', taken)]).size).toBe(taken.length + 1);
	});

	it('fills a gap in the numbering and keeps within the name limit (80 characters)', () => {
		expect(copyName('A', ['A', 'A — copy', 'A — copy 3'])).toBe('A — copy 2');
		const long = 'x'.repeat(80);
		const name = copyName(long, [long]);
		expect(name.length).toBe(80);
		expect(name.endsWith(' — copy')).toBe(true);
	});
});

describe('keep-out overlap sentence', () => {
	// A spine (divider) 3.0 mm into the card's cable keep-out along depth, no move offered.
	const o: Overlap = {
		a: {
			id: 'card/cable',
			kind: 'keepout',
			label: 'Compact graphics card · Power cable bend',
			ownerId: 'card',
			placementId: 'card',
			keepoutKind: 'cable'
		},
		b: { id: 'divider:spine', kind: 'divider', label: 'Spine', ownerId: 'spine' },
		kind: 'blocked',
		box: { min: [0, 0, 0], max: [10, 20, 3] },
		volumeMm3: 600,
		depthMm: [10, 20, 3],
		axis: 'z',
		moves: [],
		clearingMove: null
	};

	it('reads as plain words: what is in which room, by how much', () => {
		expect(overlapSentence(o)).toBe(
			'The spine is in the room kept free for the compact graphics card’s power cable bend, by 3.0\u2009mm along depth. No single move clears this.'
		);
	});
});

describe('one money formatter', () => {
	it('the catalogue reads prices as the client page does (Intl.NumberFormat, style currency)', () => {
		// 2400 cents = 24.00 EUR; en-GB puts the symbol first.
		expect(formatPrice(2400, 'EUR')).toBe('€24.00');
		expect(formatPrice(2400, 'EUR')).toBe(formatMoney(2400, 'EUR'));
		expect(formatPrice(null, 'EUR')).toBe('—');
	});
});

describe('placement labels', () => {
	it('start with the category label, numbered when there are several', () => {
		const part = (id: string, category: 'fan' | 'gpu' | 'other') => ({
			placement: { id },
			part: { category }
		});
		const names = placementNames({
			placements: [part('f1', 'fan'), part('f2', 'fan'), part('g', 'gpu'), part('o', 'other')]
		} as never);
		expect([...names.values()].map((n) => n.label)).toEqual([
			'Fan 1',
			'Fan 2',
			'Graphics card',
			'Other'
		]);
		expect(names.get('f2')!.short).toBe('fan 2');
	});
});
