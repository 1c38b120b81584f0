/**
 * The set-up scripts from a fresh clone, as a new user gets them: a `git clone` into a fresh
 * mode-700 folder (root's home is one) and into a path with a space, then scripts/db.sh start,
 * status and stop there on a spare port. Then a crash: the built app against its own durable
 * cluster, PostgreSQL killed with an immediate shutdown, and the app killed during a burst of saves.
 * Every cluster and process started here is removed again.
 */
import { execFile } from 'node:child_process';
import { existsSync } from 'node:fs';
import { copyFile, mkdtemp, rm, stat } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { and, eq } from 'drizzle-orm';
import postgres from 'postgres';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { forkVariant } from '../src/lib/server/builds';
import { demoBuildIn } from '../src/lib/server/testing/builds';
import { closeDb, db } from '../src/lib/server/db';
import { runMigrations } from '../src/lib/server/db/migrate';
import { seedStandardLibrary } from '../src/lib/server/seed/catalog';
import { builds, variants } from '../src/lib/server/db/schema';
import { Client, freePort, startApp, type App } from '../src/lib/server/testing/app-server';
import { createMember, createStudio } from '../src/lib/server/testing/factories';

const run = promisify(execFile);
const repo = resolve(import.meta.dirname, '..');
const isRoot = process.getuid?.() === 0;

type Clone = { dir: string; port: number; made: string };
const clones: Clone[] = [];

/**
 * A clone of this repository; the set-up scripts being tested are copied over the committed ones,
 * so a run on uncommitted changes tests those changes.
 */
async function cloneInto(parentLabel: string, name: string): Promise<Clone> {
	const made = await mkdtemp(join(tmpdir(), parentLabel)); // mkdtemp makes it mode 700
	const dir = join(made, name);
	await run('git', ['clone', '--quiet', repo, dir]);
	for (const f of ['scripts/lib.sh', 'scripts/db.sh']) await copyFile(join(repo, f), join(dir, f));
	const clone = { dir, port: await freePort(), made };
	clones.push(clone);
	return clone;
}

function db_sh(clone: Clone, args: string[], env: Record<string, string> = {}) {
	return run('bash', ['scripts/db.sh', ...args], {
		cwd: clone.dir,
		env: {
			...process.env,
			PGPORT: String(clone.port),
			DB_CLUSTER: 'app',
			PGDATABASE: 'interstice',
			...env
		},
		timeout: 120_000
	}).then(
		(r) => ({ code: 0, out: r.stdout + r.stderr }),
		(e: { code?: number; stdout?: string; stderr?: string }) => ({
			code: e.code ?? -1,
			out: `${e.stdout ?? ''}${e.stderr ?? ''}`
		})
	);
}

async function settingsOf(url: string) {
	const sql = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const rows = await sql<
			{ name: string; setting: string }[]
		>`select name, setting from pg_settings where name in ('fsync', 'full_page_writes', 'synchronous_commit') order by name`;
		return Object.fromEntries(rows.map((r) => [r.name, r.setting]));
	} finally {
		await sql.end({ timeout: 5 });
	}
}

async function checkStartStatusStop(clone: Clone) {
	expect((await stat(clone.made)).mode & 0o777).toBe(0o700);
	const started = await db_sh(clone, ['start']);
	expect(started.out, started.out).toMatch(new RegExp(`started on 127\\.0\\.0\\.1:${clone.port}`));
	expect(started.code).toBe(0);
	const where = (await db_sh(clone, ['where'])).out.trim();
	if (isRoot) {
		// The postgres user cannot enter a mode-700 folder of root's: the cluster lives outside.
		expect(where.startsWith('/var/lib/interstice/'), where).toBe(true);
		expect(started.out).toContain(`cluster lives in ${where}`);
	} else {
		expect(where).toBe(join(clone.dir, '.data', 'pg'));
	}
	expect(existsSync(join(where, 'PG_VERSION'))).toBe(true);
	const status = await db_sh(clone, ['status']);
	expect(status).toMatchObject({ code: 0 });
	expect(status.out).toContain(`running on 127.0.0.1:${clone.port}`);
	// npm start's cluster keeps PostgreSQL's durability defaults.
	expect(await settingsOf(`postgres://postgres@127.0.0.1:${clone.port}/interstice`)).toEqual({
		fsync: 'on',
		full_page_writes: 'on',
		synchronous_commit: 'on'
	});
	expect((await db_sh(clone, ['stop'])).out).toContain('db: stopped');
	expect(await db_sh(clone, ['status'])).toMatchObject({ code: 3 });
}

afterAll(async () => {
	for (const c of clones) {
		await db_sh(c, ['destroy', '--yes']);
		await rm(c.made, { recursive: true, force: true });
	}
}, 120_000);

