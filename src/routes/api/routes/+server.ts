import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { SceneError, sceneSchema } from '$lib/geometry';
import { checkExcess } from '$lib/geometry/cost';
import { routeInputFor, routeRunSchema } from '$lib/builds/routes';
import { requireUser } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import { refuseCost, routeInPool } from '$lib/server/engine/pool';
import type { RequestHandler } from './$types';
import { jsonRoute } from '$lib/server/errors';

const body = z.object({ scene: sceneSchema, run: routeRunSchema });

/**
 * A scene and one run between two ports → up to three suggested routes, fewest bends first (or
 * why none fits), from the same search the editor's worker runs. Like /api/check it reads no
 * studio data: any signed-in person, rate-limited, cost limits before any work. Nothing is stored.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const user = requireUser(event.locals);
	await apiLimit(event, user.id);
	const input = await readJson(event.request, body);
	const excess = checkExcess(input.scene);
	if (excess) refuseCost(excess, 'scene');
	try {
		const made = routeInputFor(input.scene, input.run);
		if (!made.ok) return problem(400, made.issue.message, [made.issue]);
		return json(await routeInPool(made.input));
	} catch (e) {
		if (e instanceof SceneError) {
			return problem(400, e.message, [{ path: `scene.${e.path}`, message: e.message }]);
		}
		throw e;
	}
});
