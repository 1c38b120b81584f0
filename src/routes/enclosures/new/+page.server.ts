import { superValidate } from 'sveltekit-superforms';
import { activeStudio } from '$lib/server/access';
import { enclosureAdapter, saveEnclosureForm } from '$lib/server/catalog/enclosure-form';
import { enclosureToForm } from '$lib/catalog/schemas';
import { PANELS, type EnclosureDef } from '$lib/geometry';
import { saveAction } from '../../catalog-actions';
import type { Actions, PageServerLoad } from './$types';

/** A plain starting box: every panel 2 mm and solid, nothing inside yet. */
function starter(): EnclosureDef {
	const panel = { thicknessMm: 2, kind: 'solid' as const, offsetMm: 0 };
	return {
		name: '',
		outerMm: [200, 320, 240],
		walls: Object.fromEntries(PANELS.map((p) => [p, { ...panel }])) as EnclosureDef['walls'],
		dividers: [],
		brackets: [],
		mounts: []
	};
}

export const load: PageServerLoad = async ({ locals, url }) => {
	const access = await activeStudio(locals, 'catalog.edit', url);
	const form = await superValidate(
		enclosureToForm(starter(), { revision: 0, description: '' }),
		enclosureAdapter,
		{ errors: false }
	);
	return { studioName: access.studioName, form };
};

export const actions: Actions = {
	save: saveAction(saveEnclosureForm)
};
