/** Accounts, studios, members and invites: the rules, independent of any page. */
import { and, count, eq, gt, isNull, sql } from 'drizzle-orm';
import { db, type Tx } from './db';
import {
	emailVerifications,
	invites,
	memberships,
	passwordResets,
	studios,
	users,
	type Role
} from './db/schema';
import { link, sendMail } from './mail';
import { hashPassword, verifyDummy, verifyPassword } from './passwords';
import { enqueue, scheduleDrain, type SignUpPayload } from './outbox';
import { hashToken, newId, newToken } from './tokens';
import { ServiceError, type ServiceErrorKind } from './errors';

/** An account or membership rule refused; `field` is the form field it is about. */
export class RuleError extends ServiceError {
	constructor(message: string, field?: string, kind: ServiceErrorKind = 'invalid') {
		super(kind, message, { field });
	}
}

const INVITE_TTL_MS = 7 * 24 * 60 * 60 * 1000;

type OneUseLinks = typeof passwordResets | typeof emailVerifications;

/** The unspent, unexpired reset or confirmation link with this token. */
function liveToken(table: OneUseLinks, token: string) {
	return and(
		eq(table.tokenHash, hashToken(token)),
		isNull(table.usedAt),
		gt(table.expiresAt, new Date())
	);
}

/** Spends every link of the user still open: one used link kills those mailed before it. */
async function spendAll(tx: Tx, table: OneUseLinks, userId: string) {
	await tx
		.update(table)
		.set({ usedAt: new Date() })
		.where(and(eq(table.userId, userId), isNull(table.usedAt)));
}

/** An invitation still open: not accepted, not withdrawn, not expired. */
function inviteOpen() {
	return and(
		isNull(invites.acceptedAt),
		isNull(invites.revokedAt),
		gt(invites.expiresAt, new Date())
	);
}

export async function findUserByEmail(email: string) {
	const [u] = await db.select().from(users).where(eq(users.email, email.toLowerCase()));
	return u ?? null;
}

/** `/invite/<token>` → the token; sign-up from an invitation link carries it in `next`. */
function inviteTokenIn(next: string | null): string | null {
	return next?.match(/^\/invite\/([A-Za-z0-9_-]{43})$/)?.[1] ?? null;
}

/**
 * Sign-up answers the same, whatever the address: the same work (a password hash, one insert
 * attempt, one outbox row) and no session. The outbox then mails a new or still unconfirmed
 * address a confirmation link, and a known one a "someone tried to sign up" note. The one
 * exception proves the address another way: signing up from an invitation link sent to exactly
 * this (new) address, which counts as confirmed and signs in at once (`userId`).
 */
export async function signUp(input: {
	name: string;
	email: string;
	password: string;
	next: string | null;
}): Promise<{ userId: string | null }> {
	const passwordHash = await hashPassword(input.password);
	const email = input.email.toLowerCase();
	const token = inviteTokenIn(input.next);
	const invited = token ? (await findValidInvite(token))?.email === email : false;
	const result = await db.transaction(async (tx) => {
		const id = newId();
		const inserted = await tx
			.insert(users)
			.values({
				id,
				name: input.name,
				email,
				passwordHash,
				emailVerifiedAt: invited ? new Date() : null
			})
			.onConflictDoNothing()
			.returning({ id: users.id });
		if (inserted.length === 1 && invited) return { userId: id };
		const payload: SignUpPayload = { name: input.name, passwordHash, next: input.next };
		await enqueue('sign-up', email, payload, tx);
		return { userId: null };
	});
	scheduleDrain();
	return result;
}

/** The same `null` for an unknown e-mail and a wrong password, after the same amount of work. */
export async function checkCredentials(email: string, password: string) {
	const user = await findUserByEmail(email);
	if (!user) return verifyDummy(password).then(() => null);
	return (await verifyPassword(user.passwordHash, password)) ? user : null;
}

/**
 * One outbox row for any address; the drain (outbox.ts) sends a link only to an account's owner.
 * Nothing here depends on whether the address has an account.
 */
export async function requestPasswordReset(email: string) {
	await enqueue('password-reset', email);
}

/** An unconfirmed account that signed in with the right password: mail it a fresh link. */
export async function resendConfirmation(user: {
	email: string;
	name: string;
	passwordHash: string;
}) {
	await enqueue('sign-up', user.email, {
		name: user.name,
		passwordHash: user.passwordHash,
		next: null
	} satisfies SignUpPayload);
}

