import { json } from '@sveltejs/kit';
import { requireBuild } from '$lib/server/access';
import { apiLimit, problem, readMultipart } from '$lib/server/api';
import { jsonRoute } from '$lib/server/errors';
import { photoUploadForm } from '$lib/schemas/sharing';
import { MAX_PHOTO_BYTES, addPhoto } from '$lib/server/sharing/photos';
import type { RequestHandler } from './$types';

/**
 * Upload one photo (multipart field `file`, optional `caption`: the upload form's schema); the
 * photos page posts here so it can show progress. The type comes from the bytes; the size is
 * checked before they are read.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const { build, access } = await requireBuild(event.locals, event.params.buildId, 'build.photos');
	await apiLimit(event, access.user.id);
	const declared = Number(event.request.headers.get('content-length') ?? 0);
	if (declared > MAX_PHOTO_BYTES + 64 * 1024) {
		return problem(413, `The file is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.`);
	}
	const { form, fields } = await readMultipart(event.request, photoUploadForm);
	const file = form.get('file');
	if (!(file instanceof File)) {
		return problem(400, 'Send the photo in a field named "file".', [
			{ path: 'file', message: 'Required' }
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
		caption: fields.caption
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
