import { error } from '@sveltejs/kit';
import { requireBuild } from '$lib/server/access';
import { imageResponse, readPhoto } from '$lib/server/sharing/photos';
import type { RequestHandler } from './$types';

/** A build photo for members allowed to see the build (clients: only builds shared with them). */
export const GET: RequestHandler = async ({ locals, params }) => {
	if (params.size !== 'thumb' && params.size !== 'full') error(404, 'Not found.');
	const { build } = await requireBuild(locals, params.id, 'build.view');
	const img = await readPhoto(build.id, params.photoId, params.size);
	if (!img) error(404, 'Not found.');
	return imageResponse(img);
};
