import { json } from '@sveltejs/kit';
import { requireBuild } from '$lib/server/access';
import { apiLimit, problem } from '$lib/server/api';
import { jsonRoute } from '$lib/server/errors';
import { MAX_PHOTO_BYTES, addPhoto } from '$lib/server/sharing/photos';
import type { RequestHandler } from './$types';

/**
 * Upload one photo (multipart field `file`, optional `caption`); the photos page posts here so it
 * can show progress. The type comes from the bytes; the size is checked before they are read.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const { build, access } = await requireBuild(event.locals, event.params.buildId, 'build.photos');
	await apiLimit(event, access.user.id);
	const declared = Number(event.request.headers.get('content-length') ?? 0);
	if (declared > MAX_PHOTO_BYTES + 64 * 1024) {
		return problem(413, `The file is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`);
	}
	let form: FormData;
	try {
		form = await event.request.formData();
	} catch {
		return problem(400, 'Send the photo as multipart form data, in a field named "file".');
	}
	const file = form.get('file');
	const caption = String(form.get('caption') ?? '').trim();
	if (!(file instanceof File)) {
		return problem(400, 'Send the photo in a field named "file".', [
			{ path: 'file', message: 'Required' }
		]);
	}
	// eslint-disable-next-line no-control-regex
	if (caption.length > 200 || /[\u0000-\u001f\u007f]/.test(caption)) {
		return problem(400, 'The caption is too long or has control characters.', [
			{ path: 'caption', message: 'At most 200 characters' }
		]);
	}
	if (file.size > MAX_PHOTO_BYTES) {
		return problem(413, `The file is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`);
	}
	// A refused photo (PhotoRejected) answers with its status and the message on `file`.
	const row = await addPhoto({
		buildId: build.id,
		uploadedBy: access.user.id,
		bytes: new Uint8Array(await file.arrayBuffer()),
		caption
	});
	return json(
		{ id: row.id, width: row.width, height: row.height, mime: row.mime, byteSize: row.byteSize },
		{ status: 201 }
	);
});

export type UploadResponse = {
	id: string;
	width: number;
	height: number;
	mime: string;
	byteSize: number;
};
