import { requireUser } from '$lib/server/access';
import { SHARED_STATUS_WORDS, sharedWithMember } from '$lib/server/sharing/shared';
import type { PageServerLoad } from './$types';

/** Everything shared with the signed-in person as a client member of a studio. */
export const load: PageServerLoad = async ({ locals, url }) => {
	const user = requireUser(locals, url);
	const shared = await sharedWithMember(user);
	return { shared: shared.map((s) => ({ ...s, statusWords: SHARED_STATUS_WORDS[s.status] })) };
};
