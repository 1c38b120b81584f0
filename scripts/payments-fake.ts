/**
 * A local stand-in for the card-payment service, for development and tests only. It answers the
 * few API calls the official SDK makes for a checkout-session flow, serves a hosted checkout page
 * where a test card "pays", then delivers a webhook signed the way the real service signs them
 * (`Stripe-Signature: t=<unix seconds>,v1=<hex HMAC-SHA256 of "<t>.<body>">`) and sends the
 * browser back to the session's success_url.
 *
 * Where the webhook goes: APP_WEBHOOK_URL if set, otherwise /api/payments/webhook on the origin
 * of the session's success_url, so an app on any port (3000, the tests' 3101) gets its own.
 *
 * Refunds: POST /v1/refunds with a paid session's payment_intent (whole amount, or `amount` minor
 * units up to what is left). Test helpers under /_fake/ list sessions, deliveries and refunds.
 *
 * Test cards: 4242 4242 4242 4242 pays; 4000 0000 0000 0002 is declined. State lives in memory.
 */
import { createHmac, randomBytes, timingSafeEqual } from 'node:crypto';
import { createServer, type IncomingMessage, type ServerResponse } from 'node:http';

const port = Number(process.env.PAYMENTS_API_PORT ?? 12111);
const host = process.env.PAYMENTS_API_HOST ?? '127.0.0.1';
const secretKey = process.env.PAYMENTS_SECRET_KEY || 'sk_test_local';
const webhookSecret = process.env.PAYMENTS_WEBHOOK_SECRET || 'whsec_local';
const fixedWebhookUrl = process.env.APP_WEBHOOK_URL || '';
const publicOrigin = `http://${host}:${port}`;
const API_VERSION = '2026-10-28.endive';
const SESSION_LIFETIME_SEC = 24 * 60 * 60;

type Session = {
	id: string;
	object: 'checkout.session';
	amount_subtotal: number;
	amount_total: number;
	currency: string;
	client_reference_id: string | null;
	customer_email: string | null;
	created: number;
	expires_at: number;
	livemode: false;
	metadata: Record<string, string>;
	mode: 'payment';
	payment_intent: string | null;
	payment_status: 'unpaid' | 'paid';
	status: 'open' | 'complete' | 'expired';
	success_url: string;
	cancel_url: string | null;
	url: string | null;
	line_items_summary: { name: string; quantity: number; unit_amount: number }[];
};

type Refund = {
	id: string;
	object: 'refund';
	amount: number;
	currency: string;
	payment_intent: string;
	status: 'succeeded';
	created: number;
	metadata: Record<string, string>;
};

type Delivery = {
	eventId: string;
	type: string;
	url: string;
	body: string;
	attempts: number;
	lastStatus: number | null;
};

const sessions = new Map<string, Session>();
const idempotent = new Map<string, { status: number; body: string }>();
const deliveries: Delivery[] = [];
const refunds: Refund[] = [];

const id = (prefix: string) =>
	`${prefix}_test_${randomBytes(18).toString('base64url').replace(/[-_]/g, 'x')}`;
const now = () => Math.floor(Date.now() / 1000);

/** `a[b][0][c]=1` form bodies, as the SDK encodes its parameters, into nested objects and arrays. */
function parseForm(body: string): Record<string, unknown> {
	const out: Record<string, unknown> = {};
	for (const [rawKey, value] of new URLSearchParams(body)) {
		const parts = rawKey.split(/\[|\]\[|\]/).filter((p, i) => i === 0 || p !== '');
		let node: Record<string, unknown> | unknown[] = out;
		parts.forEach((part, i) => {
			const last = i === parts.length - 1;
			const key: string | number = Array.isArray(node) ? Number(part) : part;
			const container = node as Record<string | number, unknown>;
			if (last) {
				container[key] = value;
				return;
			}
			if (container[key] === undefined) container[key] = /^\d+$/.test(parts[i + 1]) ? [] : {};
			node = container[key] as Record<string, unknown> | unknown[];
		});
	}
	return out;
}

function sign(payload: string, timestamp = now()): string {
	const v1 = createHmac('sha256', webhookSecret)
		.update(`${timestamp}.${payload}`, 'utf8')
		.digest('hex');
	return `t=${timestamp},v1=${v1}`;
}

