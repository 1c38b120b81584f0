/**
 * Revisions and versions of a variant, and the freeze an approval puts on it.
 *
 * - A revision is every saved state (autosave included): `variant.version` counts them and each
 *   save writes a `variant_revision` row; old rows are pruned by age (revisionsToPrune).
 * - A version is a named, numbered snapshot the designer makes on purpose. Clients see only
 *   versions: the client page shows the latest, and an approval names one.
 * - A variant whose latest approval has no later "ask for changes" is frozen: the server refuses
 *   to change its settings, delete it or move its build to another enclosure version (409).
 *   Renaming, reordering and choosing the proposal stay open: they change no part of what was
 *   approved. To change a frozen variant the designer starts a new variant from its version.
 */
import { and, desc, eq, gt, inArray, lt, max } from 'drizzle-orm';
import { canonicalJson, revisionsToPrune } from '$lib/builds/revisions';
import { db, type Runner, type Tx } from './db';
import {
	approvals,
	comments,
	payments,
	variantRevisions,
	variantVersions,
	variants,
	type VariantRow,
	type VariantVersionRow
} from './db/schema';
import { newestRow } from './rows';
import { newId } from './tokens';
import { ServiceError, type ServiceErrorKind } from './errors';

export { canonicalJson };

export async function latestVersion(
	variantId: string,
	run: Runner = db
): Promise<VariantVersionRow | null> {
	const ofVariant = eq(variantVersions.variantId, variantId);
	return newestRow(variantVersions, ofVariant, variantVersions.number, run);
}

export async function versionsOf(
	variantId: string,
	run: Runner = db
): Promise<VariantVersionRow[]> {
	return run
		.select()
		.from(variantVersions)
		.where(eq(variantVersions.variantId, variantId))
		.orderBy(desc(variantVersions.number));
}

export async function versionById(id: string, run: Runner = db): Promise<VariantVersionRow | null> {
	const [row] = await run.select().from(variantVersions).where(eq(variantVersions.id, id));
	return row ?? null;
}

/** The latest version of each variant, by variant id (one query). */
export async function latestVersions(
	variantIds: string[]
): Promise<Map<string, VariantVersionRow>> {
	if (variantIds.length === 0) return new Map();
	const rows = await db
		.select()
		.from(variantVersions)
		.where(inArray(variantVersions.variantId, variantIds))
		.orderBy(desc(variantVersions.number));
	const out = new Map<string, VariantVersionRow>();
	for (const r of rows) if (!out.has(r.variantId)) out.set(r.variantId, r);
	return out;
}

/** nextNumber outside a transaction, for pages that show the number the next save will take. */
export function nextVersionNumber(variant: Pick<VariantRow, 'id' | 'basedOnVersionId'>) {
	return nextNumber(db, variant);
}

/** A variant started from another's version N numbers its own from N + 1. */
export async function nextNumber(
	run: Runner,
	variant: Pick<VariantRow, 'id' | 'basedOnVersionId'>
): Promise<number> {
	const [own] = await run
		.select({ n: max(variantVersions.number) })
		.from(variantVersions)
		.where(eq(variantVersions.variantId, variant.id));
	if (own?.n) return own.n + 1;
	const base = variant.basedOnVersionId ? await versionById(variant.basedOnVersionId, run) : null;
	return (base?.number ?? 0) + 1;
}

/**
 * The latest version, making the first from the current state when there is none yet (a variant
 * created before versions, or shared before its designer saved one).
 */
export async function ensureVersion(
	variant: VariantRow,
	run: Runner = db
): Promise<VariantVersionRow> {
	const found = await latestVersion(variant.id, run);
	if (found) return found;
	const number = await nextNumber(run, variant);
	const [row] = await run
		.insert(variantVersions)
		.values({
			id: newId(),
			variantId: variant.id,
			number,
			note: number === 1 ? 'First version' : '',
			settings: variant.settings,
			revision: variant.version,
			createdAt: variant.updatedAt
		})
		.onConflictDoNothing()
		.returning();
	return row ?? (await latestVersion(variant.id, run))!;
}

export type FrozenState =
	| { frozen: false }
	| { frozen: true; version: number; byName: string; at: Date; paid: boolean; reason: string };

const day = (d: Date) =>
	d.toLocaleDateString('en-GB', {
		day: 'numeric',
		month: 'short',
		year: 'numeric',
		timeZone: 'UTC'
	});

