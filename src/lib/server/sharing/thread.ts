/**
 * The comment thread of a variant and its approvals. One thread, written from the client page
 * and from the editor; an approval or a change request is a comment of its own kind, so the
 * thread tells the whole story in order.
 */
import { and, asc, desc, eq, sql } from 'drizzle-orm';
import type { Scene } from '$lib/geometry';
import { db } from '../db';
import { approvals, comments, variants, type ApprovalRow, type CommentRow } from '../db/schema';
import { newId } from '../tokens';
import type { ApprovalState } from '$lib/components/client/types';

export type Author = { userId: string | null; shareLinkId: string | null; name: string; side: 'studio' | 'client' };
export type Target = { buildId: string; variantId: string; variantVersion: number };

type CommentInput = Target & { author: Author; body: string; kind: CommentRow['kind']; placementId?: string | null; partLabel?: string | null };

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

export async function addComment(input: Target & { author: Author; body: string; placementId: string | null; partLabel: string | null }): Promise<CommentRow> {
	return insertComment(db, { ...input, kind: 'comment' });
}

export type ApproveResult = { ok: true; approval: ApprovalRow; comment: CommentRow } | { ok: false; reason: 'changed'; currentVersion: number } | { ok: false; reason: 'already'; approval: ApprovalRow };

/**
 * Approves exactly the version the client looked at, freezing its scene. If the variant was saved
 * since, nothing is approved: the client must look at the new version first.
 */
export async function approveVersion(input: Target & { author: Author; message: string; scene: Scene }): Promise<ApproveResult> {
	return db.transaction(async (tx) => {
		const [v] = await tx.select({ version: variants.version }).from(variants).where(eq(variants.id, input.variantId)).for('update');
		if (!v || v.version !== input.variantVersion) return { ok: false as const, reason: 'changed' as const, currentVersion: v?.version ?? 0 };
		const [already] = await tx.select().from(approvals).where(and(eq(approvals.variantId, input.variantId), eq(approvals.variantVersion, input.variantVersion)));
		if (already) return { ok: false as const, reason: 'already' as const, approval: already };
		const comment = await insertComment(tx, { ...input, kind: 'approved', body: input.message || 'Approved.' });
		const [approval] = await tx
			.insert(approvals)
			.values({
				id: newId(),
				buildId: input.buildId,
				variantId: input.variantId,
				variantVersion: input.variantVersion,
				scene: input.scene,
				commentId: comment.id,
				byUserId: input.author.userId,
				byShareLinkId: input.author.shareLinkId,
				byName: input.author.name
			})
			.returning();
		return { ok: true as const, approval, comment };
	});
}

export async function requestChanges(input: Target & { author: Author; message: string }): Promise<CommentRow> {
	return insertComment(db, { ...input, kind: 'changes', body: input.message });
}

export async function threadOf(variantId: string): Promise<CommentRow[]> {
	return db.select().from(comments).where(eq(comments.variantId, variantId)).orderBy(asc(comments.createdAt), asc(comments.id));
}

export async function latestApproval(variantId: string): Promise<ApprovalRow | null> {
	const [row] = await db.select().from(approvals).where(eq(approvals.variantId, variantId)).orderBy(desc(approvals.variantVersion)).limit(1);
	return row ?? null;
}


export function approvalState(approval: ApprovalRow | null, currentVersion: number): ApprovalState {
	if (!approval) return null;
	return { version: approval.variantVersion, at: approval.createdAt, byName: approval.byName, current: approval.variantVersion === currentVersion };
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
