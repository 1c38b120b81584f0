import { json } from '@sveltejs/kit';
import { sceneSchema } from '$lib/geometry';
import { requireUser } from '$lib/server/access';
import { apiLimit, readJson } from '$lib/server/api';
import { checkInPool } from '$lib/server/engine/pool';
import type { RequestHandler } from './$types';
import { jsonRoute } from '$lib/server/errors';

/**
 * A scene (docs/scene-format.md) → its fit report, computed by the same engine the editor runs,
 * in a worker thread; a scene over the cost limits is refused with 422 before any work.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const user = requireUser(event.locals);
	await apiLimit(event, user.id);
	const scene = await readJson(event.request, sceneSchema);
	return json(await checkInPool(scene));
});
