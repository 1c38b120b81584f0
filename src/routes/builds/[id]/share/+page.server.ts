import { error, fail } from '@sveltejs/kit';
import { and, eq, isNull, or, gt, sql } from 'drizzle-orm';
import { z } from 'zod';
import { commentForm, EXPIRY_CHOICES, shareForm } from '$lib/schemas/sharing';
import { idField } from '$lib/schemas/common';
import { requireBuild } from '$lib/server/access';
import { loadVariant, variantsOf } from '$lib/server/builds';
import { db } from '$lib/server/db';
import { memberships, shareLinks, users } from '$lib/server/db/schema';
import { parseForm } from '$lib/server/forms';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import {
	createShareLink,
	linksOfBuild,
	revokeShareLink,
	sendShareMail,
	shareUrl
} from '$lib/server/sharing/links';
import { notifyClient } from '$lib/server/sharing/notify';
import { clientStatusOf } from '$lib/server/sharing/status';
import { ensureVersion } from '$lib/server/versions';
import { placementNames } from '$lib/server/sharing/summary';
import { addComment, threadOf } from '$lib/server/sharing/thread';
import { resolveScene } from '$lib/geometry';
import type { Actions, PageServerLoad } from './$types';

const DAY_MS = 24 * 60 * 60 * 1000;

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build, access } = await requireBuild(locals, params.id, 'build.share', url);
	const variants = await variantsOf(build.id);
	const links = await linksOfBuild(build.id);
	const overview = await clientStatusOf(build.id);
	const selected =
		variants.find((v) => v.id === url.searchParams.get('variant')) ??
		variants.find((v) => v.isProposal) ??
		variants[0];
	let thread: Awaited<ReturnType<typeof threadOf>> = [];
	let pins: { id: string; label: string }[] = [];
	if (selected) {
		thread = await threadOf(selected.id);
		const loaded = await loadVariant(
			build.id,
			build.studioId,
			build.enclosureVersionId,
			selected.id
		).catch(() => null);
		if (loaded) {
			const resolved = resolveScene(loaded.scene);
			const names = placementNames(resolved);
			pins = resolved.placements.map((rp) => ({
				id: rp.placement.id,
				label: `${names.get(rp.placement.id)!.short} — ${rp.part.name}`
			}));
		}
	}
	const clients = await db
		.select({ email: users.email, name: users.name })
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(and(eq(memberships.studioId, build.studioId), eq(memberships.role, 'client')));
	return {
		build: { id: build.id, name: build.name, clientName: build.clientName },
		role: access.role,
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
};

const revokeForm = z.object({ linkId: idField('Link') });
const studioCommentForm = z.object({
	body: commentForm.shape.body,
	variantId: z.string().min(1).max(64),
	part: z.string().max(120).default('')
});

export const actions: Actions = {
	create: async (event) => {
		const { build, access } = await requireBuild(
			event.locals,
			event.params.id,
			'build.share',
			event.url
		);
		const parsed = await parseForm(event.request, shareForm);
		if (!parsed.ok) return parsed.failure;
		const input = parsed.data;
		const variant = (await variantsOf(build.id)).find((v) => v.id === input.variantId);
		if (!variant) {
			return fail(400, {
				values: parsed.raw,
				errors: { variantId: 'Choose a variant of this build.' }
			});
		}
		if (input.send === 'on' && !input.recipientEmail) {
			return fail(400, {
				values: parsed.raw,
				errors: { recipientEmail: 'An e-mail address is needed to send the link.' }
			});
		}
		const days = EXPIRY_CHOICES[input.expires];
		const { link, token } = await createShareLink({
			studioId: build.studioId,
			buildId: build.id,
			variantId: variant.id,
			createdBy: access.user.id,
			recipientEmail: input.recipientEmail || null,
			recipientName: input.recipientName,
			expiresAt: days === null ? null : new Date(Date.now() + days * DAY_MS)
		});
		let mailed = false;
		let mailError = '';
		if (input.send === 'on' && input.recipientEmail) {
			try {
				await sendShareMail({
					linkId: link.id,
					token,
					to: input.recipientEmail,
					recipientName: input.recipientName,
					senderName: access.user.name,
					studioName: access.studioName,
					buildName: build.name,
					message: input.message
				});
				mailed = true;
			} catch (e) {
				console.error('mail: share link not sent', e);
				mailError =
					'The link was made, but the e-mail could not be sent. Copy the link and send it yourself.';
			}
		}
		return {
			created: {
				url: shareUrl(token),
				mailed,
				mailError,
				to: input.recipientEmail,
				variantName: variant.name
			}
		};
	},

	revoke: async (event) => {
		const { build } = await requireBuild(event.locals, event.params.id, 'build.share', event.url);
		const parsed = await parseForm(event.request, revokeForm);
		if (!parsed.ok) return parsed.failure;
		const ok = await revokeShareLink(build.id, parsed.data.linkId);
		if (!ok) {
			return fail(404, {
				values: {},
				errors: { linkId: 'That link is already revoked or does not exist.' }
			});
		}
		return { revoked: true };
	},

	comment: async (event) => {
		// Written as the studio: owners and designers only (clients write on their own page).
		const { build, access } = await requireBuild(
			event.locals,
			event.params.id,
			'build.share',
			event.url
		);
		await enforce(event, 'comment', limits.comment, access.user.id);
		const parsed = await parseForm(event.request, studioCommentForm);
		if (!parsed.ok) return parsed.failure;
		const variant = (await variantsOf(build.id)).find((v) => v.id === parsed.data.variantId);
		if (!variant) error(404, 'Not found.');
		let partLabel: string | null = null;
		if (parsed.data.part) {
			const loaded = await loadVariant(
				build.id,
				build.studioId,
				build.enclosureVersionId,
				variant.id
			);
			const resolved = loaded ? resolveScene(loaded.scene) : null;
			const rp = resolved?.placements.find((p) => p.placement.id === parsed.data.part);
			if (!rp || !resolved) {
				return fail(400, {
					values: parsed.raw,
					errors: { part: 'That part is not in this variant.' }
				});
			}
			partLabel = `${placementNames(resolved).get(rp.placement.id)!.short} (${rp.part.name})`;
		}
		await addComment({
			buildId: build.id,
			variantId: variant.id,
			// Comments name the version the client sees, not the editor's revision.
			variantVersion: (await ensureVersion(variant)).number,
			author: { userId: access.user.id, shareLinkId: null, name: access.user.name, side: 'studio' },
			placementId: parsed.data.part || null,
			partLabel,
			body: parsed.data.body
		});
		const recipients = await db
			.selectDistinct({ email: shareLinks.recipientEmail })
			.from(shareLinks)
			.where(
				and(
					eq(shareLinks.variantId, variant.id),
					isNull(shareLinks.revokedAt),
					or(isNull(shareLinks.expiresAt), gt(shareLinks.expiresAt, sql`now()`))
				)
			);
		for (const r of recipients) {
			if (!r.email) continue;
			try {
				await notifyClient({
					to: r.email,
					studioName: access.studioName,
					buildName: build.name,
					authorName: access.user.name,
					body: parsed.data.body
				});
			} catch (e) {
				console.error('mail: reply notice not sent', e);
			}
		}
		return { commented: true };
	}
};
