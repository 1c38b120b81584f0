/**
 * Photo uploads: the type read from the bytes (file-type), never the name or the browser's claim;
 * 10 MB at most; metadata dropped; files served only to those who may see the build or hold its
 * link. Test images are made with sharp, and checked back with sharp and file-type.
 */
import { readdir } from 'node:fs/promises';
import { resolve } from 'node:path';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { describe, expect, it } from 'vitest';
import { readObject } from '../storage';
import { config } from '../config';
import { db } from '../db';
import { photos } from '../db/schema';
import { eq } from 'drizzle-orm';
import { useApp } from '../testing/suite';
import { revokeShareLink } from './links';
import { MAX_PHOTO_BYTES, PhotoRejected, checkImage } from './photos';
import { sharedDemo } from '../testing/sharing';

const app = useApp();

const image = (format: 'jpeg' | 'png' | 'webp', width = 64, height = 48) =>
	sharp({ create: { width, height, channels: 3, background: { r: 190, g: 150, b: 74 } } })
		.toFormat(format)
		.toBuffer();

function upload(bytes: Uint8Array, name: string, type: string) {
	const form = new FormData();
	form.append('file', new Blob([new Uint8Array(bytes)], { type }), name);
	form.append('caption', 'On the bench');
	return form;
}

describe('checking an upload', () => {
	it.each(['jpeg', 'png', 'webp'] as const)(
		'accepts %s by its bytes and makes a WebP thumbnail',
		async (format) => {
			const checked = await checkImage(await image(format));
			expect(checked.mime).toBe(`image/${format}`);
			expect((await fileTypeFromBuffer(checked.thumb))?.mime).toBe('image/webp');
			expect([checked.width, checked.height]).toEqual([64, 48]);
		}
	);

	it.each([
		['text', Buffer.from('just some words, not a picture at all')],
		[
			'GIF (not accepted)',
			Buffer.from('R0lGODlhAQABAIAAAAAAAP///yH5BAEAAAAALAAAAAABAAEAAAIBRAA7', 'base64')
		],
		['PDF', Buffer.from('%PDF-1.4\n%âãÏÓ\n1 0 obj\n<<>>\nendobj\n')],
		['HTML', Buffer.from('<!doctype html><script>alert(1)</script>')]
	])('refuses %s whatever it is called', async (_label, bytes) => {
		await expect(checkImage(bytes)).rejects.toMatchObject({ status: 415 });
	});

	it('refuses an empty file, a damaged JPEG and anything over 10 MB', async () => {
		await expect(checkImage(new Uint8Array())).rejects.toBeInstanceOf(PhotoRejected);
		const jpeg = await image('jpeg');
		await expect(checkImage(jpeg.subarray(0, 40))).rejects.toMatchObject({ status: 400 });
		const big = new Uint8Array(MAX_PHOTO_BYTES + 1);
		big.set(jpeg);
		await expect(checkImage(big)).rejects.toMatchObject({ status: 413 });
	});

	it('drops the metadata a camera writes (EXIF) and turns the picture upright', async () => {
		// EXIF orientation 6: stored sideways, to be shown turned 90° clockwise.
		const withExif = await sharp(await image('jpeg', 64, 48))
			.withMetadata({ orientation: 6, exif: { IFD0: { Copyright: 'someone' } } })
			.toBuffer();
		expect((await sharp(withExif).metadata()).exif).toBeDefined();
		const checked = await checkImage(withExif);
		const meta = await sharp(checked.display).metadata();
		expect(meta.exif).toBeUndefined();
		expect([meta.width, meta.height]).toEqual([48, 64]);
	});
});

