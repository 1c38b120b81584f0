/** The build sheet: the checklist ticks a builder sets at the bench, per build variant. */
import { index, integer, pgTable, primaryKey, text } from 'drizzle-orm/pg-core';
import { looseRef, ownerRef, ts } from './columns';
import { users } from './schema-auth';
import { builds, variants } from './schema-builds';

/**
 * One ticked checklist item. Keys come from the sheet (`part:<placementId>`, `caution:leak-test`);
 * a tick whose key the sheet no longer has is kept but not shown, so undoing an edit brings it back.
 */
export const checklistTicks = pgTable(
	'checklist_tick',
	{
		variantId: ownerRef('variant_id', () => variants.id),
		itemKey: text('item_key').notNull(),
		buildId: ownerRef('build_id', () => builds.id),
		/** The variant's version when ticked: the sheet notes ticks made before a later change. */
		variantVersion: integer('variant_version').notNull(),
		tickedBy: looseRef('ticked_by', () => users.id),
		tickedAt: ts('ticked_at').notNull().defaultNow()
	},
	(t) => [
		primaryKey({ columns: [t.variantId, t.itemKey] }),
		index('checklist_tick_build_idx').on(t.buildId)
	]
);

export type ChecklistTickRow = typeof checklistTicks.$inferSelect;