/** Whether a variant is frozen by an approval (and a paid deposit), with the sentence that says so. */
export async function frozenState(variantId: string, run: Runner = db): Promise<FrozenState> {
	const approval = await newestRow(
		approvals,
		eq(approvals.variantId, variantId),
		approvals.createdAt,
		run
	);
	if (!approval) return { frozen: false };
	const [reopened] = await run
		.select({ id: comments.id })
		.from(comments)
		.where(
			and(
				eq(comments.variantId, variantId),
				eq(comments.kind, 'changes'),
				gt(comments.createdAt, approval.createdAt)
			)
		)
		.limit(1);
	if (reopened) return { frozen: false };
	const [paid] = await run
		.select({ id: payments.id })
		.from(payments)
		.where(and(eq(payments.variantId, variantId), eq(payments.status, 'paid')))
		.limit(1);
	const reason = `Version ${approval.variantVersion} was approved by ${approval.byName} on ${day(approval.createdAt)}${paid ? ' and a deposit paid' : ''}. To change it, start a new variant from it.`;
	return {
		frozen: true,
		version: approval.variantVersion,
		byName: approval.byName,
		at: approval.createdAt,
		paid: !!paid,
		reason
	};
}

/** Thrown by every write a frozen variant refuses; routes answer 409 with the message. */
export class VariantFrozen extends ServiceError {
	constructor(public state: Extract<FrozenState, { frozen: true }>) {
		super('conflict', `Read-only: ${state.reason}`);
	}
}

export async function assertNotFrozen(variantId: string, run: Runner = db) {
	const state = await frozenState(variantId, run);
	if (state.frozen) throw new VariantFrozen(state);
}

/** Records a saved state and thins the variant's older revisions by age, in the caller's transaction. */
export async function recordRevision(
	tx: Tx,
	input: {
		variantId: string;
		revision: number;
		settings: unknown;
		userId?: string | null;
		now?: Date;
	}
) {
	const now = input.now ?? new Date();
	// A revision number seen again (a variant reset by hand) takes the newer state.
	await tx
		.insert(variantRevisions)
		.values({
			id: newId(),
			variantId: input.variantId,
			revision: input.revision,
			settings: input.settings,
			createdBy: input.userId ?? null,
			createdAt: now
		})
		.onConflictDoUpdate({
			target: [variantRevisions.variantId, variantRevisions.revision],
			set: { settings: input.settings, createdBy: input.userId ?? null, createdAt: now }
		});
	const stamps = await tx
		.select({ id: variantRevisions.id, createdAt: variantRevisions.createdAt })
		.from(variantRevisions)
		.where(eq(variantRevisions.variantId, input.variantId));
	const prune = revisionsToPrune(stamps, now);
	if (prune.length) await tx.delete(variantRevisions).where(inArray(variantRevisions.id, prune));
}

/** Up to `limit` earlier saved states, oldest first (the current one left out), for undo after a reload. */
export async function recentRevisions(
	variantId: string,
	currentRevision: number,
	limit = 50
): Promise<{ revision: number; settings: unknown }[]> {
	const rows = await db
		.select({ revision: variantRevisions.revision, settings: variantRevisions.settings })
		.from(variantRevisions)
		.where(
			and(eq(variantRevisions.variantId, variantId), lt(variantRevisions.revision, currentRevision))
		)
		.orderBy(desc(variantRevisions.revision))
		.limit(limit);
	return rows.reverse();
}

export type SaveVersionResult =
	| { ok: true; version: VariantVersionRow }
	| { ok: false; reason: 'stale'; revision: number }
	| { ok: false; reason: 'unchanged'; version: VariantVersionRow };

/**
 * "Save as version N — note": snapshots the variant as the designer sees it (the revision they
 * name, else 409-stale). Nothing new when the state is the latest version's already.
 */
export async function saveVersion(input: {
	buildId: string;
	variantId: string;
	expectedRevision: number;
	note: string;
	userId: string;
}): Promise<SaveVersionResult> {
	return db.transaction(async (tx) => {
		const [variant] = await tx
			.select()
			.from(variants)
			.where(and(eq(variants.id, input.variantId), eq(variants.buildId, input.buildId)))
			.for('update');
		if (!variant) throw new VersionError('No such variant in this build.', 'not-found');
		await assertNotFrozen(variant.id, tx);
		if (variant.version !== input.expectedRevision) {
			return { ok: false as const, reason: 'stale' as const, revision: variant.version };
		}
		const latest = await latestVersion(variant.id, tx);
		if (latest && canonicalJson(latest.settings) === canonicalJson(variant.settings)) {
			return { ok: false as const, reason: 'unchanged' as const, version: latest };
		}
		const number = await nextNumber(tx, variant);
		const [row] = await tx
			.insert(variantVersions)
			.values({
				id: newId(),
				variantId: variant.id,
				number,
				note: input.note,
				settings: variant.settings,
				revision: variant.version,
				createdBy: input.userId
			})
			.returning();
		return { ok: true as const, version: row };
	});
}

export class VersionError extends ServiceError {
	constructor(message: string, kind: ServiceErrorKind = 'invalid') {
		super(kind, message);
	}
}
