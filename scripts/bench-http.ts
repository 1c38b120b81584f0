/**
 * HTTP benchmark of the server's fit check (`npm run bench:http`): starts the built app itself,
 * once as one process (`node build` on a free 127.0.0.1 port) and once as the cluster (two
 * processes behind nginx, scripts/cluster.ts, on free ports), against the development database
 * (building first when build/ is missing). Signs in as the demo designer, then runs autocannon
 * with 50 connections against POST /api/builds/demo-build/check and, for reference, POST
 * /api/noop (the same session and body cost, no work). Every request body moves the demo
 * variant's parts by a different few millimetres (a pool of scenes), so no cache of identical
 * scenes is what gets measured.
 *
 * Prints, in one run: check_vs_noop (one process; target ≥ 0.4), cluster_vs_single for the check
 * (two processes behind nginx against one process without it; target ≥ 1.3 on 2 cores), p50/p99
 * and errors (target 0) of every endpoint, and p99 at a realistic load, 20 editors each sending
 * one check a second at their own moment (target ≤ 30 ms), through both, with the worst case
 * beside it (all 20 in the same instant every second). The load average is printed with every
 * figure: the machine is shared, so the endpoints take turns in rounds (4 × 5 s each by default)
 * and every response's latency is kept, so all see the same conditions and p99 is exact over all
 * rounds. The last line is one JSON object.
 *
 * The per-user API limit (600 a minute) would stop a load test after a second. The servers are
 * started with a random INTERSTICE_BENCH_TOKEN and the requests carry it, which moves them to a
 * bucket of their own with a high limit (still counted in PostgreSQL, so the cost stays in the
 * numbers). src/lib/server/api.ts honours the token only with INTERSTICE_DEV_TOOLS=1, never in
 * production mode.
 *
 * Options: --duration=S (20, per endpoint), --rounds=N (4), --connections=N (50), --warmup=S (3),
 * --editors=N (20) and --paced=S (20) for the realistic load, --no-cluster (one process only),
 * --profile (a second, profiled server under the check's load; prints where the time goes).
 */
import autocannon, { type Result } from 'autocannon';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { once } from 'node:events';
import { Agent, request as httpRequest } from 'node:http';
import { randomBytes } from 'node:crypto';
import {
	cpSync,
	existsSync,
	mkdtempSync,
	readFileSync,
	readdirSync,
	rmSync,
	writeFileSync
} from 'node:fs';
import { availableParallelism, loadavg, tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import postgres from 'postgres';
import { databaseUrl } from './env';
import { below, cpuNow, cpuSince, postgresOf, thisProcess, type Groups } from './proc-cpu';
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
const CLUSTER = !args.has('no-cluster');
const EDITORS = Number(args.get('editors') ?? 20);
const PACED_S = Number(args.get('paced') ?? 20);
/** The saturating load's generator: wrk (Debian's package, installed when missing) or autocannon. */
const LOADER = args.get('loader') ?? 'wrk';
if (LOADER !== 'wrk' && LOADER !== 'autocannon') {
	throw new Error(`--loader must be wrk or autocannon, not ${LOADER}`);
}

const BUILD_ID = 'demo-build';
const VARIANT_ID = 'demo-variant-a';
const DESIGNER = { email: 'designer@demo.interstice.test', password: 'demo-password-1' };
const TARGET = { checkVsNoop: 0.4, clusterVsSingle: 1.3, pacedP99Ms: 30, errors: 0 };

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
	/** Microseconds of CPU per answered request, by group of processes. */
	cpuUsPerRequest: Record<string, number>;
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
	/** The machine's 1-minute load average after each round. */
	loads: number[] = [];
	/** CPU seconds each group of processes used during the rounds (scripts/proc-cpu.ts). */
	cpu: Record<string, number> = {};

	constructor(readonly name: string) {}

	load(): number {
		return round1(this.loads.reduce((a, b) => a + b, 0) / Math.max(1, this.loads.length));
	}

	add(r: Result) {
		this.seconds += r.duration;
		this.errors += r.errors + r.timeouts + r.non2xx;
		for (const [code, s] of Object.entries(r.statusCodeStats)) {
			this.statuses[code] = (this.statuses[code] ?? 0) + s.count;
		}
	}

	/** wrk's rounds: it reports percentiles, not each response's latency. */
	wrkRounds: { requests: number; p50Ms: number; p99Ms: number }[] = [];

	addWrk(r: WrkResult) {
		this.seconds += r.durationUs / 1e6;
		this.errors += r.connect + r.read + r.write + r.status + r.timeout;
		this.statuses['2xx'] = (this.statuses['2xx'] ?? 0) + r.requests - r.status;
		if (r.status) this.statuses['other'] = (this.statuses['other'] ?? 0) + r.status;
		this.wrkRounds.push({ requests: r.requests, p50Ms: r.p50Us / 1000, p99Ms: r.p99Us / 1000 });
	}

	row(): Row {
		const sorted = [...this.latenciesMs].sort((a, b) => a - b);
		const at = (q: number) =>
			sorted[Math.min(sorted.length - 1, Math.ceil(q * sorted.length) - 1)] ?? NaN;
		const round = (v: number) => Math.round(v * 10) / 10;
		// With wrk: the median is the rounds' median weighted by their requests, p99 the worst round's.
		const wrkCount = this.wrkRounds.reduce((n, r) => n + r.requests, 0);
		const count = sorted.length + wrkCount;
		const p50 = wrkCount
			? this.wrkRounds.reduce((s, r) => s + r.p50Ms * r.requests, 0) / wrkCount
			: at(0.5);
		const p99 = wrkCount ? Math.max(...this.wrkRounds.map((r) => r.p99Ms)) : at(0.99);
		return {
			name: this.name,
			rps: round(count / this.seconds),
			p50Ms: round(p50),
			p99Ms: round(p99),
			errors: this.errors,
			statuses: this.statuses,
			cpuUsPerRequest: Object.fromEntries(
				Object.entries(this.cpu).map(([k, cpuS]) => [
					k,
					Math.round((cpuS * 1e6) / Math.max(1, count))
				])
			)
		};
	}
}

