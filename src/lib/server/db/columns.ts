import { customType, integer, text, timestamp, type AnyPgColumn } from 'drizzle-orm/pg-core';

/**
 * PostgreSQL `real` (float4) for numbers derived from a definition (sizes, volumes, tolerance) that
 * are kept as columns for listing and sorting. float4 holds magnitudes from about 1.2e-38 up; a
 * smaller one (a fuzzed tolerance of 1e-300 mm) made PostgreSQL refuse the insert ("value out of
 * range: underflow"), a 500. Anything below 1e-30 is stored as 0; the definition keeps the value.
 */
export const float4 = customType<{ data: number; driverData: number | string }>({
	dataType: () => 'real',
	toDriver: (value) => (Math.abs(value) < 1e-30 ? 0 : value),
	fromDriver: (value) => Number(value)
});

/** A point in time, stored as timestamptz and read as a Date. */
export const ts = (name: string) => timestamp(name, { withTimezone: true, mode: 'date' });

/** When the row was written; the database fills it in. */
export const createdAt = () => ts('created_at').notNull().defaultNow();

/** When the row was written and last changed (spread into a table's columns). */
export const timestamps = () => ({
	createdAt: createdAt(),
	updatedAt: ts('updated_at').notNull().defaultNow()
});

/** A catalogue or build row that can be archived, with its times (spread into the columns). */
export const archivable = () => ({ archivedAt: ts('archived_at'), ...timestamps() });

/** The save counter a stale write is detected with (409): bumped on every save. */
export const revision = () => integer('revision').notNull().default(1);

/** A required link to the row this one belongs to: deleting the owner deletes this row. */
export const ownerRef = (name: string, target: () => AnyPgColumn) =>
	text(name).notNull().references(target, { onDelete: 'cascade' });

/** An optional link (who made it, what it came from) that is cleared when its target goes. */
export const looseRef = (name: string, target: () => AnyPgColumn) =>
	text(name).references(target, { onDelete: 'set null' });
