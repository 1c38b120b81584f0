import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import type { EnclosureDef } from '$lib/geometry';
import { catalogueIdsOf, variantSettingsSchema } from '$lib/builds/settings';
import { requireUser, roleMay } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import {
	SceneRejected,
	checkContext,
	partsForBuildStudio,
	validateScene
} from '$lib/server/builds';
import { checkInPool } from '$lib/server/engine/pool';
import { engineTubeKinds, tubeKindsForStudio } from '$lib/server/loop';
import type { RequestHandler } from './$types';

const body = z.object({ settings: variantSettingsSchema });

/**
 * The server's own check of what the editor shows: the build's pinned enclosure, parts from the
 * studio's catalogue (never part geometry sent by the browser), the posted settings. Called after
 * every pause in editing, so its three reads go out together: access with the enclosure, the
 * rate limit, the parts. Nothing is answered before access is settled.
 */
export const POST: RequestHandler = async (event) => {
	const user = requireUser(event.locals);
	const { settings } = await readJson(event.request, body);
	const [ctx, limited, found] = await Promise.allSettled([
		checkContext(event.params.id, user.id),
		apiLimit(event, user.id),
		partsForBuildStudio(event.params.id, catalogueIdsOf(settings).parts)
	]);
	if (ctx.status === 'rejected') throw ctx.reason;
	if (!ctx.value?.role) error(404, 'Not found.');
	if (!roleMay(ctx.value.role, 'build.edit')) {
		error(403, 'Your role in this studio does not allow this.');
	}
	if (limited.status === 'rejected') throw limited.reason;
	if (found.status === 'rejected') throw found.reason;
	const { parts, forbidden } = found.value;
	if (forbidden.length) {
		return problem(403, 'A placed part is not in this studio’s catalogue.', [
			{ path: 'settings.placements', message: forbidden.join(', ') }
		]);
	}
	const tubes = await tubeKindsForStudio(
		ctx.value.build.studioId,
		catalogueIdsOf(settings).tubeKinds
	);
	let scene;
	try {
		scene = validateScene(
			ctx.value.definition as EnclosureDef,
			parts,
			settings,
			engineTubeKinds(tubes)
		);
	} catch (e) {
		if (e instanceof SceneRejected) {
			return problem(e.status, 'The scene does not validate.', e.issues);
		}
		throw e;
	}
	return json(await checkInPool(scene, 'settings'));
};
