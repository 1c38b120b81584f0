/**
 * The build sheet on the server: one variant loaded and checked by the engine here (never trusted
 * from the browser), its sheet content and drawings, the checklist ticks, the quote and photos.
 * The page and the PDF both start from `loadSheet`.
 */
import { and, eq } from 'drizzle-orm';
import { resolveScene } from '$lib/geometry';
import type { TickInput } from '$lib/schemas/builds';
import { roomAt, type RoomFigure } from '$lib/geometry/room';
import { checkInPool } from './engine/pool';
import { orthographicViews, type DrawingRoom, type SheetDrawing } from '$lib/builds/orthographic';
import { buildSheet, checklistKeys, type SheetModel } from '$lib/builds/sheet';
import { formatMoney } from '$lib/quotes/money';
import type { QuoteView } from '$lib/quotes/view';
import {
	requireBuild,
	requireVariant,
	roleMay,
	variantsSharedWithUser,
	type Locals
} from './access';
import type { SessionUser } from './auth';
import { SceneRejected, loadVariant, variantsOf, type LoadedVariant } from './builds';
import { cutAllowanceFor } from './loop';
import { canonicalJson, ensureVersion } from './versions';
import { variantSettingsSchema } from '$lib/builds/settings';
import { db } from './db';
import { checklistTicks, users, type BuildRow } from './db/schema';
import { photosOf } from './sharing/photos';
import { quoteOfVariant } from './sharing/quotes';
import { ServiceError } from './errors';

/** ISO 216 A4 and ANSI/ASME Y14.1 Letter (8.5 × 11 in, 25.4 mm to the inch), in millimetres. */
export const PAPER = {
	a4: { label: 'A4', widthMm: 210, heightMm: 297 },
	letter: { label: 'Letter', widthMm: 215.9, heightMm: 279.4 }
} as const;
export type Paper = keyof typeof PAPER;

/** Page margin on every side, and room the drawings page keeps for its heading. */
export const MARGIN_MM = 12;
const DRAWING_HEADING_MM = 22;

export function paperOf(value: string | null): Paper {
	return value === 'letter' ? 'letter' : 'a4';
}

/** The room the three views get: one page, less margins and heading. */
export function drawingRoom(paper: Paper): DrawingRoom {
	const p = PAPER[paper];
	return {
		widthMm: p.widthMm - 2 * MARGIN_MM,
		heightMm: p.heightMm - 2 * MARGIN_MM - DRAWING_HEADING_MM,
		gutterMm: 8
	};
}

export type TickView = { at: Date; by: string | null; earlierVersion: boolean };

export type { QuoteView };

export type SheetData = {
	build: { id: string; name: string; clientName: string };
	variants: { id: string; name: string }[];
	variant: { id: string; name: string; version: number };
	sheet: SheetModel;
	drawing: SheetDrawing;
	ticks: Record<string, TickView>;
	quote: QuoteView | null;
	photos: { id: string; caption: string; width: number; height: number }[];
	canTick: boolean;
	paper: Paper;
	generatedAt: Date;
	/** The clearance table's row for this variant's positions. */
	room: RoomFigure[];
};

async function loadChecked(build: BuildRow, variantId: string | undefined) {
	let loaded: LoadedVariant | null;
	try {
		loaded = await loadVariant(build.id, build.studioId, build.enclosureVersionId, variantId);
	} catch (e) {
		if (e instanceof SceneRejected) {
			throw new ServiceError(
				'conflict',
				`This variant no longer checks against its enclosure and parts: ${e.message}`
			);
		}
		throw e;
	}
	if (!loaded) throw new ServiceError('not-found', 'No such variant in this build.');
	const resolved = resolveScene(loaded.scene);
	const [report, cutAllowancePct] = await Promise.all([
		checkInPool(loaded.scene),
		cutAllowanceFor(build.studioId)
	]);
	return { loaded, resolved, report, cutAllowancePct };
}

function sheetOf(
	build: BuildRow,
	checked: Awaited<ReturnType<typeof loadChecked>>,
	version?: { number: number; changed: boolean }
): SheetModel {
	const { loaded, resolved, report, cutAllowancePct } = checked;
	return buildSheet({
		cutAllowancePct,
		buildName: build.name,
		clientName: build.clientName,
		variantName: loaded.variant.name,
		// The title names a version (what the client saw), saying so when the variant moved on since.
		variantVersion: version?.number ?? loaded.variant.version,
		versionText: version
			? `version ${version.number}${version.changed ? ', with changes not yet saved as a version' : ''}`
			: undefined,
		scene: loaded.scene,
		resolved,
		report
	});
}

async function ticksOf(
	variantId: string,
	version: number,
	keys: Set<string>
): Promise<Record<string, TickView>> {
	const rows = await db
		.select({
			key: checklistTicks.itemKey,
			at: checklistTicks.tickedAt,
			version: checklistTicks.variantVersion,
			by: users.name
		})
		.from(checklistTicks)
		.leftJoin(users, eq(users.id, checklistTicks.tickedBy))
		.where(eq(checklistTicks.variantId, variantId));
	const out: Record<string, TickView> = {};
	for (const r of rows) {
		if (keys.has(r.key)) out[r.key] = { at: r.at, by: r.by, earlierVersion: r.version < version };
	}
	return out;
}

function percent(bp: number): string {
	return `${(bp / 100).toFixed(bp % 100 === 0 ? 0 : 2)}\u2009%`;
}

