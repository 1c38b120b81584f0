/**
 * A variant's own settings and how they combine with an enclosure and parts into an engine
 * scene. Shared by the editor (browser) and the server, so both check exactly the same scene.
 */
import { z } from 'zod';
import {
	MAX_BOXES,
	SCENE_FORMAT,
	SCENE_VERSION,
	allowedPositions,
	budgetsSchema,
	placementSchema,
	type EnclosureDef,
	type PartDef,
	type SceneInput
} from '$lib/geometry';

const offsets = z.record(
	z.string().max(120),
	z.number({ error: 'Must be a finite number' }).min(-10_000).max(10_000)
);

export const variantSettingsSchema = z.object({
	dividerPositions: offsets.default({}),
	bracketOffsets: offsets.default({}),
	placements: z
		.array(placementSchema)
		.max(MAX_BOXES, `At most ${MAX_BOXES} placed parts`)
		.default([]),
	marginMm: z
		.number({ error: 'Must be a finite number' })
		.min(0, 'Must not be negative')
		.max(100, 'At most 100 mm')
		.default(2),
	budgets: budgetsSchema.default({ wattsPer120mm: 100, psuHeadroomPct: 30 })
});
export type VariantSettings = z.infer<typeof variantSettingsSchema>;

/** Every divider and bracket at its first allowed position; nothing placed. */
export function defaultSettings(enclosure: EnclosureDef): VariantSettings {
	return {
		dividerPositions: Object.fromEntries(
			enclosure.dividers.map((d) => [d.id, allowedPositions(d)[0].offsetMm])
		),
		bracketOffsets: Object.fromEntries(
			enclosure.brackets.map((b) => [b.id, allowedPositions(b)[0].offsetMm])
		),
		placements: [],
		marginMm: 2,
		budgets: { wattsPer120mm: 100, psuHeadroomPct: 30 }
	};
}

/** The scene the engine checks: the pinned enclosure, the parts placed, the variant's settings. */
export function composeScene(
	enclosure: EnclosureDef,
	parts: PartDef[],
	settings: VariantSettings
): SceneInput {
	const used = new Set(settings.placements.map((p) => p.partId));
	return {
		format: SCENE_FORMAT,
		version: SCENE_VERSION,
		enclosure,
		parts: parts.filter((p) => used.has(p.id)),
		dividerPositions: settings.dividerPositions,
		bracketOffsets: settings.bracketOffsets,
		placements: settings.placements,
		marginMm: settings.marginMm,
		budgets: settings.budgets
	};
}
