import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { FACES, SceneError, sceneSchema, sweep, sweepGrid } from '$lib/geometry';
import { requireUser } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import type { RequestHandler } from './$types';

const control = z.object({ kind: z.enum(['divider', 'bracket']), id: z.string().min(1).max(120) });
const body = z.object({
	scene: sceneSchema,
	control,
	/** A second control makes it a grid sweep. */
	controlB: control.optional(),
	positions: z.array(z.number()).max(10_000).optional(),
	gaps: z.array(z.object({ placementId: z.string().max(120), face: z.enum(FACES) })).max(100).optional()
});

/** Runs the fit report at every allowed position of one control (or a grid of two). */
export const POST: RequestHandler = async (event) => {
	const user = requireUser(event.locals);
	await apiLimit(event, user.id);
	const input = await readJson(event.request, body);
	try {
		if (input.controlB) return json(sweepGrid(input.scene, input.control, input.controlB));
		return json(sweep(input.scene, { control: input.control, positions: input.positions, gaps: input.gaps }));
	} catch (e) {
		if (e instanceof SceneError) return problem(400, e.message, [{ path: e.path, message: e.message }]);
		throw e;
	}
};
