import { error, redirect } from '@sveltejs/kit';
import { activeStudio, roleMay } from '$lib/server/access';
import { partQueryOf } from '$lib/server/catalog/http';
import { archivePart, duplicatePart, listParts, restorePart } from '$lib/server/catalog/parts';
import { CATEGORIES } from '$lib/catalog/part-shape';
import { idField } from '$lib/schemas/common';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'catalog.view', url);
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
		studioName: access.studioName,
		canEdit: roleMay(access.role, 'catalog.edit'),
		query: { ...query, sort: query.sort ?? 'name', dir: query.dir ?? 'asc' },
		params: params.toString(),
		categories: CATEGORIES,
		total: page.total,
		page: page.page,
		pageSize: page.pageSize,
		rows: page.rows.map(({ def: _def, ...row }) => row)
	};
};

async function withId(request: Request) {
	const id = idField('Part').safeParse((await request.formData()).get('id') ?? '');
	if (!id.success) error(400, `Which part? ${id.error.issues[0].message}`);
	return id.data;
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
