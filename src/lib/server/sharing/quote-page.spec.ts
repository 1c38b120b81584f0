/**
 * The studio's quote page: opening it writes nothing (a GET never starts a quote; "Start the
 * quote" does), and a currency must be an assigned ISO 4217 code (QQQ is well formed but is no
 * currency), on the quote and on a catalogue part alike.
 */
import { count, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { testPart } from '../testing/catalog-access-rows';
import { db } from '../db';
import { parts, payments, quoteLines, quotes } from '../db/schema';
import { studioWithMembers } from '../testing/factories';
import { useApp } from '../testing/suite';
import { demoBuild, quoteFormFields } from '../testing/sharing';

const app = useApp();

async function rowCounts() {
	const n = async (t: typeof quotes | typeof quoteLines | typeof payments) =>
		(await db.select({ n: count() }).from(t))[0].n;
	return { quotes: await n(quotes), lines: await n(quoteLines), payments: await n(payments) };
}

async function setUp() {
	const f = await studioWithMembers();
	const b = await demoBuild({ studioId: f.studio.id, createdBy: f.designer.id });
	const c = app.client({ session: f.designer.session });
	return { f, b, c, page: `/builds/${b.buildId}/quote/${b.variantId}` };
}

describe('the quote page', () => {
	it('a GET writes nothing; the quote starts on "Start the quote"', async () => {
		const { b, c, page } = await setUp();
		const before = await rowCounts();
		for (let i = 0; i < 3; i++) {
			const res = await c.get(page);
			expect(res.status).toBe(200);
			expect(res.text).toContain('Start the quote');
		}
		expect(await rowCounts()).toEqual(before);
		expect(await db.$count(quotes, eq(quotes.variantId, b.variantId))).toBe(0);

		expect((await c.action(`${page}?/create`, {})).type).toBe('success');
		const [q] = await db.select().from(quotes).where(eq(quotes.variantId, b.variantId));
		expect(q).toMatchObject({ status: 'draft', currency: 'EUR' });
		expect(await db.$count(quoteLines, eq(quoteLines.quoteId, q.id))).toBeGreaterThan(0);
		const after = await rowCounts();
		// Starting it again (a second click, another tab) keeps the one quote.
		expect((await c.action(`${page}?/create`, {})).type).toBe('success');
		expect(await rowCounts()).toEqual(after);
		expect((await c.get(page)).text).toContain('Save quote');
	});

	it('refuses currency QQQ with a field error and stores nothing', async () => {
		const { b, c, page } = await setUp();
		expect((await c.action(`${page}?/create`, {})).type).toBe('success');
		const [before] = await db.select().from(quotes).where(eq(quotes.variantId, b.variantId));
		const res = await c.action(`${page}?/save`, quoteFormFields({ currency: 'QQQ' }));
		expect(res.type).toBe('failure');
		expect(res.status).toBe(400);
		expect(res.data.errors.currency).toBe('Use an ISO 4217 currency code such as EUR, GBP or USD.');
		const [after] = await db.select().from(quotes).where(eq(quotes.id, before.id));
		expect(after).toEqual(before);
		// An assigned code is taken.
		expect((await c.action(`${page}?/save`, quoteFormFields({ currency: 'GBP' }))).type).toBe(
			'success'
		);
		expect((await db.select().from(quotes).where(eq(quotes.id, before.id)))[0].currency).toBe(
			'GBP'
		);
	});
});

describe('a catalogue part', () => {
	it('refuses currency QQQ through the API, naming the field', async () => {
		const { f } = await setUp();
		const c = app.client({ session: f.designer.session });
		const before = await db.$count(parts);
		const res = await c.request('POST', '/api/parts', {
			body: JSON.stringify({ ...testPart('Currency probe'), priceMinor: 1000, currency: 'QQQ' }),
			headers: { 'content-type': 'application/json', origin: app.baseURL }
		});
		expect(res.status, res.text).toBe(400);
		expect(JSON.stringify(res.json())).toContain('currency');
		expect(await db.$count(parts)).toBe(before);
	});
});
