/**
 * What the client page shows, and nothing more: one variant's scene with every database id
 * replaced by a neutral one (parts `p1…`, placed parts `part-001…`), the fit in plain words, the
 * parts with sizes and prices, the sent quote, approval and deposit state, the thread and photos.
 * No other variant, build, studio data or catalogue entry reaches the page.
 */
import { createHash } from 'node:crypto';
import { inArray } from 'drizzle-orm';
import {
	boundsOf,
	boxSize,
	innerVolumeLitres,
	resolveScene,
	type PartDef,
	type Scene
} from '$lib/geometry';
import { versionChanges } from '$lib/builds/version-diff';
import { checkInPool } from '../engine/pool';
import { loadVariant } from '../builds';
import { ensureVersion, versionById, versionsOf } from '../versions';
import { db } from '../db';
import {
	parts as partsTable,
	type BuildRow,
	type VariantRow,
	type VariantVersionRow
} from '../db/schema';
import { paidDeposit } from '../payments';
import { photosOf } from './photos';
import { quoteOfVariant } from './quotes';
import { fitSummary, placementNames } from '../../sharing/summary';
import { categoryLabel } from '$lib/words/specs';
import { approvalState, latestApproval, threadOf } from './thread';
import type {
	ClientComment,
	ClientQuote,
	ClientView,
	DepositState,
	PartLine,
	PlacedPart
} from '$lib/sharing/types';

export type { ClientView };

const pad = (n: number) => String(n).padStart(3, '0');

/** The scene with neutral ids, and the maps back to the real ones (kept on the server). */
export function neutralScene(scene: Scene): {
	scene: Scene;
	placementIds: Map<string, string>;
	partIds: Map<string, string>;
} {
	const partIds = new Map<string, string>();
	// Placed parts, then the loops' fittings and plugs (not placed, but part of the scene).
	const loopFittings = new Set(
		(scene.loops ?? []).flatMap((l) => [
			...l.runs.flatMap((r) => [r.fittings.from, r.fittings.to]),
			...l.plugs.map((p) => p.fitting)
		])
	);
	const used = scene.parts.filter(
		(p) => scene.placements.some((pl) => pl.partId === p.id) || loopFittings.has(p.id)
	);
	used.forEach((p, i) => partIds.set(p.id, `p${i + 1}`));
	const placementIds = new Map<string, string>();
	const refOf = new Map<string, string>();
	const placements = scene.placements.map((pl, i) => {
		const ref = `part-${pad(i + 1)}`;
		placementIds.set(ref, pl.id);
		refOf.set(pl.id, ref);
		const { hidden: _h, locked: _l, ...rest } = pl;
		return { ...rest, id: ref, partId: partIds.get(pl.partId)! };
	});
	const parts: PartDef[] = used.map((p) => {
		const { source: _s, ...rest } = p;
		return { ...rest, id: partIds.get(p.id)! };
	});
	const port = <T extends { placementId: string }>(r: T): T => ({
		...r,
		placementId: refOf.get(r.placementId) ?? r.placementId
	});
	const fitting = (id: string | null) => (id ? (partIds.get(id) ?? id) : null);
	const loops = scene.loops?.map((l) => ({
		...l,
		runs: l.runs.map((r) => ({
			...r,
			from: port(r.from),
			to: port(r.to),
			fittings: { from: fitting(r.fittings.from), to: fitting(r.fittings.to) }
		})),
		plugs: l.plugs.map((p) => ({ ...port(p), fitting: fitting(p.fitting) })),
		fill: l.fill && port(l.fill),
		drain: l.drain && port(l.drain)
	}));
	return {
		scene: { ...scene, parts, placements, ...(loops ? { loops } : {}) },
		placementIds,
		partIds
	};
}

/** An opaque, stable reference to a photo for one viewer scope (a link, or the in-app view). */
export function photoRef(scopeKey: string, photoId: string): string {
	return createHash('sha256').update(`${scopeKey}:${photoId}`).digest('base64url').slice(0, 22);
}

export type ViewerKind =
	| { kind: 'link'; scopeKey: string; mayPay: boolean }
	| { kind: 'member'; scopeKey: string; mayPay: boolean };

