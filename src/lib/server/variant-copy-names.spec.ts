/** Copied variants get readable names that stay unique in their build (real PostgreSQL). */
import { afterAll, describe, expect, it } from 'vitest';
import { forkVariant } from './builds';
import { sharedDemo, variantRow } from './testing/sharing';
import { closeDb } from './db';
import { testDatabaseUrl } from './testing/env';

testDatabaseUrl();
afterAll(closeDb);

describe('copying a variant', () => {
	it('names copies "<name> — copy", "— copy 2", "— copy 3", also when a copy is copied', async () => {
		const s = await sharedDemo();
		const source = (await variantRow(s.variantId)).name;
		const first = await forkVariant(s.buildId, s.variantId);
		const second = await forkVariant(s.buildId, s.variantId);
		const ofCopy = await forkVariant(s.buildId, first);
		expect((await variantRow(first)).name).toBe(`${source} — copy`);
		expect((await variantRow(second)).name).toBe(`${source} — copy 2`);
		expect((await variantRow(ofCopy)).name).toBe(`${source} — copy 3`);
	});
});
