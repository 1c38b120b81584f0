import { redirect } from '@sveltejs/kit';
import {
	changeRole,
	inviteMember,
	membersOf,
	pendingInvites,
	removeMember,
	revokeInvite
} from '$lib/server/accounts';
import { activeStudio } from '$lib/server/access';
import { forForm, forPage } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import {
	inviteSchema,
	memberSchema,
	revokeInviteForm,
	roleChangeSchema
} from '$lib/schemas/account';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'studio.members', url);
	return {
		studioName: access.studioName,
		me: access.user.id,
		members: await membersOf(access.studioId),
		invites: await pendingInvites(access.studioId)
	};
};

/** A refused rule (the last owner) is 400 on its field; no such member or invitation stays 404. */
const ruleForm = { statusFor: { conflict: 400 } } as const;

export const actions: Actions = {
	invite: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await readForm(request, inviteSchema);
		if (!parsed.ok) return parsed.failure;
		await inviteMember({
			...access,
			studioId: access.studioId,
			studioName: access.studioName,
			email: parsed.data.email,
			role: parsed.data.role,
			invitedBy: access.user
		});
		return { invited: parsed.data.email };
	},
	role: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await readForm(request, roleChangeSchema);
		if (!parsed.ok) return parsed.failure;
		return forForm(async () => {
			await changeRole(access.studioId, parsed.data.userId, parsed.data.role);
			return { changed: true };
		}, ruleForm);
	},
	remove: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await readForm(request, memberSchema);
		if (!parsed.ok) return parsed.failure;
		return forForm(async () => {
			await removeMember(access.studioId, parsed.data.userId);
			return { removed: true };
		}, ruleForm);
	},
	revoke: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await readForm(request, revokeInviteForm);
		if (!parsed.ok) return parsed.failure;
		return forForm(async () => {
			await revokeInvite(access.studioId, parsed.data.inviteId);
			return { revoked: true };
		}, ruleForm);
	},
	/** Any member may leave; the last owner may not. */
	leave: async ({ locals, url }) => {
		const access = await activeStudio(locals, 'studio.view', url);
		// The last owner may not leave: the error page (409).
		await forPage(() => removeMember(access.studioId, access.user.id));
		redirect(303, '/studios');
	}
};
