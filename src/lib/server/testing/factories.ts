/**
 * Test data written straight to the database: much faster than going through the forms, and it
 * leaves the forms to the tests that are about them. Every e-mail and name is unique, so tests
 * never see each other's rows. Relative imports only: Playwright loads this file too.
 */
import { randomBytes } from 'node:crypto';
import { count, eq, like, or, sql } from 'drizzle-orm';
import { roleIn } from '../access';
import { createSessionToken } from '../auth';
import { db } from '../db';
import {
	invites,
	memberships,
	passwordResets,
	rateLimits,
	sessions,
	studios,
	users,
	type Role
} from '../db/schema';
import { hashPassword } from '../passwords';
import { hashToken, newId, newToken } from '../tokens';
import { testDatabaseUrl } from './env';

export const TEST_PASSWORD = 'test-password-1';

let defaultHash: Promise<string> | undefined;

export function unique(label = 'user'): string {
	return `${label}-${randomBytes(6).toString('hex')}`;
}

export function uniqueEmail(label = 'user'): string {
	return `${unique(label)}@test.interstice.test`;
}

export type TestUser = { id: string; email: string; name: string; password: string };

/** A verified account (as if its owner had opened the confirmation mail), unless `verified: false`. */
export async function createUser(
	opts: {
		name?: string;
		email?: string;
		password?: string;
		activeStudioId?: string | null;
		verified?: boolean;
	} = {}
): Promise<TestUser> {
	testDatabaseUrl();
	const password = opts.password ?? TEST_PASSWORD;
	// One argon2 hash per process for the shared password (~50 ms each).
	const passwordHash = opts.password
		? await hashPassword(password)
		: await (defaultHash ??= hashPassword(TEST_PASSWORD));
	const email = (opts.email ?? uniqueEmail()).toLowerCase();
	const user = {
		id: newId(),
		email,
		name: opts.name ?? `Tester ${randomBytes(3).toString('hex')}`,
		password
	};
	await db.insert(users).values({
		id: user.id,
		email,
		name: user.name,
		passwordHash,
		activeStudioId: opts.activeStudioId ?? null,
		emailVerifiedAt: opts.verified === false ? null : new Date()
	});
	return user;
}

export type TestStudio = { id: string; name: string };

export async function createStudio(opts: { name?: string } = {}): Promise<TestStudio> {
	const studio = { id: newId(), name: opts.name ?? `Studio ${unique('s')}` };
	await db.insert(studios).values(studio);
	return studio;
}

/** Adds the membership and makes the studio the user's active one. */
export async function addMember(studioId: string, userId: string, role: Role) {
	await db.insert(memberships).values({ studioId, userId, role });
	await db.update(users).set({ activeStudioId: studioId }).where(eq(users.id, userId));
}

/**
 * A real session (the same call sign-in makes); give the token it returns (what the cookie
 * carries, not the stored hash) to `Client.useSession`.
 */
export async function createSession(userId: string): Promise<string> {
	return (await createSessionToken(userId)).token;
}

/** A user with a session, member of `studioId` in `role`, working in it. */
export async function createMember(
	studioId: string,
	role: Role,
	opts: Parameters<typeof createUser>[0] = {}
) {
	const user = await createUser({ activeStudioId: studioId, ...opts });
	await db.insert(memberships).values({ studioId, userId: user.id, role });
	return { ...user, session: await createSession(user.id) };
}

export type TestMember = TestUser & { session: string };

/** A new studio with one member in `role`, for tests that need nobody else. */
export async function studioMember(
	role: Role
): Promise<{ studio: TestStudio; member: TestMember }> {
	const studio = await createStudio();
	return { studio, member: await createMember(studio.id, role) };
}

/**
 * A studio with one owner, one designer and one client, and an outsider: the owner of a second
 * studio (so someone with full powers elsewhere, but none here).
 */
export async function studioWithMembers(): Promise<{
	studio: TestStudio;
	owner: TestMember;
	designer: TestMember;
	client: TestMember;
	outsider: TestMember;
	otherStudio: TestStudio;
}> {
	const [studio, otherStudio] = await Promise.all([createStudio(), createStudio()]);
	const [owner, designer, client, outsider] = await Promise.all([
		createMember(studio.id, 'owner'),
		createMember(studio.id, 'designer'),
		createMember(studio.id, 'client'),
		createMember(otherStudio.id, 'owner')
	]);
	return { studio, owner, designer, client, outsider, otherStudio };
}

/** An open invitation; the token is what the mailed link carries. */
export async function createInvite(opts: {
	studioId: string;
	role: Role;
	invitedBy?: string;
	email?: string;
	expiresAt?: Date;
}) {
	const token = newToken();
	const invite = {
		id: newId(),
		email: (opts.email ?? uniqueEmail('invitee')).toLowerCase(),
		token
	};
	await db.insert(invites).values({
		id: invite.id,
		studioId: opts.studioId,
		email: invite.email,
		role: opts.role,
		tokenHash: hashToken(token),
		invitedBy: opts.invitedBy ?? null,
		expiresAt: opts.expiresAt ?? new Date(Date.now() + 7 * 24 * 3600 * 1000)
	});
	return invite;
}

/** An open invitation to the studio from its owner; without an address, to a fresh one. */
export function ownerInvite(
	f: { studio: TestStudio; owner: TestMember },
	role: Role,
	email?: string
) {
	return createInvite({ studioId: f.studio.id, role, email, invitedBy: f.owner.id });
}

/** The user's role in the studio as stored (the same read the access checks make), or null. */
export const roleOf = (studioId: string, userId: string): Promise<Role | null> =>
	roleIn(userId, studioId);

export async function sessionCount(userId: string): Promise<number> {
	const [r] = await db.select({ n: count() }).from(sessions).where(eq(sessions.userId, userId));
	return r.n;
}

/** Rows in the account tables, to prove a refused request wrote nothing. */
export async function accountRowCounts() {
	const tables = { users, sessions, studios, memberships, invites, passwordResets } as const;
	const out: Record<string, number> = {};
	for (const [name, table] of Object.entries(tables)) {
		const [r] = await db.select({ n: count() }).from(table);
		out[name] = r.n;
	}
	return out as Record<keyof typeof tables, number>;
}

/**
 * Forgets the rate-limit counters of one client address (keys are `bucket:address[:extra]`), for
 * browser tests, which all come from 127.0.0.1 and would otherwise share one budget.
 */
export async function clearRateLimits(address: string) {
	await db
		.delete(rateLimits)
		.where(or(like(rateLimits.key, `%:${address}`), like(rateLimits.key, `%:${address}:%`)));
}

/** Moves every reset link of this user one minute past its expiry. */
export async function expireResets(userId: string) {
	await db
		.update(passwordResets)
		.set({ expiresAt: sql`now() - interval '1 minute'` })
		.where(eq(passwordResets.userId, userId));
}
