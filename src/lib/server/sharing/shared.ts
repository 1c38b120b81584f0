/**
 * What a client member finds in the app: every variant shared with them through a link sent to
 * their address in a studio where they are a client, newest first, with where it stands.
 */
import { and, desc, eq, inArray, isNull } from 'drizzle-orm';
import { db } from '../db';
import {
	approvals,
	builds,
	comments,
	memberships,
	payments,
	shareLinks,
	studios,
	variants
} from '../db/schema';
import { latestVersions } from '../versions';
import { linkIsActive } from './link-state';

export type SharedStatus = 'waiting' | 'changes' | 'approved' | 'paid';

export const SHARED_STATUS_WORDS: Record<SharedStatus, string> = {
	waiting: 'waiting for you',
	changes: 'you asked for changes',
	approved: 'approved',
	paid: 'deposit paid'
};

export type SharedItem = {
	variantId: string;
	variantName: string;
	buildName: string;
	studioName: string;
	sharedAt: Date;
	version: number | null;
	status: SharedStatus;
};

export async function sharedWithMember(user: { id: string; email: string }): Promise<SharedItem[]> {
	const rows = await db
		.selectDistinctOn([shareLinks.variantId], {
			variantId: shareLinks.variantId,
			variantName: variants.name,
			buildName: builds.name,
			studioName: studios.name,
			sharedAt: shareLinks.createdAt
		})
		.from(shareLinks)
		.innerJoin(
			memberships,
			and(
				eq(memberships.studioId, shareLinks.studioId),
				eq(memberships.userId, user.id),
				eq(memberships.role, 'client')
			)
		)
		.innerJoin(variants, eq(variants.id, shareLinks.variantId))
		.innerJoin(builds, eq(builds.id, shareLinks.buildId))
		.innerJoin(studios, eq(studios.id, shareLinks.studioId))
		.where(
			and(
				eq(shareLinks.recipientEmail, user.email.toLowerCase()),
				linkIsActive(),
				isNull(builds.archivedAt)
			)
		)
		.orderBy(shareLinks.variantId, desc(shareLinks.createdAt));
	if (rows.length === 0) return [];
	const ids = rows.map((r) => r.variantId);
	const [versions, approvalRows, changeRows, paidRows] = await Promise.all([
		latestVersions(ids),
		db
			.select({
				variantId: approvals.variantId,
				version: approvals.variantVersion,
				at: approvals.createdAt
			})
			.from(approvals)
			.where(inArray(approvals.variantId, ids)),
		db
			.select({ variantId: comments.variantId, at: comments.createdAt })
			.from(comments)
			.where(and(inArray(comments.variantId, ids), eq(comments.kind, 'changes'))),
		db
			.select({ variantId: payments.variantId })
			.from(payments)
			.where(and(inArray(payments.variantId, ids), eq(payments.status, 'paid')))
	]);
	const out = rows.map((r) => {
		const version = versions.get(r.variantId)?.number ?? null;
		const approval = approvalRows
			.filter((a) => a.variantId === r.variantId && a.version === version)
			.sort((a, b) => b.at.getTime() - a.at.getTime())[0];
		const reopened =
			!!approval && changeRows.some((c) => c.variantId === r.variantId && c.at > approval.at);
		const paid = paidRows.some((p) => p.variantId === r.variantId);
		const status: SharedStatus = reopened
			? 'changes'
			: approval
				? paid
					? 'paid'
					: 'approved'
				: 'waiting';
		return { ...r, version, status };
	});
	return out.sort((a, b) => b.sharedAt.getTime() - a.sharedAt.getTime());
}
