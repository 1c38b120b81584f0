/**
 * The parts catalogue: a studio's own parts plus the read-only standard library (studio_id null).
 * Every write is validated with the engine's PartDef schema and runs in a transaction; a save that
 * names an older revision is a conflict and changes nothing.
 */
import { and, asc, desc, eq, inArray, isNotNull, isNull, or, sql, type SQL } from 'drizzle-orm';
import type { FieldIssue, PartCategory, PartDef } from '$lib/geometry';
import { bodySizeMm } from '$lib/catalog/part-shape';
import { checkPart, type PartExtras } from '$lib/catalog/schemas';
import { db, type Runner, type Tx } from '../db';
import { builds, parts, variants, type PartRow } from '../db/schema';
import { newId } from '../tokens';
import { archiving } from './archive';

export type PartRecord = {
	id: string;
	studioId: string | null;
	name: string;
	category: PartCategory;
	def: PartDef;
	widthMm: number;
	heightMm: number;
	depthMm: number;
	priceMinor: number | null;
	currency: string;
	supplierNote: string;
	provenance: PartDef['provenance'];
	toleranceMm: number;
	source: string;
	isStandard: boolean;
	copiedFromId: string | null;
	revision: number;
	archived: boolean;
	updatedAt: Date;
};

export function toPartRecord(row: PartRow): PartRecord {
	return {
		id: row.id,
		studioId: row.studioId,
		name: row.name,
		category: row.category as PartCategory,
		def: row.definition as PartDef,
		widthMm: row.widthMm,
		heightMm: row.heightMm,
		depthMm: row.depthMm,
		priceMinor: row.priceMinor,
		currency: row.currency,
		supplierNote: row.supplierNote,
		provenance: row.provenance as PartDef['provenance'],
		toleranceMm: row.toleranceMm,
		source: row.source,
		isStandard: row.isStandard,
		copiedFromId: row.copiedFromId,
		revision: row.revision,
		archived: row.archivedAt !== null,
		updatedAt: row.updatedAt
	};
}

export type WriteResult<T> =
	| { ok: true; value: T }
	| { ok: false; status: 400; issues: FieldIssue[] }
	| { ok: false; status: 404 }
	| { ok: false; status: 409; current: T; message: string };

/** Columns derived from a checked part: searchable, sortable copies of what the definition says. */
export function partColumns(def: PartDef, extras: PartExtras) {
	const [widthMm, heightMm, depthMm] = bodySizeMm(def);
	return {
		name: def.name,
		category: def.category,
		definition: def,
		widthMm,
		heightMm,
		depthMm,
		priceMinor: extras.priceMinor,
		currency: extras.currency,
		supplierNote: extras.supplierNote,
		provenance: def.provenance,
		toleranceMm: def.toleranceMm,
		source: def.source ?? ''
	};
}

/** Rows a studio may read: its own, and the standard library. */
const visibleTo = (studioId: string) => or(eq(parts.studioId, studioId), isNull(parts.studioId));

export async function getPart(
	studioId: string,
	id: string,
	run: Runner = db
): Promise<PartRecord | null> {
	const [row] = await run
		.select()
		.from(parts)
		.where(and(eq(parts.id, id), visibleTo(studioId)));
	return row ? toPartRecord(row) : null;
}

/** Inserts one checked part; the caller holds the transaction. */
export async function insertPart(
	run: Runner,
	studioId: string,
	raw: unknown,
	copiedFromId: string | null = null
): Promise<WriteResult<PartRecord>> {
	const id = newId();
	const checked = checkPart(raw, id);
	if (!checked.ok) {
		return { ok: false, status: 400, issues: checked.issues };
	}
	const [row] = await run
		.insert(parts)
		.values({ id, studioId, copiedFromId, ...partColumns(checked.def, checked.extras) })
		.returning();
	return { ok: true, value: toPartRecord(row) };
}

export async function createPart(studioId: string, raw: unknown): Promise<WriteResult<PartRecord>> {
	return db.transaction((tx) => insertPart(tx, studioId, raw));
}

/**
 * Saves a studio part if `revision` is still the stored one. The standard library is never
 * written here: it is not the studio's.
 */