function send(
	res: ServerResponse,
	status: number,
	body: unknown,
	headers: Record<string, string> = {}
) {
	const text = typeof body === 'string' ? body : JSON.stringify(body);
	res.writeHead(status, {
		'content-type': typeof body === 'string' ? 'text/html; charset=utf-8' : 'application/json',
		...headers
	});
	res.end(text);
}

function apiError(
	res: ServerResponse,
	status: number,
	message: string,
	param?: string,
	code?: string
) {
	send(res, status, {
		error: {
			type: status === 401 ? 'invalid_request_error' : 'invalid_request_error',
			message,
			param,
			code
		}
	});
}

async function readBody(req: IncomingMessage, limit = 1024 * 1024): Promise<string> {
	const chunks: Buffer[] = [];
	let size = 0;
	for await (const chunk of req) {
		size += (chunk as Buffer).length;
		if (size > limit) throw new Error('body too large');
		chunks.push(chunk as Buffer);
	}
	return Buffer.concat(chunks).toString('utf8');
}

function authorised(req: IncomingMessage): boolean {
	const header = req.headers.authorization ?? '';
	const m = /^Bearer (.+)$/.exec(header);
	if (!m) return false;
	const a = Buffer.from(m[1]);
	const b = Buffer.from(secretKey);
	return a.length === b.length && timingSafeEqual(a, b);
}

function isHttpUrl(s: unknown): s is string {
	if (typeof s !== 'string') return false;
	try {
		const u = new URL(s);
		return u.protocol === 'http:' || u.protocol === 'https:';
	} catch {
		return false;
	}
}

function expireIfDue(s: Session) {
	if (s.status === 'open' && s.expires_at <= now()) {
		s.status = 'expired';
		s.url = null;
		void deliver(s, 'checkout.session.expired');
	}
}

function createSession(params: Record<string, unknown>): {
	session?: Session;
	error?: [string, string];
} {
	if (params.mode !== 'payment') return { error: ['Only mode=payment is supported here.', 'mode'] };
	if (!isHttpUrl(params.success_url)) {
		return { error: ['success_url must be an http(s) URL.', 'success_url'] };
	}
	if (params.cancel_url !== undefined && !isHttpUrl(params.cancel_url)) {
		return { error: ['cancel_url must be an http(s) URL.', 'cancel_url'] };
	}
	const items = params.line_items;
	if (!Array.isArray(items) || items.length === 0) {
		return { error: ['line_items is required.', 'line_items'] };
	}
	let currency = '';
	let total = 0;
	const summary: Session['line_items_summary'] = [];
	for (const [i, raw] of items.entries()) {
		const item = raw as {
			quantity?: string;
			price_data?: { currency?: string; unit_amount?: string; product_data?: { name?: string } };
		};
		const quantity = Number(item.quantity ?? 1);
		const unit = Number(item.price_data?.unit_amount);
		const cur = String(item.price_data?.currency ?? '').toLowerCase();
		if (!Number.isInteger(quantity) || quantity < 1) {
			return { error: ['quantity must be a positive integer.', `line_items[${i}][quantity]`] };
		}
		if (!Number.isInteger(unit) || unit < 1) {
			return {
				error: [
					'unit_amount must be a positive integer of minor units.',
					`line_items[${i}][price_data][unit_amount]`
				]
			};
		}
		if (!/^[a-z]{3}$/.test(cur)) {
			return {
				error: ['currency must be a three-letter code.', `line_items[${i}][price_data][currency]`]
			};
		}
		if (currency && cur !== currency) {
			return {
				error: ['All line items must share one currency.', `line_items[${i}][price_data][currency]`]
			};
		}
		currency = cur;
		total += quantity * unit;
		summary.push({
			name: String(item.price_data?.product_data?.name ?? 'Item'),
			quantity,
			unit_amount: unit
		});
	}
	const sid = id('cs');
	const created = now();
	const session: Session = {
		id: sid,
		object: 'checkout.session',
		amount_subtotal: total,
		amount_total: total,
		currency,
		client_reference_id:
			typeof params.client_reference_id === 'string' ? params.client_reference_id : null,
		customer_email: typeof params.customer_email === 'string' ? params.customer_email : null,
		created,
		expires_at: created + SESSION_LIFETIME_SEC,
		livemode: false,
		metadata: (params.metadata as Record<string, string>) ?? {},
		mode: 'payment',
		payment_intent: null,
		payment_status: 'unpaid',
		status: 'open',
		success_url: params.success_url as string,
		cancel_url: (params.cancel_url as string) ?? null,
		url: `${publicOrigin}/pay/${sid}`,
		line_items_summary: summary
	};
	sessions.set(sid, session);
	return { session };
}

