/**
 * Whether a share link still works (not revoked, not past its expiry): the one owner of that rule,
 * as a function of a loaded row and as a SQL condition for queries. Expiry is exclusive: a link
 * expiring at 12:00 no longer works at 12:00.
 */
import { and, gt, isNull, or, sql, type SQL } from 'drizzle-orm';
import { shareLinks } from '../db/schema';

export type LinkState = 'active' | 'expired' | 'revoked';

export function linkState(
	link: { revokedAt: Date | null; expiresAt: Date | null },
	now = new Date()
): LinkState {
	if (link.revokedAt) return 'revoked';
	if (link.expiresAt && link.expiresAt.getTime() <= now.getTime()) return 'expired';
	return 'active';
}

/** The same rule in SQL, against the database's clock. */
export function linkIsActive(): SQL {
	return and(
		isNull(shareLinks.revokedAt),
		or(isNull(shareLinks.expiresAt), gt(shareLinks.expiresAt, sql`now()`))
	)!;
}
