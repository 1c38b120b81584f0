/**
 * The one place that answers "may this user do this to this thing?". Every load, action and
 * endpoint asks here; layouts are never trusted to have checked.
 */
import { error, redirect } from '@sveltejs/kit';
import { and, eq } from 'drizzle-orm';
import type { SessionUser } from './auth';
import { linkIsActive, linkState } from './sharing/link-state';
import { db } from './db';
import {
	builds,
	memberships,
	shareLinks,
	studios,
	variants,
	type Role,
	type ShareLinkRow
} from './db/schema';

export type Action =
	| 'studio.view'
	| 'studio.members'
	| 'catalog.view'
	| 'catalog.edit'
	| 'build.list'
	| 'build.view'
	| 'build.edit'
	| 'build.share'
	| 'build.comment'
	| 'build.approve'
	| 'build.quote'
	| 'build.photos'
	| 'build.pay';

/** Which roles may do what inside their own studio. Clients see only what is shared with them. */
export const permissions: Record<Action, readonly Role[]> = {
	'studio.view': ['owner', 'designer', 'client'],
	'studio.members': ['owner'],
	'catalog.view': ['owner', 'designer'],
	'catalog.edit': ['owner', 'designer'],
	'build.list': ['owner', 'designer', 'client'],
	'build.view': ['owner', 'designer', 'client'],
	'build.edit': ['owner', 'designer'],
	'build.share': ['owner', 'designer'],
	'build.comment': ['owner', 'designer', 'client'],
	'build.approve': ['client', 'owner'],
	'build.quote': ['owner', 'designer'],
	'build.photos': ['owner', 'designer'],
	'build.pay': ['client']
};

/** What a client does: allowed only for variants shared with them (by link, or by e-mail to a client member). */
const CLIENT_SCOPED: readonly Action[] = [
	'build.list',
	'build.view',
	'build.comment',
	'build.approve',
	'build.pay'
];

/** What holding a share link allows, on that link's variant only. */
export const LINK_HOLDER_ACTIONS: readonly Action[] = [
	'build.view',
	'build.comment',
	'build.approve',
	'build.pay'
];

export function roleMay(role: Role | null | undefined, action: Action): boolean {
	return !!role && permissions[action].includes(role);
}

export type Locals = { user: SessionUser | null };

/** Signed in, or off to the sign-in page (pages) / 401 (API). */
export function requireUser(locals: Locals, url?: URL): SessionUser {
	if (locals.user) return locals.user;
	if (url && !url.pathname.startsWith('/api/')) {
		redirect(303, `/signin?next=${encodeURIComponent(url.pathname + url.search)}`);
	}
	error(401, 'Sign in first.');
}

export async function roleIn(userId: string, studioId: string): Promise<Role | null> {
	const [row] = await db
		.select({ role: memberships.role })
		.from(memberships)
		.where(and(eq(memberships.userId, userId), eq(memberships.studioId, studioId)));
	return row?.role ?? null;
}

export type StudioAccess = { user: SessionUser; studioId: string; studioName: string; role: Role };

/**
 * The user's role in the given studio, checked against the action. A studio the user is not a
 * member of answers 404, so its existence is not revealed.
 */
export async function requireStudio(
	locals: Locals,
	studioId: string | null | undefined,
	action: Action,
	url?: URL
): Promise<StudioAccess> {
	const user = requireUser(locals, url);
	if (!studioId) {
		if (url && !url.pathname.startsWith('/api/')) redirect(303, '/studios/new');
		error(404, 'No studio selected.');
	}
	const [row] = await db
		.select({ role: memberships.role, name: studios.name })
		.from(memberships)
		.innerJoin(studios, eq(studios.id, memberships.studioId))
		.where(and(eq(memberships.userId, user.id), eq(memberships.studioId, studioId)));
	if (!row) error(404, 'Not found.');
	if (!roleMay(row.role, action)) error(403, 'Your role in this studio does not allow this.');
	return { user, studioId, studioName: row.name, role: row.role };
}

