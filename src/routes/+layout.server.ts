import { studiosOf } from '$lib/server/accounts';
import { roleMay } from '$lib/server/access';
import type { LayoutServerLoad } from './$types';

export const load: LayoutServerLoad = async ({ locals }) => {
	if (!locals.user) return { user: null, studios: [], active: null };
	const studios = await studiosOf(locals.user.id);
	const active = studios.find((s) => s.id === locals.user?.activeStudioId) ?? studios[0] ?? null;
	return {
		user: { name: locals.user.name, email: locals.user.email },
		studios: studios.map((s) => ({ id: s.id, name: s.name, role: s.role })),
		active: active
			? {
					id: active.id,
					name: active.name,
					role: active.role,
					canCatalog: roleMay(active.role, 'catalog.view'),
					canMembers: roleMay(active.role, 'studio.members')
				}
			: null
	};
};
