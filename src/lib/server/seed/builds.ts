/**
 * The demo build: the demo sandwich enclosure with the engine's demo parts placed, where everything
 * fits with the spine at "3 slots" and the card collides at "2 slots". Two variants to compare.
 */
import { eq } from 'drizzle-orm';
import { DEMO_SPINE_OFFSETS, demoSceneInput } from '$lib/geometry/standard-library';
import { demoRoutedCables } from '$lib/loop/suggest';
import { variantSettingsSchema } from '$lib/builds/settings';
import { db } from '../db';
import { builds, variants } from '../db/schema';
import { ensureVersion } from '../versions';
import { DEMO_STUDIO, DEMO_USERS } from './accounts';

export const DEMO_BUILD_ID = 'demo-build';

export async function seedBuilds() {
	const scene = demoSceneInput();
	const settings = variantSettingsSchema.parse({
		dividerPositions: scene.dividerPositions,
		bracketOffsets: scene.bracketOffsets,
		placements: scene.placements,
		marginMm: scene.marginMm,
		budgets: scene.budgets,
		// Routed by the engine at seed time (about a second), so the demo opens with its cables clear.
		cables: demoRoutedCables()
	});
	await db
		.insert(builds)
		.values({
			id: DEMO_BUILD_ID,
			studioId: DEMO_STUDIO.id,
			name: 'Quiet desk build',
			clientName: 'Demo Client',
			notes: 'Sandwich layout, front 280 radiator, compact pump-reservoir on the card side.',
			enclosureVersionId: 'demo-enc-sandwich-v1',
			createdBy: DEMO_USERS[1].id
		})
		.onConflictDoNothing();
	await db
		.insert(variants)
		.values([
			{
				id: 'demo-variant-a',
				buildId: DEMO_BUILD_ID,
				name: 'Spine at three slots',
				sortOrder: 0,
				isProposal: true,
				settings
			},
			{
				id: 'demo-variant-b',
				buildId: DEMO_BUILD_ID,
				name: 'Spine at two slots',
				sortOrder: 1,
				isProposal: false,
				settings: {
					...settings,
					dividerPositions: { ...settings.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] }
				}
			}
		])
		.onConflictDoNothing();
	// Each demo variant starts at version 1 = its seeded state (idempotent: kept once made).
	for (const v of await db.select().from(variants).where(eq(variants.buildId, DEMO_BUILD_ID))) {
		await ensureVersion(v);
	}
}
