/**
 * The comment thread of a variant and its approvals. One thread, written from the client page
 * and from the editor; an approval or a change request is a comment of its own kind, so the
 * thread tells the whole story in order.
 */
import { and, eq, gt, sql } from 'drizzle-orm';
import type { Scene } from '$lib/geometry';
import { db } from '../db';
import { approvals, comments, variants, type ApprovalRow, type CommentRow } from '../db/schema';
import { newestRow, oldestFirst } from '../rows';
import { newId } from '../tokens';
import { canonicalJson, ensureVersion, recordRevision } from '../versions';
import type { ApprovalState } from '$lib/sharing/types';

export type Author = {
	userId: string | null;
	shareLinkId: string | null;
	name: string;
	side: 'studio' | 'client';
};
export type Target = { buildId: string; variantId: string; variantVersion: number };

type CommentInput = Target & {
	author: Author;
	body: string;
	kind: CommentRow['kind'];
	placementId?: string | null;
	partLabel?: string | null;
};

async function insertComment(run: Pick<typeof db, 'insert'>, c: CommentInput): Promise<CommentRow> {
	const [row] = await run
		.insert(comments)
		.values({
			id: newId(),
			buildId: c.buildId,
			variantId: c.variantId,
			variantVersion: c.variantVersion,
			kind: c.kind,
			placementId: c.placementId ?? null,
			partLabel: c.partLabel ?? null,
			body: c.body,
			authorUserId: c.author.userId,
			shareLinkId: c.author.shareLinkId,
			authorName: c.author.name,
			authorSide: c.author.side
		})
		.returning();
	return row;
}

export async function addComment(
	input: Target & {
		author: Author;
		body: string;
		placementId: string | null;
		partLabel: string | null;
	}
): Promise<CommentRow> {
	return insertComment(db, { ...input, kind: 'comment' });
}

export type ApproveResult =
	| { ok: true; approval: ApprovalRow; comment: CommentRow }
	| { ok: false; reason: 'changed'; currentVersion: number }
	| { ok: false; reason: 'already'; approval: ApprovalRow };

/**
 * Approves exactly the version the client looked at (a version number, not a revision), freezing
 * its scene and the variant. If the studio saved a newer version since, nothing is approved: the
 * client must look at it first. Revisions the designer made after that version and never sent are
 * set aside (kept as a revision) so the variant is exactly what was approved. Approving again after
 * asking for changes renews the approval.
 */
export async function approveVersion(
	input: Target & { author: Author; message: string; scene: Scene }
): Promise<ApproveResult> {
	return db.transaction(async (tx) => {
		const [v] = await tx
			.select()
			.from(variants)
			.where(eq(variants.id, input.variantId))
			.for('update');
		const latest = v ? await ensureVersion(v, tx) : null;
		if (!v || !latest || latest.number !== input.variantVersion) {
			return {
				ok: false as const,
				reason: 'changed' as const,
				currentVersion: latest?.number ?? 0
			};
		}
		const [already] = await tx
			.select()
			.from(approvals)
			.where(
				and(
					eq(approvals.variantId, input.variantId),
					eq(approvals.variantVersion, input.variantVersion)
				)
			);
		if (already) {
			const [reopened] = await tx
				.select({ id: comments.id })
				.from(comments)
				.where(
					and(
						eq(comments.variantId, input.variantId),
						eq(comments.kind, 'changes'),
						gt(comments.createdAt, already.createdAt)
					)
				)
				.limit(1);
			if (!reopened) return { ok: false as const, reason: 'already' as const, approval: already };
		}
		if (canonicalJson(v.settings) !== canonicalJson(latest.settings)) {
			const revision = v.version + 1;
			await tx
				.update(variants)
				.set({ settings: latest.settings, version: revision, updatedAt: new Date() })
				.where(eq(variants.id, v.id));
			await recordRevision(tx, { variantId: v.id, revision, settings: latest.settings });
		}
		const comment = await insertComment(tx, {
			...input,
			kind: 'approved',
			body: input.message || 'Approved.'
		});
		const values = {
			buildId: input.buildId,
			variantId: input.variantId,
			variantVersion: input.variantVersion,
			scene: input.scene,
			commentId: comment.id,
			byUserId: input.author.userId,
			byShareLinkId: input.author.shareLinkId,
			byName: input.author.name,
			createdAt: new Date()
		};
		const [approval] = already
			? await tx.update(approvals).set(values).where(eq(approvals.id, already.id)).returning()
			: await tx
					.insert(approvals)
					.values({ id: newId(), ...values })
					.returning();
		return { ok: true as const, approval, comment };
	});
}

export async function requestChanges(
	input: Target & { author: Author; message: string }
): Promise<CommentRow> {
	return insertComment(db, { ...input, kind: 'changes', body: input.message });
}

export async function threadOf(variantId: string): Promise<CommentRow[]> {
	return oldestFirst(comments, eq(comments.variantId, variantId));
}

export async function latestApproval(variantId: string): Promise<ApprovalRow | null> {
	return newestRow(approvals, eq(approvals.variantId, variantId), approvals.variantVersion);
}

/** `currentVersion` is the variant's latest version number (what the client sees now). */
export function approvalState(
	approval: ApprovalRow | null,
	currentVersion: number,
	reopened = false
): ApprovalState {
	if (!approval) return null;
	return {
		version: approval.variantVersion,
		at: approval.createdAt,
		byName: approval.byName,
		current: approval.variantVersion === currentVersion,
		reopened
	};
}

/** Counts per variant, for the share page's overview. */
export async function threadCounts(buildId: string) {
	const rows = await db
		.select({ variantId: comments.variantId, n: sql<number>`count(*)::int` })
		.from(comments)
		.where(eq(comments.buildId, buildId))
		.groupBy(comments.variantId);
	return new Map(rows.map((r) => [r.variantId, r.n]));
}
