/** Approvals freeze the version the client saw; comments keep their part; the client view leaks no ids. */
import { eq } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { loadVariant, saveVariantSettings } from '../builds';
import { closeDb, db } from '../db';
import { approvals, builds, studios } from '../db/schema';
import { testDatabaseUrl } from '../testing/env';
import {
	approvalState,
	approveVersion,
	latestApproval,
	requestChanges,
	threadOf,
	addComment,
	type Author
} from './thread';
import { sharedDemo, variantRow } from '../testing/sharing';
import { VariantFrozen, saveVersion } from '../versions';
import { clientView } from './view';

testDatabaseUrl();
afterAll(closeDb);

const client = (linkId: string): Author => ({
	userId: null,
	shareLinkId: linkId,
	name: 'A. Client',
	side: 'client'
});

/** Who writes and about what: the shared build's variant at a version, as the link's client. */
function asClient(s: Awaited<ReturnType<typeof sharedDemo>>, variantVersion: number) {
	return {
		buildId: s.buildId,
		variantId: s.variantId,
		variantVersion,
		author: client(s.link.id)
	};
}

async function sceneOf(s: Awaited<ReturnType<typeof sharedDemo>>) {
	const loaded = await loadVariant(s.buildId, s.studio.id, s.enclosureVersionId, s.variantId);
	return loaded!.scene;
}

describe('approval freezes a version', () => {
	it('approves exactly the version seen; the variant is then read-only until the client asks for changes, and a newer version needs its own approval', async () => {
		const s = await sharedDemo();
		const v1 = await variantRow(s.variantId);
		const scene1 = await sceneOf(s);
		const first = await approveVersion({
			...asClient(s, 1),
			message: 'Looks right.',
			scene: scene1
		});
		expect(first.ok).toBe(true);
		expect(approvalState(await latestApproval(s.variantId), 1)?.current).toBe(true);

		// The designer tries to move the spine one step: refused, the variant is frozen.
		const moved = {
			...s.settings,
			dividerPositions: { ...s.settings.dividerPositions, spine: 65.68 }
		};
		const save = () =>
			saveVariantSettings({
				buildId: s.buildId,
				studioId: s.studio.id,
				enclosureVersionId: s.enclosureVersionId,
				variantId: s.variantId,
				expectedVersion: v1.version,
				settings: moved
			});
		await expect(save()).rejects.toBeInstanceOf(VariantFrozen);

		// The client asks for changes: the designer may change it and save version 2.
		await requestChanges({
			...asClient(s, 1),
			message: 'The spine one slot over, please.'
		});
		expect((await save()).ok).toBe(true);
		const v2 = await saveVersion({
			buildId: s.buildId,
			variantId: s.variantId,
			expectedRevision: v1.version + 1,
			note: 'Spine one slot over',
			userId: s.designer.id
		});
		expect(v2).toMatchObject({ ok: true, version: { number: 2 } });

		const state = approvalState(await latestApproval(s.variantId), 2);
		expect(state).toMatchObject({ version: 1, current: false });
		// The approved scene is kept as it was, not as it is now.
		const [frozen] = await db.select().from(approvals).where(eq(approvals.variantId, s.variantId));
		expect((frozen.scene as typeof scene1).dividerPositions.spine).toBe(
			scene1.dividerPositions.spine
		);
		expect((frozen.scene as typeof scene1).dividerPositions.spine).not.toBe(65.68);

		// Approving the old version again is refused: the client must look at the new one.
		const stale = await approveVersion({
			...asClient(s, 1),
			message: '',
			scene: scene1
		});
		expect(stale).toMatchObject({ ok: false, reason: 'changed', currentVersion: 2 });

		const second = await approveVersion({
			...asClient(s, 2),
			message: '',
			scene: await sceneOf(s)
		});
		expect(second.ok).toBe(true);
		expect(approvalState(await latestApproval(s.variantId), 2)).toMatchObject({
			version: 2,
			current: true
		});
	});

	it('approving the same version twice keeps one approval', async () => {
		const s = await sharedDemo();
		const v = await variantRow(s.variantId);
		const scene = await sceneOf(s);
		await approveVersion({
			...asClient(s, v.version),
			message: '',
			scene
		});
		const again = await approveVersion({
			...asClient(s, v.version),
			message: '',
			scene
		});
		expect(again).toMatchObject({ ok: false, reason: 'already' });
		expect(await db.$count(approvals, eq(approvals.variantId, s.variantId))).toBe(1);
	});

	it('puts approvals and change requests in the one thread, in order', async () => {
		const s = await sharedDemo();
		const v = await variantRow(s.variantId);
		await addComment({
			...asClient(s, v.version),
			body: 'Is the pump reachable?',
			placementId: 'pump-res',
			partLabel: 'pump-reservoir'
		});
		await requestChanges({
			...asClient(s, v.version),
			message: 'A larger radiator, please.'
		});
		await approveVersion({
			...asClient(s, v.version),
			message: '',
			scene: await sceneOf(s)
		});
		expect((await threadOf(s.variantId)).map((c) => c.kind)).toEqual([
			'comment',
			'changes',
			'approved'
		]);
	});
});

describe('the client view', () => {
	it('carries no database id of the studio, build, variant, parts or placements', async () => {
		const s = await sharedDemo();
		const [build] = await db.select().from(builds).where(eq(builds.id, s.buildId));
		const [studio] = await db.select().from(studios).where(eq(studios.id, s.studio.id));
		const v = await variantRow(s.variantId);
		const { view } = await clientView({
			build,
			variant: v,
			studioName: studio.name,
			sharedBy: 'Designer',
			viewer: { kind: 'link', scopeKey: s.link.tokenHash, mayPay: true }
		});
		const text = JSON.stringify(view);
		for (const id of [
			s.studio.id,
			s.buildId,
			s.variantId,
			s.enclosureVersionId,
			s.link.id,
			s.link.tokenHash,
			s.designer.id,
			...s.partIds.values()
		]) {
			expect(text).not.toContain(id);
		}
		const originalPlacementIds = s.settings.placements.map((p) => p.id);
		for (const p of view.scene.placements) expect(originalPlacementIds).not.toContain(p.id);
		expect(view.placed.map((p) => p.ref)).toEqual(
			s.settings.placements.map((_, i) => `part-${String(i + 1).padStart(3, '0')}`).sort()
		);
		// Eight parts placed, seven different ones (two fans): the list groups them.
		expect(view.lines.reduce((n, l) => n + l.quantity, 0)).toBe(8);
		expect(view.lines.find((l) => l.category === 'Fan')?.quantity).toBe(2);
	});
});
