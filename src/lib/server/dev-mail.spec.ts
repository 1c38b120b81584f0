/**
 * The old account-takeover path through the outgoing-mail page: an owner invited an address that
 * has an account elsewhere, withdrew the invitation, asked for a password reset for it, then read
 * the reset link on /dev/mail. The page is gone (the local mail catcher shows its own log to
 * whoever runs the machine), so no account of the app can read another account's mail, even with
 * the development tools on as in this test app.
 */
import { and, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from './db';
import { invites } from './db/schema';
import { createMember, createStudio, createUser } from './testing/factories';
import { waitForMail } from './testing/mail';
import { useApp } from './testing/suite';

const app = useApp();

describe("reading other people's mail", () => {
	it('invite, withdraw, reset for that address: the owner cannot read the reset link', async () => {
		const studio = await createStudio();
		const owner = await createMember(studio.id, 'owner');
		const victim = await createUser();
		const c = app.client({ session: owner.session });

		expect(
			(await c.action('/studio/members?/invite', { email: victim.email, role: 'designer' })).type
		).toBe('success');
		const [invite] = await db
			.select()
			.from(invites)
			.where(and(eq(invites.studioId, studio.id), eq(invites.email, victim.email.toLowerCase())));
		expect((await c.action('/studio/members?/revoke', { inviteId: invite.id })).type).toBe(
			'success'
		);
		expect((await app.client().action('/reset', { email: victim.email })).type).toBe('success');
		// The reset mail really went out (to the catcher, read here as the machine's developer).
		const reset = await waitForMail(victim.email, { subject: 'Reset' });
		const token = /\/reset\/([A-Za-z0-9_-]+)/.exec(reset.text)?.[1];
		expect(token).toBeTruthy();

		const page = await c.get('/dev/mail');
		expect(page.status).toBe(404);
		expect(page.text).not.toContain(token!);
		const members = await c.get('/studio/members');
		expect(members.status).toBe(200);
		expect(members.text).not.toContain(token!);
	});
});
