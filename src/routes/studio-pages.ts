/**
 * The pages of the studio the user works in (its lists, members, tube kinds), shared by those
 * routes: the guard (this user's role there must allow the action, else sign-in or 403) and the
 * page data that starts with the studio's name, as the page's header shows it.
 */
import { activeStudio, type Action, type StudioAccess } from '$lib/server/access';

/** A studio page's load: `studioName` and what `more` reads for the page. */
export function studioPage<T extends object>(
	action: Action,
	more: (access: StudioAccess) => Promise<T>
) {
	return async ({ locals, url }: { locals: App.Locals; url: URL }) => {
		const access = await activeStudio(locals, action, url);
		return { studioName: access.studioName, ...(await more(access)) };
	};
}
