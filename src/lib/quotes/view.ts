/** A quote as a document shows it: every amount already worded in its currency. */
export type QuoteView = {
	draft: boolean;
	lines: { description: string; quantity: number; unit: string; total: string }[];
	labour: { note: string; amount: string } | null;
	subtotal: string;
	tax: { rate: string; amount: string } | null;
	total: string;
	deposit: string;
	unpriced: number;
};
