/**
 * The JSON endpoints of one catalogue item (/api/enclosures/[id], /api/parts/[id]), shared by
 * those routes: the guard (catalog.view to read, catalog.edit to change, in the studio the address
 * names) → the service → `{[key]: item}`, 404 when the studio has no such item.
 */
import { json, type RequestEvent } from '@sveltejs/kit';
import type { StudioAccess } from '$lib/server/access';
import { jsonObject, readJson } from '$lib/server/api';
import { catalogAccess, found } from '$lib/server/catalog/http';
import { ServiceError, jsonRoute } from '$lib/server/errors';

type ItemEvent = RequestEvent<{ id: string }>;
type ByStudio = (studioId: string, id: string) => Promise<unknown>;
type Body = Record<string, unknown>;

export function catalogItem(
	key: string,
	service: { get: ByStudio; archive: ByStudio; restore: ByStudio }
) {
	return {
		/** The item as stored now. */
		GET: jsonRoute(async (event: ItemEvent) => {
			const access = await catalogAccess(event, 'catalog.view');
			return json({ [key]: found(await service.get(access.studioId, event.params.id)) });
		}),
		/** A change (PUT, PATCH): `answer` gets the editor's access, the posted JSON object and the id. */
		change: (answer: (access: StudioAccess, body: Body, id: string) => Promise<Response>) =>
			jsonRoute(async (event: ItemEvent) => {
				const access = await catalogAccess(event, 'catalog.edit');
				const body = await readJson(event.request, jsonObject);
				return answer(access, body, event.params.id);
			}),
		/** `{archived: boolean}` archives or restores the item; any other body is refused with `refusal`. */
		archived: async (access: StudioAccess, body: Body, id: string, refusal: string) => {
			if (typeof body.archived !== 'boolean') {
				throw new ServiceError('invalid', refusal, { field: 'archived' });
			}
			const change = body.archived ? service.archive : service.restore;
			return json({ [key]: found(await change(access.studioId, id)) });
		}
	};
}
