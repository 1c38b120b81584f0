import { error, json } from '@sveltejs/kit';
import { z } from 'zod';
import { int4 } from '$lib/schemas/common';
import type { FitReport } from '$lib/geometry';
import { variantSettingsSchema } from '$lib/builds/settings';
import { requireBuild } from '$lib/server/access';
import { apiLimit, problem, readJson } from '$lib/server/api';
import { SceneRejected, saveVariantSettings, variantsOf } from '$lib/server/builds';
import { VariantFrozen } from '$lib/server/versions';
import { checkInPool } from '$lib/server/engine/pool';
import type { RequestHandler } from './$types';

export const GET: RequestHandler = async (event) => {
	const { build } = await requireBuild(event.locals, event.params.id, 'build.edit');
	const variant = (await variantsOf(build.id)).find((v) => v.id === event.params.variantId);
	if (!variant) error(404, 'Not found.');
	return json({
		version: variant.version,
		settings: variantSettingsSchema.parse(variant.settings),
		updatedAt: variant.updatedAt
	});
};

// The version column is a PostgreSQL integer: 2³¹ or more used to overflow it (a 500).
const body = z.object({ version: int4('version', 1), settings: z.unknown() });

/**
 * Autosave (one revision per save). 409 with the stored scene when someone saved since `version`;
 * nothing is lost. 409 without a scene when the variant is read-only (approved by the client).
 */
export const PUT: RequestHandler = async (event) => {
	const { build, access } = await requireBuild(event.locals, event.params.id, 'build.edit');
	await apiLimit(event, access.user.id);
	const input = await readJson(event.request, body);
	try {
		const result = await saveVariantSettings({
			buildId: build.id,
			studioId: build.studioId,
			enclosureVersionId: build.enclosureVersionId,
			variantId: event.params.variantId,
			expectedVersion: input.version,
			settings: input.settings,
			userId: access.user.id
		});
		if (!result.ok) {
			return json(
				{ message: 'Someone saved this variant after you loaded it.', conflict: result.conflict },
				{ status: 409 }
			);
		}
		return json({ version: result.version, report: await checkInPool(result.scene, 'settings') });
	} catch (e) {
		if (e instanceof SceneRejected) return problem(e.status, 'The scene was not saved.', e.issues);
		if (e instanceof VariantFrozen) return problem(409, e.message);
		throw e;
	}
};

export type SaveResponse = { version: number; report: FitReport };
export type ConflictResponse = {
	message: string;
	conflict: { version: number; settings: z.infer<typeof variantSettingsSchema>; updatedAt: string };
};
