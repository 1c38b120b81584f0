/**
 * The pages of the studio the user works in (its lists, new items, members, tube kinds), shared
 * by those routes: the guard (this user's role there must allow the action, else sign-in or 403)
 * and the page data that starts with the studio's name, as the page's header shows it.
 */
import { activeStudio, type Action, type StudioAccess } from '$lib/server/access';

type StudioEvent = { locals: App.Locals; url: URL };

/** A studio page's load: `studioName` and what `more` reads for the page (from the event too). */
export function studioPage<T extends object, E extends StudioEvent = StudioEvent>(
	action: Action,
	more: (access: StudioAccess, event: E) => Promise<T>
) {
	return async (event: E) => {
		const access = await activeStudio(event.locals, action, event.url);
		return { studioName: access.studioName, ...(await more(access, event)) };
	};
}