/** The session as the API returns it (our summary of line items is the fake's own business). */
function publicSession(s: Session) {
	const { line_items_summary: _, ...rest } = s;
	return rest;
}

function webhookUrlFor(s: Session): string {
	return fixedWebhookUrl || new URL('/api/payments/webhook', s.success_url).toString();
}

async function post(d: Delivery): Promise<number> {
	d.attempts++;
	try {
		const r = await fetch(d.url, {
			method: 'POST',
			headers: {
				'content-type': 'application/json',
				'stripe-signature': sign(d.body),
				'user-agent': 'payments-fake/1'
			},
			body: d.body
		});
		d.lastStatus = r.status;
	} catch {
		d.lastStatus = 0;
	}
	return d.lastStatus ?? 0;
}

/** Posts the event; on failure tries again a few times, as the real service retries. */
async function deliver(s: Session, type: string): Promise<Delivery> {
	const event = {
		id: id('evt'),
		object: 'event',
		api_version: API_VERSION,
		created: now(),
		data: { object: publicSession(s) },
		livemode: false,
		pending_webhooks: 1,
		request: { id: null, idempotency_key: null },
		type
	};
	const d: Delivery = {
		eventId: event.id,
		type,
		url: webhookUrlFor(s),
		body: JSON.stringify(event),
		attempts: 0,
		lastStatus: null
	};
	deliveries.push(d);
	if (deliveries.length > 500) deliveries.shift();
	const status = await post(d);
	if (status < 200 || status >= 300) {
		void (async () => {
			for (const wait of [1000, 3000, 9000]) {
				await new Promise((r) => setTimeout(r, wait));
				const again = await post(d);
				if (again >= 200 && again < 300) return;
			}
		})();
	}
	return d;
}

