/** Builds and their variants: creating, loading a variant as an engine scene, saving with versions. */
import { and, asc, desc, eq, inArray, isNull, or, type SQL } from 'drizzle-orm';
import {
	allowedIndex,
	checkExcess,
	enclosureDefSchema,
	formatZodIssues,
	sceneSchema,
	trustedSceneSchema,
	type BracketDef as BracketDefT,
	type DividerDef as DividerDefT,
	type EnclosureDef,
	type FieldIssue,
	type PartDef,
	type Scene,
	type TubeKindDef
} from '$lib/geometry';
import {
	catalogueIdsOf,
	composeScene,
	defaultSettings,
	variantSettingsSchema,
	type VariantSettings
} from '$lib/builds/settings';
import { db, type Tx } from './db';
import {
	builds,
	enclosureVersions,
	enclosures,
	memberships,
	parts,
	payments,
	photos,
	variants,
	type VariantRow
} from './db/schema';
import { engineTubeKinds, tubeKindsForStudio, type StudioTubeKind } from './loop';
import { deleteObjects } from './storage';
import { lockedRow } from './rows';
import { currentVersionOf } from './catalog/enclosures';
import { newId } from './tokens';
import { ServiceError, type ServiceErrorKind } from './errors';
import { assertNotFrozen, frozenState, latestVersion, recordRevision } from './versions';
import { variantVersions } from './db/schema';
import { copyName } from '$lib/words/builds';

/** A scene, variant or enclosure the server will not compose or store; `issues` name the fields. */
export class SceneRejected extends ServiceError {
	constructor(issues: FieldIssue[], kind: ServiceErrorKind = 'invalid') {
		super(kind, issues.map((i) => `${i.path || 'scene'}: ${i.message}`).join('; '), { issues });
	}

	/** Refused for one reason, about one field. */
	static about(path: string, message: string, kind: ServiceErrorKind) {
		return new SceneRejected([{ path, message }], kind);
	}
}

export async function enclosureVersionDef(versionId: string) {
	const [row] = await db
		.select({
			id: enclosureVersions.id,
			version: enclosureVersions.version,
			definition: enclosureVersions.definition,
			enclosureId: enclosureVersions.enclosureId,
			name: enclosures.name,
			studioId: enclosures.studioId
		})
		.from(enclosureVersions)
		.innerJoin(enclosures, eq(enclosures.id, enclosureVersions.enclosureId))
		.where(eq(enclosureVersions.id, versionId));
	if (!row) return null;
	return { ...row, definition: enclosureDefSchema.parse(row.definition) };
}

/**
 * Parts a studio may place: its own (archived ones too, so old builds still load) and the
 * standard library. Anything else is reported as not allowed.
 */
export async function partsForStudio(
	studioId: string,
	ids: string[]
): Promise<{ parts: PartDef[]; forbidden: string[] }> {
	return partsWhere(ids, (unique) =>
		and(inArray(parts.id, unique), or(eq(parts.studioId, studioId), isNull(parts.studioId)))
	);
}

/** The same, for the studio that owns a build, without first reading the build (one round trip). */
export async function partsForBuildStudio(buildId: string, ids: string[]) {
	const studioOfBuild = db
		.select({ studioId: builds.studioId })
		.from(builds)
		.where(eq(builds.id, buildId));
	return partsWhere(ids, (unique) =>
		and(
			inArray(parts.id, unique),
			or(inArray(parts.studioId, studioOfBuild), isNull(parts.studioId))
		)
	);
}

async function partsWhere(ids: string[], where: (unique: string[]) => SQL | undefined) {
	const unique = [...new Set(ids)];
	if (unique.length === 0) return { parts: [] as PartDef[], forbidden: [] as string[] };
	const rows = await db
		.select({ id: parts.id, definition: parts.definition, name: parts.name })
		.from(parts)
		.where(where(unique));
	const found = new Set(rows.map((r) => r.id));
	return {
		// Stored definitions were validated on write; every caller passes them through the scene
		// schema (validateScene) before use, so they are parsed once there, not twice.
		parts: rows.map((r) => ({ ...(r.definition as object), id: r.id, name: r.name }) as PartDef),
		forbidden: unique.filter((id) => !found.has(id))
	};
}

/**
 * What the server check needs about a build, in one query: the build, the user's role in its
 * studio (null for a non-member) and the pinned enclosure definition.
 */
