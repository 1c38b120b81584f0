/**
 * Several app processes behind nginx, on loopback: what `npm start -- --processes N` (and
 * `npm run start:cluster`) runs after scripts/start.sh has set up PostgreSQL, the services and the build, and what the cluster
 * spec and `npm run bench:http` start with test ports.
 *
 * Each process is `node build` (adapter-node) on a port of its own, told that nginx is in front
 * (ORIGIN is nginx's address; the client's address is the last X-Forwarded-For entry). A process
 * that exits without being asked to is started again after RESTART_DELAY_MS. nginx runs in the
 * foreground with a prefix of its own (--prefix, default .data/nginx) and scripts/nginx.conf
 * rendered with the ports. Ctrl-C (SIGINT) or SIGTERM stops nginx and every process.
 *
 * Options (or environment): --port=N (CLUSTER_PORT, 3000: nginx), --host=A (HOST, 127.0.0.1),
 * --processes=N (CLUSTER_PROCESSES, 2), --app-ports=A,B (CLUSTER_APP_PORTS, default the ports
 * after --port), --prefix=DIR (CLUSTER_PREFIX, .data/nginx), --build=DIR (build),
 * --body-limit=SIZE (BODY_SIZE_LIMIT, 12M).
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { connect } from 'node:net';
import { resolve } from 'node:path';

const args = new Map(
	process.argv.slice(2).map((a) => {
		const [k, ...v] = a.replace(/^--/, '').split('=');
		return [k, v.join('=')] as const;
	})
);
const opt = (name: string, envName: string, fallback: string) =>
	args.get(name) ?? process.env[envName] ?? fallback;

const root = resolve(import.meta.dirname, '..');
const HOST = opt('host', 'HOST', '127.0.0.1');
const PORT = Number(opt('port', 'CLUSTER_PORT', '3000'));
const COUNT = Number(opt('processes', 'CLUSTER_PROCESSES', '2'));
const APP_PORTS = opt('app-ports', 'CLUSTER_APP_PORTS', '').split(',').filter(Boolean).map(Number);
while (APP_PORTS.length < COUNT) APP_PORTS.push(PORT + 1 + APP_PORTS.length);
const PREFIX = resolve(root, opt('prefix', 'CLUSTER_PREFIX', '.data/nginx'));
const BUILD = resolve(root, opt('build', 'CLUSTER_BUILD', 'build'));
// adapter-node's BODY_SIZE_LIMIT and nginx's client_max_body_size take the same K/M suffixes.
const BODY_LIMIT = opt('body-limit', 'BODY_SIZE_LIMIT', '12M');
const ORIGIN = process.env.ORIGIN ?? `http://${HOST}:${PORT}`;
const RESTART_DELAY_MS = 500;

const log = (msg: string) => console.log(`cluster: ${msg}`);

function nginxBinary(): string {
	for (const p of [process.env.NGINX_BIN, '/usr/sbin/nginx', '/usr/local/sbin/nginx']) {
		if (p && existsSync(p)) return p;
	}
	const found = spawnSync('sh', ['-c', 'command -v nginx'], { encoding: 'utf8' }).stdout.trim();
	if (found) return found;
	throw new Error('nginx not found: npm start -- --processes 2 installs Debian’s nginx package');
}

/** scripts/nginx.conf with the ports, written into the prefix. */
function renderConfig(): string {
	const servers = APP_PORTS.map(
		(p) => `\t\tserver 127.0.0.1:${p} max_fails=1 fail_timeout=5s;`
	).join('\n');
	const text = readFileSync(resolve(root, 'scripts/nginx.conf'), 'utf8')
		.replaceAll('{{PREFIX}}', PREFIX)
		.replaceAll('{{HOST}}', HOST)
		.replaceAll('{{PORT}}', String(PORT))
		.replaceAll('{{BODY_LIMIT}}', BODY_LIMIT.toLowerCase())
		.replaceAll('{{SERVERS}}', servers);
	mkdirSync(resolve(PREFIX, 'tmp'), { recursive: true });
	const file = resolve(PREFIX, 'nginx.conf');
	writeFileSync(file, text);
	return file;
}

