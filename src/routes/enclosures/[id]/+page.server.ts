import { error, redirect } from '@sveltejs/kit';
import { enclosureDefSchema } from '$lib/geometry';
import { roomTable } from '$lib/geometry/room';
import { activeStudio } from '$lib/server/access';
import {
	archiveEnclosure,
	duplicateEnclosure,
	getEnclosure,
	restoreEnclosure
} from '$lib/server/catalog/enclosures';
import { formFor, saveEnclosureForm } from '$lib/server/catalog/enclosure-form';
import { archivedAction, itemPage, saveAction } from '../../catalog-actions';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = itemPage(getEnclosure, async (enclosure, _access, url) => {
	const { current: _current, ...summary } = enclosure;
	return {
		enclosure: summary,
		saved: url.searchParams.get('saved'),
		form: await formFor(enclosure),
		// The current version's clearance table: the engine's, a few milliseconds.
		room: roomTable(enclosureDefSchema.parse(enclosure.current.def))
	};
});

export const actions: Actions = {
	save: saveAction(saveEnclosureForm),
	archive: archivedAction(archiveEnclosure, '/enclosures'),
	restore: archivedAction(restoreEnclosure, '/enclosures'),
	duplicate: async ({ locals, url, params }) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const copy = await duplicateEnclosure(access.studioId, access.user.id, params.id);
		if (!copy.ok) error(copy.status === 404 ? 404 : 400, 'Could not copy this enclosure.');
		redirect(303, `/enclosures/${copy.value.id}`);
	}
};