export async function checkContext(buildId: string, userId: string) {
	const [row] = await db
		.select({ build: builds, role: memberships.role, definition: enclosureVersions.definition })
		.from(builds)
		.innerJoin(enclosureVersions, eq(enclosureVersions.id, builds.enclosureVersionId))
		.leftJoin(
			memberships,
			and(eq(memberships.studioId, builds.studioId), eq(memberships.userId, userId))
		)
		.where(eq(builds.id, buildId));
	return row ?? null;
}

export async function createBuild(input: {
	studioId: string;
	userId: string;
	name: string;
	clientName: string;
	notes: string;
	enclosureId: string;
}) {
	const [enc] = await db
		.select()
		.from(enclosures)
		.where(and(eq(enclosures.id, input.enclosureId), eq(enclosures.studioId, input.studioId)));
	if (!enc) {
		throw SceneRejected.about('enclosureId', 'No such enclosure in this studio.', 'not-found');
	}
	const version = await currentVersionOf(enc);
	const definition = enclosureDefSchema.parse(version.definition);
	const id = newId();
	await db.transaction(async (tx) => {
		await tx.insert(builds).values({
			id,
			studioId: input.studioId,
			name: input.name,
			clientName: input.clientName,
			notes: input.notes,
			enclosureVersionId: version.id,
			createdBy: input.userId
		});
		const variantId = newId();
		const settings = defaultSettings(definition);
		await tx.insert(variants).values({
			id: variantId,
			buildId: id,
			name: 'Variant A',
			sortOrder: 0,
			isProposal: true,
			settings
		});
		await tx.insert(variantVersions).values({
			id: newId(),
			variantId,
			number: 1,
			note: 'First version',
			settings,
			revision: 1,
			createdBy: input.userId
		});
	});
	return id;
}

/** The studio's live builds, most recently changed first, with their enclosure's name and version. */
export async function buildsOfStudio(studioId: string) {
	return db
		.select({
			id: builds.id,
			name: builds.name,
			clientName: builds.clientName,
			updatedAt: builds.updatedAt,
			enclosureName: enclosures.name,
			enclosureVersion: enclosureVersions.version
		})
		.from(builds)
		.innerJoin(enclosureVersions, eq(enclosureVersions.id, builds.enclosureVersionId))
		.innerJoin(enclosures, eq(enclosures.id, enclosureVersions.enclosureId))
		.where(and(eq(builds.studioId, studioId), isNull(builds.archivedAt)))
		.orderBy(desc(builds.updatedAt));
}

export async function variantsOf(buildId: string) {
	return db
		.select()
		.from(variants)
		.where(eq(variants.buildId, buildId))
		.orderBy(asc(variants.sortOrder), asc(variants.createdAt));
}

export type LoadedVariant = {
	variant: VariantRow;
	settings: VariantSettings;
	enclosure: EnclosureDef;
	parts: PartDef[];
	scene: Scene;
	/** The loops' tube kinds with the studio's prices. */
	tubeKinds: StudioTubeKind[];
};

/**
 * A variant as the engine sees it. Throws SceneRejected if the stored scene no longer validates.
 * `versionSettings` loads one of its versions instead of its current state (the client page).
 */
export async function loadVariant(
	buildId: string,
	studioId: string,
	enclosureVersionId: string,
	variantId?: string,
	versionSettings?: unknown
): Promise<LoadedVariant | null> {
	const list = await variantsOf(buildId);
	const variant = variantId
		? list.find((v) => v.id === variantId)
		: (list.find((v) => v.isProposal) ?? list[0]);
	if (!variant) return null;
	const enc = await enclosureVersionDef(enclosureVersionId);
	if (!enc) return null;
	const settings = variantSettingsSchema.parse(versionSettings ?? variant.settings);
	const ids = catalogueIdsOf(settings);
	const [{ parts: defs }, tubes] = await Promise.all([
		partsForStudio(studioId, ids.parts),
		tubeKindsForStudio(studioId, ids.tubeKinds)
	]);
	const scene = validateScene(enc.definition, defs, settings, engineTubeKinds(tubes));
	return { variant, settings, enclosure: enc.definition, parts: defs, scene, tubeKinds: tubes };
}

const SETTINGS_KEYS = [
	'dividerPositions',
	'bracketOffsets',
	'placements',
	'marginMm',
	'budgets',
	'loops',
	'cables'
];

