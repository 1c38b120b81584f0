/**
 * The catalogue's tube kinds page through the built app, on the real PostgreSQL: the access
 * matrix, adding and editing a kind, bad input answered on its field with nothing written, a stale
 * edit answered 409, retiring (the editor's picker no longer offers it; old loops still load it).
 */
import { count, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '../db';
import { studioLoopSettings, tubeKinds } from '../db/schema';
import { runAccessMatrix } from '../testing/access-matrix';
import { studioWithMembers } from '../testing/factories';
import { useApp } from '../testing/suite';
import { tubeFields, tubeKindRows } from '../testing/tube-kinds-access-rows';
import { tubeKindsForStudio } from '../loop';

const app = useApp();

runAccessMatrix(tubeKindRows, app);

async function designer() {
	const f = await studioWithMembers();
	return { f, c: app.client({ session: f.designer.session }) };
}
const rowsOf = async (studioId: string) =>
	db.select().from(tubeKinds).where(eq(tubeKinds.studioId, studioId));
const countOf = async (studioId: string) =>
	(await db.select({ n: count() }).from(tubeKinds).where(eq(tubeKinds.studioId, studioId)))[0].n;

describe('tube kinds page', () => {
	it('adds a 14 mm hard tube kind, lists it and offers it to the editor', async () => {
		const { f, c } = await designer();
		const res = await c.postForm('/tube-kinds?/add', tubeFields());
		expect(res.status).toBe(200);
		const [row] = await rowsOf(f.studio.id);
		expect(row.name).toBe('Hard tube 14 mm');
		// 6.50 per metre is 650 in the minor unit.
		expect(row.pricePerMetreMinor).toBe(650);
		expect(row.definition).toMatchObject({ kind: 'hard', outerMm: 14, minBendRadiusMm: 28 });
		const page = await c.get('/tube-kinds');
		expect(page.text).toContain('Hard tube 14 mm');
		expect(page.text).toContain('28 mm');
		expect((await tubeKindsForStudio(f.studio.id)).map((t) => t.id)).toEqual([row.id]);
	});

	it.each([
		[
			'inner not below outer',
			{ kind: 'soft', innerMm: '16', outerMm: '13' },
			'Inner diameter must be smaller than the outer diameter.'
		],
		[
			'a soft tube with no inner diameter',
			{ kind: 'soft', innerMm: '' },
			'Inner diameter is required for soft tube.'
		],
		[
			'a negative bend radius',
			{ minBendRadiusMm: '-5' },
			'Minimum bend radius must not be negative'
		],
		[
			'an outer diameter that is not a number',
			{ outerMm: 'wide' },
			'Outer diameter must be a number in mm.'
		],
		['a missing name', { name: '' }, 'Name is required.'],
		['a kind that does not exist', { kind: 'glass' }, 'Kind must be soft or hard.'],
		['a bad price', { price: '-3' }, 'Price per metre must be an amount such as 4.50']
	])(
		'refuses %s with a message on the field and writes nothing',
		async (_what, change, message) => {
			const { f, c } = await designer();
			const res = await c.postForm('/tube-kinds?/add', tubeFields(change));
			expect(res.status).toBe(400);
			expect(res.text).toContain(message);
			expect(await countOf(f.studio.id)).toBe(0);
		}
	);

	it('edits a kind, and answers a stale edit with 409 leaving the newer one', async () => {
		const { f, c } = await designer();
		await c.postForm('/tube-kinds?/add', tubeFields());
		const [before] = await rowsOf(f.studio.id);
		const stamp = String(before.updatedAt.getTime());
		const first = await c.postForm(
			'/tube-kinds?/save',
			tubeFields({
				id: before.id,
				stamp,
				minBendRadiusMm: '35',
				name: 'Hard tube 14 mm, wide bends'
			})
		);
		expect(first.status).toBe(200);
		const [after] = await rowsOf(f.studio.id);
		expect(after.name).toBe('Hard tube 14 mm, wide bends');
		expect(after.definition).toMatchObject({ minBendRadiusMm: 35, id: before.id });
		const late = await c.postForm(
			'/tube-kinds?/save',
			tubeFields({ id: before.id, stamp, name: 'From an old page' })
		);
		expect(late.status).toBe(409);
		expect(late.text).toContain('Someone changed this tube kind');
		expect((await rowsOf(f.studio.id))[0].name).toBe('Hard tube 14 mm, wide bends');
	});

	it('retires a kind: not offered for new runs, still loaded by id for old loops; restores it', async () => {
		const { f, c } = await designer();
		await c.postForm('/tube-kinds?/add', tubeFields());
		const [row] = await rowsOf(f.studio.id);
		expect((await c.postForm('/tube-kinds?/retire', { id: row.id })).status).toBe(200);
		expect(await tubeKindsForStudio(f.studio.id)).toEqual([]);
		expect((await tubeKindsForStudio(f.studio.id, [row.id])).map((t) => t.id)).toEqual([row.id]);
		expect((await c.get('/tube-kinds')).text).toContain('Retired');
		expect((await c.postForm('/tube-kinds?/restore', { id: row.id })).status).toBe(200);
		expect(await tubeKindsForStudio(f.studio.id)).toHaveLength(1);
	});

	it('sets the cut allowance and refuses a negative one on its field', async () => {
		const { f, c } = await designer();
		const bad = await c.postForm('/tube-kinds?/allowance', { cutAllowancePct: '-1' });
		expect(bad.status).toBe(400);
		expect(bad.text).toContain('Cut allowance must not be negative.');
		expect(
			await db.select().from(studioLoopSettings).where(eq(studioLoopSettings.studioId, f.studio.id))
		).toEqual([]);
		expect((await c.postForm('/tube-kinds?/allowance', { cutAllowancePct: '12.5' })).status).toBe(
			200
		);
		expect((await c.get('/tube-kinds')).text).toContain('12.5');
	});

	it('refuses a client of the studio (403) and writes nothing', async () => {
		const f = await studioWithMembers();
		const client = app.client({ session: f.client.session });
		expect((await client.get('/tube-kinds')).status).toBe(403);
		expect((await client.postForm('/tube-kinds?/add', tubeFields())).status).toBe(403);
		expect(await countOf(f.studio.id)).toBe(0);
	});
});
