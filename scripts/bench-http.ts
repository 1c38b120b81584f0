/**
 * HTTP benchmark of the server's fit check (`npm run bench:http`): starts the built app itself
 * (`node build` on a free 127.0.0.1 port, the development database, building first when build/ is
 * missing), signs in as the demo designer, then runs autocannon with 50 connections for 20 s
 * against POST /api/builds/demo-build/check with the demo variant's settings and, in the same run,
 * against POST /api/noop with the same body. Prints requests/s, p99 and errors of both and the
 * ratio, then one JSON object as the last line.
 *
 * Targets (issue 5): check ≥ 70 % of the no-op's requests/s, p99 ≤ 25 ms, 0 errors.
 *
 * The per-user API limit (600 a minute) would stop a load test after a second. The server is
 * started with a random INTERSTICE_BENCH_TOKEN and the requests carry it, which moves them to a
 * bucket of their own with a high limit (still counted in PostgreSQL, so the cost stays in the
 * numbers). src/lib/server/api.ts honours the token only with INTERSTICE_DEV_TOOLS=1, never in
 * production mode.
 *
 * The machine is shared, so its load drifts: the two endpoints take turns in rounds (4 × 5 s each
 * by default) and every response's latency is kept, so both see the same conditions and p99 is
 * exact over all rounds. The load average is printed beside the numbers.
 *
 * Options: --duration=S (20, per endpoint), --rounds=N (4), --connections=N (50), --warmup=S (3),
 * --profile (a second, profiled server under the check's load; prints where the time goes).
 */