/** A scene path in the variant's own fields, named as the request names it: `settings.…`. */
function settingsPath(path: string) {
	return SETTINGS_KEYS.some(
		(k) => path === k || path.startsWith(`${k}.`) || path.startsWith(`${k}[`)
	)
		? `settings.${path}`
		: path;
}

/** Composes the scene and parses it with `schema`; a refusal names the fields as the request does. */
function parseComposed(
	schema: typeof sceneSchema | typeof trustedSceneSchema,
	enclosure: EnclosureDef,
	defs: PartDef[],
	settings: VariantSettings,
	tubeKinds: TubeKindDef[]
): Scene {
	const parsed = schema.safeParse(composeScene(enclosure, defs, settings, tubeKinds));
	if (!parsed.success) {
		throw new SceneRejected(
			formatZodIssues(parsed.error).map((i) => ({ ...i, path: settingsPath(i.path) }))
		);
	}
	return parsed.data;
}

export function validateScene(
	enclosure: EnclosureDef,
	defs: PartDef[],
	settings: VariantSettings,
	tubeKinds: TubeKindDef[] = []
): Scene {
	return parseComposed(sceneSchema, enclosure, defs, settings, tubeKinds);
}

/**
 * validateScene for definitions read back from our own tables (validated when saved): only the
 * settings and what ties them to the definitions are checked, not the stored definitions again.
 */
export function trustedScene(
	enclosure: EnclosureDef,
	defs: PartDef[],
	settings: VariantSettings,
	tubeKinds: TubeKindDef[] = []
): Scene {
	return parseComposed(trustedSceneSchema, enclosure, defs, settings, tubeKinds);
}

export type SaveResult =
	| { ok: true; version: number; scene: Scene }
	| { ok: false; conflict: { version: number; settings: VariantSettings; updatedAt: Date } };

/**
 * Saves a variant's settings if nobody saved since `expectedVersion` (the revision number). The
 * server validates the whole scene itself (positions allowed, parts this studio may use) before
 * anything is written; a frozen variant (approved) refuses with VariantFrozen (409). Each save is a
 * revision, kept and pruned by age.
 */
export async function saveVariantSettings(input: {
	buildId: string;
	studioId: string;
	enclosureVersionId: string;
	variantId: string;
	expectedVersion: number;
	settings: unknown;
	userId?: string | null;
}): Promise<SaveResult> {
	const parsed = variantSettingsSchema.safeParse(input.settings);
	if (!parsed.success) {
		throw new SceneRejected(
			formatZodIssues(parsed.error).map((i) => ({
				...i,
				path: `settings${i.path ? '.' + i.path : ''}`
			}))
		);
	}
	const settings = parsed.data;
	const ids = catalogueIdsOf(settings);
	const [{ parts: defs, forbidden }, tubes] = await Promise.all([
		partsForStudio(input.studioId, ids.parts),
		tubeKindsForStudio(input.studioId, ids.tubeKinds)
	]);
	if (forbidden.length) {
		const i = settings.placements.findIndex((p) => forbidden.includes(p.partId));
		throw new SceneRejected(
			[
				{
					path: i >= 0 ? `settings.placements[${i}].partId` : 'settings.loops',
					message: 'This part is not in your studio’s catalogue.'
				}
			],
			'forbidden'
		);
	}
	const enc = await enclosureVersionDef(input.enclosureVersionId);
	if (!enc) {
		throw SceneRejected.about('enclosure', 'The build’s enclosure version is missing.', 'conflict');
	}
	const scene = validateScene(enc.definition, defs, settings, engineTubeKinds(tubes));
	// A stored variant is checked on every later load of the editor, sheet and client page, so
	// one over the cost limits is refused here rather than stored.
	const excess = checkExcess(scene, 'settings.placements');
	if (excess) throw SceneRejected.about(excess.path, excess.message, 'over-limit');
	return db.transaction(async (tx) => {
		// The row lock orders this save after an approval being written, so the freeze is seen.
		const [locked] = await tx
			.select({ id: variants.id })
			.from(variants)
			.where(and(eq(variants.id, input.variantId), eq(variants.buildId, input.buildId)))
			.for('update');
		if (locked) await assertNotFrozen(input.variantId, tx);
		const [row] = await tx
			.update(variants)
			.set({ settings, version: input.expectedVersion + 1, updatedAt: new Date() })
			.where(
				and(
					eq(variants.id, input.variantId),
					eq(variants.buildId, input.buildId),
					eq(variants.version, input.expectedVersion)
				)
			)
			.returning({ version: variants.version });
		if (row) {
			await recordRevision(tx, {
				variantId: input.variantId,
				revision: row.version,
				settings,
				userId: input.userId
			});
			await tx.update(builds).set({ updatedAt: new Date() }).where(eq(builds.id, input.buildId));
			return { ok: true as const, version: row.version, scene };
		}
		const [current] = await tx
			.select()
			.from(variants)
			.where(and(eq(variants.id, input.variantId), eq(variants.buildId, input.buildId)));
		if (!current) {
			throw SceneRejected.about('variantId', 'No such variant in this build.', 'not-found');
		}
		return {
			ok: false as const,
			conflict: {
				version: current.version,
				settings: variantSettingsSchema.parse(current.settings),
				updatedAt: current.updatedAt
			}
		};
	});
}

