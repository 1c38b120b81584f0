/**
 * What the catalogue's endpoints share beyond the JSON helper (../api.ts): the access check (the
 * active studio, or `?studio=` for API users in several) with the API rate limit, a write's outcome
 * as a value or a ServiceError, the revision a save must carry, and the table's query string.
 */
import type { RequestEvent } from '@sveltejs/kit';
import type { PartCategory } from '$lib/geometry';
import { partCategorySchema } from '$lib/geometry';
import { INT4_MAX } from '$lib/schemas/common';
import { activeStudio, requireStudio, type Action } from '../access';
import { apiLimit, badRequest } from '../api';
import { ServiceError } from '../errors';
import { PART_SORTS, type PartQuery, type PartSort, type WriteResult } from './parts';

export async function catalogAccess(
	event: RequestEvent,
	action: Extract<Action, 'catalog.view' | 'catalog.edit'>
) {
	const chosen = event.url.searchParams.get('studio');
	const access = chosen
		? await requireStudio(event.locals, chosen, action, event.url)
		: await activeStudio(event.locals, action, event.url);
	await apiLimit(event, access.user.id);
	return access;
}

/**
 * A write's value, or its refusal thrown as a ServiceError for `jsonRoute` to answer: 400 with the
 * issues, 404, or 409 with what is stored now under `conflict`.
 */
export function valueOf<T>(result: WriteResult<T>): T {
	if (result.ok) return result.value;
	if (result.status === 400) {
		throw new ServiceError('invalid', 'Some fields need attention.', { issues: result.issues });
	}
	if (result.status === 404) throw notFound();
	throw new ServiceError('conflict', result.message, { detail: { conflict: result.current } });
}

/** What the catalogue answers for an item that is not the studio's (or does not exist). */
export const notFound = () => new ServiceError('not-found', 'Not found.');

/** The item looked up, or 404 when the studio has no such item. */
export function found<T>(item: T | null | undefined): T {
	if (item === null || item === undefined) throw notFound();
	return item;
}

export function revisionOf(body: Record<string, unknown>): number {
	const r = body.revision;
	if (typeof r !== 'number' || !Number.isInteger(r) || r < 0 || r > INT4_MAX) {
		badRequest(
			'Send the revision you loaded (a whole number) so a conflicting save can be detected.',
			[{ path: 'revision', message: 'Must be a whole number from 0.' }]
		);
	}
	return r;
}

const MAX_PAGE = 1_000_000;

/** The catalogue table's state from a query string, each value checked. */
export function partQueryOf(params: URLSearchParams): PartQuery {
	const category = partCategorySchema.safeParse(params.get('category'));
	const sort = params.get('sort');
	const scope = params.get('scope');
	return {
		q: (params.get('q') ?? '').slice(0, 200),
		category: category.success ? (category.data as PartCategory) : '',
		scope: scope === 'studio' || scope === 'standard' ? scope : 'all',
		archived: params.get('archived') === '1',
		sort: (PART_SORTS as readonly string[]).includes(sort ?? '') ? (sort as PartSort) : 'name',
		dir: params.get('dir') === 'desc' ? 'desc' : 'asc',
		// Capped so the row offset stays far inside PostgreSQL's bigint; past the last page is empty anyway.
		page: Math.min(MAX_PAGE, Math.max(1, Math.floor(Number(params.get('page')) || 1))),
		pageSize: [10, 25, 50, 100].includes(Number(params.get('size')))
			? Number(params.get('size'))
			: 25
	};
}