/** The variant's quote as sheet lines. Clients see it only once it has been sent to them. */
async function quoteView(variantId: string, mayDraft: boolean): Promise<QuoteView | null> {
	const found = await quoteOfVariant(variantId);
	if (!found || (found.quote.status !== 'sent' && !mayDraft)) return null;
	const { quote, lines, totals } = found;
	const money = (minor: number) => formatMoney(minor, quote.currency);
	return {
		draft: quote.status !== 'sent',
		lines: lines.map((l) => ({
			description: l.description,
			quantity: l.quantity,
			unit: l.unitPriceMinor === null ? 'no price yet' : money(l.unitPriceMinor),
			total: l.unitPriceMinor === null ? '—' : money(l.unitPriceMinor * l.quantity)
		})),
		labour:
			quote.labourMinor > 0 ? { note: quote.labourNote, amount: money(quote.labourMinor) } : null,
		subtotal: money(totals.subtotalMinor),
		tax:
			quote.taxRateBp > 0
				? { rate: percent(quote.taxRateBp), amount: money(totals.taxMinor) }
				: null,
		total: money(totals.totalMinor),
		deposit:
			quote.depositKind === 'percent'
				? `${money(totals.depositMinor)} (${percent(quote.depositValue)})`
				: money(totals.depositMinor),
		unpriced: totals.unpriced
	};
}

/**
 * The variants this user may open a sheet of: all for the studio, only those shared with them for
 * a client (access.ts). The one asked for must be among them (404 otherwise); none asked for means
 * the proposal, else the first.
 */
async function visibleVariants(
	locals: Locals,
	build: BuildRow,
	role: string,
	user: SessionUser,
	asked: string | null,
	url?: URL
) {
	const all = await variantsOf(build.id);
	const shared = role === 'client' ? await variantsSharedWithUser(user, build.id) : null;
	const visible = shared ? all.filter((v) => shared.includes(v.id)) : all;
	if (asked) {
		await requireVariant(locals, build.id, asked, 'build.view', url);
		return { visible, variantId: asked };
	}
	const chosen = visible.find((v) => v.isProposal) ?? visible[0];
	if (!chosen) throw new ServiceError('not-found', 'No such variant in this build.');
	return { visible, variantId: chosen.id };
}

/** Everything the sheet shows, for a user allowed to see the build and the variant. */
export async function loadSheet(locals: Locals, buildId: string, url: URL): Promise<SheetData> {
	const { build, access } = await requireBuild(locals, buildId, 'build.view', url);
	const { visible, variantId } = await visibleVariants(
		locals,
		build,
		access.role,
		access.user,
		url.searchParams.get('variant'),
		url
	);
	const paper = paperOf(url.searchParams.get('paper'));
	const checked = await loadChecked(build, variantId);
	const shown = await ensureVersion(checked.loaded.variant);
	const sheet = sheetOf(build, checked, {
		number: shown.number,
		changed:
			canonicalJson(variantSettingsSchema.parse(shown.settings)) !==
			canonicalJson(checked.loaded.settings)
	});
	const numbers = new Map(sheet.parts.map((p, i) => [p.placementId, i + 1]));
	const drawing = orthographicViews(
		checked.loaded.scene,
		checked.resolved,
		checked.report,
		drawingRoom(paper),
		numbers
	);
	const variant = checked.loaded.variant;
	const studioSide = roleMay(access.role, 'build.edit');
	const [ticks, quote, photoRows] = await Promise.all([
		ticksOf(variant.id, variant.version, checklistKeys(sheet)),
		quoteView(variant.id, studioSide),
		photosOf(build.id)
	]);
	return {
		build: { id: build.id, name: build.name, clientName: build.clientName },
		variants: visible.map((v) => ({ id: v.id, name: v.name })),
		variant: { id: variant.id, name: variant.name, version: variant.version },
		sheet,
		drawing,
		ticks,
		quote,
		photos: photoRows.map((p) => ({
			id: p.id,
			caption: p.caption,
			width: p.width,
			height: p.height
		})),
		canTick: studioSide,
		paper,
		generatedAt: new Date(),
		room: roomAt(checked.loaded.scene.enclosure, {
			dividerPositions: checked.resolved.dividerPositions,
			bracketOffsets: checked.resolved.bracketOffsets
		})
	};
}

/** A checklist key the variant's sheet does not have (now). */
export class TickRejected extends ServiceError {
	constructor(message: string) {
		super('invalid', message, { field: 'key' });
	}
}

/**
 * Ticks or unticks one checklist item. Only studio members who may edit the build tick (clients
 * read the sheet); the key must be one the variant's sheet has right now.
 */
export async function setTick(
	locals: Locals,
	buildId: string,
	input: TickInput
): Promise<{ key: string; ticked: boolean }> {
	const { build, access } = await requireVariant(locals, buildId, input.variantId, 'build.edit');
	const checked = await loadChecked(build, input.variantId);
	const variant = checked.loaded.variant;
	if (!checklistKeys(sheetOf(build, checked)).has(input.key)) {
		throw new TickRejected('This sheet has no such checklist item.');
	}
	if (input.ticked === '1') {
		const values = {
			variantId: variant.id,
			itemKey: input.key,
			buildId: build.id,
			variantVersion: variant.version,
			tickedBy: access.user.id,
			tickedAt: new Date()
		};
		await db
			.insert(checklistTicks)
			.values(values)
			.onConflictDoUpdate({
				target: [checklistTicks.variantId, checklistTicks.itemKey],
				set: {
					variantVersion: values.variantVersion,
					tickedBy: values.tickedBy,
					tickedAt: values.tickedAt
				}
			});
	} else {
		await db
			.delete(checklistTicks)
			.where(and(eq(checklistTicks.variantId, variant.id), eq(checklistTicks.itemKey, input.key)));
	}
	return { key: input.key, ticked: input.ticked === '1' };
}
