/**
 * The catalogue pages' loads and form actions (new and edit pages of enclosures and parts), shared
 * by those routes: the same guard (catalog.view to see, catalog.edit to change, in the active
 * studio) → service → page data, redirect or refusal, the page naming only its service and where
 * its items live.
 */
import { error, redirect } from '@sveltejs/kit';
import { activeStudio, type StudioAccess } from '$lib/server/access';
import { studioPage } from './studio-pages';

type CatalogEvent = {
	request: Request;
	locals: App.Locals;
	url: URL;
	params: Partial<Record<string, string>>;
};

/** An item's page: the studio's item of the address (404 when it has none), then `more`'s data. */
export function itemPage<I, T extends object>(
	get: (studioId: string, id: string) => Promise<I | null | undefined>,
	more: (item: I, access: StudioAccess, url: URL) => Promise<T>
) {
	return studioPage('catalog.view', async (access, { url, params }: CatalogEvent) => {
		const item = await get(access.studioId, params.id!);
		if (!item) error(404, 'Not found.');
		return more(item, access, url);
	});
}

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