// — variants —

/** A variant or build rule refused (no such variant, the last one, read-only, moved meanwhile). */
export class VariantRuleError extends ServiceError {
	constructor(message: string, kind: ServiceErrorKind = 'invalid') {
		super(kind, message);
	}
}

const noSuchVariant = () => new VariantRuleError('No such variant in this build.', 'not-found');

/** The build's variants in their order, locked until the transaction ends (a reorder rewrites all). */
function lockedVariants(tx: Tx, buildId: string) {
	return tx
		.select()
		.from(variants)
		.where(eq(variants.buildId, buildId))
		.orderBy(asc(variants.sortOrder), asc(variants.createdAt))
		.for('update');
}

/**
 * A copy of a variant with all its settings and placements, right after it in the order. With
 * `fromVersion`, the copy starts from the source's latest version (what the client approved, not
 * any later revision), remembers it, numbers its own versions on from it and becomes the proposal
 * when the source was: "start a new variant from it".
 */
export async function forkVariant(
	buildId: string,
	variantId: string,
	name?: string,
	opts: { fromVersion?: boolean } = {}
) {
	return db.transaction(async (tx) => {
		const list = await lockedVariants(tx, buildId);
		const source = list.find((v) => v.id === variantId);
		if (!source) throw noSuchVariant();
		const base = opts.fromVersion ? await latestVersion(source.id, tx) : null;
		if (opts.fromVersion && !base) {
			throw new VariantRuleError('This variant has no version to start from yet.', 'conflict');
		}
		const id = newId();
		const at = list.indexOf(source) + 1;
		const ordered = [...list.slice(0, at).map((v) => v.id), id, ...list.slice(at).map((v) => v.id)];
		const taken = list.map((v) => v.name);
		const wanted = base
			? uniqueName(taken, `${source.name}, after version ${base.number}`)
			: copyName(source.name, taken);
		const proposal = !!base && source.isProposal;
		if (proposal) {
			await tx.update(variants).set({ isProposal: false }).where(eq(variants.buildId, buildId));
		}
		await tx.insert(variants).values({
			id,
			buildId,
			name: name ?? wanted,
			sortOrder: at,
			isProposal: proposal,
			settings: base ? base.settings : source.settings,
			basedOnVersionId: base?.id ?? null
		});
		await renumber(tx, ordered);
		return id;
	});
}

function uniqueName(taken: string[], wanted: string) {
	if (!taken.includes(wanted)) return wanted;
	let n = 2;
	while (taken.includes(`${wanted} ${n}`)) n++;
	return `${wanted} ${n}`;
}

async function renumber(tx: Tx, ids: string[]) {
	for (let i = 0; i < ids.length; i++) {
		await tx.update(variants).set({ sortOrder: i }).where(eq(variants.id, ids[i]));
	}
}

export async function renameVariant(buildId: string, variantId: string, name: string) {
	const rows = await db
		.update(variants)
		.set({ name, updatedAt: new Date() })
		.where(and(eq(variants.id, variantId), eq(variants.buildId, buildId)))
		.returning({ id: variants.id });
	if (!rows.length) throw noSuchVariant();
}

/** Moves a variant one place up (−1) or down (+1). */
export async function moveVariant(buildId: string, variantId: string, by: -1 | 1) {
	await db.transaction(async (tx) => {
		const list = await lockedVariants(tx, buildId);
		const i = list.findIndex((v) => v.id === variantId);
		if (i < 0) throw noSuchVariant();
		const j = i + by;
		if (j < 0 || j >= list.length) return;
		const ids = list.map((v) => v.id);
		[ids[i], ids[j]] = [ids[j], ids[i]];
		await renumber(tx, ids);
	});
}

