/**
 * Access-matrix rows for the client work (see ../testing/access-matrix.ts). Each cell gets a fresh
 * studio with a demo build whose variant is shared by a live link with the studio's client, a
 * second link that was revoked, a photo, and a second variant shared with nobody.
 *
 * The link is the key on /s/[token]: everyone holding it (owner, designer, client, the outsider,
 * anonymous) gets the page; everyone holding a revoked one gets 410.
 */
import { and, count, eq, isNotNull } from 'drizzle-orm';
import sharp from 'sharp';
import { db } from '../db';
import { comments, photos, quotes, shareLinks, variants } from '../db/schema';
import type { Fields } from './client';
import { SIGN_IN, type MatrixFixture, type MatrixRow, type Visitor } from './access-matrix';
import { newId } from '../tokens';
import { createShareLink, revokeShareLink } from '../sharing/links';
import { addPhoto } from '../sharing/photos';
import { demoBuild } from './sharing';
import { photoRef } from '../sharing/view';

const all = (e: MatrixRow['expect']['owner']): MatrixRow['expect'] => ({
	owner: e,
	designer: e,
	client: e,
	outsider: e,
	anonymous: e
});
const studioOnly = (
	ok: MatrixRow['expect']['owner'],
	anonymous: MatrixRow['expect']['owner'] = SIGN_IN
): MatrixRow['expect'] => ({ owner: ok, designer: ok, client: 403, outsider: 404, anonymous });
const EVERYONE: Visitor[] = ['owner', 'designer', 'client', 'outsider', 'anonymous'];

let tinyPng: Promise<Buffer> | undefined;

async function shared(f: MatrixFixture) {
	const b = await demoBuild({ studioId: f.studio.id, createdBy: f.designer.id });
	const live = await createShareLink({
		studioId: f.studio.id,
		buildId: b.buildId,
		variantId: b.variantId,
		createdBy: f.designer.id,
		recipientEmail: f.client.email,
		recipientName: 'Matrix Client'
	});
	const gone = await createShareLink({
		studioId: f.studio.id,
		buildId: b.buildId,
		variantId: b.variantId,
		createdBy: f.designer.id
	});
	await revokeShareLink(b.buildId, gone.link.id);
	const other = newId();
	await db.insert(variants).values({
		id: other,
		buildId: b.buildId,
		name: 'Variant B',
		sortOrder: 1,
		settings: b.settings
	});
	tinyPng ??= sharp({ create: { width: 8, height: 8, channels: 3, background: '#c1964a' } })
		.png()
		.toBuffer();
	const photo = await addPhoto({
		buildId: b.buildId,
		uploadedBy: f.designer.id,
		bytes: await tinyPng,
		caption: ''
	});
	Object.assign(f.vars, {
		buildId: b.buildId,
		variantId: b.variantId,
		otherVariantId: other,
		token: live.token,
		linkId: live.link.id,
		revokedToken: gone.token,
		photoId: photo.id,
		linkPhotoRef: photoRef(live.link.tokenHash, photo.id),
		revokedPhotoRef: photoRef(gone.link.tokenHash, photo.id),
		memberPhotoRef: photoRef(`member:${b.variantId}`, photo.id)
	});
}

const commentCount = async (f: MatrixFixture) =>
	(await db.select({ n: count() }).from(comments).where(eq(comments.buildId, f.vars.buildId)))[0].n;
const linkCount = async (f: MatrixFixture) =>
	(
		await db.select({ n: count() }).from(shareLinks).where(eq(shareLinks.buildId, f.vars.buildId))
	)[0].n;
const commented = { by: EVERYONE, check: async (f: MatrixFixture) => (await commentCount(f)) > 0 };
const nothingCommented = {
	by: [] as Visitor[],
	check: async (f: MatrixFixture) => (await commentCount(f)) > 0
};

