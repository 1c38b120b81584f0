/**
 * Who is on a client page and what they may do there: the holder of a share link, or a signed-in
 * member of the studio (a client the variant was shared with, or a designer previewing it).
 */
import { error, type RequestEvent } from '@sveltejs/kit';
import { and, desc, eq, sql } from 'drizzle-orm';
import { requireLinkHolder, requireUser, requireVariant, roleMay } from '../access';
import { db } from '../db';
import { rateLimits, shareLinks, users, variants } from '../db/schema';
import { clientAddress, enforce } from '../limits';
import { limits } from '../rate-limit';
import type { ClientActor } from './client-actions';
import { linkIsActive } from './link-state';
import { resolveShareToken, type ResolvedShare } from './links';

const MISS_BUCKET = 'share-miss';

/**
 * Token guessing: only misses are counted, so a client using their link is never slowed down;
 * an address over the limit is refused before its next lookup, hit or miss.
 */
async function refuseIfGuessing(event: RequestEvent) {
	const key = `${MISS_BUCKET}:${clientAddress(event)}`;
	const [row] = await db.select().from(rateLimits).where(eq(rateLimits.key, key));
	if (!row) return;
	const windowEnds = row.windowStartedAt.getTime() + limits.shareToken.windowSec * 1000;
	if (row.count >= limits.shareToken.max && windowEnds > Date.now()) {
		const retry = Math.max(1, Math.ceil((windowEnds - Date.now()) / 1000));
		event.setHeaders({ 'retry-after': String(retry) });
		error(429, `Too many attempts. Try again in ${Math.ceil(retry / 60)} minutes.`);
	}
}

export async function countMiss(event: RequestEvent) {
	await enforce(event, MISS_BUCKET, limits.shareToken);
}

/** Resolves the token of the URL, counting a miss against the caller's address. */
export async function lookupToken(event: RequestEvent, token: string): Promise<ResolvedShare> {
	await refuseIfGuessing(event);
	const resolved = await resolveShareToken(token);
	if (resolved.state === 'missing') await countMiss(event);
	return resolved;
}

export function linkActor(
	share: Extract<ResolvedShare, { state: 'ok' }>['share'],
	token: string
): ClientActor {
	requireLinkHolder(share.link, 'build.view');
	return {
		build: share.build,
		variant: share.variant,
		studioName: share.studioName,
		sharedBy: share.senderName,
		linkCreatedBy: share.link.createdBy,
		viewer: { kind: 'link', scopeKey: share.link.tokenHash, mayPay: true },
		author: {
			userId: null,
			shareLinkId: share.link.id,
			side: 'client',
			defaultName: share.link.recipientName,
			fixedName: false
		},
		may: { comment: true, approve: true, pay: true },
		customerEmail: share.link.recipientEmail,
		pagePath: `/s/${token}`,
		limitKey: share.link.id
	};
}

/** For actions and files behind a link: a link that no longer works ends the request. */
export async function requireLinkActor(event: RequestEvent, token: string): Promise<ClientActor> {
	const r = await lookupToken(event, token);
	if (r.state === 'missing') error(404, 'This link does not work.');
	if (r.state !== 'ok') error(410, 'This link no longer works.');
	return linkActor(r.share, token);
}

/** A signed-in member on /s/v/[variantId]. Clients only for variants shared with them. */
export async function memberActor(event: RequestEvent, variantId: string): Promise<ClientActor> {
	requireUser(event.locals, event.url);
	if (!/^[A-Za-z0-9_-]{1,64}$/.test(variantId)) error(404, 'Not found.');
	const [v] = await db
		.select({ buildId: variants.buildId })
		.from(variants)
		.where(eq(variants.id, variantId));
	if (!v) error(404, 'Not found.');
	const { build, variant, access } = await requireVariant(
		event.locals,
		v.buildId,
		variantId,
		'build.view',
		event.url
	);
	const isClient = access.role === 'client';
	const [latest] = await db
		.select({ createdBy: shareLinks.createdBy, senderName: users.name })
		.from(shareLinks)
		.leftJoin(users, eq(users.id, shareLinks.createdBy))
		.where(
			and(
				eq(shareLinks.variantId, variantId),
				isClient ? eq(shareLinks.recipientEmail, access.user.email.toLowerCase()) : sql`true`,
				linkIsActive()
			)
		)
		.orderBy(desc(shareLinks.createdAt))
		.limit(1);
	return {
		build,
		variant,
		studioName: access.studioName,
		sharedBy: latest?.senderName ?? null,
		linkCreatedBy: latest?.createdBy ?? null,
		viewer: { kind: 'member', scopeKey: `member:${variantId}`, mayPay: isClient },
		author: {
			userId: access.user.id,
			shareLinkId: null,
			side: isClient ? 'client' : 'studio',
			defaultName: access.user.name,
			fixedName: true
		},
		may: {
			comment: roleMay(access.role, 'build.comment'),
			approve: roleMay(access.role, 'build.approve'),
			pay: roleMay(access.role, 'build.pay')
		},
		customerEmail: isClient ? access.user.email : null,
		pagePath: `/s/v/${variantId}`,
		limitKey: access.user.id
	};
}
