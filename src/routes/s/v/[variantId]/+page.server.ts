import { clientPageActions } from '$lib/server/sharing/client-actions';
import { memberActor } from '$lib/server/sharing/actors';
import { clientView } from '$lib/server/sharing/view';
import type { Actions, PageServerLoad } from './$types';
import { forPage } from '$lib/server/errors';

/** The client page inside the app: for a client member the variant was shared with, or a designer previewing it. */
export const load: PageServerLoad = async (event) => {
	const actor = await memberActor(event, event.params.variantId);
	const { view } = await forPage(() => clientView(actor));
	return {
		view,
		may: actor.may,
		defaultName: actor.author.defaultName,
		fixedName: actor.author.fixedName,
		photoBase: `/s/v/${event.params.variantId}/photos`,
		inApp: true,
		studioSide: actor.author.side === 'studio',
		buildId: actor.author.side === 'studio' ? actor.build.id : null,
		deposit: event.url.searchParams.get('deposit')
	};
};

export const actions: Actions = clientPageActions((event) =>
	memberActor(event, event.params.variantId!)
);
