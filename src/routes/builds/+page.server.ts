import { and, desc, eq, isNull } from 'drizzle-orm';
import { activeStudio, roleMay } from '$lib/server/access';
import { db } from '$lib/server/db';
import { builds, enclosures, enclosureVersions } from '$lib/server/db/schema';
import { SHARED_STATUS_WORDS, sharedWithMember } from '$lib/server/sharing/shared';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'build.list', url);
	const rows = await db
		.select({
			id: builds.id,
			name: builds.name,
			clientName: builds.clientName,
			updatedAt: builds.updatedAt,
			enclosureName: enclosures.name,
			enclosureVersion: enclosureVersions.version
		})
		.from(builds)
		.innerJoin(enclosureVersions, eq(enclosureVersions.id, builds.enclosureVersionId))
		.innerJoin(enclosures, eq(enclosures.id, enclosureVersions.enclosureId))
		.where(and(eq(builds.studioId, access.studioId), isNull(builds.archivedAt)))
		.orderBy(desc(builds.updatedAt));
	// Clients see builds through what is shared with them, never the studio's list.
	const shared =
		access.role === 'client'
			? (await sharedWithMember(access.user)).map((s) => ({
					...s,
					statusWords: SHARED_STATUS_WORDS[s.status]
				}))
			: [];
	return {
		studioName: access.studioName,
		shared,
		role: access.role,
		canCreate: roleMay(access.role, 'build.edit'),
		builds: access.role === 'client' ? [] : rows
	};
};
