/**
 * Build photos: JPEG, PNG or WebP up to 10 MB, the type read from the bytes (never the name or the
 * browser's claim). Each upload is re-encoded without its metadata (a phone photo carries the
 * place it was taken) and turned upright, plus a small WebP thumbnail.
 */
import { and, eq } from 'drizzle-orm';
import { fileTypeFromBuffer } from 'file-type';
import sharp from 'sharp';
import { db } from '../db';
import { photos, type PhotoRow } from '../db/schema';
import { deleteObject, newKey, putObject, readObject, type StoredExt } from '../storage';
import { oldestFirst } from '../rows';
import { newId } from '../tokens';
import { ServiceError, type ServiceErrorKind } from '../errors';

export const MAX_PHOTO_BYTES = 10 * 1024 * 1024;
/** Beyond this many pixels a "photo" is more likely a decompression bomb than a picture of a build. */
const MAX_PIXELS = 60_000_000;
const DISPLAY_EDGE_PX = 2560;
const THUMB_EDGE_PX = 480;
export const MAX_PHOTOS_PER_BUILD = 200;

const ACCEPTED: Record<string, StoredExt> = {
	'image/jpeg': 'jpg',
	'image/png': 'png',
	'image/webp': 'webp'
};

/** A photo the build will not take (empty, too large, not an image, too many); about `file`. */
export class PhotoRejected extends ServiceError {
	constructor(message: string, kind: ServiceErrorKind = 'invalid') {
		super(kind, message, { field: 'file' });
	}
}

export type CheckedImage = {
	mime: keyof typeof ACCEPTED;
	ext: StoredExt;
	display: Buffer;
	thumb: Buffer;
	width: number;
	height: number;
};

/** Checks and converts an upload; throws PhotoRejected with a sentence the uploader can act on. */
export async function checkImage(bytes: Uint8Array): Promise<CheckedImage> {
	if (bytes.byteLength === 0) throw new PhotoRejected('The file is empty.');
	if (bytes.byteLength > MAX_PHOTO_BYTES) {
		throw new PhotoRejected(
			`The file is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`,
			'too-large'
		);
	}
	const type = await fileTypeFromBuffer(bytes);
	const ext = type ? ACCEPTED[type.mime] : undefined;
	if (!type || !ext) {
		throw new PhotoRejected(
			'Only JPEG, PNG and WebP photos can be uploaded; this file is something else.',
			'unsupported-type'
		);
	}
	const mime = type.mime as keyof typeof ACCEPTED;
	try {
		const input = () => sharp(bytes, { limitInputPixels: MAX_PIXELS, failOn: 'error' });
		const display = await input()
			.rotate()
			.resize({
				width: DISPLAY_EDGE_PX,
				height: DISPLAY_EDGE_PX,
				fit: 'inside',
				withoutEnlargement: true
			})
			.toFormat(ext === 'jpg' ? 'jpeg' : ext, ext === 'png' ? {} : { quality: 85 })
			.toBuffer({ resolveWithObject: true });
		const thumb = await input()
			.rotate()
			.resize({
				width: THUMB_EDGE_PX,
				height: THUMB_EDGE_PX,
				fit: 'inside',
				withoutEnlargement: true
			})
			.webp({ quality: 75 })
			.toBuffer();
		return {
			mime,
			ext,
			display: display.data,
			thumb,
			width: display.info.width,
			height: display.info.height
		};
	} catch (e) {
		if (e instanceof Error && /pixel limit/i.test(e.message)) {
			throw new PhotoRejected('The image has too many pixels.');
		}
		throw new PhotoRejected('The image could not be read; it may be damaged.');
	}
}

export async function addPhoto(input: {
	buildId: string;
	uploadedBy: string;
	bytes: Uint8Array;
	caption: string;
}): Promise<PhotoRow> {
	const existing = await db.$count(photos, eq(photos.buildId, input.buildId));
	if (existing >= MAX_PHOTOS_PER_BUILD) {
		throw new PhotoRejected(`A build holds at most ${MAX_PHOTOS_PER_BUILD} photos.`);
	}
	const image = await checkImage(input.bytes);
	const storageKey = newKey(image.ext);
	const thumbKey = newKey('webp');
	await putObject(storageKey, image.display);
	await putObject(thumbKey, image.thumb);
	try {
		const [row] = await db
			.insert(photos)
			.values({
				id: newId(),
				buildId: input.buildId,
				storageKey,
				thumbKey,
				mime: image.mime,
				byteSize: image.display.byteLength,
				width: image.width,
				height: image.height,
				caption: input.caption,
				uploadedBy: input.uploadedBy
			})
			.returning();
		return row;
	} catch (e) {
		await deleteObject(storageKey);
		await deleteObject(thumbKey);
		throw e;
	}
}

export async function photosOf(buildId: string): Promise<PhotoRow[]> {
	return oldestFirst(photos, eq(photos.buildId, buildId));
}

export async function deletePhoto(buildId: string, photoId: string): Promise<boolean> {
	const [row] = await db
		.delete(photos)
		.where(and(eq(photos.id, photoId), eq(photos.buildId, buildId)))
		.returning();
	if (!row) return false;
	await deleteObject(row.storageKey);
	await deleteObject(row.thumbKey);
	return true;
}

export async function setCaption(
	buildId: string,
	photoId: string,
	caption: string
): Promise<boolean> {
	const rows = await db
		.update(photos)
		.set({ caption })
		.where(and(eq(photos.id, photoId), eq(photos.buildId, buildId)))
		.returning({ id: photos.id });
	return rows.length > 0;
}

export type PhotoSize = 'thumb' | 'full';

/** The bytes and type of one photo of this build, or null. */
export async function readPhoto(buildId: string, photoId: string, size: PhotoSize) {
	const [row] = await db
		.select()
		.from(photos)
		.where(and(eq(photos.id, photoId), eq(photos.buildId, buildId)));
	if (!row) return null;
	const bytes = await readObject(size === 'thumb' ? row.thumbKey : row.storageKey);
	if (!bytes) return null;
	return { bytes, mime: size === 'thumb' ? 'image/webp' : row.mime };
}

/** Image responses: private (access-checked), never sniffed into something else, and not a page. */
export function imageResponse(img: { bytes: Buffer; mime: string }) {
	return new Response(new Uint8Array(img.bytes), {
		headers: {
			'content-type': img.mime,
			'content-length': String(img.bytes.byteLength),
			'cache-control': 'private, max-age=3600',
			'x-content-type-options': 'nosniff',
			'content-security-policy': "default-src 'none'; sandbox",
			'content-disposition': 'inline'
		}
	});
}
