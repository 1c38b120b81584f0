/** The build sheet: the checklist ticks a builder sets at the bench, per build variant. */
import { index, integer, pgTable, primaryKey, text, timestamp } from 'drizzle-orm/pg-core';
import { users } from './schema-auth';
import { builds, variants } from './schema-builds';

const ts = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

/**
 * One ticked checklist item. Keys come from the sheet (`part:<placementId>`, `caution:leak-test`);
 * a tick whose key the sheet no longer has is kept but not shown, so undoing an edit brings it back.
 */
export const checklistTicks = pgTable(
	'checklist_tick',
	{
		variantId: text('variant_id')
			.notNull()
			.references(() => variants.id, { onDelete: 'cascade' }),
		itemKey: text('item_key').notNull(),
		buildId: text('build_id')
			.notNull()
			.references(() => builds.id, { onDelete: 'cascade' }),
		/** The variant's version when ticked: the sheet notes ticks made before a later change. */
		variantVersion: integer('variant_version').notNull(),
		tickedBy: text('ticked_by').references(() => users.id, { onDelete: 'set null' }),
		tickedAt: ts('ticked_at').notNull().defaultNow()
	},
	(t) => [
		primaryKey({ columns: [t.variantId, t.itemKey] }),
		index('checklist_tick_build_idx').on(t.buildId)
	]
);

export type ChecklistTickRow = typeof checklistTicks.$inferSelect;
