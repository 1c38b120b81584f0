/**
 * Versions and the freeze an approval puts on a variant, against the real PostgreSQL and through
 * the built app: a write to a frozen variant gets 409 with the reason and writes nothing; asking
 * for changes unfreezes it; a client member finds what was sent to their address, with its status.
 */
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { DEMO_SPINE_OFFSETS } from '$lib/geometry/standard-library';
import {
	deleteVariant,
	forkVariant,
	loadVariant,
	moveOn,
	saveVariantSettings,
	VariantRuleError
} from './builds';
import { db } from './db';
import { variantRevisions, variantVersions } from './db/schema';
import { sharedWithMember } from './sharing/shared';
import { sharedDemo, variantRow } from './testing/sharing';
import { approveVersion, requestChanges, type Author } from './sharing/thread';
import { useApp } from './testing/suite';
import { frozenState, latestVersion, saveVersion, versionsOf } from './versions';

const app = useApp();

type Shared = Awaited<ReturnType<typeof sharedDemo>>;
const clientAuthor = (s: Shared): Author => ({
	userId: null,
	shareLinkId: s.link.id,
	name: 'A. Client',
	side: 'client'
});

async function approveFirst(s: Shared) {
	const loaded = await loadVariant(s.buildId, s.studio.id, s.enclosureVersionId, s.variantId);
	const result = await approveVersion({
		buildId: s.buildId,
		variantId: s.variantId,
		variantVersion: 1,
		author: clientAuthor(s),
		message: '',
		scene: loaded!.scene
	});
	expect(result.ok).toBe(true);
}

const revisionCount = (variantId: string) =>
	db.$count(variantRevisions, eq(variantRevisions.variantId, variantId));
const moved = (s: Shared) => ({
	...s.settings,
	dividerPositions: { ...s.settings.dividerPositions, spine: DEMO_SPINE_OFFSETS['4 slots'] }
});

describe('a frozen variant', () => {
	const put = (s: Shared, session: string, version: number, settings: unknown) =>
		app.client({ session }).request('PUT', `/api/builds/${s.buildId}/variants/${s.variantId}`, {
			body: JSON.stringify({ version, settings }),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app.baseURL
			}
		});

	it('refuses an autosave with 409 and the reason, and writes nothing', async () => {
		const s = await sharedDemo();
		await approveFirst(s);
		const before = await variantRow(s.variantId);
		const revisions = await revisionCount(s.variantId);
		const res = await put(s, s.designer.session, before.version, moved(s));
		expect(res.status, res.text).toBe(409);
		expect(res.json<{ message: string }>().message).toMatch(
			/^Read-only: Version 1 was approved by A\. Client on \d{1,2} \w{3} \d{4}\. To change it, start a new variant from it\.$/
		);
		const after = await variantRow(s.variantId);
		expect(after.version).toBe(before.version);
		expect(after.settings).toEqual(before.settings);
		expect(await revisionCount(s.variantId)).toBe(revisions);
	});

	it('refuses a new version, deletion and moving the build on; a new variant from it copies the approved version and numbers on from it', async () => {
		const s = await sharedDemo();
		await approveFirst(s);
		await expect(
			saveVersion({
				buildId: s.buildId,
				variantId: s.variantId,
				expectedRevision: (await variantRow(s.variantId)).version,
				note: 'x',
				userId: s.designer.id
			})
		).rejects.toThrow(/^Read-only:/);
		const copy = await forkVariant(s.buildId, s.variantId, undefined, { fromVersion: true });
		await expect(deleteVariant(s.buildId, s.variantId)).rejects.toThrow(
			/Read-only: .* It cannot be deleted\./
		);
		await expect(
			moveOn(
				{ id: s.buildId, studioId: s.studio.id, enclosureVersionId: s.enclosureVersionId },
				'none'
			)
		).rejects.toBeInstanceOf(VariantRuleError);
		expect((await frozenState(copy)).frozen).toBe(false);
		const fork = await variantRow(copy);
		expect(fork.settings).toEqual((await latestVersion(s.variantId))!.settings);
		expect(fork.isProposal).toBe(true);
		const saved = await saveVariantSettings({
			buildId: s.buildId,
			studioId: s.studio.id,
			enclosureVersionId: s.enclosureVersionId,
			variantId: copy,
			expectedVersion: fork.version,
			settings: moved(s)
		});
		expect(saved.ok).toBe(true);
		const v = await saveVersion({
			buildId: s.buildId,
			variantId: copy,
			expectedRevision: fork.version + 1,
			note: 'Spine at four slots',
			userId: s.designer.id
		});
		expect(v).toMatchObject({ ok: true, version: { number: 2, note: 'Spine at four slots' } });
	});

	it('opens again when the client asks for changes; re-approving freezes it again', async () => {
		const s = await sharedDemo();
		await approveFirst(s);
		const before = await variantRow(s.variantId);
		expect((await put(s, s.designer.session, before.version, moved(s))).status).toBe(409);
		await requestChanges({
			buildId: s.buildId,
			variantId: s.variantId,
			variantVersion: 1,
			author: clientAuthor(s),
			message: 'Four slots, please.'
		});
		expect((await frozenState(s.variantId)).frozen).toBe(false);
		const ok = await put(s, s.designer.session, before.version, moved(s));
		expect(ok.status, ok.text).toBe(200);
		expect(await revisionCount(s.variantId)).toBeGreaterThan(0);
		// The client approves version 1 again as it is: the unsent revision is set aside.
		await approveFirst(s);
		expect((await frozenState(s.variantId)).frozen).toBe(true);
		expect((await variantRow(s.variantId)).settings).toEqual(
			(await latestVersion(s.variantId))!.settings
		);
	});
});

