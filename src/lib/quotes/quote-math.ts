/**
 * Quote totals in integer minor units. Shared by the quote editor (live totals) and the server
 * (what is stored, shown and charged), so both always agree to the cent.
 */
import { applyBasisPoints } from './money';

export type QuoteLineInput = { quantity: number; unitPriceMinor: number | null };
export type QuoteTermsInput = {
	labourMinor: number;
	taxRateBp: number;
	depositKind: 'amount' | 'percent';
	depositValue: number;
};

export type QuoteTotals = {
	partsMinor: number;
	labourMinor: number;
	subtotalMinor: number;
	taxMinor: number;
	totalMinor: number;
	depositMinor: number;
	/** Lines still without a price: the quote cannot be sent while any remain. */
	unpriced: number;
};

export function quoteTotals(lines: readonly QuoteLineInput[], terms: QuoteTermsInput): QuoteTotals {
	let partsMinor = 0;
	let unpriced = 0;
	for (const l of lines) {
		if (l.unitPriceMinor === null) unpriced++;
		else partsMinor += l.quantity * l.unitPriceMinor;
	}
	const subtotalMinor = partsMinor + terms.labourMinor;
	// Tax on the whole subtotal, rounded half up once (not per line).
	const taxMinor = applyBasisPoints(subtotalMinor, terms.taxRateBp);
	const totalMinor = subtotalMinor + taxMinor;
	const depositMinor =
		terms.depositKind === 'percent'
			? applyBasisPoints(totalMinor, terms.depositValue)
			: Math.min(terms.depositValue, totalMinor);
	return {
		partsMinor,
		labourMinor: terms.labourMinor,
		subtotalMinor,
		taxMinor,
		totalMinor,
		depositMinor,
		unpriced
	};
}
