import { error } from '@sveltejs/kit';
import { quoteFields, quoteForm } from '$lib/schemas/quotes';
import { requireBuild } from '$lib/server/access';
import { variantsOf } from '$lib/server/builds';
import { paymentsOfQuotes } from '$lib/server/payments';
import { forForm } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import {
	ensureQuote,
	quoteOfVariant,
	refreshLines,
	sendQuote,
	updateQuote,
	withdrawQuote
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

// A paid quote (locked, 409) or one not ready to send (400): the message on the whole form.
export const actions: Actions = {
	create: async (event) => {
		await context(event);
		return { created: true };
	},
	save: async (event) => {
		const { quote } = await context(event);
		const lineIds = quote.lines.map((l) => l.id);
		const parsed = await readForm(event.request, quoteForm(lineIds));
		if (!parsed.ok) return parsed.failure;
		const { fields } = quoteFields(parsed.data, lineIds);
		return forForm(async () => {
			await updateQuote(quote.quote.id, fields!);
			return { saved: true };
		});
	},
	refresh: async (event) => {
		const { quote, variant } = await context(event);
		return forForm(async () => {
			await refreshLines(quote.quote.id, variant.settings);
			return { refreshed: true };
		});
	},
	send: async (event) => {
		const { quote } = await context(event);
		return forForm(async () => {
			await sendQuote(quote.quote.id);
			return { sent: true };
		});
	},
	withdraw: async (event) => {
		const { quote } = await context(event);
		return forForm(async () => {
			await withdrawQuote(quote.quote.id);
			return { withdrawn: true };
		});
	}
};
