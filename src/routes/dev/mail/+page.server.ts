import { error } from '@sveltejs/kit';
import { eq } from 'drizzle-orm';
import { activeStudio } from '$lib/server/access';
import { membersOf } from '$lib/server/accounts';
import { config } from '$lib/server/config';
import { db } from '$lib/server/db';
import { invites } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

type Caught = { id: number; to: string[]; subject: string; text: string; date: string };

/**
 * Development only: the mails the local catcher holds, for an owner — and only those sent to the
 * studio's own members and invitees, so nobody reads another studio's reset links.
 */
export const load: PageServerLoad = async ({ locals, url, fetch }) => {
	if (!config.devTools) error(404, 'Not found.');
	const access = await activeStudio(locals, 'studio.mail', url);
	const members = await membersOf(access.studioId);
	const invited = await db.select({ email: invites.email }).from(invites).where(eq(invites.studioId, access.studioId));
	const allowed = new Set([...members.map((m) => m.email), ...invited.map((i) => i.email)].map((e) => e.toLowerCase()));
	try {
		const res = await fetch(`${config.mailCatcherUrl}/messages`);
		const mails = ((await res.json()) as Caught[]).filter((m) => m.to.some((t) => allowed.has(t.toLowerCase())));
		return { mails: mails.slice(0, 50), reachable: true };
	} catch {
		return { mails: [] as Caught[], reachable: false };
	}
};
