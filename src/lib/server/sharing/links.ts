/**
 * Share links: one unguessable token per link (256 bits, only its SHA-256 stored), an optional
 * expiry, revocable at any time, optionally e-mailed to the client.
 */
import { and, desc, eq, sql } from 'drizzle-orm';
import { db } from '../db';
import { builds, shareLinks, studios, users, variants, type ShareLinkRow } from '../db/schema';
import { link, sendMail } from '../mail';
import { hashToken, newId, newToken } from '../tokens';
import { linkState, type LinkState } from './link-state';

/** newToken() is 32 random bytes in base64url: exactly 43 characters of [A-Za-z0-9_-]. */
const TOKEN_SHAPE = /^[A-Za-z0-9_-]{43}$/;

export function looksLikeToken(token: string): boolean {
	return TOKEN_SHAPE.test(token);
}

export function shareUrl(token: string) {
	return link(`/s/${token}`);
}

export type CreateShareInput = {
	studioId: string;
	buildId: string;
	variantId: string;
	createdBy: string;
	recipientEmail?: string | null;
	recipientName?: string;
	expiresAt?: Date | null;
};

/** Creates a link and returns the token once; the database keeps only its hash. */
export async function createShareLink(
	input: CreateShareInput
): Promise<{ link: ShareLinkRow; token: string }> {
	const token = newToken();
	const [row] = await db
		.insert(shareLinks)
		.values({
			id: newId(),
			studioId: input.studioId,
			buildId: input.buildId,
			variantId: input.variantId,
			tokenHash: hashToken(token),
			recipientEmail: input.recipientEmail?.toLowerCase() || null,
			recipientName: input.recipientName ?? '',
			createdBy: input.createdBy,
			expiresAt: input.expiresAt ?? null
		})
		.returning();
	return { link: row, token };
}

export async function sendShareMail(input: {
	linkId: string;
	token: string;
	to: string;
	recipientName: string;
	senderName: string;
	studioName: string;
	buildName: string;
	message: string;
}) {
	const greeting = input.recipientName ? `Hello ${input.recipientName},` : 'Hello,';
	const text = [
		greeting,
		'',
		`${input.senderName} at ${input.studioName} has shared a preview of your build "${input.buildName}".`,
		'Open it to turn the 3D model, read whether everything fits, see the parts and the quote, ask questions and approve:',
		'',
		shareUrl(input.token),
		'',
		...(input.message ? [input.message, ''] : []),
		'No account is needed. Anyone holding this link can see the preview, so keep it to yourself.',
		'',
		`— ${input.studioName}`
	].join('\n');
	await sendMail({ to: input.to, subject: `Your build preview: ${input.buildName}`, text });
	await db.update(shareLinks).set({ sentAt: new Date() }).where(eq(shareLinks.id, input.linkId));
}

export type ShareContext = {
	link: ShareLinkRow;
	build: typeof builds.$inferSelect;
	variant: typeof variants.$inferSelect;
	studioName: string;
	senderName: string | null;
};

export type ResolvedShare =
	| { state: 'ok'; share: ShareContext }
	| { state: 'revoked'; studioName: string }
	| { state: 'expired'; studioName: string; expiredAt: Date }
	| { state: 'missing' };

/** What a token in a URL stands for. Never throws for a bad token: it is simply missing. */
export async function resolveShareToken(token: string, now = new Date()): Promise<ResolvedShare> {
	if (!looksLikeToken(token)) return { state: 'missing' };
	const [row] = await db
		.select({
			link: shareLinks,
			build: builds,
			variant: variants,
			studioName: studios.name,
			senderName: users.name
		})
		.from(shareLinks)
		.innerJoin(builds, eq(builds.id, shareLinks.buildId))
		.innerJoin(variants, eq(variants.id, shareLinks.variantId))
		.innerJoin(studios, eq(studios.id, shareLinks.studioId))
		.leftJoin(users, eq(users.id, shareLinks.createdBy))
		.where(eq(shareLinks.tokenHash, hashToken(token)));
	if (!row) return { state: 'missing' };
	const state = linkState(row.link, now);
	if (state === 'revoked') return { state, studioName: row.studioName };
	if (state === 'expired') {
		return { state, studioName: row.studioName, expiredAt: row.link.expiresAt! };
	}
	if (row.build.archivedAt) return { state: 'revoked', studioName: row.studioName };
	return { state: 'ok', share: row };
}

/** Counts an opening of the client page, for the designer's list of links. */
export async function recordOpened(linkId: string) {
	await db
		.update(shareLinks)
		.set({ lastOpenedAt: new Date(), openCount: sql`${shareLinks.openCount} + 1` })
		.where(eq(shareLinks.id, linkId));
}

/** Revokes a link of this build; false when there is no such link (or it was revoked already). */
export async function revokeShareLink(buildId: string, linkId: string): Promise<boolean> {
	const rows = await db
		.update(shareLinks)
		.set({ revokedAt: new Date() })
		.where(
			and(
				eq(shareLinks.id, linkId),
				eq(shareLinks.buildId, buildId),
				sql`${shareLinks.revokedAt} is null`
			)
		)
		.returning({ id: shareLinks.id });
	return rows.length > 0;
}

export type LinkSummary = {
	id: string;
	variantId: string;
	recipientEmail: string | null;
	recipientName: string;
	createdAt: Date;
	createdByName: string | null;
	sentAt: Date | null;
	lastOpenedAt: Date | null;
	openCount: number;
	expiresAt: Date | null;
	revokedAt: Date | null;
	state: LinkState;
};

export async function linksOfBuild(buildId: string, now = new Date()): Promise<LinkSummary[]> {
	const rows = await db
		.select({ link: shareLinks, createdByName: users.name })
		.from(shareLinks)
		.leftJoin(users, eq(users.id, shareLinks.createdBy))
		.where(eq(shareLinks.buildId, buildId))
		.orderBy(desc(shareLinks.createdAt));
	return rows.map(({ link: l, createdByName }) => ({
		id: l.id,
		variantId: l.variantId,
		recipientEmail: l.recipientEmail,
		recipientName: l.recipientName,
		createdAt: l.createdAt,
		createdByName,
		sentAt: l.sentAt,
		lastOpenedAt: l.lastOpenedAt,
		openCount: l.openCount,
		expiresAt: l.expiresAt,
		revokedAt: l.revokedAt,
		state: linkState(l, now)
	}));
}
