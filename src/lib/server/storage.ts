/**
 * Files on local disk under config.storageDir (outside static/, so nothing is served without an
 * access check). Keys are made here from random ids; a path is never built from user input, and
 * every key is checked against its shape before it touches the file system. Swap this module for
 * an S3-compatible store when the app runs on several machines.
 */
import { mkdir, readFile, rename, rm, writeFile } from 'node:fs/promises';
import { dirname, resolve, sep } from 'node:path';
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

export function newKey(ext: StoredExt): string {
	if (!EXTS.includes(ext)) throw new Error('Unsupported file type.');
	const id = newId();
	return `${id.slice(0, 2)}/${id}.${ext}`;
}

/** Writes to a temporary name first, so a reader never sees half a file. */
export async function putObject(key: string, bytes: Uint8Array): Promise<void> {
	const full = pathOf(key);
	await mkdir(dirname(full), { recursive: true });
	const tmp = `${full}.${newId()}.part`;
	await writeFile(tmp, bytes, { flag: 'wx' });
	await rename(tmp, full);
}

export async function readObject(key: string): Promise<Buffer | null> {
	try {
		return await readFile(pathOf(key));
	} catch (e) {
		if ((e as NodeJS.ErrnoException).code === 'ENOENT') return null;
		throw e;
	}
}

export async function deleteObject(key: string): Promise<void> {
	await rm(pathOf(key), { force: true });
}
