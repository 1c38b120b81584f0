/**
 * Deposits end to end against the built app and the local payment fake: the hosted checkout
 * pays, the signed webhook marks the deposit paid once, a replay pays nothing more, and a body
 * that was tampered with is refused with 400 and changes nothing. Signatures for the direct
 * webhook tests are made with the SDK's own test helper (an independent signer of the scheme).
 */
import Stripe from 'stripe';
import { and, eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { config } from '../config';
import { db } from '../db';
import { paymentEvents, payments } from '../db/schema';
import { listMail, waitForMail } from '../testing/mail';
import { useApp } from '../testing/suite';
import { ensureQuote, sendQuote } from './quotes';
import { sharedDemo } from './test-factory';

const app = useApp();
const fake = `${config.payments.protocol}://${config.payments.host}:${config.payments.port}`;
const sdk = new Stripe('sk_test_unused');

beforeAll(async () => {
	const health = await fetch(`${fake}/health`).catch(() => null);
	if (!health?.ok) throw new Error(`The payment fake is not running on ${fake} (scripts/lib.sh ensure_payments_fake).`);
});

/** The variant's quote sent to the client as the catalogue prices it (30 % deposit, no tax, no labour). */
async function sendDemoQuote(s: Awaited<ReturnType<typeof sharedDemo>>) {
	const q = await ensureQuote({ studioId: s.studio.id, buildId: s.buildId, variantId: s.variantId, settings: s.settings });
	await sendQuote(q.quote.id);
	return q;
}

/** A shared, approved variant with a sent quote, and the client's checkout started through the page. */
async function checkoutStarted() {
	const s = await sharedDemo();
	const quote = await sendDemoQuote(s);
	const c = app.client();
	const approved = await c.action(`/s/${s.token}?/approve`, { version: 1, message: 'Go ahead.' });
	expect(approved.type).toBe('success');
	const paid = await c.action(`/s/${s.token}?/pay`, {});
	expect(paid.type, JSON.stringify(paid.data)).toBe('success');
	const checkoutUrl: string = paid.data.checkoutUrl;
	expect(checkoutUrl.startsWith(`${fake}/pay/cs_`)).toBe(true);
	const sessionId = checkoutUrl.split('/').pop()!;
	return { s, quote, c, checkoutUrl, sessionId };
}

async function paymentOf(sessionId: string) {
	const [p] = await db.select().from(payments).where(eq(payments.checkoutSessionId, sessionId));
	return p;
}

const signed = (payload: string, secret = config.payments.webhookSecret) => sdk.webhooks.generateTestHeaderString({ payload, secret });

function completedEvent(id: string, session: { id: string; amount: number; currency?: string }) {
	return JSON.stringify({
		id,
		object: 'event',
		type: 'checkout.session.completed',
		created: Math.floor(Date.now() / 1000),
		livemode: false,
		data: { object: { id: session.id, object: 'checkout.session', amount_total: session.amount, currency: session.currency ?? 'eur', payment_status: 'paid', status: 'complete' } }
	});
}

async function postWebhook(body: string, signature: string | null) {
	return app.client().request('POST', '/api/payments/webhook', { body, headers: { 'content-type': 'application/json', ...(signature ? { 'stripe-signature': signature } : {}) } });
}

describe('deposit through the hosted checkout', () => {
	it('pays once; the designer hears once; a replayed webhook changes nothing', async () => {
		const { s, quote, c, sessionId } = await checkoutStarted();
		expect((await paymentOf(sessionId)).status).toBe('pending');
		expect((await paymentOf(sessionId)).amountMinor).toBe(quote.totals.depositMinor);

		// A declined card pays nothing.
		const declined = await fetch(`${fake}/pay/${sessionId}`, { method: 'POST', redirect: 'manual', body: new URLSearchParams({ email: s.client.email, card: '4000 0000 0000 0002', expiry: '12/39', cvc: '123', name: 'A. Client' }) });
		expect(declined.status).toBe(402);
		expect((await paymentOf(sessionId)).status).toBe('pending');

		const res = await fetch(`${fake}/pay/${sessionId}`, { method: 'POST', redirect: 'manual', body: new URLSearchParams({ email: s.client.email, card: '4242 4242 4242 4242', expiry: '12/39', cvc: '123', name: 'A. Client' }) });
		expect(res.status).toBe(303);
		const back = new URL(res.headers.get('location')!);
		expect(back.origin).toBe(app.baseURL);
		expect(back.pathname).toBe('/s/return');

		const paid = await paymentOf(sessionId);
		expect(paid.status).toBe('paid');
		const mail = await waitForMail(s.designer.email, { subject: 'Deposit paid' });
		expect(mail.text).toContain('€311.52');

		// The fake delivers the very same signed event again.
		const deliveries = (await (await fetch(`${fake}/_fake/deliveries?session=${sessionId}`)).json()) as { eventId: string; lastStatus: number }[];
		expect(deliveries).toHaveLength(1);
		expect(deliveries[0].lastStatus).toBe(200);
		const replay = (await (await fetch(`${fake}/_fake/deliveries/${deliveries[0].eventId}/replay`, { method: 'POST' })).json()) as { status: number };
		expect(replay.status).toBe(200);
		const after = await paymentOf(sessionId);
		expect(after.paidAt?.getTime()).toBe(paid.paidAt?.getTime());
		expect(await db.$count(payments, and(eq(payments.quoteId, quote.quote.id), eq(payments.status, 'paid')))).toBe(1);
		await new Promise((r) => setTimeout(r, 300));
		expect((await listMail(s.designer.email)).filter((m) => m.subject.startsWith('Deposit paid'))).toHaveLength(1);

		// Back on the client page, with the return cookie from the pay action.
		const ret = await c.get(`${back.pathname}${back.search}`);
		expect(ret.status).toBe(303);
		expect(ret.location).toBe(`/s/${s.token}?deposit=paid#deposit`);
		const page = await c.get(`/s/${s.token}?deposit=paid`);
		expect(page.text).toContain('Deposit paid: €311.52');

		// Paid: no second checkout.
		const again = await c.action(`/s/${s.token}?/pay`, {});
		expect(again.type).toBe('failure');
	});
});

describe('the webhook endpoint', () => {
	it('refuses a tampered body, a wrong secret and a missing signature with 400, changing nothing', async () => {
		const { sessionId } = await checkoutStarted();
		const p = await paymentOf(sessionId);
		const body = completedEvent('evt_test_tamper1', { id: sessionId, amount: p.amountMinor });
		const header = signed(body);
		const tampered = body.replace(`"amount_total":${p.amountMinor}`, '"amount_total":1');
		expect(tampered).not.toBe(body);
		for (const [b, h] of [
			[tampered, header],
			[body, signed(body, 'whsec_someone_else')],
			[body, null],
			[body, 't=1,v1=00']
		] as const) {
			const res = await postWebhook(b, h);
			expect(res.status).toBe(400);
		}
		expect((await paymentOf(sessionId)).status).toBe('pending');
		expect(await db.$count(paymentEvents, eq(paymentEvents.id, 'evt_test_tamper1'))).toBe(0);
	});

	it('pays on a good signature once, whatever the replays or repeat events', async () => {
		const { sessionId } = await checkoutStarted();
		const p = await paymentOf(sessionId);
		const eventId = `evt_test_${sessionId.slice(-10)}`;
		const body = completedEvent(eventId, { id: sessionId, amount: p.amountMinor });
		const first = await postWebhook(body, signed(body));
		expect(first.status).toBe(200);
		expect(first.json()).toMatchObject({ received: true, duplicate: false });
		const paid = await paymentOf(sessionId);
		expect(paid.status).toBe('paid');

		const replay = await postWebhook(body, signed(body));
		expect(replay.status).toBe(200);
		expect(replay.json()).toMatchObject({ duplicate: true });

		// The service may also send a second, different event for the same session.
		const other = completedEvent(`${eventId}b`, { id: sessionId, amount: p.amountMinor });
		expect((await postWebhook(other, signed(other))).status).toBe(200);
		const after = await paymentOf(sessionId);
		expect(after.paidAt?.getTime()).toBe(paid.paidAt?.getTime());
		expect(await db.$count(payments, and(eq(payments.quoteId, p.quoteId), eq(payments.status, 'paid')))).toBe(1);
	});

	it('does not mark paid when the service reports another amount or currency', async () => {
		const { sessionId } = await checkoutStarted();
		const p = await paymentOf(sessionId);
		for (const [i, wrong] of [{ amount: p.amountMinor - 1 }, { amount: p.amountMinor, currency: 'usd' }].entries()) {
			const body = completedEvent(`evt_test_wrong${i}_${sessionId.slice(-8)}`, { id: sessionId, ...wrong });
			expect((await postWebhook(body, signed(body))).status).toBe(200);
		}
		expect((await paymentOf(sessionId)).status).toBe('pending');
	});
});
