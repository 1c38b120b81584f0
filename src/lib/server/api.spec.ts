/**
 * The load-test bucket of the API limit (src/lib/server/api.ts): only a server started with a bench
 * token and the development flag (never in production mode: see production.spec.ts) moves calls
 * carrying that token to their own bucket. Anything
 * else is counted under the ordinary 600-a-minute `api` bucket.
 */
import { randomBytes } from 'node:crypto';
import { like } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { demoSceneInput } from '$lib/geometry/standard-library';
import { closeDb, db } from './db';
import { rateLimits } from './db/schema';
import { startApp, type App } from './testing/app-server';
import { Client } from './testing/client';
import { createMember, createStudio } from './testing/factories';

const TOKEN = randomBytes(32).toString('hex');
const apps: App[] = [];
afterAll(async () => {
	await Promise.all(apps.map((a) => a.stop()));
	await closeDb();
});

async function bucketsAfterOneCheck(env: Record<string, string>, sent: string | null) {
	const app = await startApp({ env });
	apps.push(app);
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const c = new Client(app.baseURL).useSession(designer.session);
	const headers: Record<string, string> = {
		'content-type': 'application/json',
		origin: app.baseURL
	};
	if (sent) headers['x-interstice-bench'] = sent;
	const res = await c.request('POST', '/api/check', {
		body: JSON.stringify(demoSceneInput()),
		headers
	});
	expect(res.status, res.text.slice(0, 200)).toBe(200);
	const rows = await db
		.select({ key: rateLimits.key })
		.from(rateLimits)
		.where(like(rateLimits.key, `%:${c.address}:${designer.id}`));
	return rows.map((r) => r.key.split(':')[0]).sort();
}

describe('the bench bucket', () => {
	it('a server with a bench token, outside production mode: the token moves the call to its own bucket', async () => {
		expect(await bucketsAfterOneCheck({ INTERSTICE_BENCH_TOKEN: TOKEN }, TOKEN)).toEqual([
			'api-bench'
		]);
	});

	it('a wrong or short token counts as an ordinary call', async () => {
		expect(
			await bucketsAfterOneCheck(
				{ INTERSTICE_BENCH_TOKEN: TOKEN },
				TOKEN.replace(/.$/, (c) => (c === '0' ? '1' : '0'))
			)
		).toEqual(['api']);
		expect(await bucketsAfterOneCheck({ INTERSTICE_BENCH_TOKEN: 'short' }, 'short')).toEqual([
			'api'
		]);
	});

	it('without the development flag the token does nothing', async () => {
		expect(
			await bucketsAfterOneCheck({ INTERSTICE_BENCH_TOKEN: TOKEN, INTERSTICE_DEV_TOOLS: '' }, TOKEN)
		).toEqual(['api']);
	});

	it('a server without a token ignores the header', async () => {
		expect(await bucketsAfterOneCheck({}, TOKEN)).toEqual(['api']);
	});
});
