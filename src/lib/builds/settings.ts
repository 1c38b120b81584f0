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
	loopSchema,
	cableSchema,
	placementSchema,
	type EnclosureDef,
	type PartDef,
	type SceneInput,
	type TubeKindDef
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
	budgets: budgetsSchema.default({ wattsPer120mm: 100, psuHeadroomPct: 30 }),
	/** The variant's coolant loops (docs/scene-format.md); optional, so older settings stay valid. */
	loops: z.array(loopSchema).max(8, 'At most 8 loops').optional(),
	/** The variant's power cable bundles (docs/scene-format.md); optional like the loops. */
	cables: z.array(cableSchema).max(50, 'At most 50 cables').optional()
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
	settings: VariantSettings,
	tubeKinds: TubeKindDef[] = []
): SceneInput {
	const used = new Set(catalogueIdsOf(settings).parts);
	const loops = settings.loops?.length ? settings.loops : undefined;
	const tubes = new Set(catalogueIdsOf(settings).tubeKinds);
	return {
		...(loops ? { loops, tubeKinds: tubeKinds.filter((t) => tubes.has(t.id)) } : {}),
		...(settings.cables?.length ? { cables: settings.cables } : {}),
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

/** Catalogue ids a variant uses: placed parts, the loops' fittings and plugs, the loops' tube kinds. */
export function catalogueIdsOf(settings: VariantSettings): {
	parts: string[];
	tubeKinds: string[];
} {
	const parts = new Set(settings.placements.map((p) => p.partId));
	const tubeKinds = new Set<string>();
	for (const loop of settings.loops ?? []) {
		for (const run of loop.runs) {
			tubeKinds.add(run.tube);
			if (run.fittings.from) parts.add(run.fittings.from);
			if (run.fittings.to) parts.add(run.fittings.to);
		}
		for (const plug of loop.plugs) if (plug.fitting) parts.add(plug.fitting);
	}
	return { parts: [...parts], tubeKinds: [...tubeKinds] };
}
