/**
 * Backups of the configured database and the photo store, in one file (run through scripts/backup.sh):
 *   backup                  → backups/interstice-<database>-<UTC time>.tar, prints its path and size
 *   restore FILE [--yes]    → replaces the database and the photo store with the file's copy
 * The file is a plain tar: manifest.json (what it is, checksums), database.dump (pg_dump's custom
 * format) and storage/<key> for every photo file. Restore refuses a file without our manifest, with
 * any other entry, or whose checksums do not match, and changes nothing until the copy is checked.
 */
import { spawn } from 'node:child_process';
import { createHash } from 'node:crypto';
import { createReadStream } from 'node:fs';
import {
	chmod,
	mkdir,
	mkdtemp,
	open,
	readFile,
	rename,
	rm,
	stat,
	writeFile
} from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { basename, join, relative, resolve } from 'node:path';
import { createInterface } from 'node:readline/promises';
import postgres from 'postgres';
import { z } from 'zod';
import { config } from '../src/lib/server/config';
import {
	exportObjects,
	importObjects,
	isStorageKey,
	pruneObjects,
	storeLocation,
	verifyExported
} from '../src/lib/server/storage';

const FORMAT = 'interstice-backup';
const VERSION = 1;

const manifestSchema = z.object({
	format: z.literal(FORMAT),
	version: z.number().int().min(1),
	createdAt: z.string(),
	database: z.object({
		name: z.string(),
		file: z.literal('database.dump'),
		bytes: z.number().int().nonnegative(),
		sha256: z.string().regex(/^[0-9a-f]{64}$/),
		serverVersion: z.string()
	}),
	photos: z.object({
		objects: z.array(
			z.object({
				key: z.string(),
				bytes: z.number().int().nonnegative(),
				sha256: z.string().regex(/^[0-9a-f]{64}$/)
			})
		),
		/** Files whose rows were in the snapshot but were deleted before they could be copied. */
		missing: z.array(z.string())
	})
});
type Manifest = z.infer<typeof manifestSchema>;

class Refused extends Error {}

const here = process.env.INIT_CWD ?? process.cwd();
const bin = (name: string) => (process.env.PG_BIN ? join(process.env.PG_BIN, name) : name);

function run(cmd: string, args: string[]): Promise<void> {
	return new Promise((done, fail) => {
		const child = spawn(cmd, args, { stdio: ['ignore', 'inherit', 'pipe'] });
		let err = '';
		child.stderr.on('data', (c: Buffer) => (err += c.toString()));
		child.on('error', fail);
		child.on('exit', (code) =>
			code === 0
				? done()
				: fail(new Error(`${basename(cmd)} failed (exit ${code}): ${err.trim().slice(-2000)}`))
		);
	});
}

function output(cmd: string, args: string[]): Promise<string> {
	return new Promise((done, fail) => {
		const child = spawn(cmd, args, { stdio: ['ignore', 'pipe', 'pipe'] });
		let out = '';
		let err = '';
		child.stdout.on('data', (c: Buffer) => (out += c.toString()));
		child.stderr.on('data', (c: Buffer) => (err += c.toString()));
		child.on('error', fail);
		child.on('exit', (code) =>
			code === 0 ? done(out) : fail(new Error(err.trim() || `${cmd} failed (exit ${code})`))
		);
	});
}

function sha256File(path: string): Promise<string> {
	return new Promise((done, fail) => {
		const h = createHash('sha256');
		createReadStream(path)
			.on('data', (c) => h.update(c))
			.on('error', fail)
			.on('end', () => done(h.digest('hex')));
	});
}

async function fsyncPath(path: string) {
	const fh = await open(path, 'r');
	try {
		await fh.sync();
	} finally {
		await fh.close();
	}
}

