/**
 * npm run backup / npm run restore as a studio would use them after losing its database: the demo
 * data plus photos, a backup, the database dropped and the photo store emptied, a restore. Every
 * table's row count, a hash of every build's saved scenes and every photo file byte for byte must
 * come back. Works on a database and a photo store of its own, so the rest of the suite never notices.
 */
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdir, mkdtemp, readFile, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import postgres from 'postgres';
import sharp from 'sharp';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '../src/lib/server/db';
import { runMigrations } from '../src/lib/server/db/migrate';
import { builds, users } from '../src/lib/server/db/schema';
import { addPhoto } from '../src/lib/server/sharing/photos';
import { CreateBucketCommand, DeleteBucketCommand, S3Client } from '@aws-sdk/client-s3';
import { config } from '../src/lib/server/config';
import {
	deleteObjects,
	listObjects,
	newKey,
	putObject,
	readObject
} from '../src/lib/server/storage';
import { testDatabaseUrl } from '../src/lib/server/testing/env';

const run = promisify(execFile);
const repo = resolve(import.meta.dirname, '..');
const serverUrl = new URL(testDatabaseUrl());
const dbName = 'interstice_backup_test';
const url = Object.assign(new URL(serverUrl), { pathname: `/${dbName}` }).toString();
const adminUrl = Object.assign(new URL(serverUrl), { pathname: '/postgres' }).toString();
let work: string;
let store: string;
let admin: postgres.Sql;
// The suite's driver (npm test: the local S3-compatible store), with a store of this file's own
// that it can empty: a folder on disk, or a bucket made here.
const driver = config.storage.driver;
const bucket = `interstice-backup-test-${process.pid}`;

