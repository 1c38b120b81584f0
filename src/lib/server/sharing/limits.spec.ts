/** Guessing tokens and flooding the thread are slowed down per client address (counters in PostgreSQL). */
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '../db';
import { comments } from '../db/schema';
import { limits } from '../rate-limit';
import { randomLoopback } from '../testing/client';
import { useApp } from '../testing/suite';
import { sharedDemo } from '../testing/sharing';

const app = useApp();

describe('token guessing', () => {
	it(`after ${limits.shareToken.max} wrong tokens an address is refused, even for a right one; other addresses are not`, async () => {
		const s = await sharedDemo();
		const guesser = app.client({ address: randomLoopback() });
		for (let i = 0; i < limits.shareToken.max; i++) {
			const res = await guesser.get(`/s/${String(i).padStart(43, 'g')}`);
			expect(res.status).toBe(404);
		}
		expect((await guesser.get(`/s/${'h'.repeat(43)}`)).status).toBe(429);
		const blocked = await guesser.get(`/s/${s.token}`);
		expect(blocked.status).toBe(429);
		expect(Number(blocked.header('retry-after'))).toBeGreaterThan(0);
		expect((await app.client({ address: randomLoopback() }).get(`/s/${s.token}`)).status).toBe(200);
	});

	it('using a good link many times is never slowed down', async () => {
		const s = await sharedDemo();
		const reader = app.client({ address: randomLoopback() });
		for (let i = 0; i < limits.shareToken.max + 5; i++) {
			expect((await reader.get(`/s/${s.token}`)).status).toBe(200);
		}
	});
});

describe('comment flooding', () => {
	it(`takes ${limits.comment.max} comments from one address on one link, then answers 429 and stores nothing more`, async () => {
		const s = await sharedDemo();
		const c = app.client({ address: randomLoopback() });
		for (let i = 0; i < limits.comment.max; i++) {
			const r = await c.action(`/s/${s.token}?/comment`, {
				body: `Question ${i}`,
				part: '',
				version: 1
			});
			expect(r.type).toBe('success');
		}
		const over = await c.postForm(`/s/${s.token}?/comment`, {
			body: 'One too many',
			part: '',
			version: 1
		});
		expect(over.status).toBe(429);
		expect(await db.$count(comments, eq(comments.variantId, s.variantId))).toBe(limits.comment.max);
	});

	it.each([
		['empty', { body: '   ', part: '', version: 1 }, 'body'],
		['too long', { body: 'x'.repeat(4001), part: '', version: 1 }, 'body'],
		['with control characters', { body: 'hello\u0007', part: '', version: 1 }, 'body'],
		['pinned to no such part', { body: 'Which one?', part: 'part-999', version: 1 }, 'part'],
		['pinned to something not a part', { body: 'Which one?', part: '../x', version: 1 }, 'part']
	])('refuses a comment that is %s', async (_label, form, field) => {
		const s = await sharedDemo();
		const r = await app
			.client({ address: randomLoopback() })
			.action(`/s/${s.token}?/comment`, form);
		expect(r.type).toBe('failure');
		expect(r.status).toBe(400);
		expect(r.data.errors[field]).toBeTruthy();
		expect(await db.$count(comments, eq(comments.variantId, s.variantId))).toBe(0);
	});
});
