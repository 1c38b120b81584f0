import {
	boolean,
	index,
	integer,
	jsonb,
	pgTable,
	text,
	uniqueIndex,
	type AnyPgColumn
} from 'drizzle-orm/pg-core';
import { archivable, createdAt, looseRef, ownerRef, timestamps } from './columns';
import { studios, users } from './schema-auth';
import { enclosureVersions } from './schema-catalog';

export const builds = pgTable(
	'build',
	{
		id: text('id').primaryKey(),
		studioId: ownerRef('studio_id', () => studios.id),
		name: text('name').notNull(),
		clientName: text('client_name').notNull().default(''),
		notes: text('notes').notNull().default(''),
		/** Pinned: edits to the enclosure make new versions; the build moves on only when asked. */
		enclosureVersionId: text('enclosure_version_id')
			.notNull()
			.references(() => enclosureVersions.id),
		createdBy: looseRef('created_by', () => users.id),
		...archivable()
	},
	(t) => [index('build_studio_idx').on(t.studioId)]
);

/** A saved scene of a build: divider positions, bracket offsets, placements, margin. */
export const variants = pgTable(
	'variant',
	{
		id: text('id').primaryKey(),
		buildId: ownerRef('build_id', () => builds.id),
		name: text('name').notNull(),
		sortOrder: integer('sort_order').notNull().default(0),
		isProposal: boolean('is_proposal').notNull().default(false),
		/** The variant's own settings (not the enclosure or part definitions, which are referenced). */
		settings: jsonb('settings').notNull(),
		/**
		 * The revision number: incremented on every save (autosave too); a save naming an older one gets
		 * 409. Not what the client sees: that is a version (variant_version), made on purpose.
		 */
		version: integer('version').notNull().default(1),
		/** For a variant started from another's version ("start a new variant from it"): that version. */
		basedOnVersionId: looseRef('based_on_version_id', (): AnyPgColumn => variantVersions.id),
		...timestamps()
	},
	(t) => [index('variant_build_idx').on(t.buildId)]
);

/**
 * Every saved state of a variant (each autosave), for undo across reloads and "what changed since";
 * pruned by age (src/lib/builds/revisions.ts).
 */
export const variantRevisions = pgTable(
	'variant_revision',
	{
		id: text('id').primaryKey(),
		variantId: ownerRef('variant_id', () => variants.id),
		/** The variant's revision number after this save. */
		revision: integer('revision').notNull(),
		settings: jsonb('settings').notNull(),
		createdBy: looseRef('created_by', () => users.id),
		createdAt: createdAt()
	},
	(t) => [
		uniqueIndex('variant_revision_key').on(t.variantId, t.revision),
		index('variant_revision_age_idx').on(t.variantId, t.createdAt)
	]
);

/**
 * A named, numbered snapshot the designer makes on purpose ("Save as version 3 — moved the spine
 * one slot"). Only versions reach clients: share links show the latest, approvals name one.
 */
export const variantVersions = pgTable(
	'variant_version',
	{
		id: text('id').primaryKey(),
		variantId: ownerRef('variant_id', () => variants.id),
		/** 1, 2, 3 … per variant; a variant started from another's version N continues at N + 1. */
		number: integer('number').notNull(),
		note: text('note').notNull().default(''),
		settings: jsonb('settings').notNull(),
		/** The revision it was made from. */
		revision: integer('revision').notNull(),
		createdBy: looseRef('created_by', () => users.id),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('variant_version_number_key').on(t.variantId, t.number)]
);

export type BuildRow = typeof builds.$inferSelect;
export type VariantRow = typeof variants.$inferSelect;
export type VariantRevisionRow = typeof variantRevisions.$inferSelect;
export type VariantVersionRow = typeof variantVersions.$inferSelect;
