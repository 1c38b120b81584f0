import { superValidate } from 'sveltekit-superforms';
import { enclosureAdapter, saveEnclosureForm } from '$lib/server/catalog/enclosure-form';
import { enclosureToForm } from '$lib/catalog/schemas';
import { PANELS, type EnclosureDef } from '$lib/geometry';
import { saveAction } from '../../catalog-actions';
import { studioPage } from '../../studio-pages';
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

export const load: PageServerLoad = studioPage('catalog.edit', async () => ({
	form: await superValidate(
		enclosureToForm(starter(), { revision: 0, description: '' }),
		enclosureAdapter,
		{ errors: false }
	)
}));

export const actions: Actions = {
	save: saveAction(saveEnclosureForm)
};
