/**
 * Two app processes behind nginx (scripts/cluster.ts, what npm run start:cluster runs) against the
 * test database and the local S3-compatible store: state that must be shared is shared, and a
 * process killed under load costs no request. Ports: CLUSTER_TEST_PORT (3130) for nginx and the
 * two after it for the processes. Each process is also reached directly (loopback only) to pin a
 * request to it; through nginx, the X-Interstice-Upstream header says which process answered.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { resolve } from 'node:path';
import { eq } from 'drizzle-orm';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadVariant } from '../src/lib/server/builds';
import { demoBuildIn } from '../src/lib/server/testing/builds';
import { closeDb, db } from '../src/lib/server/db';
import { photos } from '../src/lib/server/db/schema';
import { readObject } from '../src/lib/server/storage';
import { Client, TestResponse, randomLoopback } from '../src/lib/server/testing/client';
import { TEST_PASSWORD, studioWithMembers } from '../src/lib/server/testing/factories';
import { testDatabaseUrl } from '../src/lib/server/testing/env';

const repo = resolve(import.meta.dirname, '..');
const PORT = Number(process.env.CLUSTER_TEST_PORT ?? 3130);
const APP_PORTS = [PORT + 1, PORT + 2];
const PREFIX = resolve(repo, `.data/nginx-test-${process.pid}`);
const front = `http://127.0.0.1:${PORT}`;
const direct = (port: number) => `http://127.0.0.1:${port}`;

let runner: ChildProcess;
let output = '';

beforeAll(async () => {
	runner = spawn(
		resolve(repo, 'node_modules/.bin/tsx'),
		[
			'scripts/cluster.ts',
			`--port=${PORT}`,
			`--app-ports=${APP_PORTS.join(',')}`,
			`--prefix=${PREFIX}`
		],
		{
			cwd: repo,
			env: {
				...process.env,
				NODE_ENV: 'test',
				DATABASE_URL: testDatabaseUrl(),
				INTERSTICE_DEV_TOOLS: '1',
				ORIGIN: front
			},
			stdio: ['ignore', 'pipe', 'pipe']
		}
	);
	const keep = (b: Buffer) => {
		output = (output + b.toString()).slice(-20_000);
	};
	runner.stdout!.on('data', keep);
	runner.stderr!.on('data', keep);
	const deadline = Date.now() + 60_000;
	while (!output.includes('cluster: ready')) {
		if (runner.exitCode !== null) throw new Error(`the cluster exited:\n${output}`);
		if (Date.now() > deadline) throw new Error(`the cluster did not start in 60 s:\n${output}`);
		await new Promise((r) => setTimeout(r, 100));
	}
}, 90_000);

afterAll(async () => {
	if (runner && runner.exitCode === null) {
		const exited = new Promise((r) => runner.once('exit', r));
		runner.kill('SIGTERM');
		const timer = setTimeout(() => runner.kill('SIGKILL'), 20_000);
		await exited;
		clearTimeout(timer);
	}
	rmSync(PREFIX, { recursive: true, force: true });
	await closeDb();
}, 30_000);

const upstream = (r: TestResponse) => r.header('x-interstice-upstream') ?? '';
const json = (c: Client, method: string, path: string, body: unknown) =>
	c.request(method, path, {
		headers: { 'content-type': 'application/json', accept: 'application/json' },
		body: JSON.stringify(body)
	});

describe('two processes behind nginx', () => {
	it('a session made through one process works on the other', async () => {
		const f = await studioWithMembers();
		const viaFront = new Client(front);
		const signedIn = await viaFront.signIn(f.designer.email, TEST_PASSWORD);
		expect(signedIn.status, signedIn.text).toBe(303);
		const first = upstream(signedIn);
		expect(APP_PORTS.map((p) => `127.0.0.1:${p}`)).toContain(first);
		const other = APP_PORTS.find((p) => `127.0.0.1:${p}` !== first)!;

		const there = new Client(direct(other)).useSession(viaFront.sessionId!);
		const page = await there.get('/builds');
		expect(page.status, page.text.slice(0, 300)).toBe(200);
		// Through nginx too, on whichever process: every answer is the signed-in page.
		const seen = new Set<string>();
		for (let i = 0; i < 4; i++) {
			const r = await viaFront.get('/builds');
			expect(r.status).toBe(200);
			seen.add(upstream(r));
		}
		expect(seen.size, 'round-robin reaches both processes').toBe(2);
	});

	it('the sign-in limit counts tries on both processes and reaches 429', async () => {
		const f = await studioWithMembers();
		const c = new Client(front, { address: randomLoopback() });
		const served = new Set<string>();
		const statuses: number[] = [];
		for (let i = 0; i < 11; i++) {
			const r = await c.signIn(f.designer.email, 'wrong-password-1');
			statuses.push(r.status);
			served.add(upstream(r));
		}
		expect(served.size, 'the tries went to both processes').toBe(2);
		expect(statuses.slice(0, 10).every((s) => s === 400)).toBe(true);
		expect(statuses[10]).toBe(429);
		// The next try is refused on each process, reached directly, for the same client address.
		for (const port of APP_PORTS) {
			const r = await new Client(direct(port)).postForm(
				'/signin',
				{ email: f.designer.email, password: TEST_PASSWORD },
				{ origin: front, 'x-forwarded-for': c.address }
			);
			expect(r.status, `process ${port}`).toBe(429);
		}
	});

	it('two saves of one version, one on each process: one 200, one 409, nothing lost', async () => {
		const f = await studioWithMembers();
		const build = await demoBuildIn(f.studio.id, f.owner.id);
		const path = `/api/builds/${build.buildId}/variants/${build.variantId}`;
		const loaded = (await loadVariant(
			build.buildId,
			build.studioId,
			build.enclosureVersionId,
			build.variantId
		))!;
		const version = loaded.variant.version;
		const edits = [1.5, 3].map((marginMm) => ({ ...loaded.settings, marginMm }));
		const answers = await Promise.all(
			APP_PORTS.map((port, i) =>
				json(new Client(direct(port)).useSession(f.designer.session), 'PUT', path, {
					version,
					settings: edits[i]
				})
			)
		);
		expect(answers.map((a) => a.status).sort(), answers.map((a) => a.text).join('\n')).toEqual([
			200, 409
		]);
		const winner = answers.findIndex((a) => a.status === 200);
		const now = (await loadVariant(
			build.buildId,
			build.studioId,
			build.enclosureVersionId,
			build.variantId
		))!;
		expect(now.variant.version).toBe(version + 1);
		expect(now.settings.marginMm).toBe(edits[winner].marginMm);
		// The loser was told what is stored now, so its edit can be made again on top.
		expect(JSON.parse(answers[1 - winner].text)).toMatchObject({
			conflict: { version: version + 1, settings: { marginMm: edits[winner].marginMm } }
		});
	});

	it('a photo uploaded through one process is served by the other, and goes with its build', async () => {
		const f = await studioWithMembers();
		const build = await demoBuildIn(f.studio.id, f.owner.id);
		const [a, b] = APP_PORTS.map((p) => new Client(direct(p)).useSession(f.designer.session));
		const png = await sharp({
			create: { width: 64, height: 48, channels: 3, background: { r: 20, g: 140, b: 200 } }
		})
			.png()
			.toBuffer();
		const form = new FormData();
		form.set('file', new Blob([new Uint8Array(png)], { type: 'image/png' }), 'loop.png');
		form.set('caption', 'Loop filled');
		const up = await a.postForm(`/api/photos/${build.buildId}`, form, { origin: front });
		expect(up.status, up.text).toBe(201);
		const { id } = JSON.parse(up.text) as { id: string };

		const served = await b.get(`/builds/${build.buildId}/photos/${id}/full`, { accept: 'image/*' });
		expect(served.status).toBe(200);
		expect(served.header('content-type')).toMatch(/^image\//);
		const thumb = await b.get(`/builds/${build.buildId}/photos/${id}/thumb`, { accept: 'image/*' });
		expect(thumb.status).toBe(200);
		const [row] = await db.select().from(photos).where(eq(photos.id, id));
		for (const key of [row.storageKey, row.thumbKey]) {
			expect(await readObject(key), key).not.toBeNull();
		}

		// Deleted through the other process (the build's own form), the files leave the store.
		const gone = await b.postForm(
			`/builds/${build.buildId}/variants?/deleteBuild`,
			{ confirm: 'yes' },
			{ origin: front }
		);
		expect(gone.status, gone.text.slice(0, 300)).toBe(303);
		for (const key of [row.storageKey, row.thumbKey]) expect(await readObject(key), key).toBeNull();
		const after = await a.get(`/builds/${build.buildId}/photos/${id}/full`, { accept: 'image/*' });
		expect(after.status).toBe(404);
	});

	it('a process killed during 200 GETs through nginx costs no request, and starts again', async () => {
		const f = await studioWithMembers();
		const c = new Client(front).useSession(f.designer.session);
		const victim = APP_PORTS[0];
		const pidFile = resolve(PREFIX, `app-${victim}.pid`);
		const pid = Number(readFileSync(pidFile, 'utf8'));
		const results: { i: number; status: number | string }[] = [];
		let next = 0;
		const worker = async () => {
			while (next < 200) {
				const i = next++;
				if (i === 60) process.kill(pid, 'SIGKILL');
				try {
					const r = await c.get('/builds');
					results.push({ i, status: r.status });
				} catch (e) {
					results.push({ i, status: (e as Error).message });
				}
			}
		};
		await Promise.all(Array.from({ length: 8 }, worker));
		const failed = results.filter((r) => r.status !== 200);
		expect(results).toHaveLength(200);
		expect(failed, `requests that failed: ${JSON.stringify(failed)}`).toEqual([]);

		// The supervisor starts it again on its port (a new pid), and nginx sends to it again.
		const deadline = Date.now() + 30_000;
		let again = pid;
		while (Date.now() < deadline) {
			again = existsSync(pidFile) ? Number(readFileSync(pidFile, 'utf8')) : pid;
			if (again !== pid) {
				const r = await new Client(direct(victim)).get('/signin').catch(() => null);
				if (r?.status === 200) break;
			}
			await new Promise((r) => setTimeout(r, 200));
		}
		expect(again, `the killed process was not started again:\n${output.slice(-2000)}`).not.toBe(
			pid
		);
		expect((await new Client(direct(victim)).get('/signin')).status).toBe(200);
	}, 60_000);
});