type WrkResult = {
	requests: number;
	durationUs: number;
	connect: number;
	read: number;
	write: number;
	status: number;
	timeout: number;
	p50Us: number;
	p99Us: number;
};

let bodiesFile = '';
/** The pool of bodies as one JSON line each, for wrk's script (scripts/bench-wrk.lua). */
function wrkBodies(bodies: string[]): string {
	if (!bodiesFile) {
		bodiesFile = resolve(root, '.data', `bench-http-bodies-${process.pid}.jsonl`);
		writeFileSync(bodiesFile, bodies.join('\n') + '\n');
		process.once('exit', () => rmSync(bodiesFile, { force: true }));
	}
	return bodiesFile;
}

/**
 * A saturated load from wrk (one thread, CONNECTIONS connections): wrk is a C program, so it
 * takes a small share of the cores the servers are measured on; autocannon, in this Node process,
 * took about as much CPU per request as PostgreSQL did. The shell's `times` gives wrk's CPU.
 */
async function wrkLoad(
	url: string,
	headers: Record<string, string>,
	bodies: string[],
	durationS: number,
	tally?: Tally,
	groups?: Groups
) {
	const before = groups ? cpuNow(groups) : null;
	const wrkArgs = [
		'-t1',
		`-c${CONNECTIONS}`,
		// wrk reads whole seconds only (3.3s is a usage error).
		`-d${Math.max(1, Math.round(durationS))}s`,
		'--timeout',
		'10s',
		'-s',
		resolve(root, 'scripts/bench-wrk.lua'),
		...Object.entries(headers).flatMap(([k, v]) => ['-H', `${k}: ${v}`]),
		url,
		'--',
		wrkBodies(bodies)
	];
	const child = spawn('sh', ['-c', 'wrk "$@"; rc=$?; times; exit $rc', 'sh', ...wrkArgs], {
		stdio: ['ignore', 'pipe', 'inherit']
	});
	let out = '';
	child.stdout.on('data', (b: Buffer) => (out += b.toString()));
	const [code] = (await once(child, 'exit')) as [number];
	const json = out.split('\n').find((l) => l.startsWith('{"requests"'));
	if (code !== 0 || !json) throw new Error(`wrk failed (${code}):\n${out}`);
	const result = JSON.parse(json) as WrkResult;
	if (tally && groups && before) {
		const used = cpuSince(groups, before);
		// `times`' second line: the children's user and system time, as 0m1.234s 0m0.567s.
		const seconds = (t: string) => {
			const m = /(\d+)m([\d.]+)s/.exec(t);
			return m ? Number(m[1]) * 60 + Number(m[2]) : 0;
		};
		const childLine = out.trim().split('\n').at(-1) ?? '';
		used['load generator'] = childLine.split(/\s+/).reduce((a, t) => a + seconds(t), 0);
		for (const [k, v] of Object.entries(used)) tally.cpu[k] = (tally.cpu[k] ?? 0) + v;
	}
	if (tally) {
		tally.addWrk(result);
		tally.loads.push(loadavg()[0]);
	}
	return result;
}

