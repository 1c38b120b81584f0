/**
 * Archiving for the catalogue's own rows (parts, enclosures): an archived row leaves the lists but
 * is never deleted, so builds that use it keep it. Archiving or restoring is a new revision, so an
 * editor still open on the old one meets a conflict instead of undoing it.
 */
import { and, eq, sql } from 'drizzle-orm';
import { db } from '../db';
import { enclosures, parts } from '../db/schema';

type Archivable = typeof parts | typeof enclosures;

/**
 * `archive` and `restore` for one table, each answering the row as `toRecord` makes it, or null
 * when the studio has no such row (another studio's, the standard library's, an unknown id).
 */
export function archiving<T extends Archivable, R>(
	table: T,
	toRecord: (row: T['$inferSelect']) => R
) {
	const set = (archived: boolean) => (studioId: string, id: string) =>
		db.transaction(async (tx): Promise<R | null> => {
			const t = table as Archivable;
			const [row] = await tx
				.update(t)
				.set({
					archivedAt: archived ? new Date() : null,
					revision: sql`${t.revision} + 1`,
					updatedAt: new Date()
				})
				.where(and(eq(t.id, id), eq(t.studioId, studioId)))
				.returning();
			return row ? toRecord(row as T['$inferSelect']) : null;
		});
	return { archive: set(true), restore: set(false) };
}