describe('scripts/db.sh in a fresh clone', () => {
	it('starts, reports and stops a cluster from a clone in a mode-700 folder', async () => {
		await checkStartStatusStop(await cloneInto('interstice-home-', 'interstice'));
	}, 180_000);

	it('does the same with a space in the path', async () => {
		await checkStartStatusStop(await cloneInto('interstice-space-', 'inter stice'));
	}, 180_000);

	// As root, the same as an ordinary user would run it: the server runs as that user, in the clone.
	it.runIf(isRoot)(
		'runs the server as the invoking user when that is not root',
		async () => {
			const clone = await cloneInto('interstice-user-', 'interstice');
			await run('chown', ['-R', 'nobody', clone.made]);
			const as = (args: string[]) =>
				run(
					'runuser',
					[
						'-u',
						'nobody',
						'--',
						'env',
						`PGPORT=${clone.port}`,
						'DB_CLUSTER=app',
						'PGDATABASE=interstice',
						'bash',
						'scripts/db.sh',
						...args
					],
					{ cwd: clone.dir, timeout: 120_000 }
				).then(
					(r) => r.stdout + r.stderr,
					(e: { stdout?: string; stderr?: string }) => `${e.stdout ?? ''}${e.stderr ?? ''}`
				);
			try {
				const started = await as(['start']);
				expect(started).toContain(`db: app cluster in ${join(clone.dir, '.data', 'pg')}`);
				expect(started).toContain(`started on 127.0.0.1:${clone.port}`);
				const owner = (
					await run('stat', ['-c', '%U', join(clone.dir, '.data', 'pg', 'postmaster.pid')])
				).stdout.trim();
				expect(owner).toBe('nobody');
				expect(await as(['stop'])).toContain('db: stopped');
			} finally {
				await as(['destroy', '--yes']);
				await run('chown', ['-R', 'root', clone.made]);
			}
		},
		180_000
	);

	it('keeps npm test’s throwaway cluster apart, with crash safety traded for speed', async () => {
		const clone = clones[1] ?? (await cloneInto('interstice-space-', 'inter stice'));
		const test = { DB_CLUSTER: 'test', PGPORT: String(await freePort()) };
		const started = await db_sh(clone, ['start'], test);
		expect(started.code, started.out).toBe(0);
		const where = (await db_sh(clone, ['where'], test)).out.trim();
		expect(where).toBe(join(dirname((await db_sh(clone, ['where'])).out.trim()), 'pg-test'));
		expect(await settingsOf(`postgres://postgres@127.0.0.1:${test.PGPORT}/interstice`)).toEqual({
			fsync: 'off',
			full_page_writes: 'off',
			synchronous_commit: 'off'
		});
		expect((await db_sh(clone, ['destroy', '--yes'], test)).out).toContain(
			'removed the test cluster'
		);
		expect(existsSync(where)).toBe(false);
	}, 180_000);
});

/** pg_ctl's immediate shutdown: no checkpoint, as if the server had crashed. */
async function killPostgres(clone: Clone) {
	const bin = (
		await run(
			'bash',
			[
				'-c',
				'source scripts/lib.sh && find_pg_bindir "$0"',
				(await db_sh(clone, ['where'])).out.trim()
			],
			{ cwd: clone.dir }
		)
	).stdout.trim();
	const data = (await db_sh(clone, ['where'])).out.trim();
	const cmd = [join(bin, 'pg_ctl'), '-D', data, '-m', 'immediate', '-w', 'stop'];
	if (isRoot) await run('runuser', ['-u', 'postgres', '--', ...cmd], { cwd: '/' });
	else await run(cmd[0], cmd.slice(1));
}

