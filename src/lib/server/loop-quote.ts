/**
 * The quote's "loop" group: tube per kind (whole metres of the cut plus the studio's allowance, at
 * its price per metre) and fittings and plugs per part and thread, at the catalogue's prices.
 */
import { eq, inArray } from 'drizzle-orm';
import { checkScene, loopBill, type LoopBill } from '$lib/geometry';
import { catalogueIdsOf, type VariantSettings } from '$lib/builds/settings';
import { SceneRejected, enclosureVersionDef, partsForStudio, validateScene } from './builds';
import { db } from './db';
import { builds, parts } from './db/schema';
import { cutAllowanceFor, engineTubeKinds, tubeKindsForStudio, type StudioTubeKind } from './loop';

export type LoopLineDraft = {
	partId: string | null;
	description: string;
	quantity: number;
	unitPriceMinor: number | null;
	loopKey: string;
};

/** The loop's bill for a variant of a build, or null when it has none or no longer checks. */
export async function loopBillOf(
	studioId: string,
	buildId: string,
	settings: VariantSettings
): Promise<{ bill: LoopBill; tubes: StudioTubeKind[] } | null> {
	if (!settings.loops?.length) return null;
	const [build] = await db
		.select({ enclosureVersionId: builds.enclosureVersionId })
		.from(builds)
		.where(eq(builds.id, buildId));
	const enc = build && (await enclosureVersionDef(build.enclosureVersionId));
	if (!enc) return null;
	const ids = catalogueIdsOf(settings);
	const [{ parts: defs }, tubes, pct] = await Promise.all([
		partsForStudio(studioId, ids.parts),
		tubeKindsForStudio(studioId, ids.tubeKinds),
		cutAllowanceFor(studioId)
	]);
	let scene;
	try {
		scene = validateScene(enc.definition, defs, settings, engineTubeKinds(tubes));
	} catch (e) {
		if (e instanceof SceneRejected) return null;
		throw e;
	}
	const loops = checkScene(scene).loops ?? [];
	return { bill: loopBill(scene, loops, pct), tubes };
}

export async function loopLineDrafts(
	studioId: string,
	buildId: string,
	settings: VariantSettings,
	currency: string
): Promise<LoopLineDraft[]> {
	const found = await loopBillOf(studioId, buildId, settings);
	if (!found) return [];
	const { bill, tubes } = found;
	const priced = new Map(tubes.map((t) => [t.id, t]));
	const fittingIds = bill.fittings.flatMap((f) => (f.partId ? [f.partId] : []));
	const rows = fittingIds.length
		? await db
				.select({ id: parts.id, priceMinor: parts.priceMinor, currency: parts.currency })
				.from(parts)
				.where(inArray(parts.id, fittingIds))
		: [];
	const prices = new Map(rows.map((r) => [r.id, r]));
	const lines: LoopLineDraft[] = bill.tubes.map((t) => {
		const kind = priced.get(t.tubeKindId);
		return {
			partId: null,
			description: `Loop · ${t.name}: ${(t.cutMm / 1000).toFixed(2)} m cut + ${bill.cutAllowancePct} % allowance, in whole metres`,
			quantity: Math.max(1, Math.ceil(t.withAllowanceMm / 1000)),
			unitPriceMinor:
				kind && kind.pricePerMetreMinor !== null && kind.currency === currency
					? kind.pricePerMetreMinor
					: null,
			loopKey: `tube:${t.tubeKindId}`
		};
	});
	for (const f of bill.fittings) {
		const row = f.partId ? prices.get(f.partId) : undefined;
		lines.push({
			partId: f.partId,
			description: `Loop · ${f.name} (${f.thread})`,
			quantity: f.count,
			unitPriceMinor:
				row && row.priceMinor !== null && row.currency === currency ? row.priceMinor : null,
			loopKey: `fitting:${f.partId ?? 'plug'}:${f.thread}`
		});
	}
	return lines;
}
