import { fail } from '@sveltejs/kit';
import { photoCaptionForm, photoDeleteForm, photoUploadForm } from '$lib/schemas/sharing';
import { forForm } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import {
	MAX_PHOTO_BYTES,
	addPhoto,
	deletePhoto,
	photosOf,
	setCaption
} from '$lib/server/sharing/photos';
import { buildPage, fieldsOf, guardBuild } from '../../../build-pages';
import type { Actions, PageServerLoad } from './$types';

const PHOTO_FIELDS = ['id', 'caption', 'width', 'height', 'byteSize', 'createdAt'] as const;

export const load: PageServerLoad = (event) =>
	buildPage(event, 'build.photos', async (build) => ({
		maxBytes: MAX_PHOTO_BYTES,
		photos: fieldsOf(await photosOf(build.id), PHOTO_FIELDS)
	}));

export const actions: Actions = {
	/** The form without JavaScript; with it, the page uploads through /api/photos to show progress. */
	upload: async (event) => {
		const { build, access } = await guardBuild(event, 'build.photos');
		// The file goes to the service as bytes; the caption through the form schema.
		const data = await event.request.formData();
		const file = data.get('file');
		const parsed = await readForm(data, photoUploadForm);
		if (!parsed.ok) return fail(parsed.failure.status, { ...parsed.failure.data, values: {} });
		if (!(file instanceof File) || file.size === 0) {
			return fail(400, { errors: { file: 'Choose a photo to upload.' }, values: {} });
		}
		if (file.size > MAX_PHOTO_BYTES) {
			return fail(413, {
				errors: { file: `The file is larger than ${MAX_PHOTO_BYTES / 1024 / 1024} MB.` },
				values: {}
			});
		}
		// A refused photo (empty, not an image, too many) answers on `file`.
		return forForm(async () => {
			await addPhoto({
				buildId: build.id,
				uploadedBy: access.user.id,
				bytes: new Uint8Array(await file.arrayBuffer()),
				caption: parsed.data.caption
			});
			return { uploaded: true as const };
		});
	},
	delete: async (event) => {
		const { build } = await guardBuild(event, 'build.photos');
		const parsed = await readForm(event.request, photoDeleteForm);
		if (!parsed.ok) return parsed.failure;
		if (!(await deletePhoto(build.id, parsed.data.photoId))) {
			return fail(404, { errors: { photoId: 'That photo is already gone.' }, values: {} });
		}
		return { deleted: true };
	},
	caption: async (event) => {
		const { build } = await guardBuild(event, 'build.photos');
		const parsed = await readForm(event.request, photoCaptionForm);
		if (!parsed.ok) return parsed.failure;
		if (!(await setCaption(build.id, parsed.data.photoId, parsed.data.caption))) {
			return fail(404, { errors: { photoId: 'That photo is gone.' }, values: {} });
		}
		return { captioned: true };
	}
};
