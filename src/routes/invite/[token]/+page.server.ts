import { fail, redirect } from '@sveltejs/kit';
import { acceptInvite, findValidInvite } from '$lib/server/accounts';
import { requireUser } from '$lib/server/access';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	await enforce(event, 'invite-token', limits.shareToken);
	const invite = await findValidInvite(event.params.token);
	if (!invite) return { invite: null, signedIn: !!event.locals.user };
	return {
		invite: { studioName: invite.studioName, role: invite.role, email: invite.email },
		signedIn: !!event.locals.user,
		signedInAs: event.locals.user?.email ?? null
	};
};

export const actions: Actions = {
	default: async (event) => {
		await enforce(event, 'invite-token', limits.shareToken);
		const user = requireUser(event.locals, event.url);
		const invite = await findValidInvite(event.params.token);
		if (!invite) return fail(400, { error: 'This invitation has expired or was already used.' });
		// An invitation belongs to the address it was sent to; a forwarded link can't be used by someone else.
		if (invite.email !== user.email.toLowerCase()) {
			return fail(403, {
				error: `This invitation was sent to ${invite.email}. Sign in with that address to accept it.`
			});
		}
		const studioId = await acceptInvite(event.params.token, user.id);
		if (!studioId) return fail(400, { error: 'This invitation has expired or was already used.' });
		redirect(303, '/builds');
	}
};
