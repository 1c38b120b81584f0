import { boolean, index, integer, jsonb, pgTable, text, timestamp } from 'drizzle-orm/pg-core';
import { studios, users } from './schema-auth';
import { enclosureVersions } from './schema-catalog';

const ts = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

export const builds = pgTable(
	'build',
	{
		id: text('id').primaryKey(),
		studioId: text('studio_id')
			.notNull()
			.references(() => studios.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		clientName: text('client_name').notNull().default(''),
		notes: text('notes').notNull().default(''),
		/** Pinned: edits to the enclosure make new versions; the build moves on only when asked. */
		enclosureVersionId: text('enclosure_version_id')
			.notNull()
			.references(() => enclosureVersions.id),
		createdBy: text('created_by').references(() => users.id, { onDelete: 'set null' }),
		archivedAt: ts('archived_at'),
		createdAt: ts('created_at').notNull().defaultNow(),
		updatedAt: ts('updated_at').notNull().defaultNow()
	},
	(t) => [index('build_studio_idx').on(t.studioId)]
);

/** A saved scene of a build: divider positions, bracket offsets, placements, margin. */
export const variants = pgTable(
	'variant',
	{
		id: text('id').primaryKey(),
		buildId: text('build_id')
			.notNull()
			.references(() => builds.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		sortOrder: integer('sort_order').notNull().default(0),
		isProposal: boolean('is_proposal').notNull().default(false),
		/** The variant's own settings (not the enclosure or part definitions, which are referenced). */
		settings: jsonb('settings').notNull(),
		/** Incremented on every save; a save naming an older version gets 409. */
		version: integer('version').notNull().default(1),
		createdAt: ts('created_at').notNull().defaultNow(),
		updatedAt: ts('updated_at').notNull().defaultNow()
	},
	(t) => [index('variant_build_idx').on(t.buildId)]
);

export type BuildRow = typeof builds.$inferSelect;
export type VariantRow = typeof variants.$inferSelect;