const esc = (s: string) =>
	s.replace(
		/[&<>"']/g,
		(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!
	);

function money(minor: number, currency: string) {
	const digits =
		new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions()
			.maximumFractionDigits ?? 2;
	return new Intl.NumberFormat('en-GB', { style: 'currency', currency }).format(
		minor / 10 ** digits
	);
}

function checkoutPage(s: Session, error = ''): string {
	const items = s.line_items_summary
		.map((i) => `<li>${esc(i.name)}${i.quantity > 1 ? ` × ${i.quantity}` : ''}</li>`)
		.join('');
	return `<!doctype html><html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width,initial-scale=1">
<title>Test checkout</title>
<style>
body{font-family:system-ui,sans-serif;background:#f2f2f2;color:#222;margin:0;padding:2rem 1rem}
main{max-width:26rem;margin:auto;background:#fff;border:1px solid #ccc;border-radius:8px;padding:1.5rem}
h1{font-size:1.1rem;margin:0 0 .25rem}.note{font-size:.8rem;color:#666;background:#fffbe6;border:1px solid #e6d88a;padding:.5rem;border-radius:4px}
label{display:block;font-size:.85rem;margin-top:.8rem}input{width:100%;box-sizing:border-box;padding:.5rem;font-size:1rem;border:1px solid #aaa;border-radius:4px}
.row{display:flex;gap:.5rem}.row label{flex:1}button{margin-top:1.2rem;width:100%;padding:.7rem;font-size:1rem;background:#234;color:#fff;border:0;border-radius:4px}
.error{color:#b00020;font-size:.9rem}.amount{font-size:1.6rem;font-weight:600;margin:.5rem 0}
</style></head><body><main>
<h1>Test checkout</h1>
<p class="note">Local stand-in for the payment service: no real card is charged. Use 4242 4242 4242 4242, any future expiry and any CVC.</p>
<ul>${items}</ul>
<p class="amount">${esc(money(s.amount_total, s.currency.toUpperCase()))}</p>
${error ? `<p class="error" role="alert">${esc(error)}</p>` : ''}
<form method="post" action="/pay/${esc(s.id)}">
<label>E-mail<input name="email" type="email" autocomplete="email" value="${esc(s.customer_email ?? '')}" required></label>
<label>Card number<input name="card" inputmode="numeric" autocomplete="cc-number" placeholder="4242 4242 4242 4242" required></label>
<div class="row"><label>Expiry (MM/YY)<input name="expiry" autocomplete="cc-exp" placeholder="12/34" required></label>
<label>CVC<input name="cvc" inputmode="numeric" autocomplete="cc-csc" placeholder="123" required></label></div>
<label>Name on card<input name="name" autocomplete="cc-name" required></label>
<button type="submit">Pay ${esc(money(s.amount_total, s.currency.toUpperCase()))}</button>
</form>
${s.cancel_url ? `<p><a href="${esc(s.cancel_url)}">Cancel and go back</a></p>` : ''}
</main></body></html>`;
}

function luhn(digits: string): boolean {
	let sum = 0;
	for (let i = 0; i < digits.length; i++) {
		let d = Number(digits[digits.length - 1 - i]);
		if (i % 2 === 1) {
			d *= 2;
			if (d > 9) d -= 9;
		}
		sum += d;
	}
	return digits.length >= 12 && sum % 10 === 0;
}

function cardProblem(form: URLSearchParams): string {
	const card = (form.get('card') ?? '').replace(/[\s-]/g, '');
	if (!/^\d{12,19}$/.test(card) || !luhn(card)) return 'The card number is not valid.';
	const exp = /^(\d{2})\s*\/\s*(\d{2})$/.exec(form.get('expiry') ?? '');
	if (!exp || Number(exp[1]) < 1 || Number(exp[1]) > 12) return 'The expiry must look like MM/YY.';
	const end = new Date(Date.UTC(2000 + Number(exp[2]), Number(exp[1]), 1));
	if (end.getTime() <= Date.now()) return 'The card has expired.';
	if (!/^\d{3,4}$/.test(form.get('cvc') ?? '')) return 'The CVC must be 3 or 4 digits.';
	if (card === '4000000000000002') return 'The card was declined.';
	return '';
}

async function handle(req: IncomingMessage, res: ServerResponse) {
	const url = new URL(req.url ?? '/', publicOrigin);
	const path = url.pathname;

	if (path === '/health') return send(res, 200, { ok: true });

	if (path.startsWith('/v1/')) {
		if (!authorised(req)) return apiError(res, 401, 'Invalid API key provided.');
		const idem = req.headers['idempotency-key'];
		const idemKey = typeof idem === 'string' && req.method === 'POST' ? `${path}:${idem}` : null;
		if (idemKey && idempotent.has(idemKey)) {
			const hit = idempotent.get(idemKey)!;
			return send(res, hit.status, JSON.parse(hit.body), { 'idempotent-replayed': 'true' });
		}
		const reply = (status: number, body: unknown) => {
			if (idemKey) idempotent.set(idemKey, { status, body: JSON.stringify(body) });
			send(res, status, body, { 'request-id': id('req') });
		};
		if (req.method === 'POST' && path === '/v1/checkout/sessions') {
			const { session, error } = createSession(parseForm(await readBody(req)));
			if (error) return apiError(res, 400, error[0], error[1]);
			return reply(200, publicSession(session!));
		}
		if (req.method === 'POST' && path === '/v1/refunds') {
			const params = parseForm(await readBody(req));
			const paid = [...sessions.values()].find(
				(x) => x.payment_intent !== null && x.payment_intent === params.payment_intent
			);
			if (!paid) {
				return apiError(
					res,
					400,
					`No such payment_intent: '${String(params.payment_intent ?? '')}'`,
					'payment_intent',
					'resource_missing'
				);
			}
			const left =
				paid.amount_total -
				refunds
					.filter((r) => r.payment_intent === paid.payment_intent)
					.reduce((sum, r) => sum + r.amount, 0);
			const amount = params.amount === undefined ? left : Number(params.amount);
			if (left <= 0) {
				return apiError(
					res,
					400,
					'The charge has already been refunded.',
					'payment_intent',
					'charge_already_refunded'
				);
			}
			if (!Number.isInteger(amount) || amount < 1 || amount > left) {
				return apiError(
					res,
					400,
					`amount must be a whole number of minor units from 1 to ${left}.`,
					'amount'
				);
			}
			const refund: Refund = {
				id: id('re'),
				object: 'refund',
				amount,
				currency: paid.currency,
				payment_intent: paid.payment_intent!,
				status: 'succeeded',
				created: now(),
				metadata: (params.metadata as Record<string, string>) ?? {}
			};
			refunds.push(refund);
			return reply(200, refund);
		}
		const m = /^\/v1\/checkout\/sessions\/([A-Za-z0-9_]+)(\/expire)?$/.exec(path);
		if (m) {
			const s = sessions.get(m[1]);
			if (!s) {
				return apiError(
					res,
					404,
					`No such checkout.session: '${m[1]}'`,
					'session',
					'resource_missing'
				);
			}
			expireIfDue(s);
			if (m[2] && req.method === 'POST') {
				if (s.status !== 'open') return apiError(res, 400, 'Only open sessions can be expired.');
				s.status = 'expired';
				s.url = null;
				void deliver(s, 'checkout.session.expired');
				return reply(200, publicSession(s));
			}
			if (req.method === 'GET') return reply(200, publicSession(s));
		}
		return apiError(res, 404, `Unrecognized request URL (${req.method}: ${path}).`);
	}

	const pay = /^\/pay\/([A-Za-z0-9_]+)$/.exec(path);
	if (pay) {
		const s = sessions.get(pay[1]);
		if (!s) return send(res, 404, '<!doctype html><p>This checkout does not exist.</p>');
		expireIfDue(s);
		if (s.status === 'expired') {
			return send(
				res,
				410,
				'<!doctype html><p>This checkout has expired. Go back and start again.</p>'
			);
		}
		if (s.status === 'complete') {
			res.writeHead(303, { location: s.success_url.replace('{CHECKOUT_SESSION_ID}', s.id) });
			return res.end();
		}
		if (req.method === 'GET') return send(res, 200, checkoutPage(s));
		if (req.method === 'POST') {
			const form = new URLSearchParams(await readBody(req, 16 * 1024));
			const problem = cardProblem(form);
			if (problem) return send(res, 402, checkoutPage(s, problem));
			s.status = 'complete';
			s.payment_status = 'paid';
			s.payment_intent = id('pi');
			s.customer_email = form.get('email') || s.customer_email;
			s.url = null;
			await deliver(s, 'checkout.session.completed');
			res.writeHead(303, { location: s.success_url.replace('{CHECKOUT_SESSION_ID}', s.id) });
			return res.end();
		}
	}

	// Test helpers: what was delivered, and delivering an event again exactly as before (a replay).
	if (path === '/_fake/deliveries' && req.method === 'GET') {
		const session = url.searchParams.get('session');
		const list = deliveries.filter(
			(d) => !session || JSON.parse(d.body).data.object.id === session
		);
		return send(
			res,
			200,
			list.map(({ body: _, ...d }) => d)
		);
	}
	if (path === '/_fake/sessions' && req.method === 'GET') {
		const quote = url.searchParams.get('quote');
		return send(
			res,
			200,
			[...sessions.values()]
				.filter((x) => !quote || x.metadata.quote_id === quote)
				.map(publicSession)
		);
	}
	if (path === '/_fake/refunds' && req.method === 'GET') {
		const pi = url.searchParams.get('payment_intent');
		return send(
			res,
			200,
			refunds.filter((r) => !pi || r.payment_intent === pi)
		);
	}
	const replay = /^\/_fake\/deliveries\/(evt_[A-Za-z0-9_]+)\/replay$/.exec(path);
	if (replay && req.method === 'POST') {
		const d = deliveries.find((x) => x.eventId === replay[1]);
		if (!d) return send(res, 404, { error: 'no such event' });
		return send(res, 200, { status: await post(d) });
	}

	send(res, 404, { error: { type: 'invalid_request_error', message: 'Not found.' } });
}

const server = createServer((req, res) => {
	handle(req, res).catch((e: unknown) => {
		console.error(e);
		if (!res.headersSent) {
			send(res, 500, { error: { type: 'api_error', message: 'The fake failed.' } });
		}
	});
});

server.listen(port, host, () =>
	console.log(
		`payments fake on ${publicOrigin} (webhooks → ${fixedWebhookUrl || 'success_url origin'})`
	)
);
