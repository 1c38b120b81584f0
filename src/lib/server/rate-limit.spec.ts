/**
 * Rate limits: counted in PostgreSQL, so they hold across a restart of the app and between
 * processes. Each test works from a loopback address of its own (see testing/client.ts).
 */
import { eq, like, sql } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from './db';
import { rateLimits } from './db/schema';
import { clear, hit, limits } from './rate-limit';
import { startApp, type App } from './testing/app-server';
import { Client, randomLoopback } from './testing/client';
import { createUser, unique, uniqueEmail } from './testing/factories';

const apps: App[] = [];
async function start() {
	const a = await startApp();
	apps.push(a);
	return a;
}
afterAll(async () => {
	await Promise.all(apps.map((a) => a.stop()));
	await closeDb();
});

describe('hit() in the database', () => {
	it('keeps its counters in an unlogged table (no WAL flush per counted request)', async () => {
		// pg_class.relpersistence: 'p' permanent, 'u' unlogged (PostgreSQL manual, "pg_class").
		const [row] = await db.execute<{ relpersistence: string }>(
			sql`select relpersistence from pg_class where relname = 'rate_limit' and relkind = 'r'`
		);
		expect(row?.relpersistence).toBe('u');
	});

	it('counts up inside a window and starts again after it', async () => {
		const key = unique('test-bucket');
		const limit = { max: 2, windowSec: 60 };
		expect(await hit(key, limit)).toMatchObject({ allowed: true, count: 1 });
		expect(await hit(key, limit)).toMatchObject({ allowed: true, count: 2 });
		const third = await hit(key, limit);
		expect(third).toMatchObject({ allowed: false, count: 3 });
		expect(third.retryAfterSec).toBeGreaterThan(0);
		expect(third.retryAfterSec).toBeLessThanOrEqual(60);

		await db
			.update(rateLimits)
			.set({ windowStartedAt: sql`now() - interval '61 seconds'` })
			.where(eq(rateLimits.key, key));
		expect(await hit(key, limit)).toMatchObject({ allowed: true, count: 1 });
		await clear(key);
		expect(await db.select().from(rateLimits).where(eq(rateLimits.key, key))).toEqual([]);
	});

	it('loses no count when many attempts arrive at once', async () => {
		const key = unique('test-bucket');
		const results = await Promise.all(
			Array.from({ length: 25 }, () => hit(key, { max: 20, windowSec: 60 }))
		);
		expect(results.map((r) => r.count).sort((a, b) => a - b)).toEqual(
			Array.from({ length: 25 }, (_, i) => i + 1)
		);
		expect(results.filter((r) => r.allowed)).toHaveLength(20);
		await clear(key);
	});
});

describe('sign-in limit over HTTP', () => {
	it(`answers 429 after ${limits.signIn.max} tries, even with the right password, and still after a restart`, async () => {
		const [first, user] = await Promise.all([start(), createUser()]);
		const address = randomLoopback();
		const c = new Client(first.baseURL, { address });
		for (let i = 0; i < limits.signIn.max; i++) {
			expect((await c.signIn(user.email, `wrong-password-${i}`)).status).toBe(400);
		}
		const blocked = await c.signIn(user.email, user.password);
		expect(blocked.status).toBe(429);
		expect(blocked.text).toContain('Too many attempts');
		expect(Number(blocked.header('retry-after'))).toBeGreaterThan(0);
		expect(c.sessionId).toBeUndefined();

		// The counter is a row in PostgreSQL, keyed by (at least) the client's address.
		const rows = await db
			.select()
			.from(rateLimits)
			.where(like(rateLimits.key, `signin%:${address}%`));
		expect(Math.max(...rows.map((r) => r.count))).toBe(limits.signIn.max + 1);

		// A new process on another port: the counter lives in the database, not in memory.
		await first.stop();
		const restarted = await start();
		const again = new Client(restarted.baseURL, { address });
		const still = await again.signIn(user.email, user.password);
		expect(still.status).toBe(429);
		expect(again.sessionId).toBeUndefined();

		// Somebody else, from another address, is not held back.
		const other = new Client(restarted.baseURL);
		expect((await other.signIn(user.email, user.password)).status).toBe(303);
	});
});

describe('reset limit over HTTP', () => {
	it(`answers 429 after ${limits.reset.max} requests from one address, shared by two processes`, async () => {
		const address = randomLoopback();
		const [a, b] = await Promise.all([start(), start()]);
		const viaA = new Client(a.baseURL, { address });
		const viaB = new Client(b.baseURL, { address });
		for (let i = 0; i < limits.reset.max; i++) {
			const c = i % 2 === 0 ? viaA : viaB;
			expect((await c.postForm('/reset', { email: uniqueEmail('nobody') })).status).toBe(200);
		}
		const blocked = await viaB.postForm('/reset', { email: uniqueEmail('nobody') });
		expect(blocked.status).toBe(429);
		expect(blocked.text).toContain('Too many attempts');
	});
});
