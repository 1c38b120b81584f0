import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import { catalogueIdsOf, variantSettingsSchema } from '$lib/builds/settings';
import { requireUser, roleMay } from '$lib/server/access';
import { apiBucket, problem, readJson } from '$lib/server/api';
import { SESSION_LIFE_MS, readSession, sessionIdOf } from '$lib/server/auth';
import { trustedScene } from '$lib/server/builds';
import { checkTrip } from '$lib/server/check-trip';
import { checkInPool } from '$lib/server/engine/pool';
import { limitKey, refuseOver } from '$lib/server/limits';
import { engineTubeKinds, tubeKindsForStudio } from '$lib/server/loop';
import type { RequestHandler } from './$types';
import { forJson, jsonRoute } from '$lib/server/errors';

const body = z.object({ settings: variantSettingsSchema });

/**
 * The server's own check of what the editor shows: the build's pinned enclosure, parts from the
 * studio's catalogue (never part geometry sent by the browser), the posted settings. Called after
 * every pause in editing, so the session, access with the enclosure, the rate limit and the parts
 * come from one statement (src/lib/server/check-trip.ts; the session hook skips this route).
 * Nothing is answered before access is settled.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const sessionId = sessionIdOf(event.cookies);
	if (!sessionId) requireUser(event.locals);
	const { settings } = await readJson(event.request, body);
	const { bucket, limit } = apiBucket(event);
	const trip = await checkTrip({
		sessionId: sessionId!,
		buildId: event.params.id,
		partIds: catalogueIdsOf(settings).parts,
		limitPrefix: limitKey(event, bucket),
		limit
	});
	if (!trip) {
		// No valid session: readSession answers as on every route (blank cookie, expired row gone).
		const { user } = await readSession(event.cookies);
		event.locals.user = user;
		requireUser(event.locals);
		error(500, 'The session changed during the request.');
	}
	event.locals.user = trip.user;
	event.locals.session = { id: sessionId!, expiresAt: trip.sessionExpiresAt };
	// In its second half Lucia extends a session and sends a new cookie; rare, so a second trip.
	if (trip.sessionExpiresAt.getTime() - Date.now() < SESSION_LIFE_MS / 2) {
		await readSession(event.cookies);
	}
	if (!trip.build?.role) error(404, 'Not found.');
	if (!roleMay(trip.build.role, 'build.edit')) {
		error(403, 'Your role in this studio does not allow this.');
	}
	refuseOver(event, trip.rate);
	if (trip.forbidden.length) {
		return problem(403, 'A placed part is not in this studio’s catalogue.', [
			{ path: 'settings.placements', message: trip.forbidden.join(', ') }
		]);
	}
	// Only a variant with a coolant loop needs its tube kinds: a second statement, for those alone.
	const tubeIds = catalogueIdsOf(settings).tubeKinds;
	const tubes = tubeIds.length ? await tubeKindsForStudio(trip.build.studioId, tubeIds) : [];
	const { definition } = trip.build;
	const scene = await forJson(
		async () => trustedScene(definition, trip.parts, settings, engineTubeKinds(tubes)),
		'The scene does not validate.'
	);
	if (scene instanceof Response) return scene;
	return json(await checkInPool(scene, 'settings'));
});