import autocannon, { type Result } from 'autocannon';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { cpSync, existsSync, mkdtempSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { databaseUrl } from './env';
import { Client, freePort } from '../src/lib/server/testing/app-server';

const args = new Map<string, string | undefined>(
	process.argv.slice(2).map((a) => {
		const [k, v] = a.replace(/^--/, '').split('=');
		return [k, v];
	})
);
const DURATION_S = Number(args.get('duration') ?? 20);
const CONNECTIONS = Number(args.get('connections') ?? 50);
const WARMUP_S = Number(args.get('warmup') ?? 3);
const ROUNDS = Math.max(1, Number(args.get('rounds') ?? 4));
const PROFILE = args.has('profile');

const BUILD_ID = 'demo-build';
const VARIANT_ID = 'demo-variant-a';
const DESIGNER = { email: 'designer@demo.interstice.test', password: 'demo-password-1' };
const TARGET = { ratio: 0.7, p99Ms: 25, errors: 0 };

const root = resolve(import.meta.dirname, '..');
const buildDir = resolve(root, 'build');

/**
 * Builds when build/ is missing, then runs a copy of it (under .data/, so the app's packages still
 * resolve): others rebuild build/ on this machine, and the server loads route code lazily.
 */
function preparedBuild(): string {
	if (!existsSync(join(buildDir, 'index.js'))) {
		console.log('bench:http: no build/ yet, running vite build');
		const r = spawnSync(
			process.execPath,
			[resolve(root, 'node_modules/vite/bin/vite.js'), 'build', '--logLevel', 'warn'],
			{ cwd: root, stdio: 'inherit' }
		);
		if (r.status !== 0) throw new Error('vite build failed');
	}
	const copy = resolve(root, '.data', `bench-http-build-${process.pid}`);
	cpSync(buildDir, copy, { recursive: true });
	if (!existsSync(join(copy, 'index.js'))) {
		throw new Error('build/ changed while it was copied (someone is building); run again');
	}
	process.once('exit', () => rmSync(copy, { recursive: true, force: true }));
	return copy;
}

type Server = { baseURL: string; child: ChildProcess; stop(): Promise<void>; output(): string };

async function startServer(app: string, token: string, profileDir: string | null): Promise<Server> {
	const port = await freePort();
	const baseURL = `http://127.0.0.1:${port}`;
	const execArgv = profileDir ? ['--cpu-prof', `--cpu-prof-dir=${profileDir}`] : [];
	const child = spawn(process.execPath, [...execArgv, app], {
		cwd: root,
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: baseURL,
			DATABASE_URL: databaseUrl(),
			// Not production mode: the no-op endpoint and the bench token's bucket are development
			// tools (a production-mode server refuses to start with a bench token).
			INTERSTICE_DEV_TOOLS: '1',
			INTERSTICE_BENCH_TOKEN: token,
			// Close idle keep-alive connections a second after SIGINT instead of 30 s.
			SHUTDOWN_TIMEOUT: '1'
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	const lines: string[] = [];
	const keep = (b: Buffer) => {
		lines.push(...b.toString().split('\n').filter(Boolean));
		lines.splice(0, Math.max(0, lines.length - 100));
	};
	child.stdout?.on('data', keep);
	child.stderr?.on('data', keep);
	const exited = new Promise<void>((done) => child.once('exit', () => done()));
	const stop = async () => {
		if (child.exitCode !== null) return;
		// Requests autocannon left on the wire finish first: one that touches the database after
		// the shutdown closed the pool opens a new one, and the process never exits.
		await new Promise((r) => setTimeout(r, 3000));
		// SIGINT: adapter-node shuts down cleanly, so --cpu-prof writes its profile.
		child.kill('SIGINT');
		const timer = setTimeout(() => child.kill('SIGKILL'), 20_000);
		await exited;
		clearTimeout(timer);
	};
	const deadline = Date.now() + 30_000;
	for (;;) {
		if (child.exitCode !== null) throw new Error(`the server exited:\n${lines.join('\n')}`);
		try {
			await fetch(`${baseURL}/`, { redirect: 'manual' });
			break;
		} catch {
			if (Date.now() > deadline) {
				await stop();
				throw new Error(`the server did not answer on ${baseURL}:\n${lines.join('\n')}`);
			}
			await new Promise((r) => setTimeout(r, 100));
		}
	}
	return { baseURL, child, stop, output: () => lines.join('\n') };
}

/**
 * Signs in through the form, as a person does, from a loopback address of its own: sign-in
 * attempts are limited per address, and 127.0.0.1 is shared by everyone's browser tests.
 */
async function signIn(baseURL: string): Promise<string> {
	const client = new Client(baseURL);
	const res = await client.signIn(DESIGNER.email, DESIGNER.password);
	if (res.status !== 303 || !client.sessionId) {
		throw new Error(
			`signing in as ${DESIGNER.email} answered ${res.status}; is the development database seeded (npm run db:seed)?`
		);
	}
	return `interstice_session=${client.sessionId}`;
}

type Row = {
	name: string;
	rps: number;
	p50Ms: number;
	p99Ms: number;
	errors: number;
	statuses: Record<string, number>;
};

/** Responses of one endpoint over all its rounds. */
class Tally {
	latenciesMs: number[] = [];
	seconds = 0;
	errors = 0;
	statuses: Record<string, number> = {};

	constructor(readonly name: string) {}

	add(r: Result) {
		this.seconds += r.duration;
		this.errors += r.errors + r.timeouts + r.non2xx;
		for (const [code, s] of Object.entries(r.statusCodeStats)) {
			this.statuses[code] = (this.statuses[code] ?? 0) + s.count;
		}
	}

	row(): Row {
		const sorted = [...this.latenciesMs].sort((a, b) => a - b);
		const at = (q: number) =>
			sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)] ?? NaN;
		const round = (v: number) => Math.round(v * 10) / 10;
		return {
			name: this.name,
			rps: round(sorted.length / this.seconds),
			p50Ms: round(at(0.5)),
			p99Ms: round(at(0.99)),
			errors: this.errors,
			statuses: this.statuses
		};
	}
}

async function load(
	url: string,
	headers: Record<string, string>,
	body: string,
	durationS: number,
	tally?: Tally
) {
	const run = autocannon({
		url,
		method: 'POST',
		headers,
		body,
		connections: CONNECTIONS,
		duration: durationS,
		timeout: 10
	});
	if (tally) {
		run.on('response', (_client: unknown, _status: number, _bytes: number, ms: number) =>
			tally.latenciesMs.push(ms)
		);
	}
	const result = await run;
	tally?.add(result);
	return result;
}

/** Where a profiled function lives: a package, a chunk of the app, Node itself, or V8's own work. */
function areaOf(url: string, functionName: string): string {
	if (!url) return functionName.startsWith('(') ? functionName : '(native)';
	const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)/.exec(url);
	if (pkg) return pkg[1];
	if (url.startsWith('node:')) return 'node';
	const chunk = /server\/(?:chunks\/)*(?:entries\/)?([^/]+?)(?:-[\w-]{6,})?\.js$/.exec(url);
	return chunk ? `app: ${chunk[1]}` : url.replace(root + '/', '');
}