export async function findValidVerification(token: string) {
	const [row] = await db
		.select({ userId: emailVerifications.userId, email: users.email })
		.from(emailVerifications)
		.innerJoin(users, eq(users.id, emailVerifications.userId))
		.where(and(liveToken(emailVerifications, token), isNull(users.emailVerifiedAt)));
	return row ?? null;
}

/**
 * Confirms the address with the link's token (once): the account takes the name and password of
 * the sign-up that link was mailed for, and every other confirmation link of it stops working.
 * Null for a dead token or an account already confirmed.
 */
export async function verifyEmail(
	token: string
): Promise<{ userId: string; next: string | null } | null> {
	return db.transaction(async (tx) => {
		const [v] = await tx
			.update(emailVerifications)
			.set({ usedAt: new Date() })
			.where(liveToken(emailVerifications, token))
			.returning();
		if (!v) return null;
		const [u] = await tx
			.update(users)
			.set({ emailVerifiedAt: new Date(), name: v.name, passwordHash: v.passwordHash })
			.where(and(eq(users.id, v.userId), isNull(users.emailVerifiedAt)))
			.returning({ id: users.id });
		if (!u) return null;
		await spendAll(tx, emailVerifications, v.userId);
		return { userId: v.userId, next: v.next };
	});
}

export async function findValidReset(token: string) {
	const [row] = await db.select().from(passwordResets).where(liveToken(passwordResets, token));
	return row ?? null;
}

