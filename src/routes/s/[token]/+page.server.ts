import { error } from '@sveltejs/kit';
import { clientPageActions, clientPageData } from '$lib/server/sharing/client-actions';
import { linkActor, lookupToken, requireLinkActor } from '$lib/server/sharing/actors';
import { recordOpened } from '$lib/server/sharing/links';
import type { Actions, PageServerLoad } from './$types';

const dateWords = (d: Date) =>
	d.toLocaleDateString('en-GB', {
		day: 'numeric',
		month: 'long',
		year: 'numeric',
		timeZone: 'UTC'
	});

export const load: PageServerLoad = async (event) => {
	event.setHeaders({ 'cache-control': 'private, no-store', 'x-robots-tag': 'noindex, nofollow' });
	const r = await lookupToken(event, event.params.token);
	if (r.state === 'missing') {
		error(
			404,
			'This link does not work. Check that it was copied whole, or ask the studio for a new one.'
		);
	}
	if (r.state === 'revoked') {
		error(410, `${r.studioName} withdrew this link. Ask them for a new one if you still need it.`);
	}
	if (r.state === 'expired') {
		error(
			410,
			`This link stopped working on ${dateWords(r.expiredAt)}. Ask ${r.studioName} for a new one.`
		);
	}
	const actor = linkActor(r.share, event.params.token);
	// Reloads after a comment or an approval are not new openings.
	if (!event.isDataRequest) await recordOpened(r.share.link.id);
	return {
		...(await clientPageData(actor, `/s/${event.params.token}/photos`, event.url)),
		inApp: false
	};
};

export const actions: Actions = clientPageActions((event) =>
	requireLinkActor(event, event.params.token!)
);
