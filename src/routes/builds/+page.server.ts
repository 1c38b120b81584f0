import { roleMay } from '$lib/server/access';
import { buildsOfStudio } from '$lib/server/builds';
import { SHARED_STATUS_WORDS, sharedWithMember } from '$lib/server/sharing/shared';
import { studioPage } from '../studio-pages';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('build.list', async (access) => {
	// Clients see builds through what is shared with them, never the studio's list.
	const shared =
		access.role === 'client'
			? (await sharedWithMember(access.user)).map((s) => ({
					...s,
					statusWords: SHARED_STATUS_WORDS[s.status]
				}))
			: [];
	return {
		shared,
		role: access.role,
		canCreate: roleMay(access.role, 'build.edit'),
		builds: access.role === 'client' ? [] : await buildsOfStudio(access.studioId)
	};
});