/** Self time in a V8 CPU profile: per area and per function, as shares of the sampled time. */
function profileSummary(file: string, n = 20) {
	type Node = { id: number; callFrame: { functionName: string; url: string; lineNumber: number } };
	const profile = JSON.parse(readFileSync(file, 'utf8')) as {
		nodes: Node[];
		samples: number[];
		timeDeltas: number[];
	};
	const byNode = new Map(profile.nodes.map((nd) => [nd.id, nd]));
	const byFunction = new Map<string, number>();
	const byArea = new Map<string, number>();
	let total = 0;
	profile.samples.forEach((id, i) => {
		const dt = profile.timeDeltas[i] ?? 0;
		const nd = byNode.get(id);
		if (!nd) return;
		const { functionName, url, lineNumber } = nd.callFrame;
		const where = url
			? `${url.replace(/^file:\/\//, '').replace(root + '/', '')}:${lineNumber + 1}`
			: '';
		const key = `${functionName || '(anonymous)'} ${where}`.trim();
		byFunction.set(key, (byFunction.get(key) ?? 0) + dt);
		const area = areaOf(url.replace(/^file:\/\//, ''), functionName);
		byArea.set(area, (byArea.get(area) ?? 0) + dt);
		total += dt;
	});
	const top = (m: Map<string, number>) =>
		[...m]
			.sort((a, b) => b[1] - a[1])
			.slice(0, n)
			.map(([name, us]) => ({ name, pct: Math.round((1000 * us) / total) / 10 }));
	return { areas: top(byArea), functions: top(byFunction) };
}

async function main() {
	const app = preparedBuild();
	const token = randomBytes(32).toString('hex');
	const profileDir = PROFILE ? mkdtempSync(join(tmpdir(), 'bench-http-prof-')) : null;
	const server = await startServer(app, token, null);
	let noop: Row, check: Row;
	try {
		const cookie = await signIn(server.baseURL);
		const variant = await fetch(`${server.baseURL}/api/builds/${BUILD_ID}/variants/${VARIANT_ID}`, {
			headers: { cookie, accept: 'application/json' }
		});
		if (!variant.ok) {
			throw new Error(
				`GET the demo variant answered ${variant.status}; seed the development database (npm run db:seed)`
			);
		}
		const { settings } = (await variant.json()) as { settings: unknown };
		const body = JSON.stringify({ settings });
		const headers = {
			cookie,
			'content-type': 'application/json',
			accept: 'application/json',
			origin: server.baseURL,
			'x-interstice-bench': token
		};
		const checkURL = `${server.baseURL}/api/builds/${BUILD_ID}/check`;
		const noopURL = `${server.baseURL}/api/noop`;

		// One request each, to fail early with a readable message instead of 20 s of errors.
		for (const url of [checkURL, noopURL]) {
			const r = await fetch(url, { method: 'POST', headers, body });
			if (!r.ok) {
				throw new Error(`POST ${url} answered ${r.status}: ${(await r.text()).slice(0, 300)}`);
			}
		}

		console.log(
			`bench:http: ${server.baseURL}, ${CONNECTIONS} connections, ${DURATION_S} s per endpoint in ${ROUNDS} alternating rounds (after ${WARMUP_S} s warm-up), body ${body.length} bytes`
		);
		if (WARMUP_S > 0) {
			await load(noopURL, headers, body, WARMUP_S);
			await load(checkURL, headers, body, WARMUP_S);
		}
		const noopTally = new Tally('POST /api/noop');
		const checkTally = new Tally(`POST /api/builds/${BUILD_ID}/check`);
		const slice = DURATION_S / ROUNDS;
		for (let i = 0; i < ROUNDS; i++) {
			await load(noopURL, headers, body, slice, noopTally);
			await load(checkURL, headers, body, slice, checkTally);
		}
		noop = noopTally.row();
		check = checkTally.row();
	} finally {
		await server.stop();
	}

	if (profileDir) {
		// A second server, profiled, under the same check load: where the check's time goes.
		const profiled = await startServer(app, token, profileDir);
		try {
			const cookie = await signIn(profiled.baseURL);
			const variant = (await (
				await fetch(`${profiled.baseURL}/api/builds/${BUILD_ID}/variants/${VARIANT_ID}`, {
					headers: { cookie }
				})
			).json()) as { settings: unknown };
			const headers = {
				cookie,
				'content-type': 'application/json',
				origin: profiled.baseURL,
				'x-interstice-bench': token
			};
			await load(
				`${profiled.baseURL}/api/builds/${BUILD_ID}/check`,
				headers,
				JSON.stringify({ settings: variant.settings }),
				Math.min(DURATION_S, 10)
			);
		} finally {
			await profiled.stop();
		}
		const file = readdirSync(profileDir).find((f) => f.endsWith('.cpuprofile'));
		if (!file) {
			console.log('bench:http: the profiled server did not exit cleanly, so it wrote no profile');
		}
		if (file) {
			const summary = profileSummary(join(profileDir, file));
			console.log(
				`\nserver CPU profile under the check's load (${join(profileDir, file)}), self time by area:`
			);
			for (const t of summary.areas) console.log(`${String(t.pct).padStart(6)} %  ${t.name}`);
			console.log('by function:');
			for (const t of summary.functions) console.log(`${String(t.pct).padStart(6)} %  ${t.name}`);
		}
	}

	if (check.statuses['429']) {
		console.log(
			'bench:http: the check answered 429: build/ predates the bench token (src/lib/server/api.ts); run npx vite build'
		);
	}
	const ratio = check.rps / noop.rps;
	const pass =
		ratio >= TARGET.ratio &&
		check.p99Ms <= TARGET.p99Ms &&
		check.errors === TARGET.errors &&
		noop.errors === 0;
	console.log('');
	console.log('endpoint                                  req/s    p50 ms   p99 ms   errors');
	for (const r of [noop, check]) {
		console.log(
			`${r.name.padEnd(40)} ${r.rps.toFixed(0).padStart(6)}  ${String(r.p50Ms).padStart(7)}  ${String(r.p99Ms).padStart(7)}  ${String(r.errors).padStart(7)}`
		);
	}
	console.log(
		`check / noop: ${(100 * ratio).toFixed(1)} % of the no-op's rate (target ≥ ${TARGET.ratio * 100} %), check p99 ${check.p99Ms} ms (target ≤ ${TARGET.p99Ms} ms): ${pass ? 'on target' : 'OFF TARGET'}`
	);
	const load1m = Math.round(loadavg()[0] * 100) / 100;
	console.log(
		`machine load average (1 min) at the end: ${load1m} on ${availableParallelism()} cores`
	);
	console.log(
		JSON.stringify({
			connections: CONNECTIONS,
			durationS: DURATION_S,
			rounds: ROUNDS,
			loadAverage1m: load1m,
			noop,
			check,
			ratio: Math.round(ratio * 1000) / 1000,
			target: TARGET,
			pass
		})
	);
}

await main();