/** Uses the token (once) and sets the password; returns the user id, or null for a dead token. */
export async function resetPassword(token: string, password: string) {
	const passwordHash = await hashPassword(password);
	return db.transaction(async (tx) => {
		const [used] = await tx
			.update(passwordResets)
			.set({ usedAt: new Date() })
			.where(liveToken(passwordResets, token))
			.returning({ userId: passwordResets.userId });
		if (!used) return null;
		// Every other reset link of the account dies with this one: a link mailed earlier, or one
		// an attacker asked for, must not set the password again.
		await spendAll(tx, passwordResets, used.userId);
		// The link came by mail, so the address is proven too.
		await tx
			.update(users)
			.set({ passwordHash, emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())` })
			.where(eq(users.id, used.userId));
		return used.userId;
	});
}

export async function createStudio(userId: string, name: string) {
	const id = newId();
	await db.transaction(async (tx) => {
		await tx.insert(studios).values({ id, name });
		await tx.insert(memberships).values({ studioId: id, userId, role: 'owner' });
		await tx.update(users).set({ activeStudioId: id }).where(eq(users.id, userId));
	});
	return id;
}

export async function studiosOf(userId: string) {
	return db
		.select({ id: studios.id, name: studios.name, role: memberships.role })
		.from(memberships)
		.innerJoin(studios, eq(studios.id, memberships.studioId))
		.where(eq(memberships.userId, userId))
		.orderBy(studios.name);
}

export async function switchStudio(userId: string, studioId: string) {
	const [m] = await db
		.select()
		.from(memberships)
		.where(and(eq(memberships.userId, userId), eq(memberships.studioId, studioId)));
	if (!m) throw new RuleError('You are not a member of that studio.', 'studioId', 'not-found');
	await db.update(users).set({ activeStudioId: studioId }).where(eq(users.id, userId));
}

export async function membersOf(studioId: string) {
	return db
		.select({
			userId: users.id,
			name: users.name,
			email: users.email,
			role: memberships.role,
			since: memberships.createdAt
		})
		.from(memberships)
		.innerJoin(users, eq(users.id, memberships.userId))
		.where(eq(memberships.studioId, studioId))
		.orderBy(users.name);
}

export async function pendingInvites(studioId: string) {
	return db
		.select({
			id: invites.id,
			email: invites.email,
			role: invites.role,
			expiresAt: invites.expiresAt
		})
		.from(invites)
		.where(and(eq(invites.studioId, studioId), inviteOpen()))
		.orderBy(invites.createdAt);
}

export async function inviteMember(input: {
	studioId: string;
	studioName: string;
	email: string;
	role: Role;
	invitedBy: { id: string; name: string };
}) {
	const token = newToken();
	await db.insert(invites).values({
		id: newId(),
		studioId: input.studioId,
		email: input.email.toLowerCase(),
		role: input.role,
		tokenHash: hashToken(token),
		invitedBy: input.invitedBy.id,
		expiresAt: new Date(Date.now() + INVITE_TTL_MS)
	});
	await sendMail({
		to: input.email,
		subject: `${input.invitedBy.name} invites you to ${input.studioName} on Interstice`,
		text: `${input.invitedBy.name} invites you to join the studio "${input.studioName}" as ${input.role}.\n\nAccept here (the link works once, for 7 days):\n${link(`/invite/${token}`)}\n\nInterstice checks that every part of a compact build fits before anything is bought.`
	});
	return token;
}

export async function findValidInvite(token: string) {
	const [row] = await db
		.select({
			id: invites.id,
			email: invites.email,
			role: invites.role,
			studioId: invites.studioId,
			studioName: studios.name
		})
		.from(invites)
		.innerJoin(studios, eq(studios.id, invites.studioId))
		.where(and(eq(invites.tokenHash, hashToken(token)), inviteOpen()));
	return row ?? null;
}

/** Single use: the invite is marked accepted in the same transaction that adds the membership. */
export async function acceptInvite(token: string, userId: string) {
	return db.transaction(async (tx) => {
		const [inv] = await tx
			.update(invites)
			.set({ acceptedAt: new Date() })
			.where(and(eq(invites.tokenHash, hashToken(token)), inviteOpen()))
			.returning();
		if (!inv) return null;
		const [existing] = await tx
			.select()
			.from(memberships)
			.where(and(eq(memberships.studioId, inv.studioId), eq(memberships.userId, userId)));
		if (!existing) {
			await tx.insert(memberships).values({ studioId: inv.studioId, userId, role: inv.role });
		}
		// The invitation reached this address (the page checks it is the signed-in one): proven.
		await tx
			.update(users)
			.set({
				activeStudioId: inv.studioId,
				emailVerifiedAt: sql`coalesce(${users.emailVerifiedAt}, now())`
			})
			.where(eq(users.id, userId));
		return inv.studioId;
	});
}

/** Withdraws an open invitation of this studio; any other id is "no such invitation". */
export async function revokeInvite(studioId: string, inviteId: string) {
	const revoked = await db
		.update(invites)
		.set({ revokedAt: new Date() })
		.where(
			and(
				eq(invites.id, inviteId),
				eq(invites.studioId, studioId),
				isNull(invites.acceptedAt),
				isNull(invites.revokedAt)
			)
		)
		.returning({ id: invites.id });
	if (revoked.length === 0) {
		throw new RuleError('No such open invitation.', 'inviteId', 'not-found');
	}
}

/** Locks the studio's memberships so two owners can't demote each other at the same time. */
async function ownersAfter(tx: Tx, studioId: string) {
	// A row lock on the studio serialises membership changes for it.
	await tx.execute(sql`select id from studio where id = ${studioId} for update`);
	const [row] = await tx
		.select({ n: count() })
		.from(memberships)
		.where(and(eq(memberships.studioId, studioId), eq(memberships.role, 'owner')));
	return row.n;
}

/** The membership row of this user in this studio. */
const isMember = (studioId: string, userId: string) =>
	and(eq(memberships.studioId, studioId), eq(memberships.userId, userId));

/** The member about to be changed or removed; "No such member." when the user is not one. */
async function memberFor(tx: Tx, studioId: string, userId: string) {
	const [m] = await tx.select().from(memberships).where(isMember(studioId, userId));
	if (!m) throw new RuleError('No such member.', 'userId', 'not-found');
	return m;
}

export async function changeRole(studioId: string, userId: string, role: Role) {
	await db.transaction(async (tx) => {
		const m = await memberFor(tx, studioId, userId);
		if (m.role === 'owner' && role !== 'owner' && (await ownersAfter(tx, studioId)) <= 1) {
			throw new RuleError(
				'The last owner cannot be demoted; make someone else owner first.',
				'role',
				'conflict'
			);
		}
		await tx.update(memberships).set({ role }).where(isMember(studioId, userId));
	});
}

export async function removeMember(studioId: string, userId: string) {
	await db.transaction(async (tx) => {
		const m = await memberFor(tx, studioId, userId);
		if (m.role === 'owner' && (await ownersAfter(tx, studioId)) <= 1) {
			throw new RuleError(
				'The last owner cannot leave or be removed; make someone else owner first.',
				'userId',
				'conflict'
			);
		}
		await tx.delete(memberships).where(isMember(studioId, userId));
		await tx
			.update(users)
			.set({ activeStudioId: null })
			.where(and(eq(users.id, userId), eq(users.activeStudioId, studioId)));
	});
}
