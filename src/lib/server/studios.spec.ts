/**
 * Studios and members against the built app: invitation by mailed link, accepting as a new or an
 * existing user, roles, the last-owner rule, switching studios.
 */
import { eq, sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { invites, memberships, users } from './db/schema';
import {
	ownerInvite,
	createMember,
	createSession,
	createStudio,
	createUser,
	roleOf,
	studioWithMembers,
	uniqueEmail
} from './testing/factories';
import { extractLink, waitForMail } from './testing/mail';
import { useApp } from './testing/suite';

const app = useApp();

const DEAD_INVITE = 'This invitation no longer works';

describe('invite → accept → role', () => {
	it('a new person follows the mailed link, signs up, accepts and works as a designer', async () => {
		const f = await studioWithMembers();
		const owner = app.client({ session: f.owner.session });
		const email = uniqueEmail('invitee');
		const sent = await owner.action('/studio/members?/invite', { email, role: 'designer' });
		expect(sent).toMatchObject({ type: 'success', status: 200, data: { invited: email } });

		const mail = await waitForMail(email, { subject: f.studio.name });
		expect(mail.subject).toBe(`${f.owner.name} invites you to ${f.studio.name} on Interstice`);
		const link = extractLink(mail.text, '/invite/');
		const path = new URL(link).pathname;

		const guest = app.client();
		const page = await guest.get(link);
		expect(page.status).toBe(200);
		expect(page.text).toContain(`Join ${f.studio.name}`);
		expect(page.text).toContain('designer');
		expect(page.header('referrer-policy')).toBe('same-origin');
		expect(page.text).toContain(`/signup?next=${encodeURIComponent(path)}`);

		const signedUp = await guest.signUp({
			name: 'New Designer',
			email,
			password: 'long-enough-1',
			next: path
		});
		expect(signedUp.status).toBe(303);
		expect(signedUp.location).toBe(path);
		const accepted = await guest.postForm(path);
		expect(accepted.status).toBe(303);
		expect(accepted.location).toBe('/builds');

		const [me] = await db.select().from(users).where(eq(users.email, email));
		expect(await roleOf(f.studio.id, me.id)).toBe('designer');
		expect(me.activeStudioId).toBe(f.studio.id);
		const builds = await guest.get('/builds');
		expect(builds.status).toBe(200);
		expect(builds.text).toContain(f.studio.name);
		expect((await guest.get('/studio/members')).status).toBe(403);

		// The owner's list shows the new member and no longer the open invitation.
		const members = await owner.get('/studio/members');
		expect(members.text).toContain(email);
		expect(members.text).toContain('No open invitations.');
	});

	it('an existing user signs in from the link and joins with the invited role', async () => {
		const f = await studioWithMembers();
		const existing = await createUser();
		const inv = await ownerInvite(f, 'client', existing.email);
		const c = app.client();
		const anonymous = await c.postForm(`/invite/${inv.token}`);
		expect(anonymous.status).toBe(303);
		expect(anonymous.location).toBe(`/signin?next=${encodeURIComponent(`/invite/${inv.token}`)}`);

		const signedIn = await c.postForm('/signin', {
			email: existing.email,
			password: existing.password,
			next: `/invite/${inv.token}`
		});
		expect(signedIn.location).toBe(`/invite/${inv.token}`);
		expect((await c.get(`/invite/${inv.token}`)).text).toContain(
			`You are signed in as ${existing.email}`
		);
		expect((await c.postForm(`/invite/${inv.token}`)).location).toBe('/builds');
		expect(await roleOf(f.studio.id, existing.id)).toBe('client');
		expect((await c.get('/builds')).text).toContain('Nothing shared with you yet');
	});

	it.each([
		['used', { acceptedAt: sql`now()` }],
		['expired', { expiresAt: sql`now() - interval '1 minute'` }],
		['withdrawn', { revokedAt: sql`now()` }]
	])('a %s invitation shows a clear page and adds nobody', async (_label, change) => {
		const f = await studioWithMembers();
		const inv = await ownerInvite(f, 'owner');
		await db.update(invites).set(change).where(eq(invites.id, inv.id));
		const c = app.client({ session: f.outsider.session });

		const page = await c.get(`/invite/${inv.token}`);
		expect(page.status).toBe(200);
		expect(page.text).toContain(DEAD_INVITE);
		expect(page.text).not.toContain(f.studio.name);

		const post = await c.postForm(`/invite/${inv.token}`);
		expect(post.status).toBeGreaterThanOrEqual(400);
		expect(post.status).toBeLessThan(500);
		expect(post.text).toContain('This invitation has expired or was already used.');
		expect(await roleOf(f.studio.id, f.outsider.id)).toBeNull();
	});

	it('a link works once, and only for the address it was sent to', async () => {
		const f = await studioWithMembers();
		const first = await createUser();
		const second = await createUser();
		const inv = await ownerInvite(f, 'designer', first.email);
		// Someone the link was forwarded to can't use it.
		const b = app.client({ session: await createSession(second.id) });
		const forwarded = await b.postForm(`/invite/${inv.token}`);
		expect(forwarded.status).toBe(403);
		expect(forwarded.text).toContain(first.email);
		const a = app.client({ session: await createSession(first.id) });
		expect((await a.postForm(`/invite/${inv.token}`)).location).toBe('/builds');
		expect((await a.postForm(`/invite/${inv.token}`)).status).toBe(400);
		expect(await roleOf(f.studio.id, first.id)).toBe('designer');
		expect(await roleOf(f.studio.id, second.id)).toBeNull();
	});

	it.each(['not-a-token', 'x'.repeat(2000), '%E2%80%AE%00', '..%2F..%2Fetc'])(
		'a made-up token (%s) gets the clear page, not an error',
		async (token) => {
			const res = await app.client().get(`/invite/${token}`);
			expect(res.status).toBeLessThan(500);
			if (res.status === 200) expect(res.text).toContain(DEAD_INVITE);
			expect(res.text).not.toMatch(/Error:|at .*\.js:\d+/);
		}
	);

	it('the owner can withdraw an open invitation, which then no longer works', async () => {
		const f = await studioWithMembers();
		const inv = await ownerInvite(f, 'designer');
		const owner = app.client({ session: f.owner.session });
		expect((await owner.get('/studio/members')).text).toContain(inv.email);
		expect(await owner.action('/studio/members?/revoke', { inviteId: inv.id })).toMatchObject({
			type: 'success'
		});
		expect((await owner.get('/studio/members')).text).not.toContain(inv.email);
		expect((await app.client().get(`/invite/${inv.token}`)).text).toContain(DEAD_INVITE);

		// Once withdrawn (or for another studio's invitation) there is nothing left to withdraw.
		const again = await owner.action('/studio/members?/revoke', { inviteId: inv.id });
		expect(again).toMatchObject({
			type: 'failure',
			status: 404,
			data: { errors: { inviteId: 'No such open invitation.' } }
		});
	});
});

describe('roles and the last-owner rule', () => {
	it('an owner changes a designer to a client, and back', async () => {
		const f = await studioWithMembers();
		const owner = app.client({ session: f.owner.session });
		expect(
			await owner.action('/studio/members?/role', { userId: f.designer.id, role: 'client' })
		).toMatchObject({ type: 'success' });
		expect(await roleOf(f.studio.id, f.designer.id)).toBe('client');
		expect((await app.client({ session: f.designer.session }).get('/builds')).text).toContain(
			'Nothing shared with you yet'
		);
		expect(
			await owner.action('/studio/members?/role', { userId: f.designer.id, role: 'designer' })
		).toMatchObject({ type: 'success' });
		expect(await roleOf(f.studio.id, f.designer.id)).toBe('designer');
	});

	it('the only owner can neither be demoted, nor removed, nor leave', async () => {
		const f = await studioWithMembers();
		const owner = app.client({ session: f.owner.session });
		const demote = await owner.action('/studio/members?/role', {
			userId: f.owner.id,
			role: 'designer'
		});
		expect(demote).toMatchObject({ type: 'failure', status: 400 });
		expect(demote.data.errors.role).toMatch(/last owner/);
		const remove = await owner.action('/studio/members?/remove', { userId: f.owner.id });
		expect(remove).toMatchObject({ type: 'failure', status: 400 });
		expect(remove.data.errors.userId).toMatch(/last owner/);
		const leave = await owner.postForm('/studio/members?/leave');
		expect(leave.status).toBe(409);
		expect(leave.text).toMatch(/last owner/);
		expect(await roleOf(f.studio.id, f.owner.id)).toBe('owner');

		// The page shows the refusal to a person, too.
		const page = await owner.postForm('/studio/members?/role', {
			userId: f.owner.id,
			role: 'client'
		});
		expect(page.status).toBe(400);
		expect(page.text).toContain('The last owner cannot be demoted');
	});

	it('with two owners one can be demoted or leave, and then the other is the last', async () => {
		const f = await studioWithMembers();
		const second = await createMember(f.studio.id, 'owner');
		const owner = app.client({ session: f.owner.session });
		expect(
			await owner.action('/studio/members?/role', { userId: second.id, role: 'designer' })
		).toMatchObject({ type: 'success' });
		expect(await roleOf(f.studio.id, second.id)).toBe('designer');
		expect(
			await owner.action('/studio/members?/role', { userId: f.owner.id, role: 'designer' })
		).toMatchObject({ type: 'failure', status: 400 });

		expect(
			await owner.action('/studio/members?/role', { userId: second.id, role: 'owner' })
		).toMatchObject({ type: 'success' });
		const leave = await app.client({ session: second.session }).postForm('/studio/members?/leave');
		expect(leave.status).toBe(303);
		expect(leave.location).toBe('/studios');
		expect(await roleOf(f.studio.id, second.id)).toBeNull();
		expect(await owner.action('/studio/members?/remove', { userId: f.owner.id })).toMatchObject({
			type: 'failure',
			status: 400
		});
	});

	it('two owners demoting each other at the same moment leave one owner', async () => {
		const f = await studioWithMembers();
		const second = await createMember(f.studio.id, 'owner');
		const a = app.client({ session: f.owner.session });
		const b = app.client({ session: second.session });
		const results = await Promise.all([
			a.action('/studio/members?/role', { userId: second.id, role: 'designer' }),
			b.action('/studio/members?/role', { userId: f.owner.id, role: 'designer' })
		]);
		expect(results.filter((r) => r.type === 'success')).toHaveLength(1);
		// The other is refused: by the last-owner rule (400), or, when the first change committed
		// before its guard read its role, as no longer an owner (403). Which one depends on timing.
		const refused = results.find((r) => r.type !== 'success')!;
		expect([
			['failure', 400],
			['error', 403]
		]).toContainEqual([refused.type, refused.status]);
		const owners = await db
			.select()
			.from(memberships)
			.where(sql`${memberships.studioId} = ${f.studio.id} and ${memberships.role} = 'owner'`);
		expect(owners).toHaveLength(1);
	});

	it('a removed member loses the studio at once, also in a session started before', async () => {
		const f = await studioWithMembers();
		const owner = app.client({ session: f.owner.session });
		const designer = app.client({ session: f.designer.session });
		expect((await designer.get('/builds')).text).toContain(f.studio.name);
		expect(await owner.action('/studio/members?/remove', { userId: f.designer.id })).toMatchObject({
			type: 'success'
		});
		expect(await roleOf(f.studio.id, f.designer.id)).toBeNull();
		const after = await designer.get('/builds');
		expect(after.status).toBe(303);
		expect(after.location).toBe('/studios/new');
	});
});

describe('several studios', () => {
	it('a member of two studios switches between them, and cannot switch into a third', async () => {
		const f = await studioWithMembers();
		await db
			.insert(memberships)
			.values({ studioId: f.otherStudio.id, userId: f.designer.id, role: 'client' });
		const c = app.client({ session: f.designer.session });
		const stranger = await createStudio();

		const toOther = await c.postForm('/studios?/switch', { studioId: f.otherStudio.id });
		expect(toOther.status).toBe(303);
		expect(toOther.location).toBe('/builds');
		const builds = await c.get('/builds');
		expect(builds.text).toContain(f.otherStudio.name);
		expect(builds.text).toContain('Nothing shared with you yet');

		const denied = await c.postForm('/studios?/switch', { studioId: stranger.id });
		expect(denied.status).toBe(404);
		const [u] = await db.select().from(users).where(eq(users.id, f.designer.id));
		expect(u.activeStudioId).toBe(f.otherStudio.id);
	});

	it('a studio the user was removed from is never shown, even if it is still marked active', async () => {
		const f = await studioWithMembers();
		// The outsider's stored choice points at a studio they are not (or no longer) a member of.
		await db.update(users).set({ activeStudioId: f.studio.id }).where(eq(users.id, f.outsider.id));
		const c = app.client({ session: f.outsider.session });
		for (const path of ['/builds', '/studio/members', '/studios']) {
			const res = await c.get(path);
			expect(res.status).toBe(200);
			expect(res.text).not.toContain(f.studio.name);
			expect(res.text).toContain(f.otherStudio.name);
		}
	});

	it('creating a studio makes the creator its owner and their active studio', async () => {
		const user = await createUser();
		const c = app.client();
		await c.signIn(user.email, user.password);
		const res = await c.postForm('/studios/new', { name: '  Harbour Bench  ' });
		expect(res.status).toBe(303);
		expect(res.location).toBe('/builds');
		const [u] = await db.select().from(users).where(eq(users.id, user.id));
		expect(u.activeStudioId).toBeTruthy();
		expect(await roleOf(u.activeStudioId ?? '', user.id)).toBe('owner');
		expect((await c.get('/builds')).text).toContain('Harbour Bench');
	});
});