export async function updatePart(
	studioId: string,
	id: string,
	revision: number,
	raw: unknown,
	run?: Tx
): Promise<WriteResult<PartRecord>> {
	const work = async (tx: Tx): Promise<WriteResult<PartRecord>> => {
		const checked = checkPart(raw, id);
		if (!checked.ok) {
			return { ok: false, status: 400, issues: checked.issues };
		}
		const [row] = await tx
			.update(parts)
			.set({
				...partColumns(checked.def, checked.extras),
				revision: sql`${parts.revision} + 1`,
				updatedAt: new Date()
			})
			.where(and(eq(parts.id, id), eq(parts.studioId, studioId), eq(parts.revision, revision)))
			.returning();
		if (row) {
			return { ok: true, value: toPartRecord(row) };
		}
		const [current] = await tx
			.select()
			.from(parts)
			.where(and(eq(parts.id, id), eq(parts.studioId, studioId)));
		if (!current) {
			return { ok: false, status: 404 };
		}
		return {
			ok: false,
			status: 409,
			current: toPartRecord(current),
			message: `Someone saved this part after you opened it (revision ${current.revision}, yours ${revision}). Nothing was overwritten.`
		};
	};
	return run ? work(run) : db.transaction(work);
}

/** Archived parts leave search and the table's default view; builds that place them keep them. */
export const { archive: archivePart, restore: restorePart } = archiving(parts, toPartRecord);

/** How many variants of the studio's builds place this part (anywhere in their saved scene). */
export async function partUseCount(
	studioId: string,
	id: string,
	run: Runner = db
): Promise<number> {
	const [row] = await run
		.select({ n: sql<number>`count(*)::int` })
		.from(variants)
		.innerJoin(builds, eq(builds.id, variants.buildId))
		.where(
			and(
				eq(builds.studioId, studioId),
				sql`jsonb_path_exists(${variants.settings}, '$.** ? (@.partId == $id)', jsonb_build_object('id', ${id}::text))`
			)
		);
	return row?.n ?? 0;
}

/** Deletes a part no build places; one that a build uses can only be archived. */
export async function deletePart(
	studioId: string,
	id: string
): Promise<{ ok: true } | { ok: false; status: 404 | 409; message: string }> {
	return db.transaction(async (tx) => {
		const [row] = await tx
			.select({ id: parts.id })
			.from(parts)
			.where(and(eq(parts.id, id), eq(parts.studioId, studioId)))
			.for('update');
		if (!row) {
			return { ok: false, status: 404, message: 'Not found.' };
		}
		const uses = await partUseCount(studioId, id, tx);
		if (uses > 0) {
			return {
				ok: false,
				status: 409,
				message: `${uses} variant${uses === 1 ? '' : 's'} place${uses === 1 ? 's' : ''} this part; archive it instead.`
			};
		}
		await tx.delete(parts).where(eq(parts.id, id));
		return { ok: true };
	});
}

/**
 * A new studio part with the same geometry: a copy of one of the studio's parts, or of a
 * standard-library entry (which becomes the studio's to customise, provenance datasheet).
 */
export async function duplicatePart(
	studioId: string,
	id: string
): Promise<WriteResult<PartRecord>> {
	return db.transaction(async (tx) => {
		const source = await getPart(studioId, id, tx);
		if (!source) {
			return { ok: false, status: 404 };
		}
		const def = source.def;
		const input = {
			...def,
			name: source.isStandard ? def.name : `${def.name} (copy)`,
			provenance: def.provenance === 'standard' ? 'datasheet' : def.provenance,
			priceMinor: source.priceMinor,
			currency: source.currency,
			supplierNote: source.supplierNote
		};
		return insertPart(tx, studioId, input, source.id);
	});
}

export const PART_SORTS = [
	'name',
	'category',
	'widthMm',
	'heightMm',
	'depthMm',
	'priceMinor',
	'updatedAt'
] as const;
export type PartSort = (typeof PART_SORTS)[number];

export type PartQuery = {
	q?: string;
	category?: PartCategory | '';
	/** 'all' = the studio's parts and the standard library. */
	scope?: 'all' | 'studio' | 'standard';
	archived?: boolean;
	sort?: PartSort;
	dir?: 'asc' | 'desc';
	page?: number;
	pageSize?: number;
};

function escapeLike(text: string): string {
	return text.replace(/[\\%_]/g, (c) => `\\${c}`);
}

