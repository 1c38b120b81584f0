import { index, integer, jsonb, pgTable, text } from 'drizzle-orm/pg-core';
import { archivable, float4, ownerRef } from './columns';
import { studios } from './schema-auth';

/** A studio's tube kinds for coolant loops (fittings are catalogue parts of category fitting). */
export const tubeKinds = pgTable(
	'tube_kind',
	{
		id: text('id').primaryKey(),
		studioId: ownerRef('studio_id', () => studios.id),
		name: text('name').notNull(),
		/** The engine's TubeKindDef, validated with its zod schema before every write. */
		definition: jsonb('definition').notNull(),
		/** Price of one metre, in the currency's minor unit; null when the studio has none. */
		pricePerMetreMinor: integer('price_per_metre_minor'),
		currency: text('currency').notNull().default('EUR'),
		...archivable()
	},
	(t) => [index('tube_kind_studio_idx').on(t.studioId)]
);

/** Per studio: the share added to the tube the loops need, for cutting and mistakes. */
export const studioLoopSettings = pgTable('studio_loop_setting', {
	studioId: text('studio_id')
		.primaryKey()
		.references(() => studios.id, { onDelete: 'cascade' }),
	/** Percent of the cut length added when buying tube (10 % is common practice). */
	cutAllowancePct: float4('cut_allowance_pct').notNull().default(10)
});

export type TubeKindRow = typeof tubeKinds.$inferSelect;