/** The last variant can't go; deleting the proposal makes the first remaining one the proposal. */
export async function deleteVariant(buildId: string, variantId: string) {
	await db.transaction(async (tx) => {
		const list = await lockedVariants(tx, buildId);
		const target = list.find((v) => v.id === variantId);
		if (!target) throw noSuchVariant();
		if (list.length === 1) {
			throw new VariantRuleError(
				'A build keeps at least one variant; this is the last one.',
				'conflict'
			);
		}
		const frozen = await frozenState(variantId, tx);
		if (frozen.frozen) {
			throw new VariantRuleError(`Read-only: ${frozen.reason} It cannot be deleted.`, 'conflict');
		}
		await tx.delete(variants).where(eq(variants.id, variantId));
		const rest = list.filter((v) => v.id !== variantId);
		if (target.isProposal) {
			await tx.update(variants).set({ isProposal: true }).where(eq(variants.id, rest[0].id));
		}
		await renumber(
			tx,
			rest.map((v) => v.id)
		);
	});
}

/**
 * Deletes a build with everything that belongs to it (variants, share links, comments, quotes,
 * photos: the foreign keys cascade), then its photo files. The files go only after the
 * transaction commits, so a failed delete never leaves rows pointing at missing files; a crash
 * between the two leaves files with no row, which `npm run storage:check` lists and removes.
 * A build with a deposit on record stays: the studio's accounts need it.
 */
export async function deleteBuild(buildId: string): Promise<void> {
	const keys = await db.transaction(async (tx) => {
		// Locking the build first makes a photo upload that is adding a row wait (or fail on the
		// foreign key), so the list of files below is complete.
		const [build] = await tx
			.select({ id: builds.id })
			.from(builds)
			.where(eq(builds.id, buildId))
			.for('update');
		if (!build) throw new VariantRuleError('No such build.', 'not-found');
		const [paid] = await tx
			.select({ id: payments.id })
			.from(payments)
			.where(eq(payments.buildId, buildId))
			.limit(1);
		if (paid) {
			throw new VariantRuleError(
				'This build has a deposit on record, so it stays for the studio’s accounts.',
				'conflict'
			);
		}
		const files = await tx
			.select({ storageKey: photos.storageKey, thumbKey: photos.thumbKey })
			.from(photos)
			.where(eq(photos.buildId, buildId));
		await tx.delete(builds).where(eq(builds.id, buildId));
		return files.flatMap((f) => [f.storageKey, f.thumbKey]);
	});
	await deleteObjects(keys);
}

/** Exactly one variant per build is the proposal. */
export async function markProposal(buildId: string, variantId: string) {
	await db.transaction(async (tx) => {
		const target = await lockedRow(
			tx,
			variants,
			and(eq(variants.id, variantId), eq(variants.buildId, buildId))
		);
		if (!target) throw noSuchVariant();
		await tx.update(variants).set({ isProposal: false }).where(eq(variants.buildId, buildId));
		await tx.update(variants).set({ isProposal: true }).where(eq(variants.id, variantId));
	});
}

// — moving a build on to a newer enclosure version —

export type MovePlan = {
	from: { id: string; version: number; definition: EnclosureDef };
	to: { id: string; version: number; definition: EnclosureDef } | null;
	/** Per variant: the controls whose position the new version no longer allows (reset to its first). */
	variants: { id: string; name: string; resets: string[]; problems: FieldIssue[] }[];
};

