/**
 * Accounts against the built app and the real PostgreSQL: sign up, sign in, sign out (here and
 * everywhere), password reset by mailed link, and the headers every page carries.
 */
import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { passwordResets, sessions, users } from './db/schema';
import {
	accountRowCounts,
	createSession,
	createUser,
	expireResets,
	sessionCount,
	TEST_PASSWORD,
	uniqueEmail
} from './testing/factories';
import { extractLink, lastMailId, listMail, waitForMail } from './testing/mail';
import { useApp } from './testing/suite';
import { outboxOf } from './outbox';

const app = useApp();
const NO_MATCH = 'That e-mail and password do not match an account.';
/** A page's HTML without its per-response CSP nonce, to compare two answers. */
const stripNonce = (html: string) => html.replace(/nonce="[^"]*"/g, 'nonce=""');

describe('sign up', () => {
	async function confirmFromMail(email: string, afterId = 0) {
		const mail = await waitForMail(email, {
			subject: 'Confirm your address for Interstice',
			afterId
		});
		return extractLink(mail.text, '/verify/');
	}

	it('makes an unconfirmed account, mails a confirmation link, and signs in only once it is opened', async () => {
		const c = app.client();
		const email = uniqueEmail('signup');
		const res = await c.signUp({
			name: 'Nia Builder',
			email: email.toUpperCase(),
			password: 'long-enough-1'
		});
		expect(res.status).toBe(303);
		expect(res.location).toBe('/check-mail');
		expect(c.sessionId).toBeUndefined();

		const [row] = await db.select().from(users).where(eq(users.email, email));
		expect(row.name).toBe('Nia Builder');
		expect(row.emailVerifiedAt).toBeNull();
		// OWASP Password Storage Cheat Sheet: argon2id, at least m=19456 (19 MiB), t=2, p=1.
		expect(row.passwordHash).toMatch(/^\$argon2id\$v=19\$m=19456,t=2,p=1\$/);
		expect(row.passwordHash).not.toContain('long-enough-1');

		const link = await confirmFromMail(email);
		expect(new URL(link).origin).toBe(app.baseURL);
		const page = await c.get(link);
		expect(page.status).toBe(200);
		expect(page.text).toContain('Confirm your address');
		expect(page.header('referrer-policy')).toBe('same-origin');
		// Opening the link writes nothing; the button does.
		expect(
			(await db.select().from(users).where(eq(users.email, email)))[0].emailVerifiedAt
		).toBeNull();

		const confirmed = await c.postForm(link);
		expect(confirmed.status).toBe(303);
		expect(confirmed.location).toBe('/studios/new');
		expect(c.sessionId).toBeTruthy();
		const attrs = c.cookieAttributes('interstice_session') ?? '';
		expect(attrs).toMatch(/HttpOnly/i);
		expect(attrs).toMatch(/SameSite=Lax/i);
		expect(attrs).toMatch(/Path=\//i);
		const account = await c.get('/account');
		expect(account.status).toBe(200);
		expect(account.text).toContain(email);
		expect(
			(await db.select().from(users).where(eq(users.email, email)))[0].emailVerifiedAt
		).not.toBeNull();

		const again = await app.client().postForm(link);
		expect(again.status).toBe(400);
		expect(again.text).toContain('This link has expired or was already used');
	});

	it('answers a known address exactly as a new one, changes nothing, and tells the owner by mail', async () => {
		// A probe saw "An account with this e-mail exists" here: sign-up told who has an account.
		const user = await createUser();
		const fresh = uniqueEmail('fresh');
		const before = await accountRowCounts();
		const known = app.client();
		const a = await known.signUp({
			name: 'Someone Else',
			email: user.email.toUpperCase(),
			password: 'other-password-7'
		});
		const b = await app
			.client()
			.signUp({ name: 'Someone New', email: fresh, password: 'other-password-7' });
		expect([a.status, a.location]).toEqual([b.status, b.location]);
		expect([a.status, a.location]).toEqual([303, '/check-mail']);
		expect(known.sessionId).toBeUndefined();
		const followed = [await app.client().get(a.location!), await app.client().get(b.location!)];
		expect(followed[0].status).toBe(200);
		expect(stripNonce(followed[0].text)).toBe(stripNonce(followed[1].text));
		// The new address made one (unconfirmed) row; the known one none.
		expect(await accountRowCounts()).toEqual({ ...before, users: before.users + 1 });
		// Both did the same: one sign-up row in the outbox each.
		expect((await outboxOf(user.email)).map((r) => r.kind)).toEqual(['sign-up']);
		expect((await outboxOf(fresh)).map((r) => r.kind)).toEqual(['sign-up']);

		const mail = await waitForMail(user.email, {
			subject: 'Someone tried to sign up with your address'
		});
		expect(extractLink(mail.text, '/signin')).toBe(`${app.baseURL}/signin`);
		expect(extractLink(mail.text, '/reset')).toBe(`${app.baseURL}/reset`);
		expect(mail.text).not.toMatch(/\/verify\//);
		// Nothing about the account changed: the old password still works, the new one does not.
		expect((await app.client().signIn(user.email, user.password)).status).toBe(303);
		expect((await app.client().signIn(user.email, 'other-password-7')).status).toBe(400);
	});

	it('an unconfirmed account that signs in gets only "check your mail" and a fresh link, no session', async () => {
		const user = await createUser({ verified: false });
		const c = app.client();
		const after = await lastMailId(user.email);
		const res = await c.signIn(user.email, user.password);
		expect(res.status).toBe(303);
		expect(res.location).toBe('/check-mail');
		expect(c.sessionId).toBeUndefined();
		expect(await sessionCount(user.id)).toBe(0);
		const link = await confirmFromMail(user.email, after);
		expect((await c.postForm(link)).location).toBe('/studios/new');
		expect((await c.get('/account')).status).toBe(200);
	});

	it('the link confirms the sign-up it was mailed for: an earlier sign-up by someone else gets nothing', async () => {
		const email = uniqueEmail('claimed');
		// Someone who does not own the address signs up with it first …
		await app.client().signUp({ name: 'Squatter', email, password: 'squatter-pass-1' });
		const first = await waitForMail(email, { subject: 'Confirm your address for Interstice' });
		// … then the owner signs up and opens the link from their own sign-up.
		await app.client().signUp({ name: 'Real Owner', email, password: 'owner-password-2' });
		const own = await confirmFromMail(email, first.id);
		expect((await app.client().postForm(own)).status).toBe(303);
		const [row] = await db.select().from(users).where(eq(users.email, email));
		expect(row.name).toBe('Real Owner');
		expect((await app.client().signIn(email, 'squatter-pass-1')).status).toBe(400);
		expect((await app.client().signIn(email, 'owner-password-2')).status).toBe(303);
		// The squatter's link died with the confirmation.
		expect((await app.client().postForm(extractLink(first.text, '/verify/'))).status).toBe(400);
	});
});

describe('sign in', () => {
	it('starts a session and goes to the builds, or to a same-site `next`', async () => {
		const user = await createUser();
		const c = app.client();
		const res = await c.signIn(user.email.toUpperCase(), user.password);
		expect(res.status).toBe(303);
		expect(res.location).toBe('/builds');
		expect(await sessionCount(user.id)).toBe(1);

		const next = await app
			.client()
			.postForm('/signin', { email: user.email, password: user.password, next: '/account' });
		expect(next.location).toBe('/account');
		const offsite = await app.client().postForm('/signin', {
			email: user.email,
			password: user.password,
			next: '//elsewhere.test/x'
		});
		expect(offsite.location).toBe('/builds');
	});

	it('stores only the SHA-256 of the session token; the stored id does not work as a cookie', async () => {
		// Session ids used to be stored as they were: anyone reading the table could use them.
		const user = await createUser();
		const c = app.client();
		expect((await c.signIn(user.email, user.password)).status).toBe(303);
		const token = c.sessionId!;
		const rows = await db
			.select({ id: sessions.id })
			.from(sessions)
			.where(eq(sessions.userId, user.id));
		// FIPS 180-4 SHA-256 via node:crypto as the oracle.
		expect(rows.map((r) => r.id)).toEqual([createHash('sha256').update(token).digest('hex')]);
		expect((await c.get('/account')).status).toBe(200);
		const withStoredId = await app.client({ session: rows[0].id }).get('/account');
		expect(withStoredId.status).toBe(303);
		expect(withStoredId.location).toBe('/signin?next=%2Faccount');
	});

	it('gives the same answer for a wrong password and an unknown e-mail, and no session', async () => {
		const user = await createUser();
		const wrong = app.client();
		const unknown = app.client();
		const a = await wrong.action('/signin', { email: user.email, password: 'not-the-password-9' });
		const b = await unknown.action('/signin', {
			email: uniqueEmail('nobody'),
			password: 'not-the-password-9'
		});
		expect(a).toMatchObject({ type: 'failure', status: 400, data: { errors: { _: NO_MATCH } } });
		expect(b.type).toBe(a.type);
		expect(b.status).toBe(a.status);
		expect(b.data.errors).toEqual(a.data.errors);
		expect(wrong.sessionId).toBeUndefined();
		expect(unknown.sessionId).toBeUndefined();
		expect(await sessionCount(user.id)).toBe(0);

		// And as plain HTML pages: same status, same message.
		const pa = await app.client().signIn(user.email, 'not-the-password-9');
		const pb = await app.client().signIn(uniqueEmail('nobody'), 'not-the-password-9');
		expect([pa.status, pb.status]).toEqual([400, 400]);
		expect(pa.text).toContain(NO_MATCH);
		expect(pb.text).toContain(NO_MATCH);
	});

	it('refuses a form posted from another site (SvelteKit CSRF check)', async () => {
		const user = await createUser();
		const c = app.client();
		const res = await c.postForm(
			'/signin',
			{ email: user.email, password: user.password },
			{ origin: 'http://elsewhere.test' }
		);
		expect(res.status).toBe(403);
		expect(c.sessionId).toBeUndefined();
		expect(await sessionCount(user.id)).toBe(0);
	});
});

describe('sign out', () => {
	it('ends this session only', async () => {
		const user = await createUser();
		const here = app.client({ session: await createSession(user.id) });
		const there = app.client({ session: await createSession(user.id) });
		const res = await here.signOut();
		expect(res.status).toBe(303);
		expect(res.location).toBe('/');
		expect(here.sessionId).toBeUndefined();
		expect(await sessionCount(user.id)).toBe(1);
		expect((await there.get('/account')).status).toBe(200);
	});

	it('everywhere ends every session of the user, and only theirs', async () => {
		const user = await createUser();
		const bystander = await createUser();
		const laptop = app.client();
		expect((await laptop.signIn(user.email, user.password)).status).toBe(303);
		const phone = app.client();
		expect((await phone.signIn(user.email, user.password)).status).toBe(303);
		const stolenSession = await createSession(user.id);
		const other = app.client({ session: await createSession(bystander.id) });
		expect(await sessionCount(user.id)).toBe(3);

		const res = await laptop.postForm('/account?/everywhere');
		expect(res.status).toBe(303);
		expect(res.location).toBe('/signin');
		expect(await sessionCount(user.id)).toBe(0);
		for (const c of [laptop, phone, app.client({ session: stolenSession })]) {
			const page = await c.get('/account');
			expect(page.status).toBe(303);
			expect(page.location).toBe('/signin?next=%2Faccount');
		}
		expect((await other.get('/account')).status).toBe(200);
	});
});

describe('password reset by mailed link', () => {
	const SENT = 'a link to choose a new password is on its way';
	/** The page's HTML with runs of white space as one space, as a browser shows it. */
	const shown = (html: string) => html.replace(/\s+/g, ' ');

	/** A used or expired link: its page says so, and a new password posted to it is refused. */
	async function expectDeadLink(link: string, password: string) {
		const page = await app.client().get(link);
		expect(page.status).toBe(200);
		expect(page.text).toContain('This link no longer works');
		const post = await app.client().postForm(link, { password });
		expect(post.status).toBe(400);
		expect(post.text).toContain('This link has expired or was already used');
	}

	async function requestLink(email: string) {
		const after = await lastMailId(email);
		const res = await app.client().postForm('/reset', { email });
		expect(res.status).toBe(200);
		expect(shown(res.text)).toContain(SENT);
		const mail = await waitForMail(email, {
			subject: 'Reset your Interstice password',
			afterId: after
		});
		return extractLink(mail.text, '/reset/');
	}

	it('answers the same for an unknown address and mails nothing', async () => {
		const nobody = uniqueEmail('nobody');
		const before = await accountRowCounts();
		const res = await app.client().postForm('/reset', { email: nobody });
		expect(res.status).toBe(200);
		expect(shown(res.text)).toContain(SENT);
		expect(await listMail(nobody)).toEqual([]);
		expect(await accountRowCounts()).toEqual(before);
	});

	it('does the same work for a known and an unknown address: one outbox row each, the mail after the answer', async () => {
		// A probe timed ~110 ms for a known address against ~4 ms for an unknown one: the mail went
		// out inside the request. Now the request only adds an outbox row, whatever the address.
		const user = await createUser();
		const nobody = uniqueEmail('nobody');
		const a = await app.client().postForm('/reset', { email: user.email });
		const b = await app.client().postForm('/reset', { email: nobody });
		expect([a.status, b.status]).toEqual([200, 200]);
		expect(stripNonce(a.text.replaceAll(user.email, 'X'))).toBe(
			stripNonce(b.text.replaceAll(nobody, 'X'))
		);
		expect((await outboxOf(user.email)).map((r) => r.kind)).toEqual(['password-reset']);
		expect((await outboxOf(nobody)).map((r) => r.kind)).toEqual(['password-reset']);
		await waitForMail(user.email, { subject: 'Reset your Interstice password' });
		// The unknown address's row is finished too, with nothing sent.
		for (let i = 0; i < 100 && !(await outboxOf(nobody))[0].doneAt; i++) {
			await new Promise((r) => setTimeout(r, 100));
		}
		expect((await outboxOf(nobody))[0]).toMatchObject({ attempts: 0, lastError: null });
		expect((await outboxOf(nobody))[0].doneAt).not.toBeNull();
		expect(await listMail(nobody)).toEqual([]);
	});

	it('a reset ends every other reset link of the account', async () => {
		// A probe found an older link still working after the password was reset with a newer one.
		const user = await createUser();
		const first = await requestLink(user.email);
		const second = await requestLink(user.email);
		expect(first).not.toBe(second);
		expect((await app.client().postForm(second, { password: 'fresh-password-2' })).status).toBe(
			303
		);
		const stale = await app.client().postForm(first, { password: 'attacker-password-3' });
		expect(stale.status).toBe(400);
		expect(stale.text).toContain('This link has expired or was already used');
		expect((await app.client().get(first)).text).toContain('This link no longer works');
		expect((await app.client().signIn(user.email, 'fresh-password-2')).status).toBe(303);
	});

	it('sets a new password once, ends old sessions, and the used link stops working', async () => {
		const user = await createUser();
		const oldSession = app.client({ session: await createSession(user.id) });
		const link = await requestLink(user.email);
		expect(new URL(link).origin).toBe(app.baseURL);

		// Only the token's SHA-256 is stored (FIPS 180-4), never the token itself.
		const token = new URL(link).pathname.split('/').pop() ?? '';
		expect(token.length).toBeGreaterThanOrEqual(43);
		const [stored] = await db
			.select()
			.from(passwordResets)
			.where(eq(passwordResets.userId, user.id));
		expect(stored.tokenHash).toBe(createHash('sha256').update(token).digest('hex'));

		const c = app.client();
		const form = await c.get(link);
		expect(form.status).toBe(200);
		expect(form.text).toContain('Choose a new password');
		expect(form.header('referrer-policy')).toBe('same-origin');

		const saved = await c.postForm(link, { password: 'fresh-password-2' });
		expect(saved.status).toBe(303);
		expect(saved.location).toBe('/signin?reset=1');
		expect(await sessionCount(user.id)).toBe(0);
		expect((await oldSession.get('/account')).status).toBe(303);

		expect((await app.client().signIn(user.email, TEST_PASSWORD)).status).toBe(400);
		expect((await app.client().signIn(user.email, 'fresh-password-2')).status).toBe(303);

		await expectDeadLink(link, 'attacker-password-3');
		expect((await app.client().signIn(user.email, 'fresh-password-2')).status).toBe(303);
	});

	it('refuses an expired link with a clear page and keeps the old password', async () => {
		const user = await createUser();
		const link = await requestLink(user.email);
		await expireResets(user.id);

		await expectDeadLink(link, 'fresh-password-2');
		expect((await app.client().signIn(user.email, TEST_PASSWORD)).status).toBe(303);
		const [u] = await db
			.select({ n: sessions.id })
			.from(sessions)
			.where(eq(sessions.userId, user.id));
		expect(u).toBeTruthy();
	});
});

describe('headers on every page', () => {
	it('sends a content security policy with no third-party origin and no framing', async () => {
		const res = await app.client().get('/');
		expect(res.status).toBe(200);
		const csp = res.header('content-security-policy') ?? '';
		// Content Security Policy Level 3 (W3C): directives this app relies on.
		expect(csp).toContain("default-src 'self'");
		expect(csp).toContain("frame-ancestors 'none'");
		expect(csp).toContain("object-src 'none'");
		expect(csp).not.toMatch(/https?:\/\//);
		expect(res.header('x-content-type-options')).toBe('nosniff');
		expect(res.header('x-frame-options')).toBe('DENY');
		expect(res.header('referrer-policy')).toBe('strict-origin-when-cross-origin');
	});

	it('keeps signed-in pages out of shared caches', async () => {
		const user = await createUser();
		const res = await app.client({ session: await createSession(user.id) }).get('/account');
		expect(res.header('cache-control')).toContain('no-store');
	});

	it('answers an unknown address with the styled 404 page', async () => {
		const res = await app.client().get('/no/such/page');
		expect(res.status).toBe(404);
		expect(res.text).toContain('Nothing fits here');
		expect(res.text).not.toMatch(/at .*\.js:\d+/);
	});
});