async function load(
	url: string,
	headers: Record<string, string>,
	bodies: string[],
	durationS: number,
	tally?: Tally,
	paced?: { connections: number; rate: number },
	groups?: Groups
) {
	if (LOADER === 'wrk' && !paced) {
		return void (await wrkLoad(url, headers, bodies, durationS, tally, groups));
	}
	let n = 0;
	const before = groups ? cpuNow(groups) : null;
	const run = autocannon({
		url,
		method: 'POST',
		headers,
		body: bodies[0],
		// A different scene for every request, in turn from the pool.
		requests: [{ setupRequest: (req) => ({ ...req, body: bodies[n++ % bodies.length] }) }],
		connections: paced?.connections ?? CONNECTIONS,
		overallRate: paced?.rate,
		duration: durationS,
		timeout: 10
	});
	if (tally) {
		run.on('response', (_client: unknown, _status: number, _bytes: number, ms: number) =>
			tally.latenciesMs.push(ms)
		);
	}
	const result = await run;
	if (tally && groups && before) {
		for (const [k, v] of Object.entries(cpuSince(groups, before))) {
			tally.cpu[k] = (tally.cpu[k] ?? 0) + v;
		}
	}
	if (tally) {
		tally.add(result);
		tally.loads.push(loadavg()[0]);
	}
	return result;
}

/**
 * The demo variant's settings, with every placed part moved by its own few tenths of a millimetre
 * to a few millimetres: `count` different scenes of the same size and cost.
 */
function bodyPool(settings: { placements: { position: number[] }[] }, count = 500): string[] {
	let seed = 12345;
	const rand = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31) * 4 - 2;
	return Array.from({ length: count }, () =>
		JSON.stringify({
			settings: {
				...settings,
				placements: settings.placements.map((p) => ({
					...p,
					position: p.position.map((v) => Math.round((v + rand()) * 10) / 10)
				}))
			}
		})
	);
}

/**
 * The realistic load: `editors` people, each sending one check a second from their own keep-alive
 * connection, at their own moment in the second (phases spread evenly, a little jitter each time),
 * as independent editors are. autocannon's rate option fires every connection at the same instant
 * each second (its clients share one timer), which measures a burst of 20 simultaneous checks, not
 * 20 editors; that burst is still measured and printed beside it, as the worst case.
 */
