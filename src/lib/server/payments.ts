/**
 * Deposits through the card-payment service's official SDK: a checkout session, the service's
 * hosted page, a redirect back, and a signed webhook that marks the deposit paid. On this machine
 * the SDK points at scripts/payments-fake.ts; real keys come from the environment only.
 *
 * A payment becomes 'paid' at most once: from the webhook (each event id handled once) or from the
 * return page asking the service directly. Whichever comes first wins; the other finds it done.
 */
import Stripe from 'stripe';
import { and, desc, eq, inArray } from 'drizzle-orm';
import { config } from './config';
import { db, type Tx } from './db';
import { paymentEvents, payments, type PaymentRow } from './db/schema';
import { newId } from './tokens';

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
	amountMinor: number;
	currency: string;
	description: string;
	customerEmail: string | null;
	payerShareLinkId: string | null;
	payerUserId: string | null;
	/** Where the service sends the client back; `{CHECKOUT_SESSION_ID}` is filled in by the service. */
	successUrl: string;
	cancelUrl: string;
};

/**
 * The hosted checkout page for a deposit. An open session for the same amount is reused, so a
 * client who clicks twice (or comes back later) does not end up with two deposits to pay.
 */
export async function startCheckout(input: CheckoutInput): Promise<string> {
	const stripe = paymentsClient();
	const open = await db
		.select()
		.from(payments)
		.where(and(eq(payments.quoteId, input.quoteId), eq(payments.status, 'pending')))
		.orderBy(desc(payments.createdAt));
	for (const p of open) {
		if (!p.checkoutSessionId || p.amountMinor !== input.amountMinor || p.currency !== input.currency) continue;
		const session = await stripe.checkout.sessions.retrieve(p.checkoutSessionId);
		if (session.status === 'open' && session.url) return session.url;
		if (session.status === 'expired') await db.update(payments).set({ status: 'expired' }).where(and(eq(payments.id, p.id), eq(payments.status, 'pending')));
	}
	const id = newId();
	await db.insert(payments).values({
		id,
		quoteId: input.quoteId,
		buildId: input.buildId,
		variantId: input.variantId,
		amountMinor: input.amountMinor,
		currency: input.currency,
		payerShareLinkId: input.payerShareLinkId,
		payerUserId: input.payerUserId
	});
	const session = await stripe.checkout.sessions.create(
		{
			mode: 'payment',
			line_items: [{ quantity: 1, price_data: { currency: input.currency.toLowerCase(), unit_amount: input.amountMinor, product_data: { name: input.description } } }],
			success_url: input.successUrl,
			cancel_url: input.cancelUrl,
			client_reference_id: id,
			customer_email: input.customerEmail ?? undefined,
			metadata: { payment_id: id, quote_id: input.quoteId }
		},
		{ idempotencyKey: `deposit-${id}` }
	);
	if (!session.url) throw new Error('The payment service returned no checkout page.');
	await db.update(payments).set({ checkoutSessionId: session.id, checkoutUrl: session.url }).where(eq(payments.id, id));
	return session.url;
}

/**
 * Marks the payment of a checkout session paid if the service's amount and currency match what
 * was asked for. Returns the row only when this call made the change.
 */
async function markPaid(tx: Tx, session: Pick<Stripe.Checkout.Session, 'id' | 'amount_total' | 'currency' | 'payment_status'>): Promise<PaymentRow | null> {
	if (session.payment_status !== 'paid') return null;
	const [p] = await tx.select().from(payments).where(eq(payments.checkoutSessionId, session.id)).for('update');
	if (!p || p.status === 'paid') return null;
	if (session.amount_total !== p.amountMinor || session.currency?.toUpperCase() !== p.currency) {
		console.error(`payments: session ${session.id} reports ${session.amount_total} ${session.currency}, expected ${p.amountMinor} ${p.currency}; not marked paid`);
		return null;
	}
	const [row] = await tx.update(payments).set({ status: 'paid', paidAt: new Date() }).where(eq(payments.id, p.id)).returning();
	return row;
}

export class WebhookRejected extends Error {}

export type WebhookOutcome = { duplicate: boolean; paid: PaymentRow | null; type: string };

/**
 * Verifies the signature with the SDK (a tampered or unsigned body throws WebhookRejected and
 * changes nothing), then handles each event id once.
 */
export async function handleWebhook(rawBody: string, signature: string | null): Promise<WebhookOutcome> {
	let event: Stripe.Event;
	try {
		if (!signature) throw new Error('no signature');
		event = paymentsClient().webhooks.constructEvent(rawBody, signature, config.payments.webhookSecret);
	} catch {
		throw new WebhookRejected('The signature does not match.');
	}
	return db.transaction(async (tx) => {
		const session = event.type.startsWith('checkout.session.') ? (event.data.object as Stripe.Checkout.Session) : null;
		const fresh = await tx
			.insert(paymentEvents)
			.values({ id: event.id, type: event.type, checkoutSessionId: session?.id ?? null })
			.onConflictDoNothing()
			.returning({ id: paymentEvents.id });
		if (!fresh.length) return { duplicate: true, paid: null, type: event.type };
		let paid: PaymentRow | null = null;
		if (session && (event.type === 'checkout.session.completed' || event.type === 'checkout.session.async_payment_succeeded')) {
			paid = await markPaid(tx, session);
		} else if (session && event.type === 'checkout.session.expired') {
			await tx.update(payments).set({ status: 'expired' }).where(and(eq(payments.checkoutSessionId, session.id), eq(payments.status, 'pending')));
		}
		return { duplicate: false, paid, type: event.type };
	});
}

/**
 * After the redirect back: asks the service about the session (the webhook may still be on its
 * way) and records the payment if it is paid. Only sessions this app created are looked at.
 */
export async function confirmReturn(sessionId: string): Promise<{ payment: PaymentRow | null; newlyPaid: PaymentRow | null }> {
	if (!/^cs_[A-Za-z0-9_]{8,200}$/.test(sessionId)) return { payment: null, newlyPaid: null };
	const [p] = await db.select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
	if (!p) return { payment: null, newlyPaid: null };
	if (p.status === 'paid') return { payment: p, newlyPaid: null };
	const session = await paymentsClient().checkout.sessions.retrieve(sessionId);
	const newlyPaid = await db.transaction((tx) => markPaid(tx, session));
	const [now] = await db.select().from(payments).where(eq(payments.id, p.id));
	return { payment: now, newlyPaid };
}

export async function paymentsOfQuotes(quoteIds: string[]): Promise<PaymentRow[]> {
	if (!quoteIds.length) return [];
	return db.select().from(payments).where(inArray(payments.quoteId, quoteIds)).orderBy(desc(payments.createdAt));
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