const link = (f: MatrixFixture) => `/s/${f.vars.token}`;
const revoked = (f: MatrixFixture) => `/s/${f.vars.revokedToken}`;
const member = (f: MatrixFixture) => `/s/v/${f.vars.variantId}`;
const build = (f: MatrixFixture) => `/builds/${f.vars.buildId}`;

const commentForm = () => ({
	body: 'Is there room for the fittings?',
	part: 'part-002',
	version: 1
});
const approveForm = () => ({ version: 1, message: '' });
const changesForm = () => ({ version: 1, message: 'A larger radiator, please.' });

function uploadForm(): Fields {
	const form = new FormData();
	form.append('file', new Blob([Buffer.from('not an image')], { type: 'image/png' }), 'a.png');
	return form as unknown as Fields;
}

export const sharingRows: MatrixRow[] = [
	// The client page by link: the link is the key, for everyone holding it.
	{
		route: '/s/[token]',
		method: 'GET',
		path: link,
		setup: shared,
		expect: all(200),
		showsStudioToLinkHolders: true
	},
	{
		route: '/s/[token]',
		method: 'GET',
		path: revoked,
		setup: shared,
		expect: all(410),
		showsStudioToLinkHolders: true
	},
	{ route: '/s/[token]', method: 'GET', path: () => `/s/${'x'.repeat(43)}`, expect: all(404) },
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'comment',
		path: (f) => `${link(f)}?/comment`,
		form: commentForm,
		setup: shared,
		expect: all(200),
		showsStudioToLinkHolders: true,
		changes: commented
	},
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'comment',
		path: (f) => `${revoked(f)}?/comment`,
		form: commentForm,
		setup: shared,
		expect: all(410),
		showsStudioToLinkHolders: true,
		changes: nothingCommented
	},
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'approve',
		path: (f) => `${link(f)}?/approve`,
		form: approveForm,
		setup: shared,
		expect: all(200),
		showsStudioToLinkHolders: true,
		changes: commented
	},
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'approve',
		path: (f) => `${revoked(f)}?/approve`,
		form: approveForm,
		setup: shared,
		expect: all(410),
		showsStudioToLinkHolders: true,
		changes: nothingCommented
	},
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'changes',
		path: (f) => `${link(f)}?/changes`,
		form: changesForm,
		setup: shared,
		expect: all(200),
		showsStudioToLinkHolders: true,
		changes: commented
	},
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'changes',
		path: (f) => `${revoked(f)}?/changes`,
		form: changesForm,
		setup: shared,
		expect: all(410),
		showsStudioToLinkHolders: true,
		changes: nothingCommented
	},
	// No quote sent yet: nobody can pay, link or not.
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'pay',
		path: (f) => `${link(f)}?/pay`,
		setup: shared,
		expect: all(409),
		showsStudioToLinkHolders: true
	},
	{
		route: '/s/[token]',
		method: 'POST',
		action: 'pay',
		path: (f) => `${revoked(f)}?/pay`,
		setup: shared,
		expect: all(410),
		showsStudioToLinkHolders: true
	},
	{
		route: '/s/[token]/photos/[ref]/[size]',
		method: 'GET',
		path: (f) => `${link(f)}/photos/${f.vars.linkPhotoRef}/thumb`,
		setup: shared,
		expect: all(200)
	},
	{
		route: '/s/[token]/photos/[ref]/[size]',
		method: 'GET',
		path: (f) => `${revoked(f)}/photos/${f.vars.revokedPhotoRef}/thumb`,
		setup: shared,
		expect: all(410),
		showsStudioToLinkHolders: true
	},
	// A reference made for another link does not open the photo.
	{
		route: '/s/[token]/photos/[ref]/[size]',
		method: 'GET',
		path: (f) => `${link(f)}/photos/${f.vars.memberPhotoRef}/thumb`,
		setup: shared,
		expect: all(404)
	},
	{
		route: '/s/return',
		method: 'GET',
		expect: all({ status: 303, location: '/s/thanks?deposit=pending' })
	},
	{ route: '/s/thanks', method: 'GET', expect: all(200) },
	{
		route: '/s',
		method: 'GET',
		expect: { owner: 200, designer: 200, client: 200, outsider: 200, anonymous: SIGN_IN }
	},

	// The client page inside the app: the studio (as a preview) and the client it was shared with.
	{
		route: '/s/v/[variantId]',
		method: 'GET',
		path: member,
		setup: shared,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: SIGN_IN }
	},
	// Not shared with the client: not there for them.
	{
		route: '/s/v/[variantId]',
		method: 'GET',
		path: (f) => `/s/v/${f.vars.otherVariantId}`,
		setup: shared,
		expect: { owner: 200, designer: 200, client: 404, outsider: 404, anonymous: SIGN_IN }
	},
	{
		route: '/s/v/[variantId]',
		method: 'POST',
		action: 'comment',
		path: (f) => `${member(f)}?/comment`,
		form: commentForm,
		setup: shared,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: SIGN_IN },
		changes: {
			by: ['owner', 'designer', 'client'],
			check: async (f) => (await commentCount(f)) > 0
		}
	},
	{
		route: '/s/v/[variantId]',
		method: 'POST',
		action: 'approve',
		path: (f) => `${member(f)}?/approve`,
		form: approveForm,
		setup: shared,
		expect: { owner: 200, designer: 403, client: 200, outsider: 404, anonymous: SIGN_IN },
		changes: { by: ['owner', 'client'], check: async (f) => (await commentCount(f)) > 0 }
	},
	// A client may not approve a variant they were not sent.
	{
		route: '/s/v/[variantId]',
		method: 'POST',
		action: 'approve',
		path: (f) => `/s/v/${f.vars.otherVariantId}?/approve`,
		form: approveForm,
		setup: shared,
		expect: { owner: 200, designer: 403, client: 404, outsider: 404, anonymous: SIGN_IN },
		changes: { by: ['owner'], check: async (f) => (await commentCount(f)) > 0 }
	},
	{
		route: '/s/v/[variantId]',
		method: 'POST',
		action: 'changes',
		path: (f) => `${member(f)}?/changes`,
		form: changesForm,
		setup: shared,
		expect: { owner: 200, designer: 403, client: 200, outsider: 404, anonymous: SIGN_IN },
		changes: { by: ['owner', 'client'], check: async (f) => (await commentCount(f)) > 0 }
	},
	{
		route: '/s/v/[variantId]',
		method: 'POST',
		action: 'pay',
		path: (f) => `${member(f)}?/pay`,
		setup: shared,
		expect: { owner: 403, designer: 403, client: 409, outsider: 404, anonymous: SIGN_IN }
	},
	{
		route: '/s/v/[variantId]/photos/[ref]/[size]',
		method: 'GET',
		path: (f) => `${member(f)}/photos/${f.vars.memberPhotoRef}/full`,
		setup: shared,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: SIGN_IN }
	},

	// The studio's side.
	{
		route: '/builds/[id]/share',
		method: 'GET',
		path: (f) => `${build(f)}/share`,
		setup: shared,
		expect: studioOnly(200)
	},
	{
		route: '/builds/[id]/share',
		method: 'POST',
		action: 'create',
		path: (f) => `${build(f)}/share?/create`,
		form: (f) => ({
			variantId: f.vars.variantId,
			recipientEmail: '',
			recipientName: 'Someone',
			expires: '7',
			send: ''
		}),
		setup: shared,
		expect: studioOnly(200),
		changes: { by: ['owner', 'designer'], check: async (f) => (await linkCount(f)) > 2 }
	},
	{
		route: '/builds/[id]/share',
		method: 'POST',
		action: 'revoke',
		path: (f) => `${build(f)}/share?/revoke`,
		form: (f) => ({ linkId: f.vars.linkId }),
		setup: shared,
		expect: studioOnly(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) =>
				(
					await db
						.select()
						.from(shareLinks)
						.where(and(eq(shareLinks.id, f.vars.linkId), isNotNull(shareLinks.revokedAt)))
				).length === 1
		}
	},
	{
		route: '/builds/[id]/share',
		method: 'POST',
		action: 'comment',
		path: (f) => `${build(f)}/share?/comment`,
		form: (f) => ({ variantId: f.vars.variantId, body: 'The fittings clear by 4 mm.', part: '' }),
		setup: shared,
		expect: studioOnly(200),
		changes: { by: ['owner', 'designer'], check: async (f) => (await commentCount(f)) > 0 }
	},
	{
		route: '/builds/[id]/quote/[variantId]',
		method: 'GET',
		path: (f) => `${build(f)}/quote/${f.vars.variantId}`,
		setup: shared,
		expect: studioOnly(200)
	},
	{
		route: '/builds/[id]/quote/[variantId]',
		method: 'POST',
		action: 'create',
		path: (f) => `${build(f)}/quote/${f.vars.variantId}?/create`,
		setup: shared,
		expect: studioOnly(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) =>
				(await db.select().from(quotes).where(eq(quotes.variantId, f.vars.variantId))).length === 1
		}
	},
	...(['save', 'refresh', 'send', 'withdraw'] as const).map((action): MatrixRow => ({
		route: '/builds/[id]/quote/[variantId]',
		method: 'POST',
		action,
		path: (f) => `${build(f)}/quote/${f.vars.variantId}?/${action}`,
		form: () =>
			action === 'save'
				? {
						currency: 'EUR',
						labour: '150',
						labourNote: 'Assembly',
						tax: '20',
						depositKind: 'percent',
						depositValue: '30',
						notes: ''
					}
				: {},
		setup: shared,
		expect: studioOnly(200),
		changes: {
			by: action === 'refresh' || action === 'withdraw' ? [] : ['owner', 'designer'],
			check: async (f) =>
				(await db.select().from(quotes).where(eq(quotes.variantId, f.vars.variantId))).some((q) =>
					action === 'send' ? q.status === 'sent' : q.labourMinor === 15000
				)
		}
	})),
	{
		route: '/builds/[id]/photos',
		method: 'GET',
		path: (f) => `${build(f)}/photos`,
		setup: shared,
		expect: studioOnly(200)
	},
	{
		route: '/builds/[id]/photos',
		method: 'POST',
		action: 'upload',
		path: (f) => `${build(f)}/photos?/upload`,
		form: uploadForm,
		setup: shared,
		expect: studioOnly(415)
	},
	{
		route: '/builds/[id]/photos',
		method: 'POST',
		action: 'delete',
		path: (f) => `${build(f)}/photos?/delete`,
		form: (f) => ({ photoId: f.vars.photoId }),
		setup: shared,
		expect: studioOnly(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) =>
				(await db.select().from(photos).where(eq(photos.id, f.vars.photoId))).length === 0
		}
	},
	{
		route: '/builds/[id]/photos',
		method: 'POST',
		action: 'caption',
		path: (f) => `${build(f)}/photos?/caption`,
		form: (f) => ({ photoId: f.vars.photoId, caption: 'Bench test' }),
		setup: shared,
		expect: studioOnly(200)
	},
	// Images for members: clients see the build's photos once something of it is shared with them.
	{
		route: '/builds/[id]/photos/[photoId]/[size]',
		method: 'GET',
		path: (f) => `${build(f)}/photos/${f.vars.photoId}/thumb`,
		setup: shared,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: 401 }
	},
	{
		route: '/api/photos/[buildId]',
		method: 'POST',
		path: (f) => `/api/photos/${f.vars.buildId}`,
		form: uploadForm,
		setup: shared,
		expect: { owner: 415, designer: 415, client: 403, outsider: 404, anonymous: 401 }
	},
	// Unsigned: refused for everyone, whoever they are.
	{
		route: '/api/payments/webhook',
		method: 'POST',
		json: () => ({ id: 'evt_x', type: 'checkout.session.completed' }),
		expect: all(400)
	}
];