describe('uploading and serving', () => {
	it('stores by its own random name, under the storage folder, whatever the upload was called', async () => {
		const s = await sharedDemo();
		const designer = app.client({ session: s.designer.session });
		const res = await designer.request(
			'POST',
			`/api/photos/${s.buildId}`,
			await multipart(upload(await image('png'), '../../../etc/passwd.jpg', 'image/jpeg'))
		);
		expect(res.status, res.text).toBe(201);
		const body = res.json<{ id: string; mime: string }>();
		expect(body.mime).toBe('image/png');
		const [row] = await db.select().from(photos).where(eq(photos.id, body.id));
		expect(row.storageKey).toMatch(/^[A-Za-z0-9]{2}\/[A-Za-z0-9]+\.png$/);
		expect(row.storageKey).not.toContain('passwd');
		// In the store under that key, whichever driver is set (a folder or a bucket).
		expect(await readObject(row.storageKey)).not.toBeNull();
		if (config.storage.driver === 'disk') {
			const folder = resolve(config.storageDir, row.storageKey.split('/')[0]);
			expect(await readdir(folder)).toContain(row.storageKey.split('/')[1]);
		}
	});

	it.each([
		[
			'a text file named .jpg',
			415,
			async () => upload(Buffer.from('not an image'), 'photo.jpg', 'image/jpeg')
		],
		[
			'an oversized file',
			413,
			async () => upload(new Uint8Array(MAX_PHOTO_BYTES + 10), 'big.jpg', 'image/jpeg')
		]
	])('answers %s with %i and stores nothing', async (_label, status, make) => {
		const s = await sharedDemo();
		const res = await app
			.client({ session: s.designer.session })
			.request('POST', `/api/photos/${s.buildId}`, await multipart(await make()));
		expect(res.status).toBe(status);
		expect(await db.$count(photos, eq(photos.buildId, s.buildId))).toBe(0);
	});

	it('serves photos to the studio and the link holder only; a revoked link loses them', async () => {
		const s = await sharedDemo();
		const up = await app
			.client({ session: s.designer.session })
			.request(
				'POST',
				`/api/photos/${s.buildId}`,
				await multipart(upload(await image('webp'), 'x.webp', 'image/webp'))
			);
		const { id } = up.json<{ id: string }>();
		const path = `/builds/${s.buildId}/photos/${id}/thumb`;
		expect((await app.client({ session: s.owner.session }).get(path)).status).toBe(200);
		expect((await app.client({ session: s.client.session }).get(path)).status).toBe(200);
		expect((await app.client({ session: s.outsider.session }).get(path)).status).toBe(404);
		expect((await app.client().get(path)).status).toBe(401);

		const page = await app.client().get(`/s/${s.token}`);
		const ref = /\/s\/[A-Za-z0-9_-]{43}\/photos\/([A-Za-z0-9_-]{22})\/thumb/.exec(page.text)?.[1];
		expect(ref).toBeDefined();
		expect(page.text).not.toContain(id);
		const viaLink = await app.client().get(`/s/${s.token}/photos/${ref}/thumb`);
		expect(viaLink.status).toBe(200);
		expect(viaLink.header('content-type')).toBe('image/webp');
		expect(viaLink.header('x-content-type-options')).toBe('nosniff');

		await revokeShareLink(s.buildId, s.link.id);
		expect((await app.client().get(`/s/${s.token}/photos/${ref}/thumb`)).status).toBe(410);
	});

	it('refuses uploads from clients and other studios', async () => {
		const s = await sharedDemo();
		for (const who of [s.client, s.outsider]) {
			const res = await app
				.client({ session: who.session })
				.request(
					'POST',
					`/api/photos/${s.buildId}`,
					await multipart(upload(await image('png'), 'a.png', 'image/png'))
				);
			expect([403, 404]).toContain(res.status);
		}
		expect(await db.$count(photos, eq(photos.buildId, s.buildId))).toBe(0);
	});
});

async function multipart(form: FormData) {
	const r = new Response(form);
	return {
		body: Buffer.from(await r.arrayBuffer()),
		headers: {
			'content-type': r.headers.get('content-type') ?? '',
			accept: 'application/json',
			origin: app.baseURL
		}
	};
}
