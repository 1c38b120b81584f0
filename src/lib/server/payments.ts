/**
 * Deposits through the card-payment service's official SDK: a checkout session, the service's
 * hosted page, a redirect back, and a signed webhook that marks the deposit paid. On this machine
 * the SDK points at scripts/payments-fake.ts; real keys come from the environment only.
 *
 * One deposit per quote. "Pay" takes the quote's row lock (SELECT … FOR UPDATE), so simultaneous
 * posts queue and the later ones reuse the checkout the first one opened; the database backs it
 * with a unique index on the quote's open or paid payment. A payment becomes 'paid' at most once:
 * from the webhook (each event id handled once) or from the return page asking the service.
 * Money that still arrives for a quote already paid (a checkout the client kept open while it was
 * replaced) is never counted: it becomes 'duplicate' and is refunded through the service
 * ('refunded'); when the refund fails it stays 'duplicate', which the studio's quote page shows.
 */
import Stripe from 'stripe';
import { and, desc, eq, inArray, ne } from 'drizzle-orm';
import { z } from 'zod';
import { quoteTotals } from '$lib/quotes/quote-math';
import { BUILT_IN_SECRETS, config } from './config';
import { db, type Tx } from './db';
import { paymentEvents, payments, quoteLines, quotes, type PaymentRow } from './db/schema';
import { notifyPaidTwice } from './sharing/notify';
import { newId } from './tokens';
import { ServiceError } from './errors';

let client: Stripe | undefined;

export function paymentsClient(): Stripe {
	client ??= new Stripe(config.payments.secretKey, {
		host: config.payments.host,
		port: config.payments.port,
		protocol: config.payments.protocol,
		maxNetworkRetries: 1,
		timeout: 15_000,
		telemetry: false
	});
	return client;
}

export type CheckoutInput = {
	quoteId: string;
	buildId: string;
	variantId: string;
	/** The line item's name for a deposit of this amount. */
	describe: (amountMinor: number, currency: string) => string;
	customerEmail: string | null;
	payerShareLinkId: string | null;
	payerUserId: string | null;
	/** Where the service sends the client back; `{CHECKOUT_SESSION_ID}` is filled in by the service. */
	successUrl: string;
	cancelUrl: string;
};

export type CheckoutOutcome = { url: string } | { refused: string; newlyPaid: PaymentRow | null };

type SessionFacts = Pick<
	Stripe.Checkout.Session,
	'id' | 'amount_total' | 'currency' | 'payment_status'
> & { payment_intent?: string | Stripe.PaymentIntent | null };

/**
 * The hosted checkout page for the quote's deposit, at most one per quote. The amount is the
 * quote's deposit as stored now (read under the lock). An open checkout for that amount is
 * reused; one for an old amount is expired at the service first.
 */
