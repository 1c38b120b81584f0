/**
 * Access-matrix rows for the client work (see ../testing/access-matrix.ts). Each cell gets a fresh
 * studio with a demo build whose variant is shared by a live link with the studio's client, a
 * second link that was revoked, a photo, and a second variant shared with nobody.
 *
 * The link is the key on /s/[token]: everyone holding it (owner, designer, client, the outsider,
 * anonymous) gets the page; everyone holding a revoked one gets 410.
 */
import { eq } from 'drizzle-orm';
import sharp from 'sharp';
import { db } from '../db';
import { comments, photos, quotes, shareLinks, variants } from '../db/schema';
import type { Fields } from './client';
import {
	SIGN_IN,
	type Expected,
	type MatrixFixture,
	type MatrixRow,
	type Visitor
} from './access-matrix';
import { newId } from '../tokens';
import { createShareLink, revokeShareLink } from '../sharing/links';
import { addPhoto } from '../sharing/photos';
import { demoBuild, quoteFormFields, shareWithClient } from './sharing';
import { EDITORS, about, countRows, everyone, isStamped, studioOnly } from './matrix-rows';
import { photoRef } from '../sharing/view';

const all = everyone;
const EVERYONE: Visitor[] = ['owner', 'designer', 'client', 'outsider', 'anonymous'];

let tinyPng: Promise<Buffer> | undefined;

async function shared(f: MatrixFixture) {
	const b = await demoBuild({ studioId: f.studio.id, createdBy: f.designer.id });
	const live = await shareWithClient(f, b, { recipientName: 'Matrix Client' });
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

const commentCount = (f: MatrixFixture) =>
	countRows(comments, eq(comments.buildId, f.vars.buildId));
const linkCount = (f: MatrixFixture) =>
	countRows(shareLinks, eq(shareLinks.buildId, f.vars.buildId));
const linkRevoked = (f: MatrixFixture) =>
	isStamped(shareLinks, shareLinks.id, f.vars.linkId, shareLinks.revokedAt);
const quoteMade = async (f: MatrixFixture) =>
	(await countRows(quotes, eq(quotes.variantId, f.vars.variantId))) === 1;
const photoGone = async (f: MatrixFixture) =>
	(await countRows(photos, eq(photos.id, f.vars.photoId))) === 0;
const commented = { by: EVERYONE, check: async (f: MatrixFixture) => (await commentCount(f)) > 0 };
const nothingCommented = {
	by: [] as Visitor[],
	check: async (f: MatrixFixture) => (await commentCount(f)) > 0
};

const link = (f: MatrixFixture) => `/s/${f.vars.token}`;
const revoked = (f: MatrixFixture) => `/s/${f.vars.revokedToken}`;
const member = (f: MatrixFixture) => `/s/v/${f.vars.variantId}`;
const ofBuild = about(shared, { id: 'buildId', variantId: 'variantId' });
const build = (f: MatrixFixture) => `/builds/${f.vars.buildId}`;

const commentForm = () => ({
	body: 'Is there room for the fittings?',
	part: 'part-002',
	version: 1
});
const approveForm = () => ({ version: 1, message: '' });
const changesForm = () => ({ version: 1, message: 'A larger radiator, please.' });

type ClientAction = 'comment' | 'approve' | 'changes';

/**
 * One client action posted by everyone holding the live link (done, a comment row written) and by
 * everyone holding the revoked one (410, nothing written).
 */
const linkActions = (action: ClientAction, form: () => Fields): MatrixRow[] =>
	[
		{ path: link, expect: all(200), changes: commented },
		{ path: revoked, expect: all(410), changes: nothingCommented }
	].map(({ path, expect, changes }) => ({
		route: '/s/[token]',
		method: 'POST',
		action,
		path: (f) => `${path(f)}?/${action}`,
		form,
		setup: shared,
		expect,
		showsStudioToLinkHolders: true,
		changes
	}));

/** One client action on the in-app client page; `designer` is what a designer gets. */
const memberAction = (
	action: ClientAction,
	form: () => Fields,
	designer: 200 | 403,
	by: Visitor[]
): MatrixRow => ({
	route: '/s/v/[variantId]',
	method: 'POST',
	action,
	path: (f) => `${member(f)}?/${action}`,
	form,
	setup: shared,
	expect: { owner: 200, designer, client: 200, outsider: 404, anonymous: SIGN_IN },
	changes: { by, check: async (f) => (await commentCount(f)) > 0 }
});

function uploadForm(): Fields {
	const form = new FormData();
	form.append('file', new Blob([Buffer.from('not an image')], { type: 'image/png' }), 'a.png');
	return form as unknown as Fields;
}

const newLinkForm = (f: MatrixFixture) => ({
	variantId: f.vars.variantId,
	recipientEmail: '',
	recipientName: 'Someone',
	expires: '7',
	send: ''
});
const studioCommentForm = (f: MatrixFixture) => ({
	variantId: f.vars.variantId,
	body: 'The fittings clear by 4 mm.',
	part: ''
});

/**
 * A page on the studio's side of the build, and its form actions: what an editor posts, what
 * they get and, with a check, how to tell the post took effect (for the editors only).
 */
function studioPage(
	route: string,
	actions: [string, MatrixRow['form'], Expected, ((f: MatrixFixture) => Promise<boolean>)?][]
): MatrixRow[] {
	return [
		ofBuild({ route, method: 'GET', expect: studioOnly(200) }),
		...actions.map(([action, form, ok, check]) =>
			ofBuild({
				route,
				method: 'POST',
				action,
				form,
				expect: studioOnly(ok),
				...(check && { changes: { by: EDITORS, check } })
			})
		)
	];
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
	...linkActions('comment', commentForm),
	...linkActions('approve', approveForm),
	...linkActions('changes', changesForm),
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
	memberAction('comment', commentForm, 200, ['owner', 'designer', 'client']),
	memberAction('approve', approveForm, 403, ['owner', 'client']),
	// A client may not approve a variant they were not sent.
	{
		...memberAction('approve', approveForm, 403, ['owner']),
		path: (f) => `/s/v/${f.vars.otherVariantId}?/approve`,
		expect: { owner: 200, designer: 403, client: 404, outsider: 404, anonymous: SIGN_IN }
	},
	memberAction('changes', changesForm, 403, ['owner', 'client']),
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
	...studioPage('/builds/[id]/share', [
		['create', newLinkForm, 200, async (f) => (await linkCount(f)) > 2],
		['revoke', (f) => ({ linkId: f.vars.linkId }), 200, linkRevoked],
		['comment', studioCommentForm, 200, async (f) => (await commentCount(f)) > 0]
	]),
	...studioPage('/builds/[id]/quote/[variantId]', [['create', undefined, 200, quoteMade]]),
	...(['save', 'refresh', 'send', 'withdraw'] as const).map((action): MatrixRow => ({
		route: '/builds/[id]/quote/[variantId]',
		method: 'POST',
		action,
		path: (f) => `${build(f)}/quote/${f.vars.variantId}?/${action}`,
		form: () => (action === 'save' ? quoteFormFields() : {}),
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
	...studioPage('/builds/[id]/photos', [
		['upload', uploadForm, 415],
		['delete', (f) => ({ photoId: f.vars.photoId }), 200, photoGone],
		['caption', (f) => ({ photoId: f.vars.photoId, caption: 'Bench test' }), 200]
	]),
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
