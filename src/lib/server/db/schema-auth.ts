import { sql } from 'drizzle-orm';
import {
	check,
	index,
	integer,
	pgEnum,
	pgTable,
	primaryKey,
	text,
	timestamp,
	uniqueIndex
} from 'drizzle-orm/pg-core';

const ts = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

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
		createdAt: ts('created_at').notNull().defaultNow()
	},
	(t) => [uniqueIndex('user_email_key').on(t.email)]
);

export const sessions = pgTable(
	'session',
	{
		id: text('id').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		expiresAt: ts('expires_at').notNull()
	},
	(t) => [index('session_user_idx').on(t.userId)]
);

export const studios = pgTable('studio', {
	id: text('id').primaryKey(),
	name: text('name').notNull(),
	createdAt: ts('created_at').notNull().defaultNow()
});

export const memberships = pgTable(
	'membership',
	{
		studioId: text('studio_id')
			.notNull()
			.references(() => studios.id, { onDelete: 'cascade' }),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		role: roleEnum('role').notNull(),
		createdAt: ts('created_at').notNull().defaultNow()
	},
	(t) => [primaryKey({ columns: [t.studioId, t.userId] }), index('membership_user_idx').on(t.userId)]
);

export const invites = pgTable(
	'invite',
	{
		id: text('id').primaryKey(),
		studioId: text('studio_id')
			.notNull()
			.references(() => studios.id, { onDelete: 'cascade' }),
		email: text('email').notNull(),
		role: roleEnum('role').notNull(),
		/** SHA-256 of the token in the link; the token itself is never stored. */
		tokenHash: text('token_hash').notNull(),
		invitedBy: text('invited_by').references(() => users.id, { onDelete: 'set null' }),
		expiresAt: ts('expires_at').notNull(),
		acceptedAt: ts('accepted_at'),
		revokedAt: ts('revoked_at'),
		createdAt: ts('created_at').notNull().defaultNow()
	},
	(t) => [uniqueIndex('invite_token_key').on(t.tokenHash), index('invite_studio_idx').on(t.studioId)]
);

export const passwordResets = pgTable(
	'password_reset',
	{
		tokenHash: text('token_hash').primaryKey(),
		userId: text('user_id')
			.notNull()
			.references(() => users.id, { onDelete: 'cascade' }),
		expiresAt: ts('expires_at').notNull(),
		usedAt: ts('used_at'),
		createdAt: ts('created_at').notNull().defaultNow()
	},
	(t) => [index('password_reset_user_idx').on(t.userId)]
);

/** Fixed-window counters. Kept in PostgreSQL so limits hold across restarts and processes. */
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
