/**
 * The demo's client side: the demo build's proposal shared with the demo client (who finds it at
 * /s after signing in), and a sent quote so the deposit can be tried on the local payment fake.
 * Idempotent: nothing is added once the demo variant has a link.
 */
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { parts, shareLinks, variants } from '../db/schema';
import { createShareLink } from '../sharing/links';
import { ensureQuote, sendQuote, updateQuote } from '../sharing/quotes';
import { DEMO_STUDIO, DEMO_USERS } from './accounts';
import { DEMO_BUILD_ID } from './builds';

const DEMO_VARIANT = 'demo-variant-a';

/** Invented list prices by part kind, EUR cents. */
const INVENTED_PRICES: Record<string, number> = {
	board: 15_900,
	'cpu-block': 8_950,
	gpu: 42_000,
	'pump-reservoir': 13_400,
	pump: 9_900,
	reservoir: 5_900,
	radiator: 7_990,
	fan: 1_850,
	psu: 11_900,
	fitting: 650,
	drive: 6_900,
	other: 2_500
};

export async function seedSharing() {
	const [variant] = await db.select().from(variants).where(eq(variants.id, DEMO_VARIANT));
	if (!variant) return;
	const [existing] = await db
		.select({ id: shareLinks.id })
		.from(shareLinks)
		.where(eq(shareLinks.variantId, DEMO_VARIANT))
		.limit(1);
	if (existing) return;
	const designer = DEMO_USERS.find((u) => u.role === 'designer')!;
	const client = DEMO_USERS.find((u) => u.role === 'client')!;
	await createShareLink({
		studioId: DEMO_STUDIO.id,
		buildId: DEMO_BUILD_ID,
		variantId: DEMO_VARIANT,
		createdBy: designer.id,
		recipientEmail: client.email,
		recipientName: client.name
	});
	const q = await ensureQuote({
		studioId: DEMO_STUDIO.id,
		buildId: DEMO_BUILD_ID,
		variantId: DEMO_VARIANT,
		settings: variant.settings
	});
	// Invented figures: list prices where the catalogue has none, labour, 20 % tax, 30 % deposit.
	const categories = new Map(
		(await db.select({ id: parts.id, category: parts.category }).from(parts)).map((p) => [
			p.id,
			p.category
		])
	);
	const lines = q.lines.map((l) => ({
		id: l.id,
		description: l.description,
		quantity: l.quantity,
		remove: false,
		unitPriceMinor:
			l.unitPriceMinor ??
			INVENTED_PRICES[categories.get(l.partId ?? '') ?? 'other'] ??
			INVENTED_PRICES.other
	}));
	await updateQuote(q.quote.id, {
		currency: q.quote.currency,
		labourMinor: 15_000,
		labourNote: 'Assembly, leak test and cable work',
		taxRateBp: 2_000,
		depositKind: 'percent',
		depositValue: 3_000,
		notes: 'Parts are ordered once the deposit is in.',
		lines,
		added: []
	});
	await sendQuote(q.quote.id);
}
