/**
 * The seeded demo variant, put back exactly as scripts/seed.ts writes it (version 1, the demo
 * scene's settings), so browser tests that change it leave the seed for the others.
 */
import { eq } from 'drizzle-orm';
import { demoCables, demoSceneInput } from '../../src/lib/geometry/standard-library';
import { demoRoutedCables } from '../../src/lib/loop/suggest';
import { db } from '../../src/lib/server/db';
import { variants } from '../../src/lib/server/db/schema';
import { testDatabaseUrl } from '../../src/lib/server/testing/env';

export const DEMO_VARIANT = 'demo-variant-a';

/**
 * `cables: 'straight'` puts the standard library's cables in unrouted (drawn straight from plug to
 * plug, through whatever is between), for a test that routes them itself.
 */
export async function restoreDemoVariant(options: { cables?: 'routed' | 'straight' } = {}) {
	testDatabaseUrl();
	const s = demoSceneInput();
	const settings = {
		dividerPositions: s.dividerPositions,
		bracketOffsets: s.bracketOffsets,
		placements: s.placements,
		marginMm: s.marginMm,
		budgets: s.budgets,
		cables: options.cables === 'straight' ? demoCables() : demoRoutedCables()
	};
	await db
		.update(variants)
		.set({ settings, version: 1, updatedAt: new Date() })
		.where(eq(variants.id, DEMO_VARIANT));
}
