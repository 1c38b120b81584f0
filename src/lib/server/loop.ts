/** The coolant loop's catalogue: a studio's tube kinds (with prices) and its cut allowance. */
import { and, eq, inArray, isNull } from 'drizzle-orm';
import {
	formatZodIssues,
	partDefSchema,
	tubeKindSchema,
	type FieldIssue,
	type PartDef,
	type TubeKindDef
} from '$lib/geometry';
import { db } from './db';
import { parts, studioLoopSettings, tubeKinds } from './db/schema';
import { newId } from './tokens';

/** 10 % more tube than the cut list, for cutting and the odd mistake (common practice). */
export const DEFAULT_CUT_ALLOWANCE_PCT = 10;

export type StudioTubeKind = TubeKindDef & { pricePerMetreMinor: number | null; currency: string };

/** A studio's tube kinds (all of them, or those `ids` names; archived ones too, so old builds load). */
export async function tubeKindsForStudio(
	studioId: string,
	ids?: string[]
): Promise<StudioTubeKind[]> {
	if (ids && ids.length === 0) return [];
	const rows = await db
		.select()
		.from(tubeKinds)
		.where(
			and(
				eq(tubeKinds.studioId, studioId),
				ids ? inArray(tubeKinds.id, [...new Set(ids)]) : isNull(tubeKinds.archivedAt)
			)
		);
	return rows
		.map((r) => {
			const def = tubeKindSchema.parse({ ...(r.definition as object), id: r.id, name: r.name });
			return { ...def, pricePerMetreMinor: r.pricePerMetreMinor, currency: r.currency };
		})
		.sort((a, b) => a.outerMm - b.outerMm || a.name.localeCompare(b.name));
}

export async function cutAllowanceFor(studioId: string): Promise<number> {
	const [row] = await db
		.select({ pct: studioLoopSettings.cutAllowancePct })
		.from(studioLoopSettings)
		.where(eq(studioLoopSettings.studioId, studioId));
	return row?.pct ?? DEFAULT_CUT_ALLOWANCE_PCT;
}

/** Only the engine's fields: a scene carries no prices. */
export function engineTubeKinds(kinds: readonly StudioTubeKind[]): TubeKindDef[] {
	return kinds.map(({ pricePerMetreMinor: _p, currency: _c, ...def }) => def);
}

/** Adds a tube kind to a studio's catalogue; the definition is validated first (400 on a bad field). */
export async function createTubeKind(
	studioId: string,
	input: unknown,
	price: { pricePerMetreMinor: number | null; currency: string } = {
		pricePerMetreMinor: null,
		currency: 'EUR'
	}
): Promise<{ ok: true; id: string } | { ok: false; issues: FieldIssue[] }> {
	const parsed = tubeKindSchema.safeParse(input);
	if (!parsed.success) return { ok: false, issues: formatZodIssues(parsed.error) };
	const id = `${parsed.data.id}-${newId().slice(0, 8)}`;
	await db.insert(tubeKinds).values({
		id,
		studioId,
		name: parsed.data.name,
		definition: { ...parsed.data, id },
		pricePerMetreMinor: price.pricePerMetreMinor,
		currency: price.currency
	});
	return { ok: true, id };
}

/** The studio's fitting parts (category fitting, not archived), for the editor's loop panel. */
export async function fittingPartsForStudio(studioId: string): Promise<PartDef[]> {
	const rows = await db
		.select({ id: parts.id, name: parts.name, definition: parts.definition })
		.from(parts)
		.where(
			and(eq(parts.studioId, studioId), eq(parts.category, 'fitting'), isNull(parts.archivedAt))
		);
	return rows
		.map((r) => partDefSchema.parse({ ...(r.definition as object), id: r.id, name: r.name }))
		.sort((a, b) => a.name.localeCompare(b.name));
}
