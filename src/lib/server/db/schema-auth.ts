import { sql } from 'drizzle-orm';
import {
	bigserial,
	check,
	index,
	integer,
	jsonb,
	pgEnum,
	pgTable,
	primaryKey,
	text,
	uniqueIndex
} from 'drizzle-orm/pg-core';
import { createdAt, looseRef, ownerRef, ts } from './columns';

export const roleEnum = pgEnum('studio_role', ['owner', 'designer', 'client']);

export const users = pgTable(
	'user',
	{
		id: text('id').primaryKey(),
		/** Stored lower-case; compared lower-case. */
		email: text('email').notNull(),
		name: text('name').notNull(),
		passwordHash: text('password_hash').notNull(),
		activeStudioId: text('active_studio_id'),
		/** When the owner of the address proved it (a mailed link, an accepted invitation); null until then. */
		emailVerifiedAt: ts('email_verified_at'),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('user_email_key').on(t.email)]
);

export const sessions = pgTable(
	'session',
	{
		/** SHA-256 (hex) of the token in the cookie; the token itself is never stored. */
		id: text('id').primaryKey(),
		userId: ownerRef('user_id', () => users.id),
		expiresAt: ts('expires_at').notNull()
	},
	(t) => [index('session_user_idx').on(t.userId)]
);

export const studios = pgTable('studio', {
	id: text('id').primaryKey(),
	name: text('name').notNull(),
	createdAt: createdAt()
});

export const memberships = pgTable(
	'membership',
	{
		studioId: ownerRef('studio_id', () => studios.id),
		userId: ownerRef('user_id', () => users.id),
		role: roleEnum('role').notNull(),
		createdAt: createdAt()
	},
	(t) => [
		primaryKey({ columns: [t.studioId, t.userId] }),
		index('membership_user_idx').on(t.userId)
	]
);

export const invites = pgTable(
	'invite',
	{
		id: text('id').primaryKey(),
		studioId: ownerRef('studio_id', () => studios.id),
		email: text('email').notNull(),
		role: roleEnum('role').notNull(),
		/** SHA-256 of the token in the link; the token itself is never stored. */
		tokenHash: text('token_hash').notNull(),
		invitedBy: looseRef('invited_by', () => users.id),
		expiresAt: ts('expires_at').notNull(),
		acceptedAt: ts('accepted_at'),
		revokedAt: ts('revoked_at'),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('invite_token_key').on(t.tokenHash),
		index('invite_studio_idx').on(t.studioId)
	]
);

/**
 * A mailed one-use link for one user: keyed by the SHA-256 of its token (the token itself is never
 * stored), good until expires_at, spent once used_at is set.
 */
const oneUseToken = () => ({
	tokenHash: text('token_hash').primaryKey(),
	userId: ownerRef('user_id', () => users.id),
	expiresAt: ts('expires_at').notNull(),
	usedAt: ts('used_at'),
	createdAt: createdAt()
});

export const passwordResets = pgTable(
	'password_reset',
	{
		...oneUseToken()
	},
	(t) => [index('password_reset_user_idx').on(t.userId)]
);

/**
 * A mailed link that confirms a new account's address. It carries what that sign-up chose (name,
 * password hash, where to go next), so confirming applies the credentials of the sign-up whose
 * mail was opened, not of whoever signed up with the address first.
 */
export const emailVerifications = pgTable(
	'email_verification',
	{
		...oneUseToken(),
		name: text('name').notNull(),
		passwordHash: text('password_hash').notNull(),
		next: text('next')
	},
	(t) => [index('email_verification_user_idx').on(t.userId)]
);

/**
 * Account mail waiting to be sent, drained in the background after the response. The request only
 * adds a row, whatever the address, so neither the answer nor its timing says whether the address
 * has an account; the drainer looks the address up and decides what (if anything) to send.
 */
export const mailOutbox = pgTable(
	'mail_outbox',
	{
		id: bigserial('id', { mode: 'number' }).primaryKey(),
		kind: text('kind', { enum: ['password-reset', 'sign-up'] }).notNull(),
		recipient: text('recipient').notNull(),
		/** What the job needs (for a sign-up: name, password hash, next); emptied once done. */
		payload: jsonb('payload').notNull().default({}),
		attempts: integer('attempts').notNull().default(0),
		lastError: text('last_error'),
		notBefore: ts('not_before').notNull().defaultNow(),
		doneAt: ts('done_at'),
		createdAt: createdAt()
	},
	(t) => [
		index('mail_outbox_pending_idx')
			.on(t.notBefore)
			.where(sql`${t.doneAt} is null`),
		check('mail_outbox_kind', sql`${t.kind} in ('password-reset', 'sign-up')`)
	]
);

/**
 * Fixed-window counters. Kept in PostgreSQL so limits hold across app restarts and processes.
 * UNLOGGED (migration 0012, hand-written): a counted request does not wait for a WAL flush; a
 * database crash empties the table and every window starts again.
 */
export const rateLimits = pgTable(
	'rate_limit',
	{
		key: text('key').primaryKey(),
		count: integer('count').notNull(),
		windowStartedAt: ts('window_started_at').notNull()
	},
	(t) => [check('rate_limit_count_positive', sql`${t.count} > 0`)]
);

export type User = typeof users.$inferSelect;
export type Studio = typeof studios.$inferSelect;
export type Membership = typeof memberships.$inferSelect;
export type Role = (typeof roleEnum.enumValues)[number];
