import { redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { activeStudio } from '$lib/server/access';
import { SceneRejected, createBuild } from '$lib/server/builds';
import { listEnclosures } from '$lib/server/catalog/enclosures';
import { formFail, parseForm } from '$lib/server/forms';
import { line, paragraph } from '$lib/schemas/common';
import type { Actions, PageServerLoad } from './$types';

const schema = z.object({
	name: line('Build name', 120),
	clientName: line('Client', 120, 0).default(''),
	notes: paragraph('Notes', 4000).default(''),
	enclosureId: line('Enclosure', 64)
});

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'build.edit', url);
	const list = (await listEnclosures(access.studioId)).map(({ id, name, volumeLitres }) => ({
		id,
		name,
		volumeLitres
	}));
	return { enclosures: list, preselect: url.searchParams.get('enclosure') ?? '' };
};

export const actions: Actions = {
	default: async ({ locals, request, url }) => {
		const access = await activeStudio(locals, 'build.edit', url);
		const parsed = await parseForm(request, schema);
		if (!parsed.ok) return parsed.failure;
		let id: string;
		try {
			id = await createBuild({ ...parsed.data, studioId: access.studioId, userId: access.user.id });
		} catch (e) {
			if (e instanceof SceneRejected) {
				return formFail(400, parsed.raw, { enclosureId: e.issues[0]?.message ?? e.message });
			}
			throw e;
		}
		redirect(303, `/builds/${id}`);
	}
};
