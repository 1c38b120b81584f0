/**
 * Nothing left behind: deleting a build deletes its photo files (after the rows are gone), and
 * `npm run storage:check` finds files with no row and rows with no file. Uses a photo store of its
 * own, so the check's clean-up can never reach anyone else's files.
 */
import { execFile } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdtempSync } from 'node:fs';
import { mkdir, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { promisify } from 'node:util';
import { eq, inArray } from 'drizzle-orm';
import sharp from 'sharp';
import { afterAll, describe, expect, it } from 'vitest';
import { deleteBuild } from './builds';
import { demoBuildIn } from './testing/builds';
import { config } from './config';
import { closeDb, db } from './db';
import { builds, payments, photos, variants } from './db/schema';
import { addPhoto } from './sharing/photos';
import { ensureQuote } from './sharing/quotes';
import { deleteObject, listObjects, newKey, putObject, readObject } from './storage';
import { createMember, createStudio } from './testing/factories';
import { newId } from './tokens';

const store = mkdtempSync(join(tmpdir(), 'interstice-store-'));
process.env.STORAGE_DIR = store;
const repo = resolve(import.meta.dirname, '../../..');
const run = promisify(execFile);

afterAll(async () => {
	await closeDb();
	await rm(store, { recursive: true, force: true });
});

const picture = (r: number) =>
	sharp({ create: { width: 40, height: 30, channels: 3, background: { r, g: 100, b: 50 } } })
		.jpeg()
		.toBuffer();

async function buildWithPhotos(n: number) {
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const b = await demoBuildIn(studio.id, designer.id);
	const rows = [];
	for (let i = 0; i < n; i++) {
		rows.push(
			await addPhoto({
				buildId: b.buildId,
				uploadedBy: designer.id,
				bytes: await picture(40 * i),
				caption: `Step ${i}`
			})
		);
	}
	return {
		studioId: studio.id,
		buildId: b.buildId,
		rows,
		keys: rows.flatMap((r) => [r.storageKey, r.thumbKey])
	};
}

function storageCheck(args: string[] = [], env: Record<string, string> = {}) {
	return run(join(repo, 'node_modules/.bin/tsx'), ['scripts/storage-check.ts', ...args], {
		cwd: repo,
		env: { ...process.env, STORAGE_DIR: store, ...env }
	}).then(
		(r) => ({ code: 0, out: r.stdout }),
		(e: { code?: number; stdout?: string; stderr?: string }) => ({
			code: e.code ?? -1,
			out: `${e.stdout ?? ''}${e.stderr ?? ''}`
		})
	);
}

describe('deleting a build', () => {
	it('removes its photo rows and files, and leaves other builds’ photos alone', async () => {
		const gone = await buildWithPhotos(2);
		const kept = await buildWithPhotos(1);
		for (const k of [...gone.keys, ...kept.keys]) expect(await readObject(k), k).not.toBeNull();
		await deleteBuild(gone.buildId);
		expect(await db.select().from(builds).where(eq(builds.id, gone.buildId))).toHaveLength(0);
		expect(
			await db
				.select()
				.from(photos)
				.where(
					inArray(
						photos.id,
						gone.rows.map((r) => r.id)
					)
				)
		).toHaveLength(0);
		for (const k of gone.keys) expect(await readObject(k), k).toBeNull();
		for (const k of kept.keys) expect(await readObject(k), k).not.toBeNull();
	});

	it('keeps a build with a deposit on record, photos and all', async () => {
		const { studioId, buildId, keys } = await buildWithPhotos(1);
		const [v] = await db.select().from(variants).where(eq(variants.buildId, buildId));
		const q = await ensureQuote({ studioId, buildId, variantId: v.id, settings: v.settings });
		await db.insert(payments).values({
			id: newId(),
			quoteId: q.quote.id,
			buildId,
			variantId: v.id,
			amountMinor: 5000,
			currency: 'EUR'
		});
		await expect(deleteBuild(buildId)).rejects.toThrow(/deposit on record/);
		expect(await db.select().from(builds).where(eq(builds.id, buildId))).toHaveLength(1);
		for (const k of keys) expect(await readObject(k), k).not.toBeNull();
	});

	it('writes photos whole: no temporary file stays in the store', async () => {
		const { keys } = await buildWithPhotos(1);
		const { objects, strays } = await listObjects();
		expect(objects.map((o) => o.key)).toEqual(expect.arrayContaining(keys));
		expect(strays).toEqual([]);
		// On disk a write goes through a .part name first; an S3 PUT is whole by itself.
		if (config.storage.driver === 'disk') {
			expect(
				(await readdir(join(store, keys[0].slice(0, 2)))).some((f) => f.endsWith('.part'))
			).toBe(false);
		}
	});
});

describe.runIf(config.storage.driver === 's3')('photos in the S3-compatible store', () => {
	// Another Node process with its own SDK client stands in for a second app server.
	const other = async (code: string) => {
		const file = join(store, `other-${newId()}.mts`);
		await writeFile(
			file,
			`import { createHash } from 'node:crypto';\nimport * as s from ${JSON.stringify(join(repo, 'src/lib/server/storage.ts'))};\n${code}\n`
		);
		try {
			return (
				await run(join(repo, 'node_modules/.bin/tsx'), [file], { cwd: repo, env: process.env })
			).stdout.trim();
		} finally {
			await rm(file, { force: true });
		}
	};

	it('a photo written by one process is read, byte for byte, by another, and a delete is seen by both', async () => {
		const { keys } = await buildWithPhotos(1);
		const mine = (await readObject(keys[0]))!;
		const theirs = await other(
			`const b = await s.readObject(${JSON.stringify(keys[0])}); console.log(createHash('sha256').update(b).digest('hex'));`
		);
		expect(theirs).toBe(createHash('sha256').update(mine).digest('hex'));

		const key = newKey('png');
		await other(
			`await s.putObject(${JSON.stringify(key)}, Buffer.from('written by the other process'));`
		);
		expect((await readObject(key))?.toString()).toBe('written by the other process');
		await deleteObject(key);
		expect(await other(`console.log(String(await s.readObject(${JSON.stringify(key)})));`)).toBe(
			'null'
		);
	}, 60_000);

	it('npm run storage:to-s3 copies a disk store into the bucket byte for byte and keeps the files', async () => {
		const disk = mkdtempSync(join(tmpdir(), 'interstice-disk-store-'));
		const keys = [newKey('jpg'), newKey('webp')];
		try {
			const bytes = [await picture(11), Buffer.from('a thumbnail, as far as this test cares')];
			for (const [i, key] of keys.entries()) {
				await mkdir(join(disk, key.slice(0, 2)), { recursive: true });
				await writeFile(join(disk, key), bytes[i]);
			}
			const out = await run(
				join(repo, 'node_modules/.bin/tsx'),
				[join(repo, 'scripts/storage-to-s3.ts')],
				{ cwd: repo, env: { ...process.env, STORAGE_DIR: disk } }
			);
			expect(out.stdout).toContain('copied 2 of 2 photo files');
			for (const [i, key] of keys.entries()) {
				expect((await readObject(key))?.equals(bytes[i]), key).toBe(true);
				expect((await readFile(join(disk, key))).equals(bytes[i]), `${key} on disk`).toBe(true);
			}
		} finally {
			for (const key of keys) await deleteObject(key);
			await rm(disk, { recursive: true, force: true });
		}
	}, 60_000);
});

describe('npm run storage:check', () => {
	it('lists a planted orphan and a row whose file is gone, and removes only the orphan', async () => {
		const { rows } = await buildWithPhotos(1);
		const orphan = newKey('jpg');
		await putObject(orphan, await picture(7));
		await deleteObject(rows[0].thumbKey);

		const found = await storageCheck();
		expect(found.code, found.out).toBe(1);
		expect(found.out).toMatch(
			new RegExp(`files with no row: \\d+\\n(.*\\n)*  ${orphan}  \\d+ bytes`)
		);
		expect(found.out).toContain(
			`photo ${rows[0].id} of build ${rows[0].buildId}: ${rows[0].thumbKey}`
		);

		// Young orphans may be an upload whose row is a moment away: kept unless old enough.
		const young = await storageCheck(['--delete-orphans']);
		expect(young.out).toContain('newer than 15 min kept');
		expect(await readObject(orphan)).not.toBeNull();
		await storageCheck(['--delete-orphans'], { ORPHAN_AGE_MIN: '0' });
		expect(await readObject(orphan)).toBeNull();
		expect(await readObject(rows[0].storageKey)).not.toBeNull();
	}, 60_000);
});