const databaseName = (url: string) => decodeURIComponent(new URL(url).pathname.replace(/^\//, ''));
function withDatabase(url: string, name: string) {
	const u = new URL(url);
	u.pathname = `/${encodeURIComponent(name)}`;
	return u.toString();
}
const size = (bytes: number) =>
	bytes < 1024 * 1024
		? `${(bytes / 1024).toFixed(1)} kB`
		: `${(bytes / 1024 / 1024).toFixed(1)} MB`;
const stampOf = (d: Date) =>
	d
		.toISOString()
		.replace(/[-:]/g, '')
		.replace('T', '-')
		.replace(/\.\d+Z$/, 'Z');

async function backup() {
	const url = config.databaseUrl;
	const name = databaseName(url);
	const outDir = resolve(
		here,
		process.env.BACKUP_DIR ?? resolve(import.meta.dirname, '..', 'backups')
	);
	await mkdir(outDir, { recursive: true, mode: 0o700 });
	const staging = await mkdtemp(join(outDir, '.staging-'));
	const sql = postgres(url, { max: 1, onnotice: () => {} });
	try {
		const createdAt = new Date();
		const dumpFile = join(staging, 'database.dump');
		let manifest!: Manifest;
		// One snapshot for the dump and for the list of photo files the rows name, so the copy's
		// photos match its rows even while people keep working.
		await sql.begin('isolation level repeatable read read only', async (tx) => {
			const [{ snapshot, server }] = await tx<
				{ snapshot: string; server: string }[]
			>`select pg_export_snapshot() as snapshot, current_setting('server_version') as server`;
			const rows = await tx<
				{ storage_key: string; thumb_key: string }[]
			>`select storage_key, thumb_key from photo`;
			await run(bin('pg_dump'), [
				'--format=custom',
				`--snapshot=${snapshot}`,
				`--file=${dumpFile}`,
				`--dbname=${url}`
			]);
			const objects = await exportObjects(join(staging, 'storage'));
			const copied = new Set(objects.map((o) => o.key));
			const missing = rows
				.flatMap((r) => [r.storage_key, r.thumb_key])
				.filter((k) => !copied.has(k));
			manifest = {
				format: FORMAT,
				version: VERSION,
				createdAt: createdAt.toISOString(),
				database: {
					name,
					file: 'database.dump',
					bytes: (await stat(dumpFile)).size,
					sha256: await sha256File(dumpFile),
					serverVersion: server
				},
				photos: { objects, missing }
			};
		});
		await mkdir(join(staging, 'storage'), { recursive: true });
		await writeFile(join(staging, 'manifest.json'), JSON.stringify(manifest, null, '\t'));
		let target = join(
			outDir,
			`interstice-${name.replace(/[^A-Za-z0-9_-]/g, '-')}-${stampOf(createdAt)}.tar`
		);
		for (
			let n = 2;
			await stat(target).then(
				() => true,
				() => false
			);
			n++
		) {
			target = target.replace(/(-\d+)?\.tar$/, `-${n}.tar`);
		}
		const part = `${target}.part`;
		// manifest.json first, so a check reads it without going through the rest.
		await run('tar', ['-cf', part, '-C', staging, 'manifest.json', 'database.dump', 'storage']);
		await chmod(part, 0o600); // clients' builds and password hashes
		await fsyncPath(part);
		await rename(part, target);
		await fsyncPath(outDir);
		const shown = relative(here, target).startsWith('..') ? target : relative(here, target);
		console.log(
			`backup: ${shown} (${size((await stat(target)).size)}: database ${name}, ${manifest.photos.objects.length} photo files)`
		);
		if (manifest.photos.missing.length) {
			console.log(
				`backup: ${manifest.photos.missing.length} photo files were deleted while copying; their rows are in the copy without them`
			);
		}
	} finally {
		await sql.end({ timeout: 5 });
		await rm(staging, { recursive: true, force: true });
	}
}

/** Only our three kinds of entry: a path outside them (`../x`, `/etc/x`) is never extracted. */
function allowedEntry(entry: string) {
	if (entry === 'manifest.json' || entry === 'database.dump' || entry === 'storage/') return true;
	if (/^storage\/[A-Za-z0-9]{2}\/$/.test(entry)) return true;
	return entry.startsWith('storage/') && isStorageKey(entry.slice('storage/'.length));
}

async function readBackup(file: string, into: string): Promise<Manifest> {
	let entries: string[];
	try {
		entries = (await output('tar', ['-tf', file])).split('\n').filter(Boolean);
	} catch {
		throw new Refused(`${file} is not an Interstice backup (not a tar archive).`);
	}
	if (!entries.includes('manifest.json') || !entries.includes('database.dump')) {
		throw new Refused(`${file} is not an Interstice backup (no manifest.json and database.dump).`);
	}
	const odd = entries.find((e) => !allowedEntry(e));
	if (odd) {
		throw new Refused(
			`${file} is not an Interstice backup (unexpected entry ${JSON.stringify(odd)}).`
		);
	}
	await run('tar', ['-xf', file, '-C', into, '--no-same-owner', '--no-same-permissions']);
	let manifest: Manifest;
	try {
		const raw = JSON.parse(await readFile(join(into, 'manifest.json'), 'utf8'));
		if (raw?.format === FORMAT && typeof raw.version === 'number' && raw.version > VERSION) {
			throw new Refused(
				`${file} was made by a newer Interstice (backup format ${raw.version}); update first.`
			);
		}
		manifest = manifestSchema.parse(raw);
	} catch (e) {
		if (e instanceof Refused) throw e;
		throw new Refused(`${file} is not an Interstice backup (its manifest.json is not ours).`);
	}
	const dump = join(into, 'database.dump');
	if (
		(await stat(dump)).size !== manifest.database.bytes ||
		(await sha256File(dump)) !== manifest.database.sha256
	) {
		throw new Refused(`${file} is damaged: database.dump does not match its checksum.`);
	}
	const bad = await verifyExported(join(into, 'storage'), manifest.photos.objects);
	if (bad) throw new Refused(`${file} is damaged: photo ${bad}.`);
	return manifest;
}

async function confirmed(question: string): Promise<boolean> {
	if (!process.stdin.isTTY) return false;
	const rl = createInterface({ input: process.stdin, output: process.stdout });
	try {
		return (await rl.question(`${question}\nType yes to go on: `)).trim() === 'yes';
	} finally {
		rl.close();
	}
}

async function restore(fileArg: string | undefined, yes: boolean) {
	if (!fileArg) throw new Refused('usage: npm run restore -- FILE [--yes]');
	const file = resolve(here, fileArg);
	if (
		!(await stat(file).then(
			(s) => s.isFile(),
			() => false
		))
	) {
		throw new Refused(`${fileArg}: no such file.`);
	}
	const url = config.databaseUrl;
	const name = databaseName(url);
	const staging = await mkdtemp(join(tmpdir(), 'interstice-restore-'));
	try {
		const manifest = await readBackup(file, staging);
		const where = new URL(url);
		const question =
			`This replaces database ${name} on ${where.hostname}:${where.port || 5432} and the photo store in ${storeLocation()}\n` +
			`with the copy of ${manifest.database.name} from ${manifest.createdAt} (${manifest.photos.objects.length} photo files). Stop the app first.`;
		if (!yes && !(await confirmed(question))) {
			throw new Refused('restore: not confirmed (add --yes); nothing changed.');
		}

		// Into a new database first: a failed restore leaves the current one as it was.
		const admin = postgres(withDatabase(url, 'postgres'), { max: 1, onnotice: () => {} });
		const temp = `${name}_restoring_${Date.now().toString(36)}`;
		try {
			await admin`create database ${admin(temp)}`;
			try {
				await run(bin('pg_restore'), [
					'--no-owner',
					'--no-privileges',
					'--exit-on-error',
					'--single-transaction',
					`--dbname=${withDatabase(url, temp)}`,
					join(staging, 'database.dump')
				]);
			} catch (e) {
				await admin`drop database if exists ${admin(temp)} with (force)`;
				throw e;
			}
			// Files before the swap (adding files breaks nothing), stale ones only after it.
			const written = await importObjects(join(staging, 'storage'), manifest.photos.objects);
			await admin`drop database if exists ${admin(name)} with (force)`;
			await admin`alter database ${admin(temp)} rename to ${admin(name)}`;
			const removed = await pruneObjects(new Set(manifest.photos.objects.map((o) => o.key)));
			console.log(
				`restore: database ${name} and ${written} photo files restored from ${fileArg}${removed ? ` (${removed} files not in the copy removed)` : ''}`
			);
		} finally {
			await admin.end({ timeout: 5 });
		}
	} finally {
		await rm(staging, { recursive: true, force: true });
	}
}

const [command, ...rest] = process.argv.slice(2);
try {
	if (command === 'backup') await backup();
	else if (command === 'restore') {
		await restore(
			rest.find((a) => a !== '--yes'),
			rest.includes('--yes')
		);
	} else throw new Refused('usage: scripts/backup.sh backup | restore FILE [--yes]');
} catch (e) {
	console.error(e instanceof Refused ? e.message : `backup: ${(e as Error).message}`);
	process.exit(e instanceof Refused ? 2 : 1);
}
