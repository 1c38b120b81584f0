import { error, fail } from '@sveltejs/kit';
import { EXPIRY_CHOICES, revokeLinkForm, shareForm, studioCommentForm } from '$lib/schemas/sharing';
import { readForm } from '$lib/server/forms';
import { enforce } from '$lib/server/limits';
import { limits } from '$lib/server/rate-limit';
import { revokeShareLink } from '$lib/server/sharing/links';
import { postStudioComment, shareOverview, shareVariant } from '$lib/server/sharing/studio-side';
import { guardBuild } from '../../../build-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const { build, access } = await guardBuild(event, 'build.share');
	return {
		build: { id: build.id, name: build.name, clientName: build.clientName },
		role: access.role,
		...(await shareOverview(build, event.url.searchParams.get('variant')))
	};
};

export const actions: Actions = {
	create: async (event) => {
		const { build, access } = await guardBuild(event, 'build.share');
		const parsed = await readForm(event.request, shareForm);
		if (!parsed.ok) return parsed.failure;
		const input = parsed.data;
		const outcome = await shareVariant(build, access.user, access.studioName, {
			variantId: input.variantId,
			recipientEmail: input.recipientEmail,
			recipientName: input.recipientName,
			expiresInDays: EXPIRY_CHOICES[input.expires],
			send: input.send === 'on',
			message: input.message
		});
		if (!outcome.ok) {
			return fail(400, { values: parsed.values, errors: { [outcome.field]: outcome.message } });
		}
		return { created: outcome.created };
	},

	revoke: async (event) => {
		const { build } = await guardBuild(event, 'build.share');
		const parsed = await readForm(event.request, revokeLinkForm);
		if (!parsed.ok) return parsed.failure;
		const ok = await revokeShareLink(build.id, parsed.data.linkId);
		if (!ok) {
			return fail(404, {
				values: {},
				errors: { linkId: 'That link is already revoked or does not exist.' }
			});
		}
		return { revoked: true };
	},

	comment: async (event) => {
		// Written as the studio: owners and designers only (clients write on their own page).
		const { build, access } = await guardBuild(event, 'build.share');
		await enforce(event, 'comment', limits.comment, access.user.id);
		const parsed = await readForm(event.request, studioCommentForm);
		if (!parsed.ok) return parsed.failure;
		const outcome = await postStudioComment(build, access.user, access.studioName, parsed.data);
		if (outcome === 'no-variant') error(404, 'Not found.');
		if (outcome === 'no-part') {
			return fail(400, {
				values: parsed.values,
				errors: { part: 'That part is not in this variant.' }
			});
		}
		return { commented: true };
	}
};