function script(args: string[], env: Record<string, string> = {}) {
	return run('bash', args, {
		cwd: repo,
		env: {
			...process.env,
			DATABASE_URL: url,
			STORAGE_DIR: store,
			STORAGE_DRIVER: driver,
			S3_BUCKET: bucket,
			BACKUP_DIR: join(work, 'backups'),
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

function s3Admin() {
	const c = config.storage;
	return new S3Client({
		endpoint: c.endpoint,
		region: c.region,
		forcePathStyle: c.forcePathStyle,
		credentials: { accessKeyId: c.accessKeyId, secretAccessKey: c.secretAccessKey }
	});
}

async function snapshot() {
	const sql = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const tables = await sql<
			{ s: string; t: string }[]
		>`select table_schema as s, table_name as t from information_schema.tables where table_type = 'BASE TABLE' and table_schema not in ('pg_catalog', 'information_schema') order by 1, 2`;
		const counts: Record<string, number> = {};
		for (const { s, t } of tables) {
			counts[`${s}.${t}`] = Number(
				(await sql`select count(*)::int as n from ${sql(s)}.${sql(t)}`)[0].n
			);
		}
		// A build's saved scenes: every variant's id, version and settings, in id order.
		const scenes = await sql<{ id: string; hash: string }[]>`
			select b.id, md5(coalesce(string_agg(v.id || ':' || v.version || ':' || v.settings::text, ',' order by v.id), '')) as hash
			from build b left join variant v on v.build_id = b.id group by b.id order by b.id`;
		const files: Record<string, string> = {};
		for (const o of (await listObjects()).objects) {
			files[o.key] = createHash('sha256')
				.update((await readObject(o.key))!)
				.digest('hex');
		}
		return { counts, scenes: Object.fromEntries(scenes.map((r) => [r.id, r.hash])), files };
	} finally {
		await sql.end({ timeout: 5 });
	}
}

beforeAll(async () => {
	work = await mkdtemp(join(tmpdir(), 'interstice-backup-'));
	store = join(work, 'storage');
	// This file's own connections and photo files go to the copy's database and store.
	process.env.DATABASE_URL = url;
	process.env.STORAGE_DIR = store;
	process.env.S3_BUCKET = bucket;
	if (driver === 's3') await s3Admin().send(new CreateBucketCommand({ Bucket: bucket }));
	admin = postgres(adminUrl, { max: 1, onnotice: () => {} });
	await admin`drop database if exists ${admin(dbName)} with (force)`;
	await admin`create database ${admin(dbName)}`;
	await runMigrations(url);
	await run(join(repo, 'node_modules/.bin/tsx'), ['scripts/seed.ts'], {
		cwd: repo,
		env: { ...process.env, DATABASE_URL: url }
	});
	const [user] = await db.select({ id: users.id }).from(users).limit(1);
	const [build] = await db.select({ id: builds.id }).from(builds).limit(1);
	const picture = (r: number) =>
		sharp({ create: { width: 80, height: 60, channels: 3, background: { r, g: 120, b: 60 } } })
			.png()
			.toBuffer();
	await addPhoto({
		buildId: build.id,
		uploadedBy: user.id,
		bytes: await picture(200),
		caption: 'Loop filled'
	});
	await addPhoto({
		buildId: build.id,
		uploadedBy: user.id,
		bytes: await picture(90),
		caption: 'Tubes cut'
	});
	await addPhoto({
		buildId: build.id,
		uploadedBy: user.id,
		bytes: await picture(30),
		caption: 'Leak test'
	});
}, 120_000);

afterAll(async () => {
	if (driver === 's3') {
		await deleteObjects((await listObjects()).objects.map((o) => o.key));
		await s3Admin().send(new DeleteBucketCommand({ Bucket: bucket }));
	}
	await closeDb();
	await admin`drop database if exists ${admin(dbName)} with (force)`;
	await admin.end({ timeout: 5 });
	await rm(work, { recursive: true, force: true });
});

describe('backup and restore', () => {
	it('round-trips every table, every saved scene and every photo byte for byte', async () => {
		const before = await snapshot();
		expect(Object.keys(before.files)).toHaveLength(6); // three photos, each with a thumbnail
		expect(before.counts['public.build']).toBeGreaterThan(0);
		expect(before.counts['public.photo']).toBe(3);

		const made = await script(['scripts/backup.sh', 'backup']);
		expect(made.code, made.out).toBe(0);
		const m = made.out.match(
			/^backup: (.+\.tar) \((\d+\.\d) (kB|MB): database interstice_backup_test, 6 photo files\)$/m
		);
		expect(m, made.out).not.toBeNull();
		const file = resolve(repo, m![1]);
		expect(file.startsWith(join(work, 'backups'))).toBe(true);
		expect(file).toMatch(/interstice-interstice_backup_test-\d{8}-\d{6}Z\.tar$/);
		const info = await stat(file);
		expect(info.mode & 0o777).toBe(0o600);
		expect(
			Math.abs(info.size / (m![3] === 'MB' ? 1024 * 1024 : 1024) - Number(m![2]))
		).toBeLessThan(0.1);

		// Without --yes (and no terminal to ask on) nothing happens.
		const unconfirmed = await script(['scripts/backup.sh', 'restore', file]);
		expect(unconfirmed.code, unconfirmed.out).toBe(2);
		expect(unconfirmed.out).toContain('not confirmed');

		// The disaster: the database is gone, the photo store empty but for a stray file.
		await closeDb();
		await admin`drop database ${admin(dbName)} with (force)`;
		await rm(store, { recursive: true, force: true });
		await deleteObjects((await listObjects()).objects.map((o) => o.key));
		await putObject(newKey('jpg'), Buffer.from('not in the backup'));

		const restored = await script(['scripts/backup.sh', 'restore', file, '--yes']);
		expect(restored.code, restored.out).toBe(0);
		expect(restored.out).toContain('database interstice_backup_test and 6 photo files restored');
		const after = await snapshot();
		expect(after.counts).toEqual(before.counts);
		expect(after.scenes).toEqual(before.scenes);
		expect(after.files).toEqual(before.files);
	}, 180_000);

	it('refuses files that are not its own and changes nothing', async () => {
		const before = await snapshot();
		const text = join(work, 'notes.tar');
		await writeFile(text, 'just some notes');
		const notTar = await script(['scripts/backup.sh', 'restore', text, '--yes']);
		expect(notTar.code).toBe(2);
		expect(notTar.out).toContain('is not an Interstice backup');

		// A tar with the right file names but somebody else's manifest.
		const fake = join(work, 'fake');
		await mkdir(fake, { recursive: true });
		await writeFile(
			join(fake, 'manifest.json'),
			JSON.stringify({ format: 'some-other-tool', version: 1 })
		);
		await writeFile(join(fake, 'database.dump'), 'PGDMP');
		await run('tar', ['-cf', join(work, 'fake.tar'), '-C', fake, 'manifest.json', 'database.dump']);
		const foreign = await script(['scripts/backup.sh', 'restore', join(work, 'fake.tar'), '--yes']);
		expect(foreign.code).toBe(2);
		expect(foreign.out).toContain('manifest.json is not ours');

		// One of ours with a changed byte in the dump.
		const made = await script(['scripts/backup.sh', 'backup']);
		const file = resolve(repo, made.out.match(/^backup: (.+\.tar) /m)![1]);
		const x = join(work, 'x');
		await mkdir(x);
		await run('tar', ['-xf', file, '-C', x]);
		const dump = await readFile(join(x, 'database.dump'));
		dump[dump.length - 1] ^= 0xff;
		await writeFile(join(x, 'database.dump'), dump);
		await run('tar', [
			'-cf',
			join(work, 'damaged.tar'),
			'-C',
			x,
			'manifest.json',
			'database.dump',
			'storage'
		]);
		const damaged = await script([
			'scripts/backup.sh',
			'restore',
			join(work, 'damaged.tar'),
			'--yes'
		]);
		expect(damaged.code).toBe(2);
		expect(damaged.out).toContain('damaged');

		expect(await snapshot()).toEqual(before);
	}, 180_000);
});
