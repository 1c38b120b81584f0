/**
 * Row look-ups that several services make the same way, each named for what it answers: the
 * newest matching row, the matching rows oldest first, one row locked for a transaction.
 */
import { asc, desc, type SQL } from 'drizzle-orm';
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core';
import { db, type Runner, type Tx } from './db';

type Row<T extends PgTable> = T['$inferSelect'];

/** The row of `table` that `where` selects with the highest `newestBy`; null when none does. */
export async function newestRow<T extends PgTable>(
	table: T,
	where: SQL,
	newestBy: PgColumn,
	run: Runner = db
): Promise<Row<T> | null> {
	const found = await run
		.select()
		.from(table as PgTable)
		.where(where)
		.orderBy(desc(newestBy))
		.limit(1);
	return (found[0] as Row<T> | undefined) ?? null;
}

/** Every row of `table` that `where` selects, oldest first (ties by id, so the order is stable). */
export async function oldestFirst<T extends PgTable & { createdAt: PgColumn; id: PgColumn }>(
	table: T,
	where: SQL
): Promise<Row<T>[]> {
	const found = await db
		.select()
		.from(table as PgTable)
		.where(where)
		.orderBy(asc(table.createdAt), asc(table.id));
	return found as Row<T>[];
}

/** The row of `table` that `where` selects, locked until `tx` ends; null when none does. */
export async function lockedRow<T extends PgTable>(
	tx: Tx,
	table: T,
	where: SQL | undefined
): Promise<Row<T> | null> {
	const found = await tx
		.select()
		.from(table as PgTable)
		.where(where)
		.for('update');
	return (found[0] as Row<T> | undefined) ?? null;
}