describe('a crash', () => {
	let clone: Clone;
	let app: App | undefined;
	let client: Client;
	let url: string;
	let buildId: string;
	let variantId: string;
	let version: number;
	let settings: Record<string, unknown>;
	const put = (id: string, body: unknown) =>
		client.request('PUT', `/api/builds/${buildId}/variants/${id}`, {
			body: JSON.stringify(body),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app!.baseURL
			}
		});

	beforeAll(async () => {
		clone = clones[0] ?? (await cloneInto('interstice-home-', 'interstice'));
		url = `postgres://postgres@127.0.0.1:${clone.port}/interstice_crash_test`;
		const started = await db_sh(clone, ['start'], { PGDATABASE: 'interstice_crash_test' });
		expect(started.code, started.out).toBe(0);
		// This file's own connections go to the crash cluster too (each spec file has its process).
		process.env.DATABASE_URL = url;
		await runMigrations(url);
		await seedStandardLibrary();
		const studio = await createStudio();
		const designer = await createMember(studio.id, 'designer');
		const b = await demoBuildIn(studio.id, designer.id);
		({ buildId, variantId, version } = b);
		settings = b.settings as unknown as Record<string, unknown>;
		app = await startApp({ env: { DATABASE_URL: url } });
		client = new Client(app.baseURL);
		client.useSession(designer.session);
	}, 180_000);

	afterAll(async () => {
		await app?.stop();
		await closeDb();
	});

	it('keeps a saved build through an immediate shutdown of PostgreSQL', async () => {
		const saved = { ...settings, marginMm: 3.5 };
		const res = await put(variantId, { version, settings: saved });
		expect(res.status, res.text).toBe(200);
		await closeDb();
		await killPostgres(clone);
		expect((await db_sh(clone, ['start'], { PGDATABASE: 'interstice_crash_test' })).code).toBe(0);
		const [row] = await db.select().from(variants).where(eq(variants.id, variantId));
		expect(row.version).toBe(version + 1);
		expect(row.settings).toEqual(saved);
		// And the app, whose connections died with the server, reads it back too.
		let back = await client.request('GET', `/api/builds/${buildId}/variants/${variantId}`, {
			headers: { accept: 'application/json' }
		});
		for (let i = 0; i < 20 && back.status !== 200; i++) {
			await new Promise((r) => setTimeout(r, 250));
			back = await client.request('GET', `/api/builds/${buildId}/variants/${variantId}`, {
				headers: { accept: 'application/json' }
			});
		}
		expect(back.status, back.text).toBe(200);
		expect(back.json<{ settings: unknown; version: number }>()).toMatchObject({
			settings: saved,
			version: version + 1
		});
	}, 120_000);

	it('leaves each save of a burst whole or absent when the app is killed', async () => {
		const ids: string[] = [];
		for (let i = 0; i < 24; i++) ids.push(await forkVariant(buildId, variantId, `Burst ${i}`));
		const before = new Map(
			(await db.select().from(variants).where(eq(variants.buildId, buildId))).map((v) => [v.id, v])
		);
		const sent = new Map(
			ids.map((id, i) => [
				id,
				{ ...(before.get(id)!.settings as Record<string, unknown>), marginMm: 1 + i / 8 }
			])
		);
		// Kill it once a third of the saves have answered: some are done, some in flight, some not begun.
		let answered = 0;
		let third!: () => void;
		const aThird = new Promise<void>((r) => (third = r));
		const answers = ids.map((id) =>
			put(id, { version: before.get(id)!.version, settings: sent.get(id) }).then(
				(r) => {
					if (++answered === ids.length / 3) third();
					return r.status;
				},
				() => 0
			)
		);
		await aThird;
		await app!.crash();
		app = undefined;
		const statuses = await Promise.all(answers);
		const after = await db.select().from(variants).where(eq(variants.buildId, buildId));
		const [build] = await db.select().from(builds).where(eq(builds.id, buildId));
		let whole = 0;
		for (const id of ids) {
			const old = before.get(id)!;
			const now = after.find((v) => v.id === id)!;
			if (now.version === old.version) {
				expect(now.settings, id).toEqual(old.settings);
				expect(now.updatedAt).toEqual(old.updatedAt);
			} else {
				whole++;
				expect(now.version).toBe(old.version + 1);
				expect(now.settings, id).toEqual(sent.get(id));
				// The build's "changed" time is written in the same transaction.
				expect(build.updatedAt.getTime()).toBeGreaterThanOrEqual(now.updatedAt.getTime());
			}
		}
		// Every save the app answered 200 for is there.
		ids.forEach((id, i) => {
			if (statuses[i] === 200) {
				expect(after.find((v) => v.id === id)!.version, id).toBe(before.get(id)!.version + 1);
			}
		});
		expect(whole).toBeGreaterThanOrEqual(ids.length / 3);
		expect(await db.$count(variants, and(eq(variants.buildId, buildId)))).toBe(ids.length + 1);
	}, 120_000);
});

describe('npm start options', () => {
	// Checked before anything is installed or started, so a typo costs nothing.
	it.each([
		[['--processes', '0'], "--processes must be a whole number of at least 1, not '0'"],
		[['--processes=two'], "--processes must be a whole number of at least 1, not 'two'"],
		[['--process', '2'], "unknown option '--process' (known: --processes N)"]
	])('refuses %j with a message naming the option', async (args, message) => {
		const failed = await run('bash', [join(repo, 'scripts/start.sh'), ...args]).then(
			() => null,
			(e: { code: number; stderr: string }) => e
		);
		expect(failed?.code).toBe(1);
		expect(failed?.stderr).toContain(message);
	});
});
