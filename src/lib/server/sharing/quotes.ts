/** Quotes: one per shared variant; part lines from the catalogue, a labour line, tax and a deposit. */
import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import { variantSettingsSchema } from '$lib/builds/settings';
import { isCurrencyCode } from '$lib/quotes/money';
import { quoteTotals, type QuoteTotals } from '$lib/quotes/quote-math';
import type { QuoteFields } from '$lib/schemas/quotes';
import { db, type Tx } from '../db';
import {
	parts,
	payments,
	quoteLines,
	quotes,
	type QuoteLineRow,
	type QuoteRow
} from '../db/schema';
import { loopLineDrafts } from '../loop-quote';
import { newId } from '../tokens';
import { ServiceError } from '../errors';

export type LineDraft = {
	partId: string | null;
	description: string;
	quantity: number;
	unitPriceMinor: number | null;
	/** Set on the coolant loop's lines (see loop-quote.ts). */
	loopKey?: string | null;
};

/** A line's identity when lines follow the variant: its loop key, else its part. */
const lineKey = (l: { partId: string | null; loopKey?: string | null }) =>
	l.loopKey ? `loop:${l.loopKey}` : l.partId;

/**
 * One line per catalogue part placed in the variant, with how many are placed. The catalogue's
 * price is used only when it is in the quote's currency; otherwise the line waits for a price.
 */
export async function linesFromVariant(
	settingsJson: unknown,
	currency: string,
	build?: { studioId: string; buildId: string }
): Promise<LineDraft[]> {
	const settings = variantSettingsSchema.parse(settingsJson);
	const loop = build ? await loopLineDrafts(build.studioId, build.buildId, settings, currency) : [];
	const counts = new Map<string, number>();
	for (const p of settings.placements) counts.set(p.partId, (counts.get(p.partId) ?? 0) + 1);
	if (counts.size === 0) return loop;
	const rows = await db
		.select({
			id: parts.id,
			name: parts.name,
			priceMinor: parts.priceMinor,
			currency: parts.currency
		})
		.from(parts)
		.where(inArray(parts.id, [...counts.keys()]));
	const byId = new Map(rows.map((r) => [r.id, r]));
	const placed = [...counts.entries()].map(([partId, quantity]) => {
		const part = byId.get(partId);
		return {
			partId,
			description: part?.name ?? 'Part',
			quantity,
			unitPriceMinor:
				part && part.priceMinor !== null && part.currency === currency ? part.priceMinor : null
		};
	});
	return [...placed, ...loop];
}

export type QuoteWithLines = { quote: QuoteRow; lines: QuoteLineRow[]; totals: QuoteTotals };

export function totalsOf(quote: QuoteRow, lines: readonly QuoteLineRow[]): QuoteTotals {
	return quoteTotals(lines, quote);
}

export async function quoteOfVariant(variantId: string): Promise<QuoteWithLines | null> {
	const [quote] = await db.select().from(quotes).where(eq(quotes.variantId, variantId));
	if (!quote) return null;
	const lines = await db
		.select()
		.from(quoteLines)
		.where(eq(quoteLines.quoteId, quote.id))
		.orderBy(asc(quoteLines.sortOrder));
	return { quote, lines, totals: totalsOf(quote, lines) };
}

/** The variant's quote, created as a draft from the variant's parts the first time it is asked for. */
export async function ensureQuote(input: {
	studioId: string;
	buildId: string;
	variantId: string;
	settings: unknown;
	currency?: string;
}): Promise<QuoteWithLines> {
	const existing = await quoteOfVariant(input.variantId);
	if (existing) return existing;
	const currency = input.currency ?? (await commonCurrency(input.settings));
	const drafts = await linesFromVariant(input.settings, currency, input);
	await db.transaction(async (tx) => {
		const id = newId();
		const inserted = await tx
			.insert(quotes)
			.values({
				id,
				studioId: input.studioId,
				buildId: input.buildId,
				variantId: input.variantId,
				currency
			})
			.onConflictDoNothing()
			.returning({ id: quotes.id });
		if (inserted.length) await insertLines(tx, id, drafts);
	});
	return (await quoteOfVariant(input.variantId))!;
}

/** The currency most of the placed parts are priced in; EUR when none has a price. */
async function commonCurrency(settingsJson: unknown): Promise<string> {
	const settings = variantSettingsSchema.parse(settingsJson);
	const ids = [...new Set(settings.placements.map((p) => p.partId))];
	if (!ids.length) return 'EUR';
	const rows = await db
		.select({ currency: parts.currency, price: parts.priceMinor })
		.from(parts)
		.where(inArray(parts.id, ids));
	const tally = new Map<string, number>();
	for (const r of rows) {
		if (r.price !== null) tally.set(r.currency, (tally.get(r.currency) ?? 0) + 1);
	}
	const common = [...tally.entries()].sort(
		(a, b) => b[1] - a[1] || a[0].localeCompare(b[0])
	)[0]?.[0];
	return common && isCurrencyCode(common) ? common : 'EUR';
}

async function insertLines(tx: Tx, quoteId: string, drafts: readonly LineDraft[]) {
	if (!drafts.length) return;
	await tx
		.insert(quoteLines)
		.values(drafts.map((d, i) => ({ id: newId(), quoteId, sortOrder: i, ...d })));
}

