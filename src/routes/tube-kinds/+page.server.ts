import { error } from '@sveltejs/kit';
import { activeStudio, roleMay } from '$lib/server/access';
import {
	addTubeKind,
	cutAllowanceFor,
	editTubeKind,
	listTubeKinds,
	setCutAllowance,
	setTubeKindRetired
} from '$lib/server/catalog/tube-kinds';
import { cutAllowanceForm, tubeKindForm, tubeKindIdForm } from '$lib/catalog/schemas';
import { forForm } from '$lib/server/errors';
import { readForm } from '$lib/server/forms';
import { studioPage } from '../studio-pages';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = studioPage('catalog.view', async (access) => {
	const [rows, cutAllowancePct] = await Promise.all([
		listTubeKinds(access.studioId),
		cutAllowanceFor(access.studioId)
	]);
	return { canEdit: roleMay(access.role, 'catalog.edit'), rows, cutAllowancePct };
});

/** The row's tube kind id; a bad one shows the error page (the buttons sit in the table). */
async function withId(request: Request) {
	const parsed = await readForm(request, tubeKindIdForm);
	if (!parsed.ok) error(400, `Which tube kind? ${Object.values(parsed.failure.data.errors)[0]}`);
	return parsed.data.id;
}

/** Retire the row's tube kind (no longer offered for new runs) or bring it back. */
function retiredAction(retired: boolean) {
	return async ({ request, locals, url }: { request: Request; locals: App.Locals; url: URL }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const id = await withId(request);
		return forForm(async () => {
			await setTubeKindRetired(access.studioId, id, retired);
			return { done: retired ? 'retired' : 'restored', id };
		});
	};
}

export const actions: Actions = {
	add: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const parsed = await readForm(request, tubeKindForm);
		if (!parsed.ok) return parsed.failure;
		return forForm(
			async () => ({ done: 'added', id: await addTubeKind(access.studioId, parsed.data) }),
			{ values: parsed.values }
		);
	},
	save: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const parsed = await readForm(request, tubeKindForm);
		if (!parsed.ok) return parsed.failure;
		return forForm(
			async () => {
				await editTubeKind(access.studioId, parsed.data);
				return { done: 'saved', id: parsed.data.id };
			},
			{ values: parsed.values }
		);
	},
	retire: retiredAction(true),
	restore: retiredAction(false),
	allowance: async ({ request, locals, url }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const parsed = await readForm(request, cutAllowanceForm);
		if (!parsed.ok) return parsed.failure;
		await setCutAllowance(access.studioId, parsed.data.cutAllowancePct);
		return { done: 'allowance' };
	}
};
