/**
 * Sessions. Everything that touches the session library goes through this module, so it can be
 * replaced without touching routes (the library's authors have ended active development of v3).
 */
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import type { Cookies } from '@sveltejs/kit';
import { Lucia } from 'lucia';
import { config } from './config';
import { db } from './db';
import { sessions, users } from './db/schema';

const adapter = new DrizzlePostgreSQLAdapter(db, sessions, users);

export const lucia = new Lucia(adapter, {
	sessionCookie: {
		name: 'interstice_session',
		attributes: { secure: config.production, sameSite: 'lax' }
	},
	// The Drizzle adapter hands over the row with Drizzle's property names, not the column names.
	getUserAttributes: (a) => ({ email: a.email, name: a.name, activeStudioId: a.activeStudioId })
});

declare module 'lucia' {
	interface Register {
		Lucia: typeof lucia;
		DatabaseUserAttributes: { email: string; name: string; activeStudioId: string | null };
	}
}

export type SessionUser = { id: string; email: string; name: string; activeStudioId: string | null };

export async function startSession(cookies: Cookies, userId: string) {
	const session = await lucia.createSession(userId, {});
	const cookie = lucia.createSessionCookie(session.id);
	cookies.set(cookie.name, cookie.value, { path: '/', ...cookie.attributes });
}

export async function endSession(cookies: Cookies, sessionId: string) {
	await lucia.invalidateSession(sessionId);
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

export async function endAllSessions(cookies: Cookies, userId: string) {
	await lucia.invalidateUserSessions(userId);
	const blank = lucia.createBlankSessionCookie();
	cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
}

/** Reads the cookie, validates and refreshes the session. */
export async function readSession(cookies: Cookies) {
	const id = cookies.get(lucia.sessionCookieName);
	if (!id) return { user: null, session: null };
	const { session, user } = await lucia.validateSession(id);
	if (session?.fresh) {
		const c = lucia.createSessionCookie(session.id);
		cookies.set(c.name, c.value, { path: '/', ...c.attributes });
	}
	if (!session) {
		const blank = lucia.createBlankSessionCookie();
		cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
	}
	return { user: user as SessionUser | null, session };
}