async function editorsLoad(
	url: string,
	headers: Record<string, string>,
	bodies: string[],
	durationS: number,
	editors: number,
	tally: Tally
) {
	const agent = new Agent({ keepAlive: true, maxSockets: editors });
	const target = new URL(url);
	const post = (body: string) =>
		new Promise<number>((done, fail) => {
			const req = httpRequest(
				{
					host: target.hostname,
					port: target.port,
					path: target.pathname,
					method: 'POST',
					agent,
					headers: { ...headers, 'content-length': Buffer.byteLength(body) }
				},
				(res) => {
					res.resume();
					res.on('end', () => done(res.statusCode ?? 0));
				}
			);
			req.on('error', fail);
			req.end(body);
		});
	let seed = 777;
	const jitter = () => ((seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31 - 0.5) * 100;
	let n = 0;
	const started = performance.now();
	const endAt = started + durationS * 1000;
	const sleep = (ms: number) => new Promise((r) => setTimeout(r, Math.max(0, ms)));
	await Promise.all(
		Array.from({ length: editors }, async (_, e) => {
			// Editor e first sends at e/editors of the first second, then once a second.
			for (let k = 0; ; k++) {
				const due = started + (e / editors) * 1000 + k * 1000 + (k > 0 ? jitter() : 0);
				if (due >= endAt) break;
				await sleep(due - performance.now());
				const t0 = performance.now();
				try {
					const status = await post(bodies[n++ % bodies.length]);
					tally.latenciesMs.push(performance.now() - t0);
					tally.statuses[status] = (tally.statuses[status] ?? 0) + 1;
					if (status < 200 || status >= 300) tally.errors++;
				} catch {
					tally.errors++;
				}
			}
		})
	);
	agent.destroy();
	tally.seconds += durationS;
	tally.loads.push(loadavg()[0]);
}

type Target = {
	baseURL: string;
	stop(): Promise<void>;
	label: string;
	/** The target's own processes, for the CPU breakdown (PostgreSQL and the load generator are added). */
	groups: Groups;
};

/** scripts/cluster.ts on free ports: nginx in front of two processes of the copied build. */
async function startCluster(app: string, token: string): Promise<Target> {
	const [port, a, b] = [await freePort(), await freePort(), await freePort()];
	const prefix = resolve(root, '.data', `bench-http-nginx-${process.pid}`);
	const baseURL = `http://127.0.0.1:${port}`;
	const child = spawn(
		resolve(root, 'node_modules/.bin/tsx'),
		[
			resolve(root, 'scripts/cluster.ts'),
			`--port=${port}`,
			`--app-ports=${a},${b}`,
			`--prefix=${prefix}`,
			`--build=${app}`
		],
		{
			cwd: root,
			env: {
				...process.env,
				ORIGIN: baseURL,
				DATABASE_URL: databaseUrl(),
				INTERSTICE_DEV_TOOLS: '1',
				INTERSTICE_BENCH_TOKEN: token
			},
			stdio: ['ignore', 'pipe', 'pipe']
		}
	);
	let out = '';
	const keep = (c: Buffer) => (out = (out + c.toString()).slice(-10_000));
	child.stdout?.on('data', keep);
	child.stderr?.on('data', keep);
	const deadline = Date.now() + 60_000;
	while (!out.includes('cluster: ready')) {
		if (child.exitCode !== null) throw new Error(`the cluster exited:\n${out}`);
		if (Date.now() > deadline) throw new Error(`the cluster did not start:\n${out}`);
		await new Promise((r) => setTimeout(r, 100));
	}
	const stop = async () => {
		if (child.exitCode !== null) return;
		await new Promise((r) => setTimeout(r, 2000));
		child.kill('SIGTERM');
		await once(child, 'exit');
		rmSync(prefix, { recursive: true, force: true });
	};
	const pid = child.pid!;
	return {
		baseURL,
		stop,
		label: 'cluster (nginx, 2 processes)',
		groups: { app: below(pid, app), nginx: below(pid, /^nginx/) }
	};
}

const round1 = (v: number) => Math.round(v * 100) / 100;

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
	if (LOADER === 'wrk') {
		const r = spawnSync('bash', ['-c', 'source scripts/lib.sh && ensure_wrk'], {
			cwd: root,
			stdio: 'inherit'
		});
		if (r.status !== 0) {
			throw new Error(
				'wrk is missing and could not be installed (--loader=autocannon runs without it)'
			);
		}
	}
	const app = preparedBuild();
	const token = randomBytes(32).toString('hex');
	const profileDir = PROFILE ? mkdtempSync(join(tmpdir(), 'bench-http-prof-')) : null;
	const single = await startServer(app, token, null);
	const targets: Target[] = [
		{ ...single, label: 'one process', groups: { app: below(single.child.pid!, app) } }
	];
	// PostgreSQL's processes, found from one backend's parent (the postmaster).
	const sql = postgres(databaseUrl(), { max: 1 });
	const [{ pid: backendPid }] = await sql<{ pid: number }[]>`select pg_backend_pid() as pid`;
	// The load generator is autocannon, in this process.
	const shared: Groups = { postgresql: postgresOf(backendPid), 'load generator': thisProcess };
	await sql.end();
	const rows: (Row & { load1m: number; target: string })[] = [];
	try {
		if (CLUSTER) targets.push(await startCluster(app, token));
		type Prepared = { t: Target; headers: Record<string, string>; check: string; noop: string };
		const prepared: Prepared[] = [];
		let bodies: string[] = [];
		for (const t of targets) {
			const cookie = await signIn(t.baseURL);
			const variant = await fetch(`${t.baseURL}/api/builds/${BUILD_ID}/variants/${VARIANT_ID}`, {
				headers: { cookie, accept: 'application/json' }
			});
			if (!variant.ok) {
				throw new Error(
					`GET the demo variant answered ${variant.status}; seed the development database (npm run db:seed)`
				);
			}
			const { settings } = (await variant.json()) as {
				settings: { placements: { position: number[] }[] };
			};
			if (!bodies.length) bodies = bodyPool(settings);
			const headers = {
				cookie,
				'content-type': 'application/json',
				accept: 'application/json',
				origin: t.baseURL,
				'x-interstice-bench': token
			};
			const p = {
				t,
				headers,
				check: `${t.baseURL}/api/builds/${BUILD_ID}/check`,
				noop: `${t.baseURL}/api/noop`
			};
			// One request each, to fail early with a readable message instead of 20 s of errors.
			for (const url of [p.check, p.noop]) {
				const r = await fetch(url, { method: 'POST', headers, body: bodies[1] });
				if (!r.ok) {
					throw new Error(`POST ${url} answered ${r.status}: ${(await r.text()).slice(0, 300)}`);
				}
			}
			prepared.push(p);
		}

		console.log(
			`bench:http: ${LOADER}, ${CONNECTIONS} connections, ${DURATION_S} s per endpoint in ${ROUNDS} alternating rounds (after ${WARMUP_S} s warm-up), ${bodies.length} different bodies of about ${bodies[0].length} bytes; then ${EDITORS} editors × 1 check/s for ${PACED_S} s`
		);
		for (const p of prepared) {
			if (WARMUP_S > 0) {
				await load(p.noop, p.headers, bodies, WARMUP_S);
				await load(p.check, p.headers, bodies, WARMUP_S);
			}
		}
		// Turns: noop and check through each target in every round, so drift in the machine's load
		// reaches all of them alike.
		const tallies = prepared.map((p) => ({
			p,
			noop: new Tally(`${p.t.label}: POST /api/noop`),
			check: new Tally(`${p.t.label}: POST check`)
		}));
		const slice = DURATION_S / ROUNDS;
		for (let i = 0; i < ROUNDS; i++) {
			for (const { p, noop, check } of tallies) {
				const groups = { ...p.t.groups, ...shared };
				await load(p.noop, p.headers, bodies, slice, noop, undefined, groups);
				await load(p.check, p.headers, bodies, slice, check, undefined, groups);
			}
		}
		const paced = prepared.map((p) => ({
			p,
			tally: new Tally(`${p.t.label}: check, paced`),
			burst: new Tally(`${p.t.label}: check, ${EDITORS} at once each second`)
		}));
		for (const { p, tally, burst } of paced) {
			await editorsLoad(p.check, p.headers, bodies, PACED_S, EDITORS, tally);
			await load(p.check, p.headers, bodies, PACED_S, burst, {
				connections: EDITORS,
				rate: EDITORS
			});
		}
		for (const { p, noop, check } of tallies) {
			rows.push({ ...noop.row(), load1m: noop.load(), target: p.t.label });
			rows.push({ ...check.row(), load1m: check.load(), target: p.t.label });
		}
		for (const { p, tally, burst } of paced) {
			rows.push({ ...tally.row(), load1m: tally.load(), target: p.t.label });
			rows.push({ ...burst.row(), load1m: burst.load(), target: p.t.label });
		}
	} finally {
		for (const t of targets.reverse()) await t.stop();
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
			).json()) as { settings: { placements: { position: number[] }[] } };
			const headers = {
				cookie,
				'content-type': 'application/json',
				origin: profiled.baseURL,
				'x-interstice-bench': token
			};
			await load(
				`${profiled.baseURL}/api/builds/${BUILD_ID}/check`,
				headers,
				bodyPool(variant.settings),
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

	const find = (name: string) => rows.find((r) => r.name === name);
	const sNoop = find('one process: POST /api/noop')!;
	const sCheck = find('one process: POST check')!;
	const cCheck = find('cluster (nginx, 2 processes): POST check');
	const sPaced = find('one process: check, paced')!;
	const cPaced = find('cluster (nginx, 2 processes): check, paced');
	const sBurst = find(`one process: check, ${EDITORS} at once each second`);
	const cBurst = find(`cluster (nginx, 2 processes): check, ${EDITORS} at once each second`);
	if (rows.some((r) => r.statuses['429'])) {
		console.log(
			'bench:http: a check answered 429: build/ predates the bench token (src/lib/server/api.ts); run npx vite build'
		);
	}
	const checkVsNoop = round1(sCheck.rps / sNoop.rps);
	const clusterVsSingle = cCheck ? round1(cCheck.rps / sCheck.rps) : null;
	const errors = rows.reduce((n, r) => n + r.errors, 0);
	const worstPaced = Math.max(sPaced.p99Ms, cPaced?.p99Ms ?? 0);
	const pass =
		checkVsNoop >= TARGET.checkVsNoop &&
		(clusterVsSingle === null || clusterVsSingle >= TARGET.clusterVsSingle) &&
		worstPaced <= TARGET.pacedP99Ms &&
		errors === TARGET.errors;
	console.log('');
	console.log(
		'endpoint                                              req/s    p50 ms   p99 ms   errors   load (1 min)'
	);
	for (const r of rows) {
		console.log(
			`${r.name.padEnd(52)} ${r.rps.toFixed(0).padStart(6)}  ${String(r.p50Ms).padStart(7)}  ${String(r.p99Ms).padStart(7)}  ${String(r.errors).padStart(7)}   ${r.load1m.toFixed(2)}`
		);
	}
	// Where each answered request's CPU went. On this machine every group shares the same cores,
	// so the cluster's ceiling is cores ÷ (sum of the groups) however many app processes there are.
	console.log('\nCPU per answered request (µs), by group of processes, saturated rounds:');
	for (const r of rows.filter((r) => Object.keys(r.cpuUsPerRequest).length)) {
		const total = Object.values(r.cpuUsPerRequest).reduce((a, b) => a + b, 0);
		const parts = Object.entries(r.cpuUsPerRequest).map(([k, us]) => `${k} ${us}`);
		const ceiling = Math.round((availableParallelism() * 1e6) / Math.max(1, total));
		console.log(
			`${r.name.padEnd(52)} ${parts.join(', ')}; total ${total} (all ${availableParallelism()} cores: at most ${ceiling} req/s)`
		);
	}
	console.log(
		`check_vs_noop (one process): ${checkVsNoop} (target ≥ ${TARGET.checkVsNoop})` +
			(clusterVsSingle === null
				? ''
				: `; cluster_vs_single (check): ${clusterVsSingle} (target ≥ ${TARGET.clusterVsSingle})`) +
			`; p99 at ${EDITORS} editors × 1 check/s: ${sPaced.p99Ms} ms one process${cPaced ? `, ${cPaced.p99Ms} ms cluster` : ''} (target ≤ ${TARGET.pacedP99Ms} ms; all ${EDITORS} in the same instant, the worst case: ${sBurst?.p99Ms} ms${cBurst ? ` / ${cBurst.p99Ms} ms` : ''}); errors ${errors}: ${pass ? 'on target' : 'OFF TARGET'}`
	);
	const load1m = round1(loadavg()[0]);
	console.log(
		`machine load average (1 min) at the end: ${load1m} on ${availableParallelism()} cores`
	);
	console.log(
		JSON.stringify({
			connections: CONNECTIONS,
			durationS: DURATION_S,
			rounds: ROUNDS,
			editors: EDITORS,
			loadAverage1m: load1m,
			rows,
			check_vs_noop: checkVsNoop,
			cluster_vs_single: clusterVsSingle,
			paced_p99_ms: { single: sPaced.p99Ms, cluster: cPaced?.p99Ms ?? null },
			burst_p99_ms: { single: sBurst?.p99Ms ?? null, cluster: cBurst?.p99Ms ?? null },
			errors,
			target: TARGET,
			pass
		})
	);
}

await main();
