import { error } from '@sveltejs/kit';
import { requireBuild } from '$lib/server/access';
import { imageResponse, readPhoto } from '$lib/server/sharing/photos';
import type { RequestHandler } from './$types';

/** A photo's thumbnail for the build sheet, for anyone who may see the build. */
export const GET: RequestHandler = async ({ locals, params }) => {
	const { build } = await requireBuild(locals, params.id, 'build.view');
	const img = await readPhoto(build.id, params.photoId, 'thumb');
	if (!img) error(404, 'Not found.');
	return imageResponse(img);
};
