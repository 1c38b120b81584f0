import { error, fail } from '@sveltejs/kit';
import { isCurrencyCode, parseMoney, parsePercent } from '$lib/quotes/money';
import { line, paragraph } from '$lib/schemas/common';
import { requireBuild } from '$lib/server/access';
import { variantsOf } from '$lib/server/builds';
import { paymentsOfQuotes } from '$lib/server/payments';
import {
	QuoteLocked,
	QuoteNotReady,
	ensureQuote,
	quoteOfVariant,
	refreshLines,
	sendQuote,
	updateQuote,
	withdrawQuote,
	type QuoteUpdate
} from '$lib/server/sharing/quotes';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

async function variantOf(event: Pick<RequestEvent, 'locals' | 'params' | 'url'>) {
	const { build, access } = await requireBuild(
		event.locals,
		event.params.id,
		'build.quote',
		event.url
	);
	const variant = (await variantsOf(build.id)).find((v) => v.id === event.params.variantId);
	if (!variant) error(404, 'Not found.');
	return { build, access, variant };
}

/** For the form actions (explicit posts): the variant's quote, started from its parts if it has none. */
async function context(event: Pick<RequestEvent, 'locals' | 'params' | 'url'>) {
	const { build, access, variant } = await variantOf(event);
	const quote = await ensureQuote({
		studioId: build.studioId,
		buildId: build.id,
		variantId: variant.id,
		settings: variant.settings
	});
	return { build, access, variant, quote };
}

/** Reads only: opening the page never starts a quote (the "Start the quote" button does). */
export const load: PageServerLoad = async (event) => {
	const { build, variant } = await variantOf(event);
	const quote = await quoteOfVariant(variant.id);
	const payments = quote ? await paymentsOfQuotes([quote.quote.id]) : [];
	return {
		build: { id: build.id, name: build.name },
		variant: { id: variant.id, name: variant.name, version: variant.version },
		quote: quote?.quote ?? null,
		lines: quote?.lines ?? [],
		totals: quote?.totals ?? null,
		payments: payments.map((p) => ({
			id: p.id,
			status: p.status,
			amountMinor: p.amountMinor,
			currency: p.currency,
			paidAt: p.paidAt,
			createdAt: p.createdAt,
			refundedAt: p.refundedAt
		})),
		locked: payments.some((p) => p.status === 'paid')
	};
};

const description = line('Description', 200);
const labourNote = line('Labour line', 200, 0);
const notes = paragraph('Notes', 2000);

/** Reads the quote form into minor units and basis points, one message per field that is wrong. */
function readQuoteForm(
	form: FormData,
	lineIds: string[]
):
	| { ok: true; data: QuoteUpdate }
	| { ok: false; errors: Record<string, string>; values: Record<string, string> } {
	const values: Record<string, string> = {};
	for (const [k, v] of form) if (typeof v === 'string') values[k] = v;
	const errors: Record<string, string> = {};
	const get = (k: string) => values[k] ?? '';
	const currency = get('currency').trim().toUpperCase();
	if (!isCurrencyCode(currency)) {
		errors.currency = 'Use an ISO 4217 currency code such as EUR, GBP or USD.';
	}
	const cur = errors.currency ? 'EUR' : currency;
	const money = (key: string, label: string, required: boolean): number | null => {
		const raw = get(key).trim();
		if (!raw) {
			if (required) errors[key] = `${label} is required.`;
			return null;
		}
		const v = parseMoney(raw, cur);
		if (v === null || v > 100_000_000_00) errors[key] = `${label} must be an amount like 120.50.`;
		return v;
	};
	const qty = (key: string) => {
		const n = Number(get(key));
		if (!Number.isInteger(n) || n < 1 || n > 10_000) {
			errors[key] = 'A whole number from 1 to 10,000.';
		}
		return n;
	};
	const text = (key: string, schema: typeof description) => {
		const r = schema.safeParse(get(key));
		if (!r.success) errors[key] = r.error.issues[0].message;
		return r.success ? r.data : '';
	};
	// Lines the form does not mention stay as they are.
	const lines = lineIds
		.filter((id) => `line-${id}-description` in values || `line-${id}-remove` in values)
		.map((id) => ({
			id,
			remove: get(`line-${id}-remove`) === 'on',
			description:
				get(`line-${id}-remove`) === 'on' ? '' : text(`line-${id}-description`, description),
			quantity: get(`line-${id}-remove`) === 'on' ? 1 : qty(`line-${id}-quantity`),
			unitPriceMinor:
				get(`line-${id}-remove`) === 'on' ? null : money(`line-${id}-price`, 'The price', false)
		}));
	const added: QuoteUpdate['added'] = [];
	if (get('new-description').trim() || get('new-price').trim()) {
		added.push({
			partId: null,
			description: text('new-description', description),
			quantity: get('new-quantity') ? qty('new-quantity') : 1,
			unitPriceMinor: money('new-price', 'The price', true)
		});
	}
	const labourMinor = money('labour', 'Labour', false) ?? 0;
	const taxRateBp = parsePercent(get('tax') || '0');
	if (taxRateBp === null) errors.tax = 'A percentage from 0 to 100, at most two decimals.';
	const depositKind = get('depositKind') === 'amount' ? 'amount' : 'percent';
	let depositValue: number | null;
	if (depositKind === 'percent') {
		depositValue = parsePercent(get('depositValue') || '0');
		if (depositValue === null) {
			errors.depositValue = 'A percentage from 0 to 100, at most two decimals.';
		}
	} else {
		depositValue = money('depositValue', 'The deposit', true);
	}
	const noteParsed = notes.safeParse(get('notes'));
	if (!noteParsed.success) errors.notes = noteParsed.error.issues[0].message;
	const labourText = labourNote.safeParse(get('labourNote'));
	if (!labourText.success) errors.labourNote = labourText.error.issues[0].message;
	if (Object.keys(errors).length) return { ok: false, errors, values };
	return {
		ok: true,
		data: {
			currency,
			labourMinor,
			labourNote: labourText.data!,
			taxRateBp: taxRateBp!,
			depositKind,
			depositValue: depositValue!,
			notes: noteParsed.data!,
			lines,
			added
		}
	};
}

function locked(e: unknown) {
	if (e instanceof QuoteLocked) return fail(409, { errors: { _: e.message }, values: {} });
	throw e;
}

export const actions: Actions = {
	create: async (event) => {
		await context(event);
		return { created: true };
	},
	save: async (event) => {
		const { quote } = await context(event);
		const form = await event.request.formData();
		const parsed = readQuoteForm(
			form,
			quote.lines.map((l) => l.id)
		);
		if (!parsed.ok) return fail(400, { errors: parsed.errors, values: parsed.values });
		try {
			await updateQuote(quote.quote.id, parsed.data);
		} catch (e) {
			return locked(e);
		}
		return { saved: true };
	},
	refresh: async (event) => {
		const { quote, variant } = await context(event);
		try {
			await refreshLines(quote.quote.id, variant.settings);
		} catch (e) {
			return locked(e);
		}
		return { refreshed: true };
	},
	send: async (event) => {
		const { quote } = await context(event);
		try {
			await sendQuote(quote.quote.id);
		} catch (e) {
			if (e instanceof QuoteNotReady) return fail(400, { errors: { _: e.message }, values: {} });
			throw e;
		}
		return { sent: true };
	},
	withdraw: async (event) => {
		const { quote } = await context(event);
		try {
			await withdrawQuote(quote.quote.id);
		} catch (e) {
			return locked(e);
		}
		return { withdrawn: true };
	}
};
