/**
 * Test data for the client work: a studio with members, the engine's demo enclosure and parts
 * (invented, generic) written straight to the database, a build and one variant placing them as
 * the engine's demo scene does. Relative imports only: Playwright loads this file too.
 */
import { eq } from 'drizzle-orm';
import { demoEnclosure, demoParts, demoSceneInput } from '../../geometry/standard-library';
import { boundsOf } from '../../geometry';
import { db } from '../db';
import { parts, variants } from '../db/schema';
import { insertBuild, insertEnclosure } from './builds';
import { studioWithMembers } from './factories';
import { newId } from '../tokens';
import { createShareLink } from '../sharing/links';

/** Invented list prices, minor units (EUR cents), keyed by the demo part ids. */
/** The quote form as the studio posts it: EUR, 150.00 labour, 20 % tax, a 30 % deposit. */
export const quoteFormFields = (extra: Record<string, string> = {}) => ({
	currency: 'EUR',
	labour: '150',
	labourNote: 'Assembly',
	tax: '20',
	depositKind: 'percent',
	depositValue: '30',
	notes: '',
	...extra
});

export const DEMO_PRICES: Record<string, number> = {
	'std-mini-itx': 15_900,
	'std-fan-140-25': 1_850,
	'demo-psu': 11_900,
	'demo-cpu-block': 8_950,
	'demo-card': 42_000,
	'demo-pump-res': 13_400,
	'demo-radiator-280': 7_990
};

export async function demoBuild(opts: {
	studioId: string;
	createdBy: string;
	prices?: boolean;
	name?: string;
}) {
	const enclosure = demoEnclosure();
	const enclosureId = newId();
	const versionId = newId();
	await insertEnclosure(db, {
		enclosureId,
		versionId,
		studioId: opts.studioId,
		definition: enclosure
	});
	const idMap = new Map<string, string>();
	for (const part of demoParts()) {
		const id = newId();
		idMap.set(part.id, id);
		const b = boundsOf(part.bodies.map((x) => x.box));
		await db.insert(parts).values({
			id,
			studioId: opts.studioId,
			name: part.name,
			category: part.category,
			definition: { ...part, id },
			widthMm: b.max[0] - b.min[0],
			heightMm: b.max[1] - b.min[1],
			depthMm: b.max[2] - b.min[2],
			priceMinor: opts.prices === false ? null : DEMO_PRICES[part.id],
			currency: 'EUR',
			provenance: part.provenance
		});
	}
	const scene = demoSceneInput();
	const settings = {
		dividerPositions: scene.dividerPositions,
		bracketOffsets: scene.bracketOffsets,
		placements: scene.placements!.map((p) => ({ ...p, partId: idMap.get(p.partId)! })),
		marginMm: scene.marginMm,
		budgets: scene.budgets
	};
	const buildId = newId();
	const variantId = newId();
	await insertBuild(db, {
		studioId: opts.studioId,
		enclosureVersionId: versionId,
		createdBy: opts.createdBy,
		build: { id: buildId, name: opts.name ?? 'Compact sandwich build', clientName: 'A. Client' },
		variant: { id: variantId, name: 'Variant A', isProposal: true, settings }
	});
	return { buildId, variantId, enclosureVersionId: versionId, partIds: idMap, settings };
}

export async function variantRow(variantId: string) {
	const [v] = await db.select().from(variants).where(eq(variants.id, variantId));
	return v;
}

/** A live link to the build's variant, made by the studio's designer for the studio's client. */
export function shareWithClient(
	f: { studio: { id: string }; designer: { id: string }; client: { email: string } },
	b: { buildId: string; variantId: string },
	opts: { recipientName?: string; expiresAt?: Date | null } = {}
) {
	return createShareLink({
		studioId: f.studio.id,
		buildId: b.buildId,
		variantId: b.variantId,
		createdBy: f.designer.id,
		recipientEmail: f.client.email,
		...opts
	});
}

/** A studio (owner, designer, client, and an outsider elsewhere), a demo build, and a live link for the client. */
export async function sharedDemo(opts: { expiresAt?: Date | null } = {}) {
	const f = await studioWithMembers();
	const build = await demoBuild({ studioId: f.studio.id, createdBy: f.designer.id });
	const share = await shareWithClient(f, build, {
		recipientName: 'A. Client',
		expiresAt: opts.expiresAt ?? null
	});
	return { ...f, ...build, link: share.link, token: share.token };
}
