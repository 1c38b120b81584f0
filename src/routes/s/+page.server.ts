import { and, desc, eq, gt, isNull, or, sql } from 'drizzle-orm';
import { requireUser } from '$lib/server/access';
import { db } from '$lib/server/db';
import { builds, memberships, shareLinks, studios, variants } from '$lib/server/db/schema';
import type { PageServerLoad } from './$types';

/** Everything shared with the signed-in person as a client member of a studio. */
export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	const rows = await db
		.selectDistinctOn([shareLinks.variantId], {
			variantId: shareLinks.variantId,
			variantName: variants.name,
			buildName: builds.name,
			studioName: studios.name,
			sharedAt: shareLinks.createdAt
		})
		.from(shareLinks)
		.innerJoin(memberships, and(eq(memberships.studioId, shareLinks.studioId), eq(memberships.userId, user.id), eq(memberships.role, 'client')))
		.innerJoin(variants, eq(variants.id, shareLinks.variantId))
		.innerJoin(builds, eq(builds.id, shareLinks.buildId))
		.innerJoin(studios, eq(studios.id, shareLinks.studioId))
		.where(and(eq(shareLinks.recipientEmail, user.email.toLowerCase()), isNull(shareLinks.revokedAt), isNull(builds.archivedAt), or(isNull(shareLinks.expiresAt), gt(shareLinks.expiresAt, sql`now()`))))
		.orderBy(shareLinks.variantId, desc(shareLinks.createdAt));
	rows.sort((a, b) => b.sharedAt.getTime() - a.sharedAt.getTime());
	return { shared: rows };
};