export async function clientView(input: {
	build: BuildRow;
	variant: VariantRow;
	studioName: string;
	sharedBy: string | null;
	viewer: ViewerKind;
}): Promise<{ view: ClientView; placementIds: Map<string, string>; frozenScene: Scene }> {
	const { build, variant } = input;
	// Clients see versions only: the latest one the studio saved, never later autosaved revisions.
	const shown = await ensureVersion(variant);
	const loaded = await loadVariant(
		build.id,
		build.studioId,
		build.enclosureVersionId,
		variant.id,
		shown.settings
	);
	if (!loaded) throw new Error('The shared variant could not be loaded.');
	const changes = await changesSince(input, shown, loaded);
	const neutral = neutralScene(loaded.scene);
	const scene = neutral.scene;
	const report = await checkInPool(scene);
	const resolved = resolveScene(scene);
	const names = placementNames(resolved);
	const statusOf = new Map(report.parts.map((p) => [p.placementId, p.status]));

	const placed: PlacedPart[] = resolved.placements.map((rp) => ({
		ref: rp.placement.id,
		short: names.get(rp.placement.id)!.short,
		label: names.get(rp.placement.id)!.label,
		name: rp.part.name,
		category: categoryLabel(rp.part.category),
		sizeMm: boxSize(rp.bounds),
		status: statusOf.get(rp.placement.id) ?? 'clear'
	}));

	const [quoteData, approval, thread, photoRows] = await Promise.all([
		quoteOfVariant(variant.id),
		latestApproval(variant.id),
		threadOf(variant.id),
		photosOf(build.id)
	]);
	const sentQuote = quoteData && quoteData.quote.status === 'sent' ? quoteData : null;
	const realPartIds = [...neutral.partIds.keys()];
	const catalogue = realPartIds.length
		? await db
				.select({
					id: partsTable.id,
					priceMinor: partsTable.priceMinor,
					currency: partsTable.currency
				})
				.from(partsTable)
				.where(inArray(partsTable.id, realPartIds))
		: [];
	const priceById = new Map(catalogue.map((c) => [c.id, c]));

	const lines: PartLine[] = [];
	// The loop's fittings and plugs are counted from the loop, its tube from the cut list.
	const loopUses = new Map<string, number>();
	for (const l of scene.loops ?? []) {
		for (const id of [
			...l.runs.flatMap((r) => [r.fittings.from, r.fittings.to]),
			...l.plugs.map((p) => p.fitting)
		]) {
			if (id) loopUses.set(id, (loopUses.get(id) ?? 0) + 1);
		}
	}
	for (const [realId, neutralId] of neutral.partIds) {
		const first = resolved.placements.find((rp) => rp.part.id === neutralId);
		if (!first) {
			const def = scene.parts.find((p) => p.id === neutralId)!;
			const cat = priceById.get(realId);
			const quoteLine = sentQuote?.lines.find((l) => l.partId === realId);
			lines.push({
				name: def.name,
				category: categoryLabel(def.category),
				quantity: loopUses.get(neutralId) ?? 0,
				sizeMm: boxSize(boundsOf(def.bodies.map((b) => b.box))),
				unitPriceMinor: sentQuote ? (quoteLine?.unitPriceMinor ?? null) : (cat?.priceMinor ?? null),
				currency: sentQuote ? sentQuote.quote.currency : (cat?.currency ?? null)
			});
			continue;
		}
		const quoteLine = sentQuote?.lines.find((l) => l.partId === realId);
		const cat = priceById.get(realId);
		lines.push({
			name: first.part.name,
			category: categoryLabel(first.part.category),
			quantity: resolved.placements.filter((rp) => rp.part.id === neutralId).length,
			sizeMm: boxSize(first.bounds),
			unitPriceMinor: sentQuote ? (quoteLine?.unitPriceMinor ?? null) : (cat?.priceMinor ?? null),
			currency: sentQuote ? sentQuote.quote.currency : (cat?.currency ?? null)
		});
	}

	for (const t of scene.tubeKinds ?? []) {
		const runs = (report.loops ?? []).flatMap((l) => l.runs.filter((r) => r.tubeKindId === t.id));
		if (!runs.length) continue;
		const cutMm = runs.reduce((n, r) => n + r.cutLengthMm, 0);
		lines.push({
			name: `${t.name}, ${(cutMm / 1000).toFixed(2)} m cut in ${runs.length} ${runs.length === 1 ? 'run' : 'runs'}`,
			category: 'Tube',
			quantity: runs.length,
			sizeMm: [t.outerMm, t.outerMm, cutMm],
			unitPriceMinor: null,
			currency: null
		});
	}

	const quote: ClientQuote | null = sentQuote
		? {
				currency: sentQuote.quote.currency,
				lines: sentQuote.lines.map((l) => ({
					description: l.description,
					quantity: l.quantity,
					unitPriceMinor: l.unitPriceMinor ?? 0,
					totalMinor: l.quantity * (l.unitPriceMinor ?? 0)
				})),
				labourNote: sentQuote.quote.labourNote,
				labourMinor: sentQuote.totals.labourMinor,
				subtotalMinor: sentQuote.totals.subtotalMinor,
				taxRateBp: sentQuote.quote.taxRateBp,
				taxMinor: sentQuote.totals.taxMinor,
				totalMinor: sentQuote.totals.totalMinor,
				depositMinor: sentQuote.totals.depositMinor,
				depositKind: sentQuote.quote.depositKind,
				depositValue: sentQuote.quote.depositValue,
				notes: sentQuote.quote.notes,
				sentAt: sentQuote.quote.sentAt
			}
		: null;

	const reopened =
		!!approval && thread.some((c) => c.kind === 'changes' && c.createdAt > approval.createdAt);
	const approvalNow = approvalState(approval, shown.number, reopened);
	const paid = quoteData ? await paidDeposit(quoteData.quote.id) : null;
	const deposit: DepositState = {
		paid:
			paid && paid.paidAt
				? { amountMinor: paid.amountMinor, currency: paid.currency, paidAt: paid.paidAt }
				: null,
		dueMinor: quote?.depositMinor ?? null,
		currency: quote?.currency ?? null,
		canPay: false,
		reason: null
	};
	if (!deposit.paid) {
		if (!quote) deposit.reason = 'The studio has not sent a quote yet.';
		else if (!approvalNow?.current || approvalNow.reopened) {
			deposit.reason = 'Approve the build first; the deposit is for the version you approve.';
		} else if (!input.viewer.mayPay) deposit.reason = 'Only the client can pay the deposit.';
		else deposit.canPay = true;
	}

	const refByPlacement = new Map([...neutral.placementIds].map(([ref, real]) => [real, ref]));
	const comments: ClientComment[] = thread.map((c) => ({
		kind: c.kind,
		body: c.body,
		authorName: c.authorName,
		side: c.authorSide as 'studio' | 'client',
		partLabel: c.partLabel,
		partRef: c.placementId ? (refByPlacement.get(c.placementId) ?? null) : null,
		at: c.createdAt,
		version: c.variantVersion
	}));

	const view: ClientView = {
		studioName: input.studioName,
		buildName: build.name,
		clientName: build.clientName,
		variantName: variant.name,
		version: shown.number,
		updatedAt: shown.createdAt,
		versionNote: shown.note,
		changes,
		sharedBy: input.sharedBy,
		enclosure: {
			name: scene.enclosure.name,
			outerMm: scene.enclosure.outerMm,
			innerLitres: innerVolumeLitres(scene.enclosure)
		},
		summary: fitSummary(report, resolved, scene.marginMm),
		placed,
		lines,
		scene,
		quote,
		approval: approvalNow,
		deposit,
		comments,
		photos: photoRows.map((p) => ({
			ref: photoRef(input.viewer.scopeKey, p.id),
			caption: p.caption,
			width: p.width,
			height: p.height
		}))
	};
	return { view, placementIds: neutral.placementIds, frozenScene: loaded.scene };
}

