import { clientPageActions, clientPageData } from '$lib/server/sharing/client-actions';
import { memberActor } from '$lib/server/sharing/actors';
import type { Actions, PageServerLoad } from './$types';

/** The client page inside the app: for a client member the variant was shared with, or a designer previewing it. */
export const load: PageServerLoad = async (event) => {
	const actor = await memberActor(event, event.params.variantId);
	return {
		...(await clientPageData(actor, `/s/v/${event.params.variantId}/photos`, event.url)),
		inApp: true,
		studioSide: actor.author.side === 'studio',
		buildId: actor.author.side === 'studio' ? actor.build.id : null
	};
};

export const actions: Actions = clientPageActions((event) =>
	memberActor(event, event.params.variantId!)
);
