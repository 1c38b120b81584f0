import { activeStudio } from '$lib/server/access';
import { listEnclosures } from '$lib/server/catalog/enclosures';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'catalog.view', url);
	const archived = url.searchParams.get('archived') === '1';
	const q = (url.searchParams.get('q') ?? '').slice(0, 200);
	return {
		studioName: access.studioName,
		archived,
		q,
		enclosures: await listEnclosures(access.studioId, { q, archived })
	};
};
