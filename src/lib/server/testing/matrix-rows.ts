/**
 * What the access-matrix row files share: the usual answers per visitor, who edits, counting the
 * rows a request wrote, and a row maker for rows about one item a setup makes.
 */
import { and, count, eq, isNotNull, type SQL } from 'drizzle-orm';
import type { PgColumn, PgTable } from 'drizzle-orm/pg-core';
import { db } from '../db';
import {
	SIGN_IN,
	rowPath,
	type Expected,
	type MatrixFixture,
	type MatrixRow,
	type Visitor
} from './access-matrix';

/** The same answer for all five visitors. */
export const everyone = (e: Expected): MatrixRow['expect'] => ({
	owner: e,
	designer: e,
	client: e,
	outsider: e,
	anonymous: e
});

/**
 * A studio-only page or endpoint: the studio's owner and designer get `ok`, its client 403, the
 * owner of another studio `outsider` (404: this studio's items are not revealed; a list answers
 * with their own studio's), anonymous visitors the sign-in page (pages) or 401 (API).
 */
export const studioOnly = (
	ok: Expected,
	outsider: Expected = 404,
	anonymous: Expected = SIGN_IN
): MatrixRow['expect'] => ({ owner: ok, designer: ok, client: 403, outsider, anonymous });

/** The visitors whose edits reach the studio's catalogue and builds. */
export const EDITORS: Visitor[] = ['owner', 'designer'];

/** How many rows of `table` match `where`. */
export async function countRows(table: PgTable, where: SQL | undefined): Promise<number> {
	const [row] = await db.select({ n: count() }).from(table).where(where);
	return row.n;
}

/** Whether the row of `table` whose `idColumn` is `id` has its time `at` set (archived, revoked). */
export async function isStamped(
	table: PgTable,
	idColumn: PgColumn,
	id: string,
	at: PgColumn
): Promise<boolean> {
	return (await countRows(table, and(eq(idColumn, id), isNotNull(at)))) === 1;
}

/**
 * Rows about the item a setup makes: each gets that setup and, unless it names its own path, its
 * route id with the item's ids filled in (`ids` maps a route parameter to a fixture variable) and
 * its form action after it.
 */
export const about =
	(setup: (f: MatrixFixture) => Promise<void>, ids: Record<string, string>) =>
	(row: Omit<MatrixRow, 'setup'>): MatrixRow => ({
		setup,
		path: (f) =>
			Object.entries(ids).reduce(
				(path, [param, key]) => path.replace(`[${param}]`, f.vars[key]),
				rowPath(row as MatrixRow, f)
			),
		...row
	});
