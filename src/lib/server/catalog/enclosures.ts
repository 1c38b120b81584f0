/**
 * Enclosures and their versions. A build pins one version; saving an enclosure whose current
 * version a build uses makes version n+1, so the build keeps what it was made with. A version no
 * build uses is updated in place. A save naming an older revision is a conflict and writes nothing.
 */
import { and, asc, desc, eq, ilike, isNotNull, isNull, sql } from 'drizzle-orm';
import { innerVolumeLitres, type EnclosureDef, type FieldIssue } from '$lib/geometry';
import { checkEnclosure } from '$lib/catalog/schemas';
import { enclosureChanges } from '$lib/catalog/enclosure-diff';
import { db, type Runner } from '../db';
import {
	builds,
	enclosures,
	enclosureVersions,
	type EnclosureRow,
	type EnclosureVersionRow
} from '../db/schema';
import { lockedRow } from '../rows';
import { newId } from '../tokens';
import { archiving } from './archive';
import type { WriteResult } from './parts';

export type EnclosureSummary = {
	id: string;
	name: string;
	description: string;
	volumeLitres: number;
	currentVersion: number;
	revision: number;
	archived: boolean;
	updatedAt: Date;
};

export type EnclosureVersion = {
	id: string;
	enclosureId: string;
	version: number;
	def: EnclosureDef;
	volumeLitres: number;
	note: string;
	createdAt: Date;
};

export type EnclosureDetail = EnclosureSummary & {
	current: EnclosureVersion;
	versions: (Omit<EnclosureVersion, 'def'> & { buildCount: number })[];
};

function toSummary(row: EnclosureRow): EnclosureSummary {
	return {
		id: row.id,
		name: row.name,
		description: row.description,
		volumeLitres: row.volumeLitres,
		currentVersion: row.currentVersion,
		revision: row.revision,
		archived: row.archivedAt !== null,
		updatedAt: row.updatedAt
	};
}

function toVersion(row: EnclosureVersionRow): EnclosureVersion {
	return {
		id: row.id,
		enclosureId: row.enclosureId,
		version: row.version,
		def: row.definition as EnclosureDef,
		volumeLitres: row.volumeLitres,
		note: row.note,
		createdAt: row.createdAt
	};
}

export type EnclosureInput = { definition: unknown; description?: string; note?: string };

function checkInput(
	input: EnclosureInput
):
	| { ok: true; def: EnclosureDef; description: string; note: string }
	| { ok: false; issues: FieldIssue[] } {
	const checked = checkEnclosure(input.definition);
	const description = typeof input.description === 'string' ? input.description.trim() : '';
	const note = typeof input.note === 'string' ? input.note.trim() : '';
	const issues: FieldIssue[] = checked.ok ? [] : [...checked.issues];
	if (description.length > 2000) {
		issues.push({ path: 'description', message: 'At most 2000 characters' });
	}
	if (note.length > 500) {
		issues.push({ path: 'note', message: 'At most 500 characters' });
	}
	if (!checked.ok || issues.length) {
		return { ok: false, issues };
	}
	return { ok: true, def: checked.def, description, note };
}

export async function listEnclosures(
	studioId: string,
	opts: { q?: string; archived?: boolean } = {}
): Promise<EnclosureSummary[]> {
	const rows = await db
		.select()
		.from(enclosures)
		.where(
			and(
				eq(enclosures.studioId, studioId),
				opts.archived ? isNotNull(enclosures.archivedAt) : isNull(enclosures.archivedAt),
				opts.q
					? ilike(enclosures.name, `%${opts.q.replace(/[\\%_]/g, (c) => `\\${c}`)}%`)
					: undefined
			)
		)
		.orderBy(asc(enclosures.name), asc(enclosures.id));
	return rows.map(toSummary);
}

export async function createEnclosure(
	studioId: string,
	userId: string | null,
	input: EnclosureInput
): Promise<WriteResult<EnclosureDetail>> {
	const checked = checkInput(input);
	if (!checked.ok) {
		return { ok: false, status: 400, issues: checked.issues };
	}
	const id = newId();
	const volumeLitres = innerVolumeLitres(checked.def);
	await db.transaction(async (tx) => {
		await tx.insert(enclosures).values({
			id,
			studioId,
			name: checked.def.name,
			description: checked.description,
			volumeLitres,
			currentVersion: 1
		});
		await tx.insert(enclosureVersions).values({
			id: newId(),
			enclosureId: id,
			version: 1,
			definition: checked.def,
			volumeLitres,
			note: checked.note || 'First version',
			createdBy: userId
		});
	});
	return { ok: true, value: (await getEnclosure(studioId, id))! };
}

/** The version row an enclosure's current version number names. */
export async function currentVersionOf(
	enc: { id: string; currentVersion: number },
	run: Runner = db
) {
	const [row] = await run
		.select()
		.from(enclosureVersions)
		.where(
			and(
				eq(enclosureVersions.enclosureId, enc.id),
				eq(enclosureVersions.version, enc.currentVersion)
			)
		);
	return row;
}

