import { boolean, index, integer, jsonb, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { archivable, createdAt, float4, looseRef, ownerRef, revision } from './columns';
import { studios, users } from './schema-auth';

/** An enclosure's identity; its geometry lives in versions so builds can stay pinned to one. */
export const enclosures = pgTable(
	'enclosure',
	{
		id: text('id').primaryKey(),
		studioId: ownerRef('studio_id', () => studios.id),
		name: text('name').notNull(),
		description: text('description').notNull().default(''),
		/** Litres of inner volume of the current version, for search and sorting. */
		volumeLitres: float4('volume_litres').notNull(),
		currentVersion: integer('current_version').notNull().default(1),
		/** Bumped on every save; a save that names an older revision is a conflict. */
		revision: revision(),
		...archivable()
	},
	(t) => [index('enclosure_studio_idx').on(t.studioId)]
);

export const enclosureVersions = pgTable(
	'enclosure_version',
	{
		id: text('id').primaryKey(),
		enclosureId: ownerRef('enclosure_id', () => enclosures.id),
		version: integer('version').notNull(),
		/** The engine's EnclosureDef, validated with its zod schema before every write. */
		definition: jsonb('definition').notNull(),
		volumeLitres: float4('volume_litres').notNull(),
		/** What changed in this version, in the user's words or generated from the diff. */
		note: text('note').notNull().default(''),
		createdBy: looseRef('created_by', () => users.id),
		createdAt: createdAt()
	},
	(t) => [uniqueIndex('enclosure_version_key').on(t.enclosureId, t.version)]
);

/** A catalogue part. studio_id null marks the read-only standard library. */
export const parts = pgTable(
	'part',
	{
		id: text('id').primaryKey(),
		studioId: text('studio_id').references(() => studios.id, { onDelete: 'cascade' }),
		name: text('name').notNull(),
		category: text('category').notNull(),
		/** The engine's PartDef (bodies, keep-outs, ports, specs). */
		definition: jsonb('definition').notNull(),
		/** Bounding size of the bodies, millimetres, for sorting and search. */
		widthMm: float4('width_mm').notNull(),
		heightMm: float4('height_mm').notNull(),
		depthMm: float4('depth_mm').notNull(),
		priceMinor: integer('price_minor'),
		currency: text('currency').notNull().default('EUR'),
		supplierNote: text('supplier_note').notNull().default(''),
		provenance: text('provenance').notNull(),
		toleranceMm: float4('tolerance_mm').notNull().default(0),
		/** Where a standard part's numbers come from (document name). */
		source: text('source').notNull().default(''),
		isStandard: boolean('is_standard').notNull().default(false),
		/** The part this one was duplicated or copied from (a standard-library entry, another part). */
		copiedFromId: text('copied_from_id'),
		revision: revision(),
		...archivable()
	},
	(t) => [
		index('part_studio_idx').on(t.studioId, t.archivedAt),
		index('part_category_idx').on(t.category),
		index('part_name_idx').on(t.name)
	]
);

export type EnclosureRow = typeof enclosures.$inferSelect;
export type EnclosureVersionRow = typeof enclosureVersions.$inferSelect;
export type PartRow = typeof parts.$inferSelect;
