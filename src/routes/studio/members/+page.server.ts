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
import type { z } from 'zod';
import { studioPage } from '../../studio-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('studio.members', async (access) => ({
	me: access.user.id,
	members: await membersOf(access.studioId),
	invites: await pendingInvites(access.studioId)
}));

/** A refused rule (the last owner) is 400 on its field; no such member or invitation stays 404. */
const ruleForm = { statusFor: { conflict: 400 } } as const;

/**
 * An owner's change to one member or invitation: the guard, the posted form, then the rule (a
 * refusal as `ruleForm` says) and `done` once it is applied.
 */
function ownerAction<S extends Parameters<typeof readForm>[1], const D extends object>(
	schema: S,
	apply: (studioId: string, data: z.output<S>) => Promise<unknown>,
	done: D
) {
	return async ({ locals, request, url }: { locals: App.Locals; request: Request; url: URL }) => {
		const access = await activeStudio(locals, 'studio.members', url);
		const parsed = await readForm(request, schema);
		if (!parsed.ok) return parsed.failure;
		return forForm(async () => {
			await apply(access.studioId, parsed.data);
			return done;
		}, ruleForm);
	};
}

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
	role: ownerAction(roleChangeSchema, (studioId, d) => changeRole(studioId, d.userId, d.role), {
		changed: true
	}),
	remove: ownerAction(memberSchema, (studioId, d) => removeMember(studioId, d.userId), {
		removed: true
	}),
	revoke: ownerAction(revokeInviteForm, (studioId, d) => revokeInvite(studioId, d.inviteId), {
		revoked: true
	}),
	/** Any member may leave; the last owner may not. */
	leave: async ({ locals, url }) => {
		const access = await activeStudio(locals, 'studio.view', url);
		// The last owner may not leave: the error page (409).
		await forPage(() => removeMember(access.studioId, access.user.id));
		redirect(303, '/studios');
	}
};
