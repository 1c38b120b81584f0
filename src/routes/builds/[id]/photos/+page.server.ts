import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import { idField, line } from '$lib/schemas/common';
import { requireBuild } from '$lib/server/access';
import { parseForm } from '$lib/server/forms';
import {
	MAX_PHOTO_BYTES,
	PhotoRejected,
	addPhoto,
	deletePhoto,
	photosOf,
	setCaption
} from '$lib/server/sharing/photos';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build } = await requireBuild(locals, params.id, 'build.photos', url);
	const rows = await photosOf(build.id);
	return {
		build: { id: build.id, name: build.name },
		maxBytes: MAX_PHOTO_BYTES,
		photos: rows.map((p) => ({
			id: p.id,
			caption: p.caption,
			width: p.width,
			height: p.height,
			byteSize: p.byteSize,
			createdAt: p.createdAt
		}))
	};
};

const caption = z.union([line('Caption', 200), z.literal('')]).default('');

export const actions: Actions = {
	/** The form without JavaScript; with it, the page uploads through /api/photos to show progress. */
	upload: async ({ locals, params, url, request }) => {
		const { build, access } = await requireBuild(locals, params.id, 'build.photos', url);
		const form = await request.formData();
		const file = form.get('file');
		const text = caption.safeParse(form.get('caption') ?? '');
		if (!text.success) {
			return fail(400, { errors: { caption: text.error.issues[0].message }, values: {} });
		}
		if (!(file instanceof File) || file.size === 0) {
			return fail(400, { errors: { file: 'Choose a photo to upload.' }, values: {} });
		}
		if (file.size > MAX_PHOTO_BYTES) {
			return fail(413, {
				errors: { file: `The file is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.` },
				values: {}
			});
		}
		try {
			await addPhoto({
				buildId: build.id,
				uploadedBy: access.user.id,
				bytes: new Uint8Array(await file.arrayBuffer()),
				caption: text.data
			});
		} catch (e) {
			if (e instanceof PhotoRejected) {
				return fail(e.status, { errors: { file: e.message }, values: {} });
			}
			throw e;
		}
		return { uploaded: true };
	},
	delete: async (event) => {
		const { build } = await requireBuild(event.locals, event.params.id, 'build.photos', event.url);
		const parsed = await parseForm(event.request, z.object({ photoId: idField('Photo') }));
		if (!parsed.ok) return parsed.failure;
		if (!(await deletePhoto(build.id, parsed.data.photoId))) {
			return fail(404, { errors: { photoId: 'That photo is already gone.' }, values: {} });
		}
		return { deleted: true };
	},
	caption: async (event) => {
		const { build } = await requireBuild(event.locals, event.params.id, 'build.photos', event.url);
		const parsed = await parseForm(event.request, z.object({ photoId: idField('Photo'), caption }));
		if (!parsed.ok) return parsed.failure;
		if (!(await setCaption(build.id, parsed.data.photoId, parsed.data.caption))) {
			return fail(404, { errors: { photoId: 'That photo is gone.' }, values: {} });
		}
		return { captioned: true };
	}
};
