import { listEnclosures } from '$lib/server/catalog/enclosures';
import { studioPage } from '../studio-pages';
import type { PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('catalog.view', async (access, { url }) => {
	const archived = url.searchParams.get('archived') === '1';
	const q = (url.searchParams.get('q') ?? '').slice(0, 200);
	return {
		archived,
		q,
		enclosures: await listEnclosures(access.studioId, { q, archived })
	};
});
