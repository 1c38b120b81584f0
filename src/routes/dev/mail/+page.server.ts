import { error } from '@sveltejs/kit';
import { activeStudio } from '$lib/server/access';
import { config } from '$lib/server/config';
import type { PageServerLoad } from './$types';

type Caught = { id: number; to: string[]; subject: string; text: string; date: string };

/** Development only: the mails the local catcher holds, for a signed-in owner. */
export const load: PageServerLoad = async ({ locals, url, fetch }) => {
	if (!config.devTools) error(404, 'Not found.');
	await activeStudio(locals, 'studio.mail', url);
	try {
		const res = await fetch(`${config.mailCatcherUrl}/messages`);
		return { mails: ((await res.json()) as Caught[]).slice(0, 50), reachable: true };
	} catch {
		return { mails: [] as Caught[], reachable: false };
	}
};