export async function startCheckout(input: CheckoutInput): Promise<CheckoutOutcome> {
	const stripe = paymentsClient();
	const after: AfterCommit = { refund: [], expire: [] };
	const outcome = await db.transaction(async (tx): Promise<CheckoutOutcome> => {
		const [quote] = await tx
			.select()
			.from(quotes)
			.where(eq(quotes.id, input.quoteId))
			.for('update');
		if (!quote || quote.status !== 'sent') {
			return { refused: 'The studio has not sent a quote yet.', newlyPaid: null };
		}
		const lines = await tx.select().from(quoteLines).where(eq(quoteLines.quoteId, quote.id));
		const amountMinor = quoteTotals(lines, quote).depositMinor;
		if (amountMinor <= 0) {
			return { refused: 'The studio has not set a deposit yet.', newlyPaid: null };
		}
		const [open] = await tx
			.select()
			.from(payments)
			.where(and(eq(payments.quoteId, quote.id), inArray(payments.status, ['pending', 'paid'])));
		if (open?.status === 'paid') {
			return { refused: 'The deposit is already paid.', newlyPaid: null };
		}
		if (open?.checkoutSessionId) {
			let session = await stripe.checkout.sessions.retrieve(open.checkoutSessionId);
			if (
				session.status === 'open' &&
				session.url &&
				open.amountMinor === amountMinor &&
				open.currency === quote.currency
			) {
				return { url: session.url };
			}
			if (session.status === 'open') {
				// The quote changed since this checkout opened: close it before opening the new one.
				session = await stripe.checkout.sessions
					.expire(session.id)
					.catch(() => stripe.checkout.sessions.retrieve(session.id));
			}
			if (session.status === 'complete') {
				const marked = await markPaid(tx, session, after);
				const refused =
					session.payment_status === 'paid'
						? 'The deposit is already paid.'
						: 'Your payment is being processed; this page will show it once it is through.';
				return { refused, newlyPaid: marked };
			}
		}
		if (open) await tx.update(payments).set({ status: 'expired' }).where(eq(payments.id, open.id));
		const id = newId();
		// The unique index on the quote's open payment makes a second claim fail rather than pass.
		await tx.insert(payments).values({
			id,
			quoteId: quote.id,
			buildId: input.buildId,
			variantId: input.variantId,
			amountMinor,
			currency: quote.currency,
			payerShareLinkId: input.payerShareLinkId,
			payerUserId: input.payerUserId
		});
		const session = await stripe.checkout.sessions.create(
			{
				mode: 'payment',
				line_items: [
					{
						quantity: 1,
						price_data: {
							currency: quote.currency.toLowerCase(),
							unit_amount: amountMinor,
							product_data: { name: input.describe(amountMinor, quote.currency) }
						}
					}
				],
				success_url: input.successUrl,
				cancel_url: input.cancelUrl,
				client_reference_id: id,
				customer_email: input.customerEmail ?? undefined,
				metadata: { payment_id: id, quote_id: quote.id }
			},
			{ idempotencyKey: `deposit-${id}` }
		);
		if (!session.url) throw new Error('The payment service returned no checkout page.');
		await tx
			.update(payments)
			.set({ checkoutSessionId: session.id, checkoutUrl: session.url })
			.where(eq(payments.id, id));
		return { url: session.url };
	});
	await settle(after);
	return outcome;
}

/** Work for the service once the database agrees: refunds of duplicates, checkouts to close. */
type AfterCommit = {
	refund: { paymentId: string; paymentIntent: string | null }[];
	expire: string[];
};

/**
 * Records a paid session against its payment, if the amount and currency are what was asked for.
 * Takes the quote's lock first (the same order as startCheckout). The first paid payment of a
 * quote counts; any later one becomes 'duplicate' and is queued for a refund. Returns the row only
 * when this call made it the quote's deposit.
 */
