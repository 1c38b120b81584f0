import { json } from '@sveltejs/kit';
import { SceneError, checkScene, sceneSchema } from '$lib/geometry';
import { requireUser } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import type { RequestHandler } from './$types';

/** A scene (docs/scene-format.md) → its fit report, computed by the same engine the editor runs. */
export const POST: RequestHandler = async (event) => {
	const user = requireUser(event.locals);
	await apiLimit(event, user.id);
	const scene = await readJson(event.request, sceneSchema);
	try {
		return json(checkScene(scene));
	} catch (e) {
		if (e instanceof SceneError) return problem(400, e.message, [{ path: e.path, message: e.message }]);
		throw e;
	}
};
