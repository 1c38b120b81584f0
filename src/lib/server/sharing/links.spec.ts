/** Share links: what is stored, when a link stops working, and that the token is never kept. */
import { createHash } from 'node:crypto';
import { eq } from 'drizzle-orm';
import { afterAll, describe, expect, it } from 'vitest';
import { closeDb, db } from '../db';
import { shareLinks } from '../db/schema';
import { hashToken, newToken } from '../tokens';
import { testDatabaseUrl } from '../testing/env';
import {
	createShareLink,
	linksOfBuild,
	looksLikeToken,
	recordOpened,
	resolveShareToken,
	revokeShareLink
} from './links';
import { sharedDemo } from '../testing/sharing';

testDatabaseUrl();
afterAll(closeDb);

describe('token hashing', () => {
	it('hashes with SHA-256 (FIPS 180-4 test vector for "abc")', () => {
		expect(hashToken('abc')).toBe(
			'ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad'
		);
	});

	it('makes tokens of 256 random bits (43 base64url characters), all different', () => {
		const tokens = Array.from({ length: 200 }, newToken);
		for (const t of tokens) {
			expect(t).toMatch(/^[A-Za-z0-9_-]{43}$/);
			expect(Buffer.from(t, 'base64url').length * 8).toBeGreaterThanOrEqual(128);
			expect(looksLikeToken(t)).toBe(true);
		}
		expect(new Set(tokens).size).toBe(tokens.length);
	});

	it('stores only the hash: the token appears nowhere in the row', async () => {
		const s = await sharedDemo();
		const [row] = await db.select().from(shareLinks).where(eq(shareLinks.id, s.link.id));
		expect(row.tokenHash).toBe(createHash('sha256').update(s.token).digest('hex'));
		expect(JSON.stringify(row)).not.toContain(s.token);
		const found = await resolveShareToken(s.token);
		expect(found.state).toBe('ok');
	});

	it.each([
		['empty', ''],
		['too short', 'abc'],
		['one character off', null],
		['with a slash', 'a'.repeat(42) + '/'],
		['right shape, never issued', 'A'.repeat(43)]
	])('a token that is %s is missing', async (_label, token) => {
		const s = await sharedDemo();
		const probe = token ?? (s.token[0] === 'A' ? 'B' : 'A') + s.token.slice(1);
		expect((await resolveShareToken(probe)).state).toBe('missing');
	});
});

describe('revocation and expiry', () => {
	it('a revoked link stops working at once and says so; revoking twice is refused', async () => {
		const s = await sharedDemo();
		expect(await revokeShareLink(s.buildId, s.link.id)).toBe(true);
		expect((await resolveShareToken(s.token)).state).toBe('revoked');
		expect(await revokeShareLink(s.buildId, s.link.id)).toBe(false);
	});

	it('revoking needs the link’s own build', async () => {
		const a = await sharedDemo();
		const b = await sharedDemo();
		expect(await revokeShareLink(b.buildId, a.link.id)).toBe(false);
		expect((await resolveShareToken(a.token)).state).toBe('ok');
	});

	it('works until its expiry, and not from that instant on', async () => {
		const s = await sharedDemo();
		const expiresAt = new Date(Date.now() + 60_000);
		const { token } = await createShareLink({
			studioId: s.studio.id,
			buildId: s.buildId,
			variantId: s.variantId,
			createdBy: s.designer.id,
			expiresAt
		});
		expect((await resolveShareToken(token, new Date(expiresAt.getTime() - 1))).state).toBe('ok');
		const at = await resolveShareToken(token, expiresAt);
		expect(at.state).toBe('expired');
		if (at.state === 'expired') expect(at.expiredAt.getTime()).toBe(expiresAt.getTime());
	});

	it('lists each link with its state, recipient and when it was last opened', async () => {
		const s = await sharedDemo();
		const other = await createShareLink({
			studioId: s.studio.id,
			buildId: s.buildId,
			variantId: s.variantId,
			createdBy: s.designer.id,
			expiresAt: new Date(Date.now() - 1000)
		});
		await recordOpened(s.link.id);
		await recordOpened(s.link.id);
		const list = await linksOfBuild(s.buildId);
		const mine = list.find((l) => l.id === s.link.id)!;
		expect(mine).toMatchObject({ state: 'active', recipientEmail: s.client.email, openCount: 2 });
		expect(mine.lastOpenedAt).toBeInstanceOf(Date);
		expect(list.find((l) => l.id === other.link.id)!.state).toBe('expired');
	});
});
