import { requireBuild } from '$lib/server/access';
import { loadComparison } from '$lib/server/compare';
import type { PageServerLoad } from './$types';
import { forPage } from '$lib/server/errors';

export const load: PageServerLoad = async ({ locals, params, url }) => {
	const { build } = await requireBuild(locals, params.id, 'build.edit', url);
	const c = await forPage(() => loadComparison(build, url.searchParams.get('variants')));
	return {
		build: { id: build.id, name: build.name },
		allVariants: c.all.map((v) => ({ id: v.id, name: v.name })),
		items: c.items.map((i) => ({ id: i.id, name: i.name, scene: i.scene, report: i.report })),
		rows: c.rows
	};
};
