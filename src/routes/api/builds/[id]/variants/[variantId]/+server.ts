import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import { int4 } from '$lib/schemas/common';
import type { FitReport } from '$lib/geometry';
import { variantSettingsSchema } from '$lib/builds/settings';
import { requireBuild } from '$lib/server/access';
import { apiLimit, readJson } from '$lib/server/api';
import { saveVariantSettings, variantsOf } from '$lib/server/builds';
import { checkInPool } from '$lib/server/engine/pool';
import type { RequestHandler } from './$types';
import { forJson, jsonRoute } from '$lib/server/errors';

export const GET: RequestHandler = jsonRoute(async (event) => {
	const { build } = await requireBuild(event.locals, event.params.id, 'build.edit');
	const variant = (await variantsOf(build.id)).find((v) => v.id === event.params.variantId);
	if (!variant) error(404, 'Not found.');
	return json({
		version: variant.version,
		settings: variantSettingsSchema.parse(variant.settings),
		updatedAt: variant.updatedAt
	});
});

// The version column is a PostgreSQL integer: 2³¹ or more used to overflow it (a 500).
const body = z.object({ version: int4('version', 1), settings: z.unknown() });

/**
 * Autosave (one revision per save). 409 with the stored scene when someone saved since `version`;
 * nothing is lost. 409 without a scene when the variant is read-only (approved by the client).
 */
export const PUT: RequestHandler = jsonRoute(async (event) => {
	const { build, access } = await requireBuild(event.locals, event.params.id, 'build.edit');
	await apiLimit(event, access.user.id);
	const input = await readJson(event.request, body);
	// A scene that does not validate answers with its issues; a read-only variant 409.
	const result = await forJson(
		() =>
			saveVariantSettings({
				buildId: build.id,
				studioId: build.studioId,
				enclosureVersionId: build.enclosureVersionId,
				variantId: event.params.variantId,
				expectedVersion: input.version,
				settings: input.settings,
				userId: access.user.id
			}),
		'The scene was not saved.'
	);
	if (result instanceof Response) return result;
	if (!result.ok) {
		return json(
			{ message: 'Someone saved this variant after you loaded it.', conflict: result.conflict },
			{ status: 409 }
		);
	}
	return json({ version: result.version, report: await checkInPool(result.scene, 'settings') });
});

export type SaveResponse = { version: number; report: FitReport };
export type ConflictResponse = {
	message: string;
	conflict: { version: number; settings: z.infer<typeof variantSettingsSchema>; updatedAt: string };
};