/** The studio the user is working in: their chosen one, else their first. */
export async function activeStudio(locals: Locals, action: Action, url?: URL) {
	const user = requireUser(locals, url);
	let studioId = user.activeStudioId;
	if (studioId && !(await roleIn(user.id, studioId))) studioId = null;
	if (!studioId) {
		const [first] = await db
			.select({ studioId: memberships.studioId })
			.from(memberships)
			.where(eq(memberships.userId, user.id))
			.orderBy(memberships.createdAt)
			.limit(1);
		studioId = first?.studioId ?? null;
	}
	return requireStudio(locals, studioId, action, url);
}

/**
 * May this user do this to this build? Loads the build's studio and checks the role there.
 * A build of a studio the user is not in answers 404.
 */
export async function requireBuild(locals: Locals, buildId: string, action: Action, url?: URL) {
	const user = requireUser(locals, url);
	// One round trip: the build, the studio's name and this user's role there.
	const [row] = await db
		.select({ build: builds, studioName: studios.name, role: memberships.role })
		.from(builds)
		.innerJoin(studios, eq(studios.id, builds.studioId))
		.leftJoin(
			memberships,
			and(eq(memberships.studioId, builds.studioId), eq(memberships.userId, user.id))
		)
		.where(eq(builds.id, buildId));
	if (!row?.role) error(404, 'Not found.');
	if (!roleMay(row.role, action)) error(403, 'Your role in this studio does not allow this.');
	const build = row.build;
	const access: StudioAccess = {
		user,
		studioId: build.studioId,
		studioName: row.studioName,
		role: row.role
	};
	// A client of the studio sees a build only through the variants shared with them.
	if (access.role === 'client' && (await variantsSharedWithUser(user, build.id)).length === 0) {
		error(404, 'Not found.');
	}
	return { build, access };
}

/**
 * Variant ids of this build shared with this signed-in client: an active share link sent to their
 * e-mail address. Revoking the link ends it for them too.
 */
export async function variantsSharedWithUser(
	user: SessionUser,
	buildId: string
): Promise<string[]> {
	const rows = await db
		.selectDistinct({ variantId: shareLinks.variantId })
		.from(shareLinks)
		.where(
			and(
				eq(shareLinks.buildId, buildId),
				eq(shareLinks.recipientEmail, user.email.toLowerCase()),
				linkIsActive()
			)
		);
	return rows.map((r) => r.variantId);
}

/**
 * May this user do this to this variant? Owners and designers by role; a client only on a variant
 * shared with them, and only the client-side actions. Anything else answers 404.
 */
export async function requireVariant(
	locals: Locals,
	buildId: string,
	variantId: string,
	action: Action,
	url?: URL
) {
	const user = requireUser(locals, url);
	const [row] = await db
		.select({ build: builds, variant: variants })
		.from(variants)
		.innerJoin(builds, eq(builds.id, variants.buildId))
		.where(and(eq(variants.id, variantId), eq(variants.buildId, buildId)));
	if (!row) error(404, 'Not found.');
	const access = await requireStudio({ user }, row.build.studioId, action, url);
	if (access.role === 'client') {
		if (!CLIENT_SCOPED.includes(action)) {
			error(403, 'Your role in this studio does not allow this.');
		}
		if (!(await variantsSharedWithUser(user, buildId)).includes(variantId)) {
			error(404, 'Not found.');
		}
	}
	return { build: row.build, variant: row.variant, access };
}

/** May the holder of this (already resolved, active) link do this? Only on the link's own variant. */
export function requireLinkHolder(
	link: Pick<ShareLinkRow, 'revokedAt' | 'expiresAt'>,
	action: Action
) {
	if (linkState(link) !== 'active') error(410, 'This link no longer works.');
	if (!LINK_HOLDER_ACTIONS.includes(action)) error(403, 'A share link does not allow this.');
}
