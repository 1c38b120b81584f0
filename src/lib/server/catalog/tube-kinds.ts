/**
 * The catalogue's tube kinds page: a studio's tube kinds (soft and hard) and its cut allowance.
 * Kinds are retired, never deleted, so a variant's loop that names one still loads. The table has
 * no revision column: a stale edit is caught by the row's `updated_at` the form was filled from.
 */
import { and, eq } from 'drizzle-orm';
import { tubeKindSchema, type TubeKindDef } from '$lib/geometry';
import { parsePrice, type TubeKindForm } from '$lib/catalog/schemas';
import { db } from '../db';
import { studioLoopSettings, tubeKinds } from '../db/schema';
import { ServiceError } from '../errors';
import { newId } from '../tokens';
import { cutAllowanceFor } from '../loop';

export type TubeKindListRow = TubeKindDef & {
	pricePerMetreMinor: number | null;
	currency: string;
	retired: boolean;
	/** ms since 1970 of the last change: the edit form posts it back. */
	stamp: number;
};

/** Every tube kind of the studio, retired ones too (marked), thinnest first. */
export async function listTubeKinds(studioId: string): Promise<TubeKindListRow[]> {
	const rows = await db.select().from(tubeKinds).where(eq(tubeKinds.studioId, studioId));
	return rows
		.map((r) => ({
			...tubeKindSchema.parse({ ...(r.definition as object), id: r.id, name: r.name }),
			pricePerMetreMinor: r.pricePerMetreMinor,
			currency: r.currency,
			retired: r.archivedAt !== null,
			stamp: r.updatedAt.getTime()
		}))
		.sort(
			(a, b) =>
				Number(a.retired) - Number(b.retired) ||
				a.outerMm - b.outerMm ||
				a.name.localeCompare(b.name)
		);
}

/** The form's fields as the engine's definition, checked with the engine's own schema. */
function definitionOf(id: string, form: TubeKindForm): TubeKindDef {
	const parsed = tubeKindSchema.safeParse({
		id,
		name: form.name,
		kind: form.kind,
		innerMm: form.innerMm === '' ? undefined : Number(form.innerMm),
		outerMm: form.outerMm,
		minBendRadiusMm: form.minBendRadiusMm,
		clearanceMm: form.clearanceMm
	});
	if (!parsed.success) {
		const issue = parsed.error.issues[0];
		const field = String(issue.path[0] ?? '_');
		throw new ServiceError('invalid', issue.message, { field });
	}
	return parsed.data;
}

/** Adds a tube kind; its id is made from its kind and outer diameter plus a random tail. */
export async function addTubeKind(studioId: string, form: TubeKindForm): Promise<string> {
	const id = `${form.kind}-${String(form.outerMm).replace('.', 'p')}-${newId().slice(0, 8)}`;
	const def = definitionOf(id, form);
	await db.insert(tubeKinds).values({
		id,
		studioId,
		name: def.name,
		definition: def,
		pricePerMetreMinor: parsePrice(form.price),
		currency: form.currency
	});
	return id;
}

/** Edits a tube kind; 404 when it is not this studio's, 409 when it changed since the form was filled. */
export async function editTubeKind(studioId: string, form: TubeKindForm): Promise<void> {
	if (!form.id) throw new ServiceError('invalid', 'Which tube kind?', { field: 'id' });
	const stamp = Number(form.stamp);
	if (!form.stamp || !Number.isFinite(stamp)) {
		throw new ServiceError('invalid', 'Reload the page: the form has no change time.', {
			field: 'stamp'
		});
	}
	const def = definitionOf(form.id, form);
	await db.transaction(async (tx) => {
		const [row] = await tx
			.select({ updatedAt: tubeKinds.updatedAt })
			.from(tubeKinds)
			.where(and(eq(tubeKinds.id, form.id), eq(tubeKinds.studioId, studioId)))
			.for('update');
		if (!row) throw new ServiceError('not-found', 'No such tube kind in this studio.');
		if (row.updatedAt.getTime() !== stamp) {
			throw new ServiceError(
				'conflict',
				'Someone changed this tube kind since you opened the page. Reload to see their change.'
			);
		}
		await tx
			.update(tubeKinds)
			.set({
				name: def.name,
				definition: def,
				pricePerMetreMinor: parsePrice(form.price),
				currency: form.currency,
				updatedAt: new Date(Math.max(Date.now(), stamp + 1))
			})
			.where(eq(tubeKinds.id, form.id));
	});
}

/** Retires (or restores) a tube kind: retired ones are not offered for new runs; old loops keep them. */
export async function setTubeKindRetired(
	studioId: string,
	id: string,
	retired: boolean
): Promise<void> {
	const done = await db
		.update(tubeKinds)
		.set({ archivedAt: retired ? new Date() : null, updatedAt: new Date() })
		.where(and(eq(tubeKinds.id, id), eq(tubeKinds.studioId, studioId)))
		.returning({ id: tubeKinds.id });
	if (done.length === 0) throw new ServiceError('not-found', 'No such tube kind in this studio.');
}

export { cutAllowanceFor };

/** Sets the studio's cut allowance in percent (one row per studio). */
export async function setCutAllowance(studioId: string, pct: number): Promise<void> {
	await db
		.insert(studioLoopSettings)
		.values({ studioId, cutAllowancePct: pct })
		.onConflictDoUpdate({ target: studioLoopSettings.studioId, set: { cutAllowancePct: pct } });
}
