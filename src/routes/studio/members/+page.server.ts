import { error, redirect } from '@sveltejs/kit';
import {
	RuleError,
	changeRole,
	inviteMember,
	membersOf,
	pendingInvites,
	removeMember,
	revokeInvite
} from '$lib/server/accounts';
import { activeStudio } from '$lib/server/access';
import { formFail, parseForm } from '$lib/server/forms';
import { inviteSchema, memberSchema, roleChangeSchema } from '$lib/schemas/account';
import { z } from 'zod';
import { line } from '$lib/schemas/common';
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

function ruleFailure(e: unknown) {
	if (e instanceof RuleError) {
		return formFail(e.status === 404 ? 404 : 400, {}, { [e.field]: e.message });
	}
	throw e;
}

export const actions: Actions = {
	invite: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await parseForm(request, inviteSchema);
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
		const parsed = await parseForm(request, roleChangeSchema);
		if (!parsed.ok) return parsed.failure;
		try {
			await changeRole(access.studioId, parsed.data.userId, parsed.data.role);
		} catch (e) {
			return ruleFailure(e);
		}
		return { changed: true };
	},
	remove: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await parseForm(request, memberSchema);
		if (!parsed.ok) return parsed.failure;
		try {
			await removeMember(access.studioId, parsed.data.userId);
		} catch (e) {
			return ruleFailure(e);
		}
		return { removed: true };
	},
	revoke: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await parseForm(request, z.object({ inviteId: line('Invitation', 64) }));
		if (!parsed.ok) return parsed.failure;
		try {
			await revokeInvite(access.studioId, parsed.data.inviteId);
		} catch (e) {
			return ruleFailure(e);
		}
		return { revoked: true };
	},
	/** Any member may leave; the last owner may not. */
	leave: async ({ locals, url }) => {
		const access = await activeStudio(locals, 'studio.view', url);
		try {
			await removeMember(access.studioId, access.user.id);
		} catch (e) {
			if (e instanceof RuleError) error(e.status, e.message);
			throw e;
		}
		redirect(303, '/studios');
	}
};
