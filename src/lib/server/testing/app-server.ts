/**
 * Runs the built app (`node build`, what `npm start` serves) as a child process, so tests go
 * through adapter-node, hooks, CSRF checks and cookies exactly as a browser does. Build first
 * (`npx vite build`); `npm test` does.
 */
import { spawn } from 'node:child_process';
import { existsSync } from 'node:fs';
import { request } from 'node:http';
import { createServer } from 'node:net';
import { resolve } from 'node:path';
import { testDatabaseUrl } from './env';

export { Client, TestResponse, type ActionResult, type Fields } from './client';

export type App = {
	baseURL: string;
	port: number;
	/** The process's recent stdout and stderr, for failure messages. */
	output(): string;
	stop(): Promise<void>;
	/** SIGKILL at once, as a crash or a power cut would end it; resolves when it has exited. */
	crash(): Promise<void>;
};

export type StartOptions = {
	port?: number;
	/** Extra environment for the server process (merged over the defaults below). */
	env?: Record<string, string>;
	/** Defaults to INTERSTICE_BUILD_DIR or `build`. */
	buildDir?: string;
	timeoutMs?: number;
};

/** A port nobody listens on right now (the OS picks it). */
export function freePort(): Promise<number> {
	return new Promise((done, fail) => {
		const srv = createServer();
		srv.once('error', fail);
		srv.listen(0, '127.0.0.1', () => {
			const address = srv.address();
			const port = typeof address === 'object' && address ? address.port : 0;
			srv.close(() => done(port));
		});
	});
}

function answers(baseURL: string): Promise<boolean> {
	return new Promise((done) => {
		const req = request(`${baseURL}/`, { method: 'GET', agent: false, timeout: 2000 }, (res) => {
			res.resume();
			done(true);
		});
		req.on('error', () => done(false));
		req.on('timeout', () => req.destroy());
		req.end();
	});
}

const running = new Set<() => void>();
process.once('exit', () => running.forEach((kill) => kill()));

export async function startApp(opts: StartOptions = {}): Promise<App> {
	const buildDir = resolve(opts.buildDir ?? process.env.INTERSTICE_BUILD_DIR ?? 'build');
	if (!existsSync(resolve(buildDir, 'index.js'))) {
		throw new Error(`No built app in ${buildDir}; run \`npx vite build\` first.`);
	}
	const port = opts.port ?? (await freePort());
	const baseURL = `http://127.0.0.1:${port}`;
	const child = spawn(process.execPath, [buildDir], {
		env: {
			...process.env,
			// Not production mode (which needs real secrets and has no development tools); a test
			// may start one with NODE_ENV=production in opts.env.
			NODE_ENV: 'test',
			HOST: '127.0.0.1',
			PORT: String(port),
			ORIGIN: baseURL,
			DATABASE_URL: testDatabaseUrl(),
			INTERSTICE_DEV_TOOLS: '1',
			BODY_SIZE_LIMIT: '12M',
			...opts.env
		},
		stdio: ['ignore', 'pipe', 'pipe']
	});
	const lines: string[] = [];
	const keep = (chunk: Buffer) => {
		lines.push(...chunk.toString('utf8').split('\n').filter(Boolean));
		if (lines.length > 300) lines.splice(0, lines.length - 300);
	};
	child.stdout.on('data', keep);
	child.stderr.on('data', keep);
	const output = () => lines.join('\n');

	let exited = false;
	const exit = new Promise<void>((done) =>
		child.once('exit', () => {
			exited = true;
			done();
		})
	);
	const kill = () => {
		if (!exited) child.kill('SIGKILL');
	};
	running.add(kill);

	const stop = async () => {
		running.delete(kill);
		if (exited) return;
		child.kill('SIGTERM');
		const timer = setTimeout(kill, 5000);
		await exit;
		clearTimeout(timer);
	};

	const crash = async () => {
		running.delete(kill);
		kill();
		await exit;
	};

	const deadline = Date.now() + (opts.timeoutMs ?? 30_000);
	while (!(await answers(baseURL))) {
		if (exited) throw new Error(`The app exited before it answered on ${baseURL}:\n${output()}`);
		if (Date.now() > deadline) {
			await stop();
			throw new Error(`The app did not answer on ${baseURL} in time:\n${output()}`);
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	return { baseURL, port, output, stop, crash };
}
