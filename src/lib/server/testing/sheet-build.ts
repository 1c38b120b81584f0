/**
 * Test data for the build sheet: a build of the engine's demo sandwich (enclosure, version, the
 * demo parts as the studio's own, one variant with the demo scene), written straight to the
 * database. Relative imports only: the Playwright tests load this file too.
 */
import { randomBytes } from 'node:crypto';
import { eq, inArray } from 'drizzle-orm';
import { demoEnclosure, demoParts, demoSceneInput } from '../../geometry/standard-library';
import type { PartDef } from '../../geometry/schema';
import { db } from '../db';
import { insertBuild, insertEnclosure } from './builds';
import { checklistTicks, parts, variants } from '../db/schema';

export type SheetTestBuild = {
	buildId: string;
	variantId: string;
	enclosureId: string;
	partIds: Record<string, string>;
};

const id = (label: string) => `${label}-${randomBytes(6).toString('hex')}`;

function bounds(part: PartDef): [number, number, number] {
	return [0, 1, 2].map(
		(i) =>
			Math.max(...part.bodies.map((b) => b.box.max[i])) -
			Math.min(...part.bodies.map((b) => b.box.min[i]))
	) as [number, number, number];
}

/**
 * The demo build in `studioId`. `scene` changes the variant's settings (a divider moved, a
 * placement added) before it is stored.
 */
export async function createSheetBuild(opts: {
	studioId: string;
	userId?: string | null;
	name?: string;
	adjust?: (settings: ReturnType<typeof demoSettings>) => void;
}): Promise<SheetTestBuild> {
	const enclosureId = id('enc');
	const versionId = id('encv');
	const definition = demoEnclosure();
	const partIds: Record<string, string> = {};
	const rows = demoParts().map((p) => {
		partIds[p.id] = id(p.id);
		const [w, h, d] = bounds(p);
		return {
			id: partIds[p.id],
			studioId: opts.studioId,
			name: p.name,
			category: p.category,
			definition: p,
			widthMm: w,
			heightMm: h,
			depthMm: d,
			provenance: p.provenance,
			toleranceMm: p.toleranceMm
		};
	});
	const settings = demoSettings();
	settings.placements = settings.placements.map((pl) => ({
		...pl,
		partId: partIds[pl.partId] ?? pl.partId
	}));
	opts.adjust?.(settings);
	const buildId = id('build');
	const variantId = id('variant');
	await db.transaction(async (tx) => {
		await insertEnclosure(tx, { enclosureId, versionId, studioId: opts.studioId, definition });
		await tx.insert(parts).values(rows);
		await insertBuild(tx, {
			studioId: opts.studioId,
			enclosureVersionId: versionId,
			createdBy: opts.userId ?? null,
			build: { id: buildId, name: opts.name ?? 'Sheet test build', clientName: 'Test Client' },
			variant: {
				id: variantId,
				name: 'Spine at three slots',
				sortOrder: 0,
				isProposal: true,
				settings
			}
		});
	});
	return { buildId, variantId, enclosureId, partIds };
}

/** The demo scene's own settings, as a variant stores them. */
export function demoSettings() {
	const scene = demoSceneInput();
	return {
		dividerPositions: { ...scene.dividerPositions } as Record<string, number>,
		bracketOffsets: { ...scene.bracketOffsets } as Record<string, number>,
		placements: [...(scene.placements ?? [])].map((p) => ({
			...p,
			rotation: { x: 0, y: 0, z: 0, ...p.rotation }
		})),
		marginMm: scene.marginMm ?? 2,
		budgets: { wattsPer120mm: 100, psuHeadroomPct: 30, ...scene.budgets }
	};
}

/** Forgets every tick of a build's variants, so a test starts from an empty checklist. */
export async function clearTicks(buildId: string) {
	const ids = (
		await db.select({ id: variants.id }).from(variants).where(eq(variants.buildId, buildId))
	).map((v) => v.id);
	if (ids.length) await db.delete(checklistTicks).where(inArray(checklistTicks.variantId, ids));
}