function answers(port: number): Promise<boolean> {
	return new Promise((done) => {
		const s = connect({ host: '127.0.0.1', port }, () => {
			s.destroy();
			done(true);
		});
		s.on('error', () => done(false));
	});
}

async function waitPort(port: number, ms = 30_000) {
	const deadline = Date.now() + ms;
	while (!(await answers(port))) {
		if (Date.now() > deadline) throw new Error(`nothing answers on 127.0.0.1:${port}`);
		await new Promise((r) => setTimeout(r, 100));
	}
}

let stopping = false;
const apps = new Map<number, ChildProcess>();

function startApp(port: number) {
	const child = spawn(process.execPath, [BUILD], {
		cwd: root,
		env: {
			...process.env,
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN,
			// The client's address is the entry nginx appends (the last one); earlier entries are
			// whatever the client sent and are not trusted.
			ADDRESS_HEADER: 'x-forwarded-for',
			XFF_DEPTH: '1',
			BODY_SIZE_LIMIT: BODY_LIMIT,
			// Idle keep-alive connections from nginx close a second after SIGTERM, not 30 s.
			SHUTDOWN_TIMEOUT: process.env.SHUTDOWN_TIMEOUT ?? '1'
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	const tag = (b: Buffer) =>
		b
			.toString()
			.split('\n')
			.filter(Boolean)
			.forEach((l) => console.log(`[app ${port}] ${l}`));
	child.stdout?.on('data', tag);
	child.stderr?.on('data', tag);
	apps.set(port, child);
	writeFileSync(resolve(PREFIX, `app-${port}.pid`), String(child.pid));
	child.once('exit', (code, signal) => {
		if (stopping) return;
		log(`process on ${port} exited (${signal ?? code}); starting it again`);
		setTimeout(() => {
			if (!stopping) startApp(port);
		}, RESTART_DELAY_MS);
	});
}

async function main() {
	if (!existsSync(resolve(BUILD, 'index.js'))) {
		throw new Error(`no built app in ${BUILD}: run npx vite build`);
	}
	const conf = renderConfig();
	const nginx = nginxBinary();
	const test = spawnSync(
		nginx,
		['-t', '-q', '-p', PREFIX, '-e', `${PREFIX}/error.log`, '-c', conf],
		{
			encoding: 'utf8'
		}
	);
	if (test.status !== 0) throw new Error(`nginx refuses ${conf}:\n${test.stderr}`);

	for (const port of APP_PORTS) startApp(port);
	await Promise.all(APP_PORTS.map((p) => waitPort(p)));

	const proxy = spawn(
		nginx,
		['-p', PREFIX, '-e', `${PREFIX}/error.log`, '-c', conf, '-g', 'daemon off;'],
		{ stdio: ['ignore', 'inherit', 'inherit'] }
	);
	writeFileSync(resolve(PREFIX, 'nginx-master.pid'), String(proxy.pid));

	const stop = async () => {
		if (stopping) return;
		stopping = true;
		proxy.kill('SIGQUIT'); // nginx: finish requests in flight, then exit
		for (const child of apps.values()) child.kill('SIGTERM');
		const all = [proxy, ...apps.values()].map(
			(c) =>
				new Promise<void>((done) => {
					if (c.exitCode !== null || c.signalCode !== null) return done();
					const timer = setTimeout(() => c.kill('SIGKILL'), 10_000);
					c.once('exit', () => {
						clearTimeout(timer);
						done();
					});
				})
		);
		await Promise.all(all);
		process.exit(0);
	};
	process.on('SIGINT', () => void stop());
	process.on('SIGTERM', () => void stop());
	proxy.once('exit', (code) => {
		if (!stopping) {
			console.error(`cluster: nginx exited (${code}); see ${PREFIX}/error.log`);
			void stop();
		}
	});
	await waitPort(PORT);
	log(`nginx on http://${HOST}:${PORT} → ${APP_PORTS.map((p) => `127.0.0.1:${p}`).join(', ')}`);
	log('ready');
}

main().catch((e) => {
	console.error(`cluster: ${(e as Error).message}`);
	stopping = true;
	for (const child of apps.values()) child.kill('SIGTERM');
	process.exit(1);
});
