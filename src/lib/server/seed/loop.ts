/**
 * The demo studio's loop catalogue: invented generic tube kinds and fittings (no maker names;
 * bend radii and insertion depths from memory), its cut allowance, and ports on the demo pump,
 * block and radiator where their stored definitions have none. Idempotent.
 */
import { eq, inArray } from 'drizzle-orm';
import { partDefSchema, type PartDef } from '$lib/geometry';
import { defaultFittings, defaultTubeKinds } from '$lib/geometry/loop-library';
import { demoParts } from '$lib/geometry/standard-library';
import { checkPart } from '$lib/catalog/schemas';
import { db } from '../db';
import { parts, studioLoopSettings, tubeKinds } from '../db/schema';
import { partColumns } from '../catalog/parts';
import { DEFAULT_CUT_ALLOWANCE_PCT } from '../loop';
import { DEMO_STUDIO } from './accounts';

/** Invented prices per metre (EUR cents) and per fitting. */
const TUBE_PRICES: Record<string, number> = {
	'soft-10-13': 450,
	'soft-10-16': 550,
	'hard-12': 700,
	'hard-14': 800,
	'hard-16': 900
};
const FITTING_PRICES: Record<string, number> = {
	'fit-straight-16': 700,
	'fit-straight-soft': 500,
	'fit-45-16': 900,
	'fit-rotary-16': 1100,
	'fit-extension-10': 600,
	'fit-qd': 2900,
	'plug-g14': 300
};

/**
 * Ports the demo parts get when their stored definition has none: the engine's demo parts' own
 * (G 1/4, part frames; the radiator's and pump-reservoir's face the tube cut-outs).
 */
const DEMO_PORTS: Record<string, PartDef['ports']> = Object.fromEntries(
	demoParts()
		.filter((p) => p.ports.length > 0)
		.map((p) => [p.id, p.ports])
);

/** The older demo fittings, told what kind they are (those rows keep their prices). */
const DEMO_FITTING_KINDS: Record<string, Partial<PartDef['specs']>> = {
	'demo-fitting-90': { fittingKind: 'rotary', insertionDepthMm: 10 },
	'demo-fitting-16': { fittingKind: 'straight', insertionDepthMm: 10 },
	'demo-fitting-qd': { fittingKind: 'quick-disconnect', insertionDepthMm: 10 }
};

export const demoTubeKindId = (id: string) => `demo-${id}`;
export const demoFittingId = (id: string) => `demo-${id}`;

export async function seedLoopCatalogue() {
	for (const t of defaultTubeKinds()) {
		const id = demoTubeKindId(t.id);
		await db
			.insert(tubeKinds)
			.values({
				id,
				studioId: DEMO_STUDIO.id,
				name: t.name,
				definition: { ...t, id },
				pricePerMetreMinor: TUBE_PRICES[t.id] ?? null,
				currency: 'EUR'
			})
			.onConflictDoNothing();
	}
	await db
		.insert(studioLoopSettings)
		.values({ studioId: DEMO_STUDIO.id, cutAllowancePct: DEFAULT_CUT_ALLOWANCE_PCT })
		.onConflictDoNothing();
	for (const f of defaultFittings()) {
		const id = demoFittingId(f.id);
		const checked = checkPart({ ...f, priceMinor: FITTING_PRICES[f.id] ?? null }, id);
		if (!checked.ok) throw new Error(`seed fitting ${id}: ${JSON.stringify(checked.issues)}`);
		await db
			.insert(parts)
			.values({ id, studioId: DEMO_STUDIO.id, ...partColumns(checked.def, checked.extras) })
			.onConflictDoNothing();
	}
	const ids = [...Object.keys(DEMO_PORTS), ...Object.keys(DEMO_FITTING_KINDS)];
	const rows = await db
		.select({ id: parts.id, definition: parts.definition })
		.from(parts)
		.where(inArray(parts.id, ids));
	for (const row of rows) {
		const def = partDefSchema.parse(row.definition);
		const ports = DEMO_PORTS[row.id];
		const kind = DEMO_FITTING_KINDS[row.id];
		const next: PartDef = { ...def };
		if (ports && def.ports.length === 0) next.ports = ports;
		if (kind && def.specs.fittingKind === undefined) next.specs = { ...def.specs, ...kind };
		if (next.ports === def.ports && next.specs === def.specs) continue;
		await db
			.update(parts)
			.set({ definition: partDefSchema.parse(next), updatedAt: new Date() })
			.where(eq(parts.id, row.id));
	}
}