async function markPaid(
	tx: Tx,
	session: SessionFacts,
	after: AfterCommit
): Promise<PaymentRow | null> {
	if (session.payment_status !== 'paid') return null;
	const [found] = await tx
		.select({ quoteId: payments.quoteId })
		.from(payments)
		.where(eq(payments.checkoutSessionId, session.id));
	if (!found) return null;
	await tx.select({ id: quotes.id }).from(quotes).where(eq(quotes.id, found.quoteId)).for('update');
	const [p] = await tx
		.select()
		.from(payments)
		.where(eq(payments.checkoutSessionId, session.id))
		.for('update');
	if (p.status === 'paid' || p.status === 'duplicate' || p.status === 'refunded') return null;
	if (session.amount_total !== p.amountMinor || session.currency?.toUpperCase() !== p.currency) {
		console.error(
			`payments: session ${session.id} reports ${session.amount_total} ${session.currency}, expected ${p.amountMinor} ${p.currency}; not marked paid`
		);
		return null;
	}
	const paymentIntent =
		typeof session.payment_intent === 'string'
			? session.payment_intent
			: (session.payment_intent?.id ?? null);
	const [counted] = await tx
		.select({ id: payments.id })
		.from(payments)
		.where(
			and(eq(payments.quoteId, p.quoteId), eq(payments.status, 'paid'), ne(payments.id, p.id))
		);
	if (counted) {
		console.error(
			`payments: session ${session.id} paid for quote ${p.quoteId}, whose deposit is already paid; not counted, refunding`
		);
		await tx
			.update(payments)
			.set({ status: 'duplicate', paidAt: new Date() })
			.where(eq(payments.id, p.id));
		after.refund.push({ paymentId: p.id, paymentIntent });
		return null;
	}
	// Paid on a checkout we had let go: it counts, and whatever else is open on the quote closes.
	const others = await tx
		.update(payments)
		.set({ status: 'expired' })
		.where(
			and(eq(payments.quoteId, p.quoteId), eq(payments.status, 'pending'), ne(payments.id, p.id))
		)
		.returning({ sessionId: payments.checkoutSessionId });
	for (const o of others) if (o.sessionId) after.expire.push(o.sessionId);
	const [row] = await tx
		.update(payments)
		.set({ status: 'paid', paidAt: new Date() })
		.where(eq(payments.id, p.id))
		.returning();
	return row;
}

/**
 * Refunds duplicates and closes replaced checkouts at the service. A refund that fails leaves the
 * payment 'duplicate' for the studio to settle by hand; a checkout that will not close is paid
 * into a duplicate at worst, which is refunded in turn.
 */
async function settle(after: AfterCommit) {
	const stripe = paymentsClient();
	for (const sessionId of after.expire) {
		await stripe.checkout.sessions
			.expire(sessionId)
			.catch((e: unknown) => console.error(`payments: could not close checkout ${sessionId}`, e));
	}
	for (const r of after.refund) {
		let refunded = false;
		try {
			if (!r.paymentIntent) throw new Error('the service named no payment to refund');
			const refund = await stripe.refunds.create(
				{
					payment_intent: r.paymentIntent,
					metadata: { payment_id: r.paymentId, reason: 'deposit already paid' }
				},
				{ idempotencyKey: `refund-${r.paymentId}` }
			);
			await db
				.update(payments)
				.set({ status: 'refunded', refundId: refund.id, refundedAt: new Date() })
				.where(and(eq(payments.id, r.paymentId), eq(payments.status, 'duplicate')));
			refunded = true;
		} catch (e) {
			console.error(
				`payments: could not refund duplicate payment ${r.paymentId}; it stays flagged for the studio`,
				e
			);
		}
		const [row] = await db.select().from(payments).where(eq(payments.id, r.paymentId));
		if (row) await notifyPaidTwice(row, refunded);
	}
}

/** An unsigned, altered or malformed webhook event: 400, nothing changed. */
export class WebhookRejected extends ServiceError {
	constructor(message: string) {
		super('invalid', message);
	}
}

export type WebhookOutcome = { duplicate: boolean; paid: PaymentRow | null; type: string };

/** The parts of an event this app reads, checked after the signature: anything else is a 400. */
const eventSchema = z.object({
	id: z.string().regex(/^[A-Za-z0-9_]{1,255}$/),
	type: z.string().regex(/^[a-z0-9_.]{1,100}$/),
	data: z.object({ object: z.record(z.string(), z.unknown()) })
});

const sessionSchema = z.object({
	id: z.string().regex(/^cs_[A-Za-z0-9_]{1,250}$/),
	amount_total: z.number().int().nullable(),
	currency: z.string().max(10).nullable(),
	payment_status: z.string().max(40),
	payment_intent: z.string().max(255).nullable().optional()
});

/**
 * Verifies the signature with the SDK (a tampered or unsigned body throws WebhookRejected and
 * changes nothing), then checks the event's shape with zod (a malformed one is refused the same
 * way and logged), then handles each event id once.
 */
