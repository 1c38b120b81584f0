/**
 * Soak run (`npm run soak`, not part of `npm test`): one built app process (`node build`, as
 * `npm start` serves it) under mixed ordinary use from several accounts for a while: editor
 * loads, server checks, autosaves, sheet PDFs, client pages, comparison and scene checks through
 * the API (now and then the heaviest scene the cost limits allow). Prints the server's memory at
 * the start and the end and every minute, and the error count (5xx, network errors, or a status
 * the request should not get). Exits non-zero when there were errors.
 *
 * Needs the test database (DATABASE_URL naming a database with "test" in its name, migrated and
 * seeded) and a build (`npx vite build`). Options: --minutes=N (10), --accounts=N (4),
 * --pause-ms=N (100, between one account's requests).
 */
import { resolve } from 'node:path';
import { demoSceneInput } from '../src/lib/geometry/standard-library';
import { largestAllowedPile, pileSceneInput } from '../src/lib/server/testing/engine-hostile';
import { closeDb } from '../src/lib/server/db';
import { sharedDemo } from '../src/lib/server/testing/sharing';
import { Client, startApp } from '../src/lib/server/testing/app-server';

const args = new Map(
	process.argv.slice(2).map((a) => a.replace(/^--/, '').split('=') as [string, string])
);
const MINUTES = Number(args.get('minutes') ?? 10);
const ACCOUNTS = Number(args.get('accounts') ?? 4);
const PAUSE_MS = Number(args.get('pause-ms') ?? 100);

type Memory = { rss: number; heapUsed: number; heapTotal: number; external: number };
const mb = (b: number) => `${(b / 1024 / 1024).toFixed(1)} MB`;
const show = (m: Memory | null) =>
	m
		? `rss ${mb(m.rss)}, heap used ${mb(m.heapUsed)} of ${mb(m.heapTotal)}, external ${mb(m.external)}`
		: 'unknown';

async function main() {
	const app = await startApp({
		env: { NODE_OPTIONS: `--import ${resolve(import.meta.dirname, 'soak-memory.mjs')}` }
	});
	const memory = (): Memory | null => {
		const line = app
			.output()
			.split('\n')
			.reverse()
			.find((l) => l.startsWith('soak-memory '));
		return line ? (JSON.parse(line.slice('soak-memory '.length)) as Memory) : null;
	};
	const accounts = await Promise.all(Array.from({ length: ACCOUNTS }, () => sharedDemo()));
	const heavy = JSON.stringify(pileSceneInput(largestAllowedPile()));
	const demo = JSON.stringify(demoSceneInput());
	const counts = new Map<string, number>();
	const errors: string[] = [];
	let requests = 0;

	const jsonHeaders = {
		'content-type': 'application/json',
		accept: 'application/json',
		origin: app.baseURL
	};
	await new Promise((r) => setTimeout(r, 5500));
	const start = memory();
	console.log(`soak: ${MINUTES} min, ${ACCOUNTS} accounts, server at ${app.baseURL}`);
	console.log(`memory at start: ${show(start)}`);
	const endAt = Date.now() + MINUTES * 60_000;

	async function account(a: (typeof accounts)[number]) {
		const designer = new Client(app.baseURL).useSession(a.designer.session);
		const visitor = new Client(app.baseURL);
		let version = (
			await designer.get(`/api/builds/${a.buildId}/variants/${a.variantId}`, {
				accept: 'application/json'
			})
		).json<{ version: number }>().version;
		let margin = 2;
		const actions: [string, () => Promise<{ status: number; text: string }>, number[]][] = [
			['editor', () => designer.get(`/builds/${a.buildId}`), [200]],
			[
				'server check',
				() =>
					designer.request('POST', `/api/builds/${a.buildId}/check`, {
						body: JSON.stringify({ settings: a.settings }),
						headers: jsonHeaders
					}),
				[200]
			],
			[
				'save',
				async () => {
					margin = margin === 2 ? 2.5 : 2;
					const res = await designer.request(
						'PUT',
						`/api/builds/${a.buildId}/variants/${a.variantId}`,
						{
							body: JSON.stringify({ version, settings: { ...a.settings, marginMm: margin } }),
							headers: jsonHeaders
						}
					);
					if (res.status === 200) version = res.json<{ version: number }>().version;
					return res;
				},
				[200]
			],
			['sheet pdf', () => designer.get(`/builds/${a.buildId}/sheet.pdf`), [200]],
			['client page', () => visitor.get(`/s/${a.token}`), [200]],
			[
				'api check',
				() => designer.request('POST', '/api/check', { body: demo, headers: jsonHeaders }),
				[200]
			],
			[
				'sweep',
				() =>
					designer.request('POST', '/api/sweep', {
						body: JSON.stringify({
							scene: JSON.parse(demo),
							control: { kind: 'divider', id: 'spine' }
						}),
						headers: jsonHeaders
					}),
				[200]
			]
		];
		let k = 0;
		while (Date.now() < endAt) {
			// Every 25th request is the heaviest scene the limits allow, to the worker pool.
			const [name, run, ok] =
				++k % 25 === 0
					? ([
							'heavy check',
							() => designer.request('POST', '/api/check', { body: heavy, headers: jsonHeaders }),
							[200] as number[]
						] as const)
					: actions[Math.floor(Math.random() * actions.length)];
			try {
				const res = await run();
				requests++;
				counts.set(`${name} ${res.status}`, (counts.get(`${name} ${res.status}`) ?? 0) + 1);
				if (!ok.includes(res.status)) {
					errors.push(`${name}: ${res.status} ${res.text.slice(0, 160)}`);
				}
			} catch (e) {
				requests++;
				errors.push(`${name}: ${(e as Error).message}`);
			}
			await new Promise((r) => setTimeout(r, PAUSE_MS));
		}
	}

	const ticker = setInterval(
		() =>
			console.log(
				`  ${new Date().toISOString()} ${requests} requests, ${errors.length} errors; ${show(memory())}`
			),
		60_000
	);
	await Promise.all(accounts.map(account));
	clearInterval(ticker);
	await new Promise((r) => setTimeout(r, 5500));
	const end = memory();
	console.log(`requests: ${requests}`);
	for (const [k, v] of [...counts].sort()) console.log(`  ${k}: ${v}`);
	console.log(`memory at start: ${show(start)}`);
	console.log(`memory at end:   ${show(end)}`);
	console.log(`errors: ${errors.length}`);
	for (const e of errors.slice(0, 20)) console.log(`  ${e}`);
	console.log(
		JSON.stringify({
			minutes: MINUTES,
			accounts: ACCOUNTS,
			requests,
			errors: errors.length,
			rssStartMb: start && +(start.rss / 2 ** 20).toFixed(1),
			rssEndMb: end && +(end.rss / 2 ** 20).toFixed(1),
			heapStartMb: start && +(start.heapUsed / 2 ** 20).toFixed(1),
			heapEndMb: end && +(end.heapUsed / 2 ** 20).toFixed(1)
		})
	);
	await app.stop();
	await closeDb();
	process.exit(errors.length ? 1 : 0);
}

main().catch((e) => {
	console.error(e);
	process.exit(1);
});
