import { json } from '@sveltejs/kit';
import { z } from 'zod';
import {
	FACES,
	MAX_SWEEP_POINTS,
	allowedPositions,
	sceneSchema,
	type Scene,
	type SweepControl
} from '$lib/geometry';
import { requireUser } from '$lib/server/access';
import { apiLimit, readJson } from '$lib/server/api';
import { gridInPool, sweepInPool } from '$lib/server/engine/pool';
import type { RequestHandler } from './$types';
import { jsonRoute } from '$lib/server/errors';

const control = z.object({ kind: z.enum(['divider', 'bracket']), id: z.string().min(1).max(120) });
const body = z.object({
	scene: sceneSchema,
	control,
	/** A second control makes it a grid sweep. */
	controlB: control.optional(),
	positions: z.array(z.number()).max(MAX_SWEEP_POINTS).optional(),
	gaps: z
		.array(z.object({ placementId: z.string().max(120), face: z.enum(FACES) }))
		.max(100)
		.optional()
});

/** Allowed positions of a control (0 for an unknown one: the sweep itself names that error). */
function positionCount(scene: Scene, c: SweepControl): number {
	const def =
		c.kind === 'divider'
			? scene.enclosure.dividers.find((d) => d.id === c.id)
			: scene.enclosure.brackets.find((b) => b.id === c.id);
	return def ? allowedPositions(def).length : 0;
}

/**
 * Runs the fit report at every allowed position of one control (or a grid of two), in a worker;
 * counted first, so a sweep over the limits is refused with 422 naming the limit.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const user = requireUser(event.locals);
	await apiLimit(event, user.id);
	const { scene, control, controlB, positions, gaps } = await readJson(event.request, body);
	const count = (c: SweepControl) => positionCount(scene, c);
	if (controlB) {
		const grid = { kind: 'grid', scene, controlA: control, controlB, gaps } as const;
		return json(await gridInPool(grid, count(control) * count(controlB)));
	}
	const sweep = { kind: 'sweep', scene, control, positions, gaps } as const;
	return json(await sweepInPool(sweep, positions?.length ?? count(control)));
});
