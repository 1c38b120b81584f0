import { error } from '@sveltejs/kit';
import { memberActor } from '$lib/server/sharing/actors';
import { imageResponse, readPhoto } from '$lib/server/sharing/photos';
import { photoIdForRef } from '$lib/server/sharing/view';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const size = event.params.size;
	if (size !== 'thumb' && size !== 'full') error(404, 'Not found.');
	const actor = await memberActor(event, event.params.variantId);
	const photoId = await photoIdForRef(actor.build.id, actor.viewer.scopeKey, event.params.ref);
	if (!photoId) error(404, 'Not found.');
	const img = await readPhoto(actor.build.id, photoId, size);
	if (!img) error(404, 'Not found.');
	return imageResponse(img);
};