export async function handleWebhook(
	rawBody: string,
	signature: string | null
): Promise<WebhookOutcome> {
	const secret = config.payments.webhookSecret;
	// The start-up check refuses these in production mode already; this keeps it so at any time.
	if (config.production && BUILT_IN_SECRETS.includes(secret)) {
		throw new WebhookRejected('The signature does not match.');
	}
	let raw: unknown;
	try {
		if (!signature) throw new Error('no signature');
		raw = paymentsClient().webhooks.constructEvent(rawBody, signature, secret);
	} catch {
		throw new WebhookRejected('The signature does not match.');
	}
	const parsed = eventSchema.safeParse(raw);
	const isSession = parsed.success && parsed.data.type.startsWith('checkout.session.');
	const session = isSession ? sessionSchema.safeParse(parsed.data.data.object) : null;
	if (!parsed.success || (session && !session.success)) {
		const issue = (parsed.success ? session!.error! : parsed.error).issues[0];
		const where = issue?.path.length
			? (parsed.success ? ['data', 'object', ...issue.path] : issue.path).join('.')
			: 'the event';
		console.warn(
			`payments: signed webhook refused, malformed at ${where}: ${issue?.message ?? 'not an event'}`
		);
		throw new WebhookRejected(`The event is malformed at ${where}.`);
	}
	const event = parsed.data;
	const s = session?.data ?? null;
	const after: AfterCommit = { refund: [], expire: [] };
	const outcome = await db.transaction(async (tx): Promise<WebhookOutcome> => {
		const fresh = await tx
			.insert(paymentEvents)
			.values({ id: event.id, type: event.type, checkoutSessionId: s?.id ?? null })
			.onConflictDoNothing()
			.returning({ id: paymentEvents.id });
		if (!fresh.length) return { duplicate: true, paid: null, type: event.type };
		let paid: PaymentRow | null = null;
		if (
			s &&
			(event.type === 'checkout.session.completed' ||
				event.type === 'checkout.session.async_payment_succeeded')
		) {
			paid = await markPaid(tx, s, after);
		} else if (s && event.type === 'checkout.session.expired') {
			await tx
				.update(payments)
				.set({ status: 'expired' })
				.where(and(eq(payments.checkoutSessionId, s.id), eq(payments.status, 'pending')));
		}
		return { duplicate: false, paid, type: event.type };
	});
	await settle(after);
	return outcome;
}

/**
 * After the redirect back: asks the service about the session (the webhook may still be on its
 * way) and records the payment if it is paid. Only sessions this app created are looked at.
 */
export async function confirmReturn(
	sessionId: string
): Promise<{ payment: PaymentRow | null; newlyPaid: PaymentRow | null }> {
	if (!/^cs_[A-Za-z0-9_]{8,200}$/.test(sessionId)) return { payment: null, newlyPaid: null };
	const [p] = await db.select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
	if (!p) return { payment: null, newlyPaid: null };
	if (p.status === 'paid') return { payment: p, newlyPaid: null };
	const session = await paymentsClient().checkout.sessions.retrieve(sessionId);
	const after: AfterCommit = { refund: [], expire: [] };
	const newlyPaid = await db.transaction((tx) => markPaid(tx, session, after));
	await settle(after);
	const [now] = await db.select().from(payments).where(eq(payments.id, p.id));
	return { payment: now, newlyPaid };
}

export async function paymentsOfQuotes(quoteIds: string[]): Promise<PaymentRow[]> {
	if (!quoteIds.length) return [];
	return db
		.select()
		.from(payments)
		.where(inArray(payments.quoteId, quoteIds))
		.orderBy(desc(payments.createdAt));
}

export async function paidDeposit(quoteId: string): Promise<PaymentRow | null> {
	const [row] = await db
		.select()
		.from(payments)
		.where(and(eq(payments.quoteId, quoteId), eq(payments.status, 'paid')))
		.orderBy(payments.paidAt)
		.limit(1);
	return row ?? null;
}
