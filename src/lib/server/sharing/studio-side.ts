/**
 * The studio's side of sharing a build (the /builds/[id]/share page): what the page shows, making and
 * mailing a link, and a studio comment with its notice to the clients who hold a working link.
 * Callers have already asked access.ts (`build.share`).
 */
import { and, eq } from 'drizzle-orm';
import { resolveScene } from '$lib/geometry';
import type { BuildRow } from '../db/schema';
import { loadVariant, variantsOf } from '../builds';
import { db } from '../db';
import { memberships, shareLinks, users } from '../db/schema';
import { sendOrLog } from '../mail';
import { ensureVersion } from '../versions';
import { createShareLink, linksOfBuild, sendShareMail, shareUrl } from './links';
import { linkIsActive } from './link-state';
import { notifyClient } from './notify';
import { clientStatusOf } from './status';
import { placementNames } from '../../sharing/summary';
import { addComment, threadOf } from './thread';

const DAY_MS = 24 * 60 * 60 * 1000;

type StudioUser = { id: string; name: string };

/** The resolved scene of one variant of the build, or null when it no longer loads. */
async function resolvedVariant(build: BuildRow, variantId: string) {
	const loaded = await loadVariant(build.id, build.studioId, build.enclosureVersionId, variantId);
	return loaded ? resolveScene(loaded.scene) : null;
}

export async function shareOverview(build: BuildRow, wantedVariantId: string | null) {
	const variants = await variantsOf(build.id);
	const links = await linksOfBuild(build.id);
	const overview = await clientStatusOf(build.id);
	const selected =
		variants.find((v) => v.id === wantedVariantId) ??
		variants.find((v) => v.isProposal) ??
		variants[0];
	let thread: Awaited<ReturnType<typeof threadOf>> = [];
	let pins: { id: string; label: string }[] = [];
	if (selected) {
		thread = await threadOf(selected.id);
		const resolved = await resolvedVariant(build, selected.id).catch(() => null);
		if (resolved) {
			const names = placementNames(resolved);
			pins = resolved.placements.map((rp) => ({
				id: rp.placement.id,
				label: `${names.get(rp.placement.id)!.label} — ${rp.part.name}`
			}));
		}
	}
	const clients = await db
		.select({ email: users.email, name: users.name })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(and(eq(memberships.studioId, build.studioId), eq(memberships.role, 'client')));
	return {
		variants: overview,
		selectedId: selected?.id ?? null,
		links,
		thread: thread.map((c) => ({
			id: c.id,
			kind: c.kind,
			body: c.body,
			authorName: c.authorName,
			side: c.authorSide,
			partLabel: c.partLabel,
			at: c.createdAt,
			version: c.variantVersion
		})),
		pins,
		clients
	};
}

export type ShareInput = {
	variantId: string;
	recipientEmail: string;
	recipientName: string;
	/** Days until the link stops working; null for no expiry. */
	expiresInDays: number | null;
	send: boolean;
	message: string;
};

export type ShareOutcome =
	| { ok: false; field: 'variantId' | 'recipientEmail'; message: string }
	| {
			ok: true;
			created: { url: string; mailed: boolean; mailError: string; to: string; variantName: string };
	  };

/** Makes a link to one variant and, when asked, mails it; a mail failure keeps the link. */
export async function shareVariant(
	build: BuildRow,
	by: StudioUser,
	studioName: string,
	input: ShareInput
): Promise<ShareOutcome> {
	const variant = (await variantsOf(build.id)).find((v) => v.id === input.variantId);
	if (!variant) {
		return { ok: false, field: 'variantId', message: 'Choose a variant of this build.' };
	}
	if (input.send && !input.recipientEmail) {
		return {
			ok: false,
			field: 'recipientEmail',
			message: 'An e-mail address is needed to send the link.'
		};
	}
	const days = input.expiresInDays;
	const { link, token } = await createShareLink({
		studioId: build.studioId,
		buildId: build.id,
		variantId: variant.id,
		createdBy: by.id,
		recipientEmail: input.recipientEmail || null,
		recipientName: input.recipientName,
		expiresAt: days === null ? null : new Date(Date.now() + days * DAY_MS)
	});
	let mailed = false;
	let mailError = '';
	if (input.send && input.recipientEmail) {
		const to = input.recipientEmail;
		mailed = await sendOrLog('share link not sent', () =>
			sendShareMail({
				linkId: link.id,
				token,
				to,
				recipientName: input.recipientName,
				senderName: by.name,
				studioName,
				buildName: build.name,
				message: input.message
			})
		);
		if (!mailed) {
			mailError =
				'The link was made, but the e-mail could not be sent. Copy the link and send it yourself.';
		}
	}
	return {
		ok: true,
		created: {
			url: shareUrl(token),
			mailed,
			mailError,
			to: input.recipientEmail,
			variantName: variant.name
		}
	};
}

export type StudioCommentOutcome = 'posted' | 'no-variant' | 'no-part';

/**
 * A comment written as the studio on one variant (optionally about one placed part), then a short
 * notice to every address that holds a working link to that variant. A mail failure is logged only.
 */
export async function postStudioComment(
	build: BuildRow,
	by: StudioUser,
	studioName: string,
	input: { variantId: string; part: string; body: string }
): Promise<StudioCommentOutcome> {
	const variant = (await variantsOf(build.id)).find((v) => v.id === input.variantId);
	if (!variant) return 'no-variant';
	let partLabel: string | null = null;
	if (input.part) {
		const resolved = await resolvedVariant(build, variant.id);
		const rp = resolved?.placements.find((p) => p.placement.id === input.part);
		if (!rp || !resolved) return 'no-part';
		partLabel = `${placementNames(resolved).get(rp.placement.id)!.short} (${rp.part.name})`;
	}
	await addComment({
		buildId: build.id,
		variantId: variant.id,
		// Comments name the version the client sees, not the editor's revision.
		variantVersion: (await ensureVersion(variant)).number,
		author: { userId: by.id, shareLinkId: null, name: by.name, side: 'studio' },
		placementId: input.part || null,
		partLabel,
		body: input.body
	});
	const recipients = await db
		.selectDistinct({ email: shareLinks.recipientEmail })
		.from(shareLinks)
		.where(and(eq(shareLinks.variantId, variant.id), linkIsActive()));
	for (const r of recipients) {
		if (!r.email) continue;
		const to = r.email;
		await sendOrLog('reply notice not sent', () =>
			notifyClient({ to, studioName, buildName: build.name, authorName: by.name, body: input.body })
		);
	}
	return 'posted';
}
