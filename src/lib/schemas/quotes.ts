/**
 * The quote form: its fields are text as typed ("1,250.50", "20 %"); the schema turns them into
 * minor units and basis points (`$lib/quotes/money`), one message per field that is wrong.
 */
import { z } from 'zod';
import { isCurrencyCode, parseMoney, parsePercent } from '$lib/quotes/money';
import { line, paragraph } from './common';

const description = line('Description', 200);
const labourNote = line('Labour line', 200, 0);
const notes = paragraph('Notes', 2000);

/** The largest amount a line, the labour or a deposit may hold: 100,000,000.00 in minor units. */
const MAX_MINOR = 100_000_000_00;

/** What the quote form says, in minor units and basis points, ready for the quote service. */
export type QuoteFields = {
	currency: string;
	labourMinor: number;
	labourNote: string;
	taxRateBp: number;
	depositKind: 'amount' | 'percent';
	depositValue: number;
	notes: string;
	lines: {
		id: string;
		remove: boolean;
		description: string;
		quantity: number;
		unitPriceMinor: number | null;
	}[];
	added: { partId: null; description: string; quantity: number; unitPriceMinor: number | null }[];
};

/**
 * Reads the posted quote fields of a quote whose lines have these ids. Each line posts
 * `line-<id>-description`, `-quantity`, `-price` and `-remove`; a line the form does not mention
 * stays as it is, a new line comes as `new-description`, `new-quantity`, `new-price`.
 */
export function quoteFields(
	values: Record<string, string>,
	lineIds: string[]
): { fields: QuoteFields | null; errors: Record<string, string> } {
	const errors: Record<string, string> = {};
	const get = (k: string) => values[k] ?? '';
	const flag = (key: string, message: string) => {
		errors[key] ??= message;
	};
	const currency = get('currency').trim().toUpperCase();
	if (!isCurrencyCode(currency)) {
		flag('currency', 'Use an ISO 4217 currency code such as EUR, GBP or USD.');
	}
	const cur = 'currency' in errors ? 'EUR' : currency;
	const money = (key: string, label: string, required: boolean): number | null => {
		const raw = get(key).trim();
		if (!raw) {
			if (required) flag(key, `${label} is required.`);
			return null;
		}
		const v = parseMoney(raw, cur);
		if (v === null || v > MAX_MINOR) flag(key, `${label} must be an amount like 120.50.`);
		return v;
	};
	const qty = (key: string) => {
		const n = Number(get(key));
		if (!Number.isInteger(n) || n < 1 || n > 10_000) flag(key, 'A whole number from 1 to 10,000.');
		return n;
	};
	const field = (key: string, schema: z.ZodType<string>) => {
		const r = schema.safeParse(get(key));
		if (!r.success) flag(key, r.error.issues[0].message);
		return r.success ? r.data : '';
	};
	const lines = lineIds
		.filter((id) => `line-${id}-description` in values || `line-${id}-remove` in values)
		.map((id) => {
			const remove = get(`line-${id}-remove`) === 'on';
			return {
				id,
				remove,
				description: remove ? '' : field(`line-${id}-description`, description),
				quantity: remove ? 1 : qty(`line-${id}-quantity`),
				unitPriceMinor: remove ? null : money(`line-${id}-price`, 'The price', false)
			};
		});
	const added: QuoteFields['added'] = [];
	if (get('new-description').trim() || get('new-price').trim()) {
		added.push({
			partId: null,
			description: field('new-description', description),
			quantity: get('new-quantity') ? qty('new-quantity') : 1,
			unitPriceMinor: money('new-price', 'The price', true)
		});
	}
	const labourMinor = money('labour', 'Labour', false) ?? 0;
	const taxRateBp = parsePercent(get('tax') || '0');
	if (taxRateBp === null) flag('tax', 'A percentage from 0 to 100, at most two decimals.');
	const depositKind: 'amount' | 'percent' = get('depositKind') === 'amount' ? 'amount' : 'percent';
	const depositValue =
		depositKind === 'percent'
			? parsePercent(get('depositValue') || '0')
			: money('depositValue', 'The deposit', true);
	if (depositKind === 'percent' && depositValue === null) {
		flag('depositValue', 'A percentage from 0 to 100, at most two decimals.');
	}
	const noteText = field('notes', notes);
	const labourText = field('labourNote', labourNote);
	if (Object.keys(errors).length) return { fields: null, errors };
	return {
		fields: {
			currency,
			labourMinor,
			labourNote: labourText,
			taxRateBp: taxRateBp!,
			depositKind,
			depositValue: depositValue!,
			notes: noteText,
			lines,
			added
		},
		errors
	};
}

/** The quote form's schema: text fields, each checked by `quoteFields`, its message on the field. */
export function quoteForm(lineIds: string[]) {
	const text = z.string({ error: 'Must be text.' }).default('');
	return z
		.object({ currency: text, labour: text, labourNote: text, tax: text, notes: text })
		.extend({ depositKind: text, depositValue: text })
		.catchall(z.string({ error: 'Must be text.' }))
		.superRefine((posted, ctx) => {
			for (const [key, message] of Object.entries(quoteFields(posted, lineIds).errors)) {
				ctx.addIssue({ code: 'custom', path: [key], message });
			}
		});
}