/** Every word must appear in the name, category, supplier note or source. */
function searchCondition(q: string): SQL | undefined {
	const words = q.trim().split(/\s+/).filter(Boolean).slice(0, 8);
	if (!words.length) {
		return undefined;
	}
	const haystack = sql`(${parts.name} || ' ' || ${parts.category} || ' ' || ${parts.supplierNote} || ' ' || ${parts.source})`;
	return and(...words.map((w) => sql`${haystack} ilike ${'%' + escapeLike(w) + '%'}`));
}

function queryConditions(studioId: string, query: PartQuery): SQL | undefined {
	const scope = query.scope ?? 'all';
	return and(
		scope === 'studio'
			? eq(parts.studioId, studioId)
			: scope === 'standard'
				? isNull(parts.studioId)
				: visibleTo(studioId),
		query.archived ? isNotNull(parts.archivedAt) : isNull(parts.archivedAt),
		query.category ? eq(parts.category, query.category) : undefined,
		query.q ? searchCondition(query.q) : undefined
	);
}

/** One page of the catalogue table, sorted and paged in the database. */
export async function listParts(
	studioId: string,
	query: PartQuery
): Promise<{ rows: PartRecord[]; total: number; page: number; pageSize: number }> {
	const pageSize = Math.min(Math.max(query.pageSize ?? 25, 1), 200);
	const where = queryConditions(studioId, query);
	const [{ total }] = await db
		.select({ total: sql<number>`count(*)::int` })
		.from(parts)
		.where(where);
	const pages = Math.max(1, Math.ceil(total / pageSize));
	const page = Math.min(Math.max(query.page ?? 1, 1), pages);
	const column = parts[query.sort ?? 'name'];
	const order = query.dir === 'desc' ? desc(column) : asc(column);
	const rows = await db
		.select()
		.from(parts)
		.where(where)
		.orderBy(order, asc(parts.name), asc(parts.id))
		.limit(pageSize)
		.offset((page - 1) * pageSize);
	return { rows: rows.map(toPartRecord), total, page, pageSize };
}

/** Every part a filter selects (for export), in the table's order, at most `limit`. */
export async function allParts(
	studioId: string,
	query: PartQuery,
	limit = 10_000
): Promise<PartRecord[]> {
	const column = parts[query.sort ?? 'name'];
	const rows = await db
		.select()
		.from(parts)
		.where(queryConditions(studioId, query))
		.orderBy(query.dir === 'desc' ? desc(column) : asc(column), asc(parts.name), asc(parts.id))
		.limit(limit);
	return rows.map(toPartRecord);
}

/**
 * For the build editor's add-part search: the studio's parts and the standard library, archived
 * ones left out, best name matches first.
 */
export async function listPartsForStudio(
	studioId: string,
	opts: { q?: string; category?: PartCategory; limit?: number; maxLimit?: number } = {}
): Promise<PartRecord[]> {
	// 200 for a search list; "what fits here" streams a whole catalogue and asks for more.
	const limit = Math.min(Math.max(opts.limit ?? 50, 1), opts.maxLimit ?? 200);
	const rows = await db
		.select()
		.from(parts)
		.where(
			and(
				visibleTo(studioId),
				isNull(parts.archivedAt),
				opts.category ? eq(parts.category, opts.category) : undefined,
				opts.q ? searchCondition(opts.q) : undefined
			)
		)
		.orderBy(
			opts.q ? sql`position(lower(${opts.q.trim()}) in lower(${parts.name})) = 0` : asc(parts.name),
			sql`${parts.studioId} is null`,
			asc(parts.name),
			asc(parts.id)
		)
		.limit(limit);
	return rows.map(toPartRecord);
}

/** Parts by id as a build needs them: archived and standard ones included, other studios' never. */
export async function getPartsByIds(
	studioId: string,
	ids: readonly string[]
): Promise<PartRecord[]> {
	const unique = [...new Set(ids)].slice(0, 5_000);
	if (!unique.length) {
		return [];
	}
	const rows = await db
		.select()
		.from(parts)
		.where(and(inArray(parts.id, unique), visibleTo(studioId)))
		.orderBy(asc(parts.id));
	return rows.map(toPartRecord);
}
