/**
 * The catalogue pages' form actions (new and edit pages of enclosures and parts), shared by those
 * routes: the same guard (catalog.edit in the active studio) → service → redirect or refusal,
 * the page naming only its service and where its items live.
 */
import { error, redirect } from '@sveltejs/kit';
import { activeStudio, type StudioAccess } from '$lib/server/access';

type CatalogEvent = {
	request: Request;
	locals: App.Locals;
	url: URL;
	params: Partial<Record<string, string>>;
};

/** Save the posted editor (a new item when the route has no id): its page on success, else the refusal. */
export function saveAction<R extends object>(
	save: (request: Request, access: StudioAccess, id?: string) => Promise<{ saved: string } | R>
) {
	return async ({ request, locals, url, params }: CatalogEvent) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		const outcome = await save(request, access, params.id);
		if ('saved' in outcome) redirect(303, outcome.saved);
		return outcome;
	};
}

/** Archive or restore the route's item (the service answers null when it is not the studio's: 404), then show it again. */
export function archivedAction(
	setArchived: (studioId: string, id: string) => Promise<unknown>,
	list: string
) {
	return async ({ locals, url, params }: CatalogEvent) => {
		const access = await activeStudio(locals, 'catalog.edit', url);
		if (!(await setArchived(access.studioId, params.id!))) error(404, 'Not found.');
		redirect(303, `${list}/${params.id}`);
	};
}
