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
import { paymentEvents, payments, quotes } from '../db/schema';
import { listMail, waitForMail } from '../testing/mail';
import { useApp } from '../testing/suite';
import { ensureQuote, sendQuote } from './quotes';
import { sharedDemo } from '../testing/sharing';

const app = useApp();
const fake = `${config.payments.protocol}://${config.payments.host}:${config.payments.port}`;
const sdk = new Stripe('sk_test_unused');

beforeAll(async () => {
	const health = await fetch(`${fake}/health`).catch(() => null);
	if (!health?.ok) {
		throw new Error(
			`The payment fake is not running on ${fake} (scripts/lib.sh ensure_payments_fake).`
		);
	}
});

/** The variant's quote sent to the client as the catalogue prices it (30 % deposit, no tax, no labour). */
async function sendDemoQuote(s: Awaited<ReturnType<typeof sharedDemo>>) {
	const q = await ensureQuote({
		studioId: s.studio.id,
		buildId: s.buildId,
		variantId: s.variantId,
		settings: s.settings
	});
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

const signed = (payload: string, secret = config.payments.webhookSecret) =>
	sdk.webhooks.generateTestHeaderString({ payload, secret });

function completedEvent(id: string, session: { id: string; amount: number; currency?: string }) {
	return JSON.stringify({
		id,
		object: 'event',
		type: 'checkout.session.completed',
		created: Math.floor(Date.now() / 1000),
		livemode: false,
		data: {
			object: {
				id: session.id,
				object: 'checkout.session',
				amount_total: session.amount,
				currency: session.currency ?? 'eur',
				payment_status: 'paid',
				status: 'complete'
			}
		}
	});
}

async function postWebhook(body: string, signature: string | null) {
	return app.client().request('POST', '/api/payments/webhook', {
		body,
		headers: {
			'content-type': 'application/json',
			...(signature ? { 'stripe-signature': signature } : {})
		}
	});
}

describe('deposit through the hosted checkout', () => {
	it('pays once; the designer hears once; a replayed webhook changes nothing', async () => {
		const { s, quote, c, sessionId } = await checkoutStarted();
		expect((await paymentOf(sessionId)).status).toBe('pending');
		expect((await paymentOf(sessionId)).amountMinor).toBe(quote.totals.depositMinor);

		// A declined card pays nothing.
		const declined = await fetch(`${fake}/pay/${sessionId}`, {
			method: 'POST',
			redirect: 'manual',
			body: new URLSearchParams({
				email: s.client.email,
				card: '4000 0000 0000 0002',
				expiry: '12/39',
				cvc: '123',
				name: 'A. Client'
			})
		});
		expect(declined.status).toBe(402);
		expect((await paymentOf(sessionId)).status).toBe('pending');

		const res = await fetch(`${fake}/pay/${sessionId}`, {
			method: 'POST',
			redirect: 'manual',
			body: new URLSearchParams({
				email: s.client.email,
				card: '4242 4242 4242 4242',
				expiry: '12/39',
				cvc: '123',
				name: 'A. Client'
			})
		});
		expect(res.status).toBe(303);
		const back = new URL(res.headers.get('location')!);
		expect(back.origin).toBe(app.baseURL);
		expect(back.pathname).toBe('/s/return');

		const paid = await paymentOf(sessionId);
		expect(paid.status).toBe('paid');
		const mail = await waitForMail(s.designer.email, { subject: 'Deposit paid' });
		expect(mail.text).toContain('€311.52');

		// The fake delivers the very same signed event again.
		const deliveries = (await (
			await fetch(`${fake}/_fake/deliveries?session=${sessionId}`)
		).json()) as { eventId: string; lastStatus: number }[];
		expect(deliveries).toHaveLength(1);
		expect(deliveries[0].lastStatus).toBe(200);
		const replay = (await (
			await fetch(`${fake}/_fake/deliveries/${deliveries[0].eventId}/replay`, { method: 'POST' })
		).json()) as { status: number };
		expect(replay.status).toBe(200);
		const after = await paymentOf(sessionId);
		expect(after.paidAt?.getTime()).toBe(paid.paidAt?.getTime());
		expect(
			await db.$count(
				payments,
				and(eq(payments.quoteId, quote.quote.id), eq(payments.status, 'paid'))
			)
		).toBe(1);
		await new Promise((r) => setTimeout(r, 300));
		expect(
			(await listMail(s.designer.email)).filter((m) => m.subject.startsWith('Deposit paid'))
		).toHaveLength(1);

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
		expect(
			await db.$count(payments, and(eq(payments.quoteId, p.quoteId), eq(payments.status, 'paid')))
		).toBe(1);
	});

	it('does not mark paid when the service reports another amount or currency', async () => {
		const { sessionId } = await checkoutStarted();
		const p = await paymentOf(sessionId);
		for (const [i, wrong] of [
			{ amount: p.amountMinor - 1 },
			{ amount: p.amountMinor, currency: 'usd' }
		].entries()) {
			const body = completedEvent(`evt_test_wrong${i}_${sessionId.slice(-8)}`, {
				id: sessionId,
				...wrong
			});
			expect((await postWebhook(body, signed(body))).status).toBe(200);
		}
		expect((await paymentOf(sessionId)).status).toBe('pending');
	});
});

type FakeSession = {
	id: string;
	status: string;
	payment_intent: string | null;
	amount_total: number;
};
type FakeRefund = { id: string; amount: number; payment_intent: string };

const fakeJson = async <T>(path: string): Promise<T> =>
	(await (await fetch(`${fake}${path}`)).json()) as T;
const payAtFake = (sessionId: string, email: string) =>
	fetch(`${fake}/pay/${sessionId}`, {
		method: 'POST',
		redirect: 'manual',
		body: new URLSearchParams({
			email,
			card: '4242 4242 4242 4242',
			expiry: '12/39',
			cvc: '123',
			name: 'A. Client'
		})
	});
const paymentsOfQuote = (quoteId: string) =>
	db.select().from(payments).where(eq(payments.quoteId, quoteId));

/** The designer sees `onPage` on the variant's quote page, and a "Paid twice" mail says `inMail`. */
async function expectDesignerTold(
	s: Awaited<ReturnType<typeof sharedDemo>>,
	onPage: string,
	inMail: string
) {
	const page = await app
		.client({ session: s.designer.session })
		.get(`/builds/${s.buildId}/quote/${s.variantId}`);
	expect(page.text).toContain(onPage);
	const told = await waitForMail(s.designer.email, { subject: 'Paid twice' });
	expect(told.text).toContain(inMail);
}

describe('one deposit per quote', () => {
	it('20 simultaneous "pay" posts open one checkout: one session at the service, one payment row, one link for all', async () => {
		const s = await sharedDemo();
		const quote = await sendDemoQuote(s);
		const c = app.client();
		expect(
			(await c.action(`/s/${s.token}?/approve`, { version: 1, message: 'Go ahead.' })).type
		).toBe('success');
		const posts = await Promise.all(
			Array.from({ length: 20 }, () => c.action(`/s/${s.token}?/pay`, {}))
		);
		expect(posts.map((p) => p.type)).toEqual(Array(20).fill('success'));
		const urls = new Set(posts.map((p) => p.data.checkoutUrl as string));
		expect(urls.size).toBe(1);
		expect(await fakeJson<FakeSession[]>(`/_fake/sessions?quote=${quote.quote.id}`)).toHaveLength(
			1
		);
		const rows = await paymentsOfQuote(quote.quote.id);
		expect(rows).toHaveLength(1);
		expect(rows[0]).toMatchObject({ status: 'pending', checkoutUrl: [...urls][0] });
	});

	it('the database refuses a second open payment for a quote (payment_quote_open_key)', async () => {
		const { quote } = await checkoutStarted();
		const [p] = await paymentsOfQuote(quote.quote.id);
		const second = db
			.insert(payments)
			.values({ ...p, id: `${p.id}x`, checkoutSessionId: null, checkoutUrl: null });
		await expect(second).rejects.toThrow();
		expect(await paymentsOfQuote(quote.quote.id)).toHaveLength(1);
	});

	it('a changed deposit closes the old checkout at the service before opening the new one', async () => {
		const { s, quote, c, sessionId } = await checkoutStarted();
		await db
			.update(quotes)
			.set({ depositKind: 'amount', depositValue: 10_000 })
			.where(eq(quotes.id, quote.quote.id));
		const again = await c.action(`/s/${s.token}?/pay`, {});
		expect(again.type).toBe('success');
		expect(again.data.checkoutUrl).not.toContain(sessionId);
		const sessions = await fakeJson<FakeSession[]>(`/_fake/sessions?quote=${quote.quote.id}`);
		expect(
			sessions.map((x) => [x.id === sessionId ? 'old' : 'new', x.status, x.amount_total]).sort()
		).toEqual([
			['new', 'open', 10_000],
			['old', 'expired', quote.totals.depositMinor]
		]);
		expect((await payAtFake(sessionId, s.client.email)).status).toBe(410);
		expect((await paymentsOfQuote(quote.quote.id)).map((p) => p.status).sort()).toEqual([
			'expired',
			'pending'
		]);
	});

	it('two paid checkouts for one quote: the first counts, the second is refunded through the service and never counted', async () => {
		// A checkout the service still takes after this app let it go (as a quote left from before
		// the one-deposit rule, or a page the client kept open): A is open at the service, expired here.
		const { s, quote, c, sessionId: a } = await checkoutStarted();
		await db.update(payments).set({ status: 'expired' }).where(eq(payments.checkoutSessionId, a));
		const again = await c.action(`/s/${s.token}?/pay`, {});
		expect(again.type).toBe('success');
		const b = (again.data.checkoutUrl as string).split('/').pop()!;
		expect(b).not.toBe(a);

		expect((await payAtFake(b, s.client.email)).status).toBe(303);
		expect((await paymentOf(b)).status).toBe('paid');
		expect((await payAtFake(a, s.client.email)).status).toBe(303);

		const rows = await paymentsOfQuote(quote.quote.id);
		expect(rows.filter((p) => p.status === 'paid').map((p) => p.checkoutSessionId)).toEqual([b]);
		const dup = rows.find((p) => p.checkoutSessionId === a)!;
		expect(dup.status).toBe('refunded');
		const sessionA = (
			await fakeJson<FakeSession[]>(`/_fake/sessions?quote=${quote.quote.id}`)
		).find((x) => x.id === a)!;
		const refunds = await fakeJson<FakeRefund[]>(
			`/_fake/refunds?payment_intent=${sessionA.payment_intent}`
		);
		expect(refunds).toHaveLength(1);
		expect(refunds[0]).toMatchObject({ id: dup.refundId, amount: dup.amountMinor });

		// The return page for A says nothing was paid twice; the designer heard of one deposit.
		const ret = await c.get(`/s/return?session_id=${a}`);
		expect(ret.status).toBe(303);
		await waitForMail(s.designer.email, { subject: 'Deposit paid' });
		await new Promise((r) => setTimeout(r, 300));
		expect(
			(await listMail(s.designer.email)).filter((m) => m.subject.startsWith('Deposit paid'))
		).toHaveLength(1);
		await expectDesignerTold(
			s,
			'not counted and refunded',
			'It was refunded through the payment service'
		);
	});

	it('a second paid event the service gives no payment for stays flagged for the studio (refund by hand)', async () => {
		const { s, quote, sessionId: a } = await checkoutStarted();
		await db.update(payments).set({ status: 'expired' }).where(eq(payments.checkoutSessionId, a));
		const again = await app.client().action(`/s/${s.token}?/pay`, {});
		const b = (again.data.checkoutUrl as string).split('/').pop()!;
		expect((await payAtFake(b, s.client.email)).status).toBe(303);
		// A correctly signed event for A without a payment to refund (payment_intent null).
		const body = completedEvent(`evt_test_noref_${a.slice(-8)}`, {
			id: a,
			amount: quote.totals.depositMinor
		});
		expect((await postWebhook(body, signed(body))).status).toBe(200);
		const rows = await paymentsOfQuote(quote.quote.id);
		expect(rows.map((p) => [p.checkoutSessionId === a ? 'a' : 'b', p.status]).sort()).toEqual([
			['a', 'duplicate'],
			['b', 'paid']
		]);
		await expectDesignerTold(
			s,
			'the automatic refund failed, refund it with the payment service',
			'The automatic refund failed: refund it with the payment service.'
		);
	});
});

describe('malformed signed webhook events', () => {
	it.each([
		['{}', '{}'],
		['[]', '[]'],
		['null', 'null'],
		['a number', '42'],
		[
			'a session without amounts',
			JSON.stringify({
				id: 'evt_test_shape1',
				type: 'checkout.session.completed',
				data: { object: { id: 'cs_test_shape1' } }
			})
		],
		[
			'an id with a NUL byte',
			JSON.stringify({
				id: 'evt_\u0000x',
				type: 'checkout.session.expired',
				data: { object: { id: 'cs_test_x' } }
			})
		]
	])('%s → 400, logged, nothing stored', async (_label, body) => {
		const before = await db.$count(paymentEvents);
		const res = await postWebhook(body, signed(body));
		expect(res.status, res.text).toBe(400);
		expect(res.json()).toMatchObject({
			message: expect.stringMatching(/^The event is malformed at /)
		});
		expect(await db.$count(paymentEvents)).toBe(before);
		expect(app.app.output()).toContain('payments: signed webhook refused, malformed at');
	});

	it('an event of a type this app ignores is accepted once (the service stops retrying)', async () => {
		const body = JSON.stringify({
			id: `evt_test_other_${Date.now()}`,
			object: 'event',
			type: 'customer.created',
			data: { object: { id: 'cus_test_1' } }
		});
		expect((await postWebhook(body, signed(body))).status).toBe(200);
	});
});