export class QuoteLocked extends ServiceError {
	constructor() {
		super('locked', 'The deposit on this quote is paid, so it can no longer change.');
	}
}

async function assertEditable(tx: Tx, quoteId: string) {
	const paid = await tx
		.select({ id: payments.id })
		.from(payments)
		.where(and(eq(payments.quoteId, quoteId), eq(payments.status, 'paid')))
		.limit(1);
	if (paid.length) throw new QuoteLocked();
}

/** The quote form's fields (the same shape), with added lines that may name a catalogue part. */
export type QuoteUpdate = Omit<QuoteFields, 'added'> & { added: LineDraft[] };

/** Saves the designer's edits; lines not belonging to this quote are ignored. */
export async function updateQuote(quoteId: string, input: QuoteUpdate) {
	await db.transaction(async (tx) => {
		await assertEditable(tx, quoteId);
		await tx
			.update(quotes)
			.set({
				currency: input.currency,
				labourMinor: input.labourMinor,
				labourNote: input.labourNote,
				taxRateBp: input.taxRateBp,
				depositKind: input.depositKind,
				depositValue: input.depositValue,
				notes: input.notes,
				updatedAt: new Date(),
				revision: sqlIncrement()
			})
			.where(eq(quotes.id, quoteId));
		const existing = await tx.select().from(quoteLines).where(eq(quoteLines.quoteId, quoteId));
		const ids = new Set(existing.map((l) => l.id));
		for (const l of input.lines) {
			if (!ids.has(l.id)) continue;
			if (l.remove) await tx.delete(quoteLines).where(eq(quoteLines.id, l.id));
			else {
				await tx
					.update(quoteLines)
					.set({
						description: l.description,
						quantity: l.quantity,
						unitPriceMinor: l.unitPriceMinor
					})
					.where(eq(quoteLines.id, l.id));
			}
		}
		const next = existing.reduce((m, l) => Math.max(m, l.sortOrder + 1), 0);
		if (input.added.length) {
			await tx
				.insert(quoteLines)
				.values(input.added.map((d, i) => ({ id: newId(), quoteId, sortOrder: next + i, ...d })));
		}
	});
}

/**
 * Brings the part lines in line with the variant as it is now: new parts get a line, counts
 * follow the placements, removed parts lose theirs. Prices and wording the designer set stay;
 * lines without a part (the designer's own) are kept as they are.
 */
export async function refreshLines(quoteId: string, settings: unknown) {
	await db.transaction(async (tx) => {
		await assertEditable(tx, quoteId);
		const [quote] = await tx.select().from(quotes).where(eq(quotes.id, quoteId));
		const existing = await tx
			.select()
			.from(quoteLines)
			.where(eq(quoteLines.quoteId, quoteId))
			.orderBy(asc(quoteLines.sortOrder));
		const drafts = await linesFromVariant(settings, quote.currency, quote);
		const wanted = new Map(drafts.map((d) => [lineKey(d), d]));
		for (const l of existing) {
			if (lineKey(l) === null) continue;
			const d = wanted.get(lineKey(l));
			if (!d) await tx.delete(quoteLines).where(eq(quoteLines.id, l.id));
			else {
				await tx
					.update(quoteLines)
					.set({ quantity: d.quantity, unitPriceMinor: l.unitPriceMinor ?? d.unitPriceMinor })
					.where(eq(quoteLines.id, l.id));
				wanted.delete(lineKey(l));
			}
		}
		const next = existing.reduce((m, l) => Math.max(m, l.sortOrder + 1), 0);
		const fresh = [...wanted.values()];
		if (fresh.length) {
			await tx
				.insert(quoteLines)
				.values(fresh.map((d, i) => ({ id: newId(), quoteId, sortOrder: next + i, ...d })));
		}
		await tx
			.update(quotes)
			.set({ updatedAt: new Date(), revision: sqlIncrement() })
			.where(eq(quotes.id, quoteId));
	});
}

/** A quote that cannot be sent yet (a line without a price, a zero total or deposit). */
export class QuoteNotReady extends ServiceError {
	constructor(message: string) {
		super('invalid', message);
	}
}

/** Shows the quote on the client page. Every line needs a price and the total must be above zero. */
export async function sendQuote(quoteId: string) {
	const [quote] = await db.select().from(quotes).where(eq(quotes.id, quoteId));
	const lines = await db.select().from(quoteLines).where(eq(quoteLines.quoteId, quoteId));
	const totals = totalsOf(quote, lines);
	if (totals.unpriced > 0) {
		throw new QuoteNotReady(
			`${totals.unpriced} line${totals.unpriced === 1 ? ' has' : 's have'} no price yet.`
		);
	}
	if (totals.totalMinor <= 0) throw new QuoteNotReady('The total is zero.');
	if (totals.depositMinor <= 0) {
		throw new QuoteNotReady('The deposit is zero; set an amount or a percentage.');
	}
	await db
		.update(quotes)
		.set({ status: 'sent', sentAt: new Date(), updatedAt: new Date() })
		.where(eq(quotes.id, quoteId));
}

export async function withdrawQuote(quoteId: string) {
	await db.transaction(async (tx) => {
		await assertEditable(tx, quoteId);
		await tx
			.update(quotes)
			.set({ status: 'draft', updatedAt: new Date() })
			.where(eq(quotes.id, quoteId));
	});
}

function sqlIncrement() {
	return sql`${quotes.revision} + 1`;
}
