/**
 * Test data for builds: the engine's demo enclosure and parts (src/lib/geometry/standard-library.ts) put
 * into a studio's own catalogue, and a build with the demo scene saved as its first variant. The
 * studio's parts get ids of their own, so placements are rewritten to them.
 */
import { eq } from 'drizzle-orm';
import { demoEnclosure, demoParts, demoSceneInput } from '$lib/geometry/standard-library';
import { checkScene, resolveScene, type Scene } from '$lib/geometry';
import { variantSettingsSchema, type VariantSettings } from '$lib/builds/settings';
import { buildSheet } from '$lib/builds/sheet';
import {
	SceneRejected,
	createBuild,
	loadVariant,
	saveVariantSettings,
	variantsOf
} from '../builds';
import { createEnclosure } from '../catalog/enclosures';
import { createPart } from '../catalog/parts';
import { innerVolumeLitres } from '$lib/geometry/enclosure';
import type { EnclosureDef } from '$lib/geometry/schema';
import { db, type Runner } from '../db';
import { builds, enclosureVersions, enclosures, variants } from '../db/schema';

/** Writes an enclosure and its version 1 straight to the tables, for fixtures that pick their ids. */
export async function insertEnclosure(
	run: Runner,
	row: { enclosureId: string; versionId: string; studioId: string; definition: EnclosureDef }
) {
	const volumeLitres = innerVolumeLitres(row.definition);
	await run.insert(enclosures).values({
		id: row.enclosureId,
		studioId: row.studioId,
		name: row.definition.name,
		volumeLitres
	});
	await run.insert(enclosureVersions).values({
		id: row.versionId,
		enclosureId: row.enclosureId,
		version: 1,
		definition: row.definition,
		volumeLitres
	});
}

/**
 * Writes a build of an enclosure version and its one variant straight to the tables, for
 * fixtures that pick their ids.
 */
export async function insertBuild(
	run: Runner,
	row: {
		studioId: string;
		enclosureVersionId: string;
		createdBy: string | null;
		build: { id: string; name: string; clientName: string };
		variant: Omit<typeof variants.$inferInsert, 'buildId'>;
	}
) {
	const { build, variant, ...owner } = row;
	await run.insert(builds).values({ ...build, ...owner });
	await run.insert(variants).values({ ...variant, buildId: build.id });
}

export type TestBuild = {
	studioId: string;
	buildId: string;
	variantId: string;
	enclosureId: string;
	enclosureVersionId: string;
	/** Demo part id → the studio's own copy (standard-library parts keep their ids). */
	partIds: Record<string, string>;
	/** The demo scene's settings as saved, and the version they were saved as. */
	settings: VariantSettings;
	version: number;
};

export async function demoEnclosureIn(studioId: string, userId: string | null) {
	const created = await createEnclosure(studioId, userId, {
		definition: demoEnclosure(),
		note: 'test'
	});
	if (!created.ok) throw new Error(`demo enclosure refused: ${JSON.stringify(created)}`);
	return { enclosureId: created.value.id, enclosureVersionId: created.value.current.id };
}

/** The demo parts that are not in the standard library, copied into the studio's catalogue. */
export async function demoPartsIn(studioId: string): Promise<Record<string, string>> {
	const ids: Record<string, string> = {};
	for (const p of demoParts()) {
		if (p.id.startsWith('std-')) {
			ids[p.id] = p.id;
			continue;
		}
		const created = await createPart(studioId, {
			...p,
			provenance: p.provenance === 'standard' ? 'estimate' : p.provenance
		});
		if (!created.ok) throw new Error(`demo part ${p.id} refused: ${JSON.stringify(created)}`);
		ids[p.id] = created.value.id;
	}
	return ids;
}

/** The demo scene's settings with the studio's part ids: everything fits, spine at "3 slots". */
export function demoSettings(partIds: Record<string, string>): VariantSettings {
	const s = demoSceneInput();
	return variantSettingsSchema.parse({
		dividerPositions: s.dividerPositions,
		bracketOffsets: s.bracketOffsets,
		placements: (s.placements ?? []).map((p) => ({ ...p, partId: partIds[p.partId] })),
		marginMm: s.marginMm,
		budgets: s.budgets
	});
}

/** A build of the demo enclosure in `studioId`, its first variant holding the demo scene. */
export async function demoBuildIn(studioId: string, userId: string): Promise<TestBuild> {
	const { enclosureId, enclosureVersionId } = await demoEnclosureIn(studioId, userId);
	const partIds = await demoPartsIn(studioId);
	const buildId = await createBuild({
		studioId,
		userId,
		name: 'Test build',
		clientName: '',
		notes: '',
		enclosureId
	});
	const [variant] = await variantsOf(buildId);
	const settings = demoSettings(partIds);
	const saved = await saveVariantSettings({
		buildId,
		studioId,
		enclosureVersionId,
		variantId: variant.id,
		expectedVersion: variant.version,
		settings
	});
	if (!saved.ok) throw new Error('the first save of a fresh variant conflicted');
	return {
		studioId,
		buildId,
		variantId: variant.id,
		enclosureId,
		enclosureVersionId,
		partIds,
		settings,
		version: saved.version
	};
}

/** The test build's variant as the server loads it for the editor; a variant that is gone fails. */
export async function loadedVariant(b: TestBuild) {
	const loaded = await loadVariant(b.buildId, b.studioId, b.enclosureVersionId, b.variantId);
	if (!loaded) throw new Error(`variant ${b.variantId} did not load`);
	return loaded;
}

/** The build sheet of a scene: build "b", variant "v" at version 1, a 10 % cut allowance. */
export function sheetOf(scene: Scene) {
	return buildSheet({
		buildName: 'b',
		variantName: 'v',
		variantVersion: 1,
		scene,
		resolved: resolveScene(scene),
		report: checkScene(scene),
		cutAllowancePct: 10
	});
}

/** The variant's row as stored: version and settings. */
export async function storedVariant(variantId: string) {
	const [row] = await db
		.select({
			version: variants.version,
			settings: variants.settings,
			updatedAt: variants.updatedAt
		})
		.from(variants)
		.where(eq(variants.id, variantId));
	return row;
}

export async function buildCount(studioId: string) {
	return (await db.select({ id: builds.id }).from(builds).where(eq(builds.studioId, studioId)))
		.length;
}

/** Saves settings over the test build's variant, expecting it to be at `expectedVersion`. */
export function saveOver(b: TestBuild, expectedVersion: number, settings: unknown) {
	return saveVariantSettings({
		buildId: b.buildId,
		studioId: b.studioId,
		enclosureVersionId: b.enclosureVersionId,
		variantId: b.variantId,
		expectedVersion,
		settings
	});
}

/** The status and issues of a save the server refused; any other outcome fails the test. */
export async function sceneRefusal(p: Promise<unknown>) {
	try {
		await p;
	} catch (e) {
		if (e instanceof SceneRejected) {
			return { status: e.status, issues: e.issues };
		}
		throw e;
	}
	throw new Error('saved');
}
