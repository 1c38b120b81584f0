import { json } from '@sveltejs/kit';
import { z } from 'zod';
import { checkScene } from '$lib/geometry';
import { variantSettingsSchema } from '$lib/builds/settings';
import { requireBuild } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import { SceneRejected, enclosureVersionDef, partsForStudio, validateScene } from '$lib/server/builds';
import type { RequestHandler } from './$types';

const body = z.object({ settings: variantSettingsSchema });

/**
 * The server's own check of what the editor shows: the build's pinned enclosure, parts from the
 * studio's catalogue (never part geometry sent by the browser), the posted settings.
 */
export const POST: RequestHandler = async (event) => {
	const { build, access } = await requireBuild(event.locals, event.params.id, 'build.edit');
	await apiLimit(event, access.user.id);
	const { settings } = await readJson(event.request, body);
	try {
		const { parts, forbidden } = await partsForStudio(build.studioId, settings.placements.map((p) => p.partId));
		if (forbidden.length) return problem(403, 'A placed part is not in this studio’s catalogue.', [{ path: 'settings.placements', message: forbidden.join(', ') }]);
		const enc = await enclosureVersionDef(build.enclosureVersionId);
		if (!enc) return problem(409, 'The build’s enclosure version is missing.');
		return json(checkScene(validateScene(enc.definition, parts, settings)));
	} catch (e) {
		if (e instanceof SceneRejected) return problem(e.status, 'The scene does not validate.', e.issues);
		throw e;
	}
};