describe('versions', () => {
	it('only a change makes a new version; the number counts up and the note is kept', async () => {
		const s = await sharedDemo();
		const v = await variantRow(s.variantId);
		const first = await saveVersion({
			buildId: s.buildId,
			variantId: s.variantId,
			expectedRevision: v.version,
			note: 'First look',
			userId: s.designer.id
		});
		expect(first).toMatchObject({ ok: true, version: { number: 1 } });
		const same = await saveVersion({
			buildId: s.buildId,
			variantId: s.variantId,
			expectedRevision: v.version,
			note: 'nothing',
			userId: s.designer.id
		});
		expect(same).toMatchObject({ ok: false, reason: 'unchanged', version: { number: 1 } });
		await saveVariantSettings({
			buildId: s.buildId,
			studioId: s.studio.id,
			enclosureVersionId: s.enclosureVersionId,
			variantId: s.variantId,
			expectedVersion: v.version,
			settings: moved(s)
		});
		expect(
			await saveVersion({
				buildId: s.buildId,
				variantId: s.variantId,
				expectedRevision: v.version,
				note: 'stale',
				userId: s.designer.id
			})
		).toMatchObject({ ok: false, reason: 'stale' });
		expect(
			await saveVersion({
				buildId: s.buildId,
				variantId: s.variantId,
				expectedRevision: v.version + 1,
				note: 'Spine one slot over',
				userId: s.designer.id
			})
		).toMatchObject({ ok: true, version: { number: 2 } });
		expect((await versionsOf(s.variantId)).map((x) => [x.number, x.note])).toEqual([
			[2, 'Spine one slot over'],
			[1, 'First look']
		]);
		expect(await db.$count(variantVersions, eq(variantVersions.variantId, s.variantId))).toBe(2);
	});
});

describe('a client member’s builds', () => {
	it('lists the variant whose link was sent to their address, with its status, on the builds page', async () => {
		const s = await sharedDemo();
		const listed = await sharedWithMember(s.client);
		expect(listed.map((x) => [x.variantId, x.version, x.status])).toEqual([
			[s.variantId, null, 'waiting']
		]);
		const c = app.client({ session: s.client.session });
		const page = await c.get('/builds');
		expect(page.status).toBe(200);
		expect(page.text).toContain('Compact sandwich build');
		expect(page.text).toContain('waiting for you');
		await approveFirst(s);
		expect((await sharedWithMember(s.client)).map((x) => [x.version, x.status])).toEqual([
			[1, 'approved']
		]);
		expect((await c.get('/builds')).text).toContain('approved');
		// Nobody else sees it: another studio's member, the designer (not a client member).
		expect(await sharedWithMember(s.outsider)).toEqual([]);
		expect(await sharedWithMember(s.designer)).toEqual([]);
	});
});
