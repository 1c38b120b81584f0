/**
 * Production mode (NODE_ENV=production) against the built app: it will not start on missing or
 * built-in settings and says which, one line each; started properly, it accepts no webhook signed
 * with a built-in secret and has no development tools. The build's route list has no /dev/ page
 * and no no-op endpoint in any mode.
 */
import Stripe from 'stripe';
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { readFileSync, readdirSync } from 'node:fs';
import { resolve } from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BUILT_IN_SECRETS } from './config';
import { closeDb } from './db';
import { startApp, freePort, type App } from './testing/app-server';
import { Client } from './testing/client';
import { testDatabaseUrl } from './testing/env';
import { createMember, createStudio } from './testing/factories';

const buildDir = resolve(process.env.INTERSTICE_BUILD_DIR ?? 'build');
const sdk = new Stripe('sk_test_unused');

/** Runs `node build` with exactly this environment; resolves with its exit code and output once it exits (or null if it was still running after 20 s). */
async function startProduction(
	env: Record<string, string>
): Promise<{ code: number | null; output: string }> {
	const port = await freePort();
	const child = spawn(process.execPath, [buildDir], {
		env: {
			PATH: process.env.PATH ?? '',
			NODE_ENV: 'production',
			HOST: '127.0.0.1',
			PORT: String(port),
			DATABASE_URL: testDatabaseUrl(),
			...env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	let output = '';
	child.stdout.on('data', (b: Buffer) => (output += b.toString()));
	child.stderr.on('data', (b: Buffer) => (output += b.toString()));
	return new Promise((done) => {
		const timer = setTimeout(() => {
			child.kill('SIGKILL');
			done({ code: null, output });
		}, 20_000);
		child.once('exit', (code) => {
			clearTimeout(timer);
			done({ code, output });
		});
	});
}

const secret = () => `whsec_${randomBytes(24).toString('hex')}`;
const goodEnv = () => ({
	PAYMENTS_SECRET_KEY: `sk_live_${randomBytes(16).toString('hex')}`,
	PAYMENTS_WEBHOOK_SECRET: secret(),
	ORIGIN: 'https://studio.example.test',
	MAIL_DISABLED: '1'
});

describe('a production-mode start', () => {
	it('without the secrets, ORIGIN and mail settings exits non-zero naming each, one line per setting', async () => {
		const { code, output } = await startProduction({});
		expect(code).not.toBe(0);
		expect(code).not.toBeNull();
		for (const name of [
			'PAYMENTS_SECRET_KEY',
			'PAYMENTS_WEBHOOK_SECRET',
			'ORIGIN',
			'SMTP_HOST',
			'SMTP_PORT',
			'MAIL_FROM'
		]) {
			expect(
				output.split('\n').filter((l) => l.includes(`- ${name} is not set`)),
				name
			).toHaveLength(1);
		}
	});

	it('with the built-in development secrets exits non-zero', async () => {
		const { code, output } = await startProduction({
			...goodEnv(),
			PAYMENTS_SECRET_KEY: BUILT_IN_SECRETS[0],
			PAYMENTS_WEBHOOK_SECRET: BUILT_IN_SECRETS[1]
		});
		expect(code).not.toBe(0);
		expect(output).toContain('PAYMENTS_SECRET_KEY is the built-in development value');
		expect(output).toContain('PAYMENTS_WEBHOOK_SECRET is the built-in development value');
		expect(output).not.toContain('ORIGIN is not set');
		expect(output).not.toContain('SMTP_HOST');
	});

	it('with a development flag or a bench token exits non-zero', async () => {
		const { code, output } = await startProduction({
			...goodEnv(),
			INTERSTICE_DEV_TOOLS: '1',
			INTERSTICE_BENCH_TOKEN: randomBytes(32).toString('hex')
		});
		expect(code).not.toBe(0);
		expect(output).toContain('INTERSTICE_DEV_TOOLS is set');
		expect(output).toContain('INTERSTICE_BENCH_TOKEN is set');
	});

	it('with mail settings instead of MAIL_DISABLED, and everything else set, starts', async () => {
		const app = await startApp({
			env: {
				NODE_ENV: 'production',
				INTERSTICE_DEV_TOOLS: '',
				...goodEnv(),
				MAIL_DISABLED: '',
				SMTP_HOST: '127.0.0.1',
				SMTP_PORT: '2525',
				MAIL_FROM: 'Studio <studio@example.test>'
			}
		});
		await app.stop();
	});
});

describe('a production-mode server', () => {
	const webhookSecret = secret();
	let app: App;
	beforeAll(async () => {
		app = await startApp({
			env: {
				NODE_ENV: 'production',
				INTERSTICE_DEV_TOOLS: '',
				...goodEnv(),
				PAYMENTS_WEBHOOK_SECRET: webhookSecret
			}
		});
	});
	afterAll(async () => {
		await app?.stop();
		await closeDb();
	});

	const event = (id: string) =>
		JSON.stringify({
			id,
			object: 'event',
			type: 'checkout.session.completed',
			data: {
				object: {
					id: 'cs_test_forged0001',
					object: 'checkout.session',
					amount_total: 100,
					currency: 'eur',
					payment_status: 'paid',
					payment_intent: 'pi_test_forged'
				}
			}
		});
	const post = (body: string, key: string) =>
		new Client(app.baseURL).request('POST', '/api/payments/webhook', {
			body,
			headers: {
				'content-type': 'application/json',
				'stripe-signature': sdk.webhooks.generateTestHeaderString({ payload: body, secret: key })
			}
		});

	it('refuses a webhook signed with any built-in secret (400) and takes one signed with its own', async () => {
		for (const [i, key] of BUILT_IN_SECRETS.entries()) {
			const res = await post(event(`evt_test_forged_${i}`), key);
			expect(res.status, key).toBe(400);
		}
		// An event for a session nobody opened: accepted, changes nothing.
		expect((await post(event(`evt_test_own_${Date.now()}`), webhookSecret)).status).toBe(200);
	});

	it('has no development tools: /api/noop and /dev/mail answer 404, signed in or not', async () => {
		const studio = await createStudio();
		const owner = await createMember(studio.id, 'owner');
		for (const c of [new Client(app.baseURL), new Client(app.baseURL).useSession(owner.session)]) {
			const noop = await c.request('POST', '/api/noop', {
				body: '{}',
				headers: { 'content-type': 'application/json', origin: app.baseURL }
			});
			expect(noop.status).toBe(404);
			expect((await c.request('GET', '/dev/mail')).status).toBe(404);
		}
	});

	it('sets Secure on the session cookie', async () => {
		const studio = await createStudio();
		const owner = await createMember(studio.id, 'owner');
		const c = new Client(app.baseURL);
		const res = await c.request('POST', '/signin', {
			body: new URLSearchParams({ email: owner.email, password: owner.password }).toString(),
			headers: {
				'content-type': 'application/x-www-form-urlencoded',
				accept: 'text/html',
				origin: 'https://studio.example.test'
			}
		});
		expect(res.status, res.text.slice(0, 300)).toBe(303);
		expect(c.cookieAttributes('interstice_session')).toMatch(/Secure/);
	});
});

describe('the build', () => {
	it('lists no /dev/ route and no no-op endpoint (the development tools live in the server hook)', () => {
		// adapter-node's server manifest (server/manifest.js, or a hashed chunk of it).
		const files = readdirSync(resolve(buildDir, 'server'), {
			recursive: true,
			encoding: 'utf8'
		}).filter((f) => /(^|\/)manifest\.js(-[\w-]+\.js)?$/.test(f));
		expect(files.length).toBeGreaterThan(0);
		const routeIds = files.flatMap((f) =>
			[...readFileSync(resolve(buildDir, 'server', f), 'utf8').matchAll(/id: *"(\/[^"]*)"/g)].map(
				(m) => m[1]
			)
		);
		expect(routeIds).toContain('/api/check');
		expect(routeIds.filter((r) => r.startsWith('/dev') || r.includes('noop'))).toEqual([]);
	});
});
