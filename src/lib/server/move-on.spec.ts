import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { DEMO_SPINE_OFFSETS, demoEnclosure } from '$lib/geometry/standard-library';
import { variantSettingsSchema } from '$lib/builds/settings';
import { createEnclosure, getEnclosure, updateEnclosure } from './catalog/enclosures';
import { createBuild, moveOn, planMoveOn, saveVariantSettings, variantsOf } from './builds';
import { db } from './db';
import { builds } from './db/schema';
import { createStudio, createUser } from './testing/factories';
import './testing/env';

/** A build on v1 of an enclosure whose v2 drops the spine's "2 slots" position. */
async function setUp() {
	const studio = await createStudio();
	const user = await createUser({ activeStudioId: studio.id });
	const created = await createEnclosure(studio.id, user.id, { definition: demoEnclosure() });
	if (!created.ok) throw new Error('enclosure not created');
	const enclosureId = created.value.id;
	const buildId = await createBuild({
		studioId: studio.id,
		userId: user.id,
		name: 'Move-on test',
		clientName: '',
		notes: '',
		enclosureId
	});
	const [variant] = await variantsOf(buildId);
	const settings = variantSettingsSchema.parse(variant.settings);
	const saved = await saveVariantSettings({
		buildId,
		studioId: studio.id,
		enclosureVersionId: (await db.select().from(builds).where(eq(builds.id, buildId)))[0]
			.enclosureVersionId,
		variantId: variant.id,
		expectedVersion: variant.version,
		settings: {
			...settings,
			dividerPositions: { ...settings.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] }
		}
	});
	expect(saved.ok).toBe(true);
	const v2 = demoEnclosure();
	const spine = v2.dividers.find((d) => d.id === 'spine')!;
	if (spine.positions.kind === 'list') {
		spine.positions.options = spine.positions.options.filter((o) => o.label !== '2 slots');
	}
	const detail = (await getEnclosure(studio.id, enclosureId))!;
	const updated = await updateEnclosure(studio.id, enclosureId, detail.revision, user.id, {
		definition: v2,
		note: 'spine loses its outermost position'
	});
	expect(updated.ok && updated.created).toBe(true);
	const [build] = await db.select().from(builds).where(eq(builds.id, buildId));
	return { build, variantId: variant.id };
}

describe('moving a build on to a newer enclosure version', () => {
	it('shows what would change without changing anything, then moves every variant in one go', async () => {
		const { build, variantId } = await setUp();
		const plan = (await planMoveOn(build))!;
		expect(plan.from.version).toBe(1);
		expect(plan.to?.version).toBe(2);
		const v = plan.variants.find((x) => x.id === variantId)!;
		expect(v.resets).toEqual([
			`Spine: ${DEMO_SPINE_OFFSETS['2 slots']} mm is not allowed any more; set to ${DEMO_SPINE_OFFSETS['4 slots']} mm`
		]);
		// Planning wrote nothing: the build is still pinned to v1.
		const [still] = await db.select().from(builds).where(eq(builds.id, build.id));
		expect(still.enclosureVersionId).toBe(build.enclosureVersionId);

		await moveOn(build, plan.to!.id);
		const [moved] = await db.select().from(builds).where(eq(builds.id, build.id));
		expect(moved.enclosureVersionId).toBe(plan.to!.id);
		const [after] = await variantsOf(build.id);
		expect(variantSettingsSchema.parse(after.settings).dividerPositions.spine).toBe(
			DEMO_SPINE_OFFSETS['4 slots']
		);
		expect(after.version).toBeGreaterThan(1);
	});

	it('refuses a stale plan: the version named must still be the current one', async () => {
		const { build } = await setUp();
		await expect(moveOn(build, 'some-other-version')).rejects.toThrow(/changed again/);
	});
});