export async function getEnclosure(
	studioId: string,
	id: string,
	run: Runner = db
): Promise<EnclosureDetail | null> {
	const [row] = await run
		.select()
		.from(enclosures)
		.where(and(eq(enclosures.id, id), eq(enclosures.studioId, studioId)));
	if (!row) {
		return null;
	}
	const versions = await run
		.select({ v: enclosureVersions, buildCount: sql<number>`count(${builds.id})::int` })
		.from(enclosureVersions)
		.leftJoin(builds, eq(builds.enclosureVersionId, enclosureVersions.id))
		.where(eq(enclosureVersions.enclosureId, id))
		.groupBy(enclosureVersions.id)
		.orderBy(desc(enclosureVersions.version));
	const current = versions.find((v) => v.v.version === row.currentVersion);
	if (!current) {
		return null;
	}
	return {
		...toSummary(row),
		current: toVersion(current.v),
		versions: versions.map(({ v, buildCount }) => {
			const { def: _def, ...rest } = toVersion(v);
			return { ...rest, buildCount };
		})
	};
}

/** One version of a studio's enclosure, as a build pins it; null for other studios' versions. */
export async function getEnclosureVersion(
	studioId: string,
	versionId: string
): Promise<EnclosureVersion | null> {
	const [row] = await db
		.select({ v: enclosureVersions })
		.from(enclosureVersions)
		.innerJoin(enclosures, eq(enclosures.id, enclosureVersions.enclosureId))
		.where(and(eq(enclosureVersions.id, versionId), eq(enclosures.studioId, studioId)));
	return row ? toVersion(row.v) : null;
}

/**
 * Saves a new definition. Locks the enclosure row, so two saves at once are ordered and the
 * second sees the first's revision.
 */
export async function updateEnclosure(
	studioId: string,
	id: string,
	revision: number,
	userId: string | null,
	input: EnclosureInput
): Promise<WriteResult<EnclosureDetail> & { created?: boolean }> {
	const checked = checkInput(input);
	if (!checked.ok) {
		return { ok: false, status: 400, issues: checked.issues };
	}
	return db.transaction(async (tx) => {
		const row = await lockedRow(
			tx,
			enclosures,
			and(eq(enclosures.id, id), eq(enclosures.studioId, studioId))
		);
		if (!row) {
			return { ok: false, status: 404 } as const;
		}
		if (row.revision !== revision) {
			return {
				ok: false,
				status: 409,
				current: (await getEnclosure(studioId, id, tx))!,
				message: `Someone saved this enclosure after you opened it (revision ${row.revision}, yours ${revision}). Nothing was overwritten.`
			} as const;
		}
		const current = await currentVersionOf(row, tx);
		const [{ used }] = await tx
			.select({ used: sql<number>`count(*)::int` })
			.from(builds)
			.where(eq(builds.enclosureVersionId, current.id));
		const volumeLitres = innerVolumeLitres(checked.def);
		let nextVersion = row.currentVersion;
		if (used > 0) {
			nextVersion = row.currentVersion + 1;
			await tx.insert(enclosureVersions).values({
				id: newId(),
				enclosureId: id,
				version: nextVersion,
				definition: checked.def,
				volumeLitres,
				// Without a note of the user's, the version says what changed.
				note:
					checked.note ||
					enclosureChanges(current.definition as EnclosureDef, checked.def)
						.join('; ')
						.slice(0, 500),
				createdBy: userId
			});
		} else {
			await tx
				.update(enclosureVersions)
				.set({ definition: checked.def, volumeLitres, note: checked.note || current.note })
				.where(eq(enclosureVersions.id, current.id));
		}
		await tx
			.update(enclosures)
			.set({
				name: checked.def.name,
				description: checked.description,
				volumeLitres,
				currentVersion: nextVersion,
				revision: row.revision + 1,
				updatedAt: new Date()
			})
			.where(eq(enclosures.id, id));
		return { ok: true, value: (await getEnclosure(studioId, id, tx))!, created: used > 0 } as const;
	});
}

/** Archived enclosures leave the list; builds pinned to their versions keep them. Never deleted. */
export const { archive: archiveEnclosure, restore: restoreEnclosure } = archiving(
	enclosures,
	toSummary
);

export async function duplicateEnclosure(
	studioId: string,
	userId: string | null,
	id: string
): Promise<WriteResult<EnclosureDetail>> {
	const source = await getEnclosure(studioId, id);
	if (!source) {
		return { ok: false, status: 404 };
	}
	const def = { ...source.current.def, name: `${source.current.def.name} (copy)`.slice(0, 200) };
	return createEnclosure(studioId, userId, {
		definition: def,
		description: source.description,
		note: `Copied from ${source.name} v${source.currentVersion}`
	});
}
