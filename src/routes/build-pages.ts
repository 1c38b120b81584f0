/**
 * The pages under /builds/[id], shared by those routes: the guard on the build of the address
 * (this user's role must allow the action there, else sign-in, 404 or 403) and the page data that
 * starts with the build as the page's header names it and links back to it.
 */
import { requireBuild, type Action } from '$lib/server/access';

type BuildEvent = { locals: App.Locals; params: { id: string }; url: URL };
type Guarded = Awaited<ReturnType<typeof requireBuild>>;

/** The build of the address and this user's access to it, when their role allows `action`. */
export function guardBuild(event: BuildEvent, action: Action) {
	return requireBuild(event.locals, event.params.id, action, event.url);
}

/** A build page's data: `build` (its id and name) and what `more` reads for the page. */
export async function buildPage<T extends object>(
	event: BuildEvent,
	action: Action,
	more: (build: Guarded['build'], access: Guarded['access']) => Promise<T>
) {
	const { build, access } = await guardBuild(event, action);
	return { build: { id: build.id, name: build.name }, ...(await more(build, access)) };
}

/** Each row with only the named fields: what the page shows, not all a service's row holds. */
export function fieldsOf<T, K extends keyof T>(rows: T[], keys: readonly K[]): Pick<T, K>[] {
	return rows.map((row) => Object.fromEntries(keys.map((k) => [k, row[k]])) as Pick<T, K>);
}
