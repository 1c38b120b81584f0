/**
 * Files on local disk under config.storageDir (outside static/, so nothing is served without an
 * access check). Keys are made here from random ids; a path is never built from user input, and
 * every key is checked against its shape before it touches the file system. With STORAGE_DRIVER=s3
 * the same functions talk to an S3-compatible bucket through the AWS SDK instead (several app
 * processes or machines see one store); backups (exportObjects, importObjects) and the clean-up
 * check (listObjects) go through them too, so they follow whichever driver is set.
 */
import { createHash } from 'node:crypto';
import { mkdir, open, readdir, readFile, rename, rm, stat } from 'node:fs/promises';
import { dirname, join, resolve, sep } from 'node:path';
import {
	CreateBucketCommand,
	DeleteObjectCommand,
	DeleteObjectsCommand,
	GetObjectCommand,
	HeadBucketCommand,
	ListObjectsV2Command,
	PutObjectCommand,
	S3Client
} from '@aws-sdk/client-s3';
import { config } from './config';
import { newId } from './tokens';

export type StoredExt = 'jpg' | 'png' | 'webp';
const EXTS: readonly StoredExt[] = ['jpg', 'png', 'webp'];

/** `ab/abcdef…xyz.webp`: two-character folder from the id, the id, a known extension. */
const KEY_SHAPE = /^([A-Za-z0-9]{2})\/\1[A-Za-z0-9]{18,}\.(jpg|png|webp)$/;

export function isStorageKey(key: string): boolean {
	return KEY_SHAPE.test(key);
}

function root() {
	return resolve(config.storageDir);
}

function pathOf(key: string): string {
	if (!isStorageKey(key)) throw new Error('Not a storage key.');
	const base = root();
	const full = resolve(base, key);
	if (!full.startsWith(base + sep)) throw new Error('Not a storage key.');
	return full;
}

const s3on = () => config.storage.driver === 's3';
let client: S3Client | null = null;
function s3(): S3Client {
	client ??= new S3Client({
		endpoint: config.storage.endpoint,
		region: config.storage.region,
		forcePathStyle: config.storage.forcePathStyle,
		credentials: {
			accessKeyId: config.storage.accessKeyId,
			secretAccessKey: config.storage.secretAccessKey
		}
	});
	return client;
}
const Bucket = () => config.storage.bucket;
const CONTENT_TYPE: Record<StoredExt, string> = {
	jpg: 'image/jpeg',
	png: 'image/png',
	webp: 'image/webp'
};

export function newKey(ext: StoredExt): string {
	if (!EXTS.includes(ext)) throw new Error('Unsupported file type.');
	const id = newId();
	return `${id.slice(0, 2)}/${id}.${ext}`;
}

/** fsync of a folder: makes a new name in it (a file, a subfolder) survive a power cut. */
async function syncDir(dir: string) {
	const fh = await open(dir, 'r');
	try {
		await fh.sync();
	} finally {
		await fh.close();
	}
}

/**
 * Writes to a temporary name first, so a reader never sees half a file, and syncs the file and its
 * folder before returning: once the photo's row commits, the bytes are on disk too.
 */
export async function putObject(key: string, bytes: Uint8Array): Promise<void> {
	if (s3on()) {
		if (!isStorageKey(key)) throw new Error('Not a storage key.');
		// A PUT is whole or not at all, and acknowledged only once the store holds it.
		const ext = key.slice(key.lastIndexOf('.') + 1) as StoredExt;
		await s3().send(
			new PutObjectCommand({
				Bucket: Bucket(),
				Key: key,
				Body: bytes,
				ContentType: CONTENT_TYPE[ext]
			})
		);
		return;
	}
	const full = pathOf(key);
	const dir = dirname(full);
	const made = await mkdir(dir, { recursive: true });
	if (made) await syncDir(dirname(dir));
	const tmp = `${full}.${newId()}.part`;
	const fh = await open(tmp, 'wx');
	try {
		await fh.writeFile(bytes);
		await fh.sync();
	} finally {
		await fh.close();
	}
	await rename(tmp, full);
	await syncDir(dir);
}

export async function readObject(key: string): Promise<Buffer | null> {
	if (s3on()) {
		if (!isStorageKey(key)) throw new Error('Not a storage key.');
		try {
			const out = await s3().send(new GetObjectCommand({ Bucket: Bucket(), Key: key }));
			return Buffer.from(await out.Body!.transformToByteArray());
		} catch (e) {
			if ((e as { name?: string }).name === 'NoSuchKey') return null;
			throw e;
		}
	}
	try {
		return await readFile(pathOf(key));
	} catch (e) {
		if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
		throw e;
	}
}

export async function deleteObject(key: string): Promise<void> {
	if (s3on()) {
		if (!isStorageKey(key)) throw new Error('Not a storage key.');
		await s3().send(new DeleteObjectCommand({ Bucket: Bucket(), Key: key }));
		return;
	}
	await rm(pathOf(key), { force: true });
}

/**
 * Makes the configured bucket when it is missing (S3 only; true when it made one). For the local
 * fake: one left running from an earlier checkout knows only the buckets it was started with.
 */
