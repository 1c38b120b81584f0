import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { checkScene } from '$lib/geometry';
import { variantSettingsSchema } from '$lib/builds/settings';
import { requireBuild, requireUser } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import { SceneRejected, enclosureVersionDef, partsForStudio, validateScene } from '$lib/server/builds';
import type { RequestHandler } from './$types';

const body = z.object({ settings: variantSettingsSchema });

/**
 * The server's own check of what the editor shows: the build's pinned enclosure, parts from the
 * studio's catalogue (never part geometry sent by the browser), the posted settings.
 */
export const POST: RequestHandler = async (event) => {
	const user = requireUser(event.locals);
	// Independent steps run side by side (this endpoint follows every pause in editing); their
	// failures still answer in a fixed order: access, then the rate limit, then the body.
	const settled = await Promise.allSettled([requireBuild(event.locals, event.params.id, 'build.edit'), apiLimit(event, user.id), readJson(event.request, body)]);
	for (const r of settled) if (r.status === 'rejected') throw r.reason;
	const [{ build }, , { settings }] = settled.map((r) => (r as PromiseFulfilledResult<unknown>).value) as [Awaited<ReturnType<typeof requireBuild>>, void, z.infer<typeof body>];
	try {
		const [{ parts, forbidden }, enc] = await Promise.all([partsForStudio(build.studioId, settings.placements.map((p) => p.partId)), enclosureVersionDef(build.enclosureVersionId)]);
		if (forbidden.length) return problem(403, 'A placed part is not in this studio’s catalogue.', [{ path: 'settings.placements', message: forbidden.join(', ') }]);
		if (!enc) return problem(409, 'The build’s enclosure version is missing.');
		return json(checkScene(validateScene(enc.definition, parts, settings)));
	} catch (e) {
		if (e instanceof SceneRejected) return problem(e.status, 'The scene does not validate.', e.issues);
		throw e;
	}
};