/** What moving the build to the enclosure's current version would change, without changing anything. */
export async function planMoveOn(build: {
	id: string;
	studioId: string;
	enclosureVersionId: string;
}): Promise<MovePlan | null> {
	const from = await enclosureVersionDef(build.enclosureVersionId);
	if (!from) return null;
	const [enc] = await db.select().from(enclosures).where(eq(enclosures.id, from.enclosureId));
	const latest = await currentVersionOf(enc);
	const base = { id: from.id, version: from.version, definition: from.definition };
	if (!latest || latest.id === from.id) return { from: base, to: null, variants: [] };
	const to = {
		id: latest.id,
		version: latest.version,
		definition: enclosureDefSchema.parse(latest.definition)
	};
	const list = await variantsOf(build.id);
	const out: MovePlan['variants'] = [];
	for (const v of list) {
		const { settings, resets } = adaptSettings(
			variantSettingsSchema.parse(v.settings),
			to.definition
		);
		const ids = catalogueIdsOf(settings);
		const { parts: defs } = await partsForStudio(build.studioId, ids.parts);
		const tubes = await tubeKindsForStudio(build.studioId, ids.tubeKinds);
		let problems: FieldIssue[] = [];
		try {
			validateScene(to.definition, defs, settings, engineTubeKinds(tubes));
		} catch (e) {
			if (!(e instanceof SceneRejected)) throw e;
			problems = e.issues;
		}
		out.push({ id: v.id, name: v.name, resets, problems });
	}
	return { from: base, to, variants: out };
}

/** Keeps every position the new definition allows; others go to its first allowed position. */
function adaptSettings(
	settings: VariantSettings,
	def: EnclosureDef
): { settings: VariantSettings; resets: string[] } {
	const fresh = defaultSettings(def);
	const resets: string[] = [];
	const keep = (kind: 'dividerPositions' | 'bracketOffsets', defs: (DividerDefT | BracketDefT)[]) =>
		Object.fromEntries(
			defs.map((d) => {
				const old = settings[kind][d.id];
				if (old !== undefined && allowedIndex(d, old) >= 0) return [d.id, old];
				if (old !== undefined) {
					resets.push(
						`${d.label}: ${old} mm is not allowed any more; set to ${fresh[kind][d.id]} mm`
					);
				}
				return [d.id, fresh[kind][d.id]];
			})
		);
	const mounts = new Set(def.mounts.map((m) => m.id));
	const placements = settings.placements.map((p) => {
		if (p.mountId && !mounts.has(p.mountId)) {
			resets.push(`mount ${p.mountId} is gone; ${p.id} is no longer on a mount`);
			const { mountId: _m, ...rest } = p;
			return rest;
		}
		return p;
	});
	return {
		settings: {
			...settings,
			dividerPositions: keep('dividerPositions', def.dividers),
			bracketOffsets: keep('bracketOffsets', def.brackets),
			placements
		},
		resets
	};
}

/** Moves the build and adapts every variant in one transaction; each variant gets a new version. */
export async function moveOn(
	build: { id: string; studioId: string; enclosureVersionId: string },
	expectedToVersionId: string
) {
	const plan = await planMoveOn(build);
	if (!plan?.to) {
		throw new VariantRuleError('The build is already on the current version.', 'conflict');
	}
	if (plan.to.id !== expectedToVersionId) {
		throw new VariantRuleError(
			'The enclosure changed again; look at the new changes first.',
			'conflict'
		);
	}
	const to = plan.to;
	for (const v of plan.variants) {
		const frozen = await frozenState(v.id);
		if (frozen.frozen) {
			throw new VariantRuleError(
				`${v.name} is read-only: ${frozen.reason} Moving the build would change it.`,
				'conflict'
			);
		}
	}
	await db.transaction(async (tx) => {
		const [row] = await tx
			.update(builds)
			.set({ enclosureVersionId: to.id, updatedAt: new Date() })
			.where(and(eq(builds.id, build.id), eq(builds.enclosureVersionId, build.enclosureVersionId)))
			.returning({ id: builds.id });
		if (!row) throw new VariantRuleError('Someone moved this build at the same time.', 'conflict');
		const list = await tx
			.select()
			.from(variants)
			.where(eq(variants.buildId, build.id))
			.for('update');
		for (const v of list) {
			const { settings } = adaptSettings(variantSettingsSchema.parse(v.settings), to.definition);
			await tx
				.update(variants)
				.set({ settings, version: v.version + 1, updatedAt: new Date() })
				.where(eq(variants.id, v.id));
		}
	});
	return plan;
}

/** The enclosure's current version number when the build is pinned to an older one, else null. */
export async function newerEnclosureVersion(enclosureVersionId: string): Promise<number | null> {
	const [row] = await db
		.select({ pinned: enclosureVersions.version, current: enclosures.currentVersion })
		.from(enclosureVersions)
		.innerJoin(enclosures, eq(enclosures.id, enclosureVersions.enclosureId))
		.where(eq(enclosureVersions.id, enclosureVersionId));
	return row && row.current > row.pinned ? row.current : null;
}