export async function ensureBucket(): Promise<boolean> {
	if (!s3on()) return false;
	try {
		await s3().send(new HeadBucketCommand({ Bucket: Bucket() }));
		return false;
	} catch (e) {
		if ((e as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode !== 404) {
			throw e;
		}
	}
	await s3().send(new CreateBucketCommand({ Bucket: Bucket() }));
	return true;
}

/** Deletes several objects; missing ones are fine (a repeated clean-up is not an error). */
export async function deleteObjects(keys: Iterable<string>): Promise<void> {
	if (s3on()) {
		const all = [...keys];
		for (const k of all) if (!isStorageKey(k)) throw new Error('Not a storage key.');
		// S3 takes up to 1000 keys per DeleteObjects request.
		for (let i = 0; i < all.length; i += 1000) {
			const Objects = all.slice(i, i + 1000).map((Key) => ({ Key }));
			await s3().send(
				new DeleteObjectsCommand({ Bucket: Bucket(), Delete: { Objects, Quiet: true } })
			);
		}
		return;
	}
	for (const key of keys) await deleteObject(key);
}

export type StoredObject = { key: string; bytes: number; modifiedAt: Date };

/**
 * Everything in the store: objects under valid keys, and stray files that are not (a `.part` left by
 * a write that never finished, anything copied in by hand), as paths relative to the store.
 */
export async function listObjects(): Promise<{ objects: StoredObject[]; strays: string[] }> {
	const objects: StoredObject[] = [];
	const strays: string[] = [];
	if (s3on()) {
		let ContinuationToken: string | undefined;
		do {
			const page = await s3().send(
				new ListObjectsV2Command({ Bucket: Bucket(), ContinuationToken })
			);
			for (const o of page.Contents ?? []) {
				const key = o.Key ?? '';
				if (isStorageKey(key)) {
					objects.push({ key, bytes: o.Size ?? 0, modifiedAt: o.LastModified ?? new Date(0) });
				} else strays.push(key);
			}
			ContinuationToken = page.IsTruncated ? page.NextContinuationToken : undefined;
		} while (ContinuationToken);
		objects.sort((a, b) => (a.key < b.key ? -1 : 1));
		return { objects, strays: strays.sort() };
	}
	const base = root();
	let entries: string[];
	try {
		entries = await readdir(base, { recursive: true });
	} catch (e) {
		if ((e as NodeJS.ErrnoException).code === 'ENOENT') return { objects, strays };
		throw e;
	}
	for (const rel of entries.sort()) {
		const info = await stat(join(base, rel));
		if (info.isDirectory()) continue;
		const key = rel.split(sep).join('/');
		if (isStorageKey(key)) objects.push({ key, bytes: info.size, modifiedAt: info.mtime });
		else strays.push(key);
	}
	return { objects, strays };
}

/** Removes a stray file found by listObjects (never a path outside the store). */
export async function deleteStray(rel: string): Promise<void> {
	if (s3on()) {
		// Any key in our bucket is inside the store; the SDK escapes it in the request path.
		await s3().send(new DeleteObjectCommand({ Bucket: Bucket(), Key: rel }));
		return;
	}
	const base = root();
	const full = resolve(base, rel);
	if (!full.startsWith(base + sep)) throw new Error('Not inside the store.');
	await rm(full, { force: true });
}

export type ExportedObject = { key: string; bytes: number; sha256: string };

const sha256 = (b: Uint8Array) => createHash('sha256').update(b).digest('hex');

/** Copies every object into `dir/<key>` (for a backup) and says what it copied, with checksums. */
export async function exportObjects(dir: string): Promise<ExportedObject[]> {
	const out: ExportedObject[] = [];
	for (const { key } of (await listObjects()).objects) {
		const bytes = await readObject(key);
		if (!bytes) continue; // deleted while we listed
		const target = join(dir, ...key.split('/'));
		await mkdir(dirname(target), { recursive: true });
		const fh = await open(target, 'wx');
		try {
			await fh.writeFile(bytes);
		} finally {
			await fh.close();
		}
		out.push({ key, bytes: bytes.byteLength, sha256: sha256(bytes) });
	}
	return out;
}

/** Checks that `dir/<key>` holds exactly the bytes listed (a backup's photos before a restore). */
export async function verifyExported(dir: string, list: ExportedObject[]): Promise<string | null> {
	for (const o of list) {
		if (!isStorageKey(o.key)) return `${o.key} is not a storage key`;
		let bytes: Buffer;
		try {
			bytes = await readFile(join(dir, ...o.key.split('/')));
		} catch {
			return `${o.key} is missing`;
		}
		if (bytes.byteLength !== o.bytes || sha256(bytes) !== o.sha256) {
			return `${o.key} does not match its checksum`;
		}
	}
	return null;
}

/** Writes every listed object from `dir/<key>` into the store (a restore, before the swap). */
export async function importObjects(dir: string, list: ExportedObject[]): Promise<number> {
	for (const o of list) await putObject(o.key, await readFile(join(dir, ...o.key.split('/'))));
	return list.length;
}

/** Deletes every object not in `keep`, and stray files (a restore, after the swap). */
export async function pruneObjects(keep: Set<string>): Promise<number> {
	const { objects, strays } = await listObjects();
	const extra = objects.filter((o) => !keep.has(o.key));
	await deleteObjects(extra.map((o) => o.key));
	for (const s of strays) await deleteStray(s);
	return extra.length + strays.length;
}

/** Where the store is, for messages (a folder today; a bucket's address with an object store). */
export function storeLocation(): string {
	if (s3on()) return `${config.storage.endpoint.replace(/\/$/, '')}/${config.storage.bucket} (S3)`;
	return root();
}
