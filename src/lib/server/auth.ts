/**
 * Sessions. Everything that touches the session library goes through this module, so it can be
 * replaced without touching routes (the library's authors have ended active development of v3).
 *
 * The cookie carries a random token (256 bits); the session table keeps only its SHA-256, used as
 * the row's id. Someone who reads the table (a backup, a leaked dump) cannot use what they read:
 * the cookie that works is the one whose hash it is. Lucia lets us choose the id when it creates a
 * session, so the library still handles expiry and refresh.
 */
import { DrizzlePostgreSQLAdapter } from '@lucia-auth/adapter-drizzle';
import type { Cookies } from '@sveltejs/kit';
import { Lucia } from 'lucia';
import { config } from './config';
import { db } from './db';
import { sessions, users } from './db/schema';
import { hashToken, newToken } from './tokens';

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

export type SessionUser = {
	id: string;
	email: string;
	name: string;
	activeStudioId: string | null;
};

/** A new session; `token` goes to the cookie, `id` (its hash) is what the table holds. */
export async function createSessionToken(userId: string): Promise<{ token: string; id: string }> {
	const token = newToken();
	const session = await lucia.createSession(userId, {}, { sessionId: hashToken(token) });
	return { token, id: session.id };
}

export async function startSession(cookies: Cookies, userId: string) {
	const { token } = await createSessionToken(userId);
	const cookie = lucia.createSessionCookie(token);
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

/** The longest cookie value looked up; ours are 43 characters. */
const MAX_TOKEN_CHARS = 200;

/** Lucia's default session life (30 days, ms); it extends a session in its second half. */
export const SESSION_LIFE_MS = 30 * 24 * 3600 * 1000;

/**
 * The session table's id for the cookie's token, or null: for a query that reads the session
 * together with what a request needs (src/lib/server/check-trip.ts). The same length guard and
 * hash as readSession.
 */
export function sessionIdOf(cookies: Cookies): string | null {
	const token = cookies.get(lucia.sessionCookieName);
	return token && token.length <= MAX_TOKEN_CHARS ? hashToken(token) : null;
}

/**
 * Reads the cookie, validates and refreshes the session. `session.id` is the hash, never the
 * token; hashing first also means whatever the cookie holds (a NUL byte, 1 MB) never reaches a
 * query as it is.
 */
export async function readSession(cookies: Cookies) {
	const token = cookies.get(lucia.sessionCookieName);
	if (!token) return { user: null, session: null };
	const { session, user } =
		token.length > MAX_TOKEN_CHARS
			? { session: null, user: null }
			: await lucia.validateSession(hashToken(token));
	if (session?.fresh) {
		const c = lucia.createSessionCookie(token);
		cookies.set(c.name, c.value, { path: '/', ...c.attributes });
	}
	if (!session) {
		const blank = lucia.createBlankSessionCookie();
		cookies.set(blank.name, blank.value, { path: '/', ...blank.attributes });
	}
	return { user: user as SessionUser | null, session };
}