/**
 * The difference between the shown version and the one before it (of this variant, or the version
 * it was started from), in words; null for a first version.
 */
async function changesSince(
	input: { build: BuildRow; variant: VariantRow },
	shown: VariantVersionRow,
	loaded: NonNullable<Awaited<ReturnType<typeof loadVariant>>>
) {
	const older = (await versionsOf(input.variant.id)).find((v) => v.number < shown.number);
	const before =
		older ??
		(input.variant.basedOnVersionId ? await versionById(input.variant.basedOnVersionId) : null);
	if (!before || before.id === shown.id) return null;
	let prior;
	try {
		prior = await loadVariant(
			input.build.id,
			input.build.studioId,
			input.build.enclosureVersionId,
			input.variant.id,
			before.settings
		);
	} catch {
		// An old version that no longer validates (its enclosure moved on): no comparison to offer.
		return null;
	}
	if (!prior) return null;
	const parts = [
		...loaded.parts,
		...prior.parts.filter((p) => !loaded.parts.some((q) => q.id === p.id))
	];
	const [priorReport, shownReport] = await Promise.all([
		checkInPool(prior.scene),
		checkInPool(loaded.scene)
	]);
	const lines = versionChanges(
		loaded.enclosure,
		parts,
		{ settings: prior.settings, report: priorReport },
		{ settings: loaded.settings, report: shownReport }
	);
	return { since: before.number, lines };
}

/** The photo id behind a reference, among this build's photos. */
export async function photoIdForRef(
	buildId: string,
	scopeKey: string,
	ref: string
): Promise<string | null> {
	if (!/^[A-Za-z0-9_-]{22}$/.test(ref)) return null;
	const rows = await photosOf(buildId);
	return rows.find((p) => photoRef(scopeKey, p.id) === ref)?.id ?? null;
}
