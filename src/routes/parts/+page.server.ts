import { error, redirect } from '@sveltejs/kit';
import { activeStudio, roleMay } from '$lib/server/access';
import { partQueryOf } from '$lib/server/catalog/http';
import { archivePart, duplicatePart, listParts, restorePart } from '$lib/server/catalog/parts';
import { CATEGORIES } from '$lib/catalog/part-shape';
import { partIdForm } from '$lib/catalog/schemas';
import { readForm } from '$lib/server/forms';
import { studioPage } from '../studio-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('catalog.view', async (access, { url }) => {
	const query = partQueryOf(url.searchParams);
	const page = await listParts(access.studioId, query);
	const params = new URLSearchParams();
	for (const [k, v] of Object.entries({
		q: query.q,
		category: query.category,
		scope: query.scope === 'all' ? '' : query.scope,
		archived: query.archived ? '1' : '',
		sort: query.sort,
		dir: query.dir,
		size: query.pageSize === 25 ? '' : query.pageSize
	})) {
		if (v) params.set(k, String(v));
	}
	return {
		canEdit: roleMay(access.role, 'catalog.edit'),
		query: { ...query, sort: query.sort ?? 'name', dir: query.dir ?? 'asc' },
		params: params.toString(),
		categories: CATEGORIES,
		total: page.total,
		page: page.page,
		pageSize: page.pageSize,
		rows: page.rows.map(({ def: _def, ...row }) => row)
	};
});

/** The row's part id; a bad one shows the error page (the buttons are links in a list). */
async function withId(request: Request) {
	const parsed = await readForm(request, partIdForm);
	if (!parsed.ok) error(400, `Which part? ${Object.values(parsed.failure.data.errors)[0]}`);
	return parsed.data.id;
}

export const actions: Actions = {
	duplicate: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const copy = await duplicatePart(access.studioId, await withId(request));
		if (!copy.ok) error(copy.status === 404 ? 404 : 400, 'Could not copy this part.');
		redirect(303, `/parts/${copy.value.id}?copied=1`);
	},
	archive: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		if (!(await archivePart(access.studioId, await withId(request)))) error(404, 'Not found.');
		return { done: 'archived' };
	},
	restore: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		if (!(await restorePart(access.studioId, await withId(request)))) error(404, 'Not found.');
		return { done: 'restored' };
	}
};
