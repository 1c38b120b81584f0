/**
 * The catalogue through the built app: the access matrix for its routes, conflicts as 409 (API)
 * and as the form shown again with both versions (no JavaScript), field errors that write nothing,
 * and CSV in and out over HTTP.
 */
import { count, eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { db } from '../db';
import { enclosures, parts } from '../db/schema';
import { runAccessMatrix } from '../testing/access-matrix';
import { studioWithMembers } from '../testing/factories';
import { useApp } from '../testing/suite';
import { catalogRows, enclosureFields, partFields, testPart } from '../testing/catalog-access-rows';

const app = useApp();

runAccessMatrix(catalogRows, app);

const partRows = async (studioId: string) =>
	(await db.select({ n: count() }).from(parts).where(eq(parts.studioId, studioId)))[0].n;

async function designer() {
	const f = await studioWithMembers();
	return { f, c: app.client({ session: f.designer.session }) };
}

const sendJson = (c: ReturnType<typeof app.client>, method: string, path: string, body: unknown) =>
	c.request(method, path, {
		body: JSON.stringify(body),
		headers: { 'content-type': 'application/json', accept: 'application/json' }
	});

describe('conflicts', () => {
	it('answers a stale revision with 409 and the stored part, and overwrites nothing (API)', async () => {
		const { f, c } = await designer();
		const made = (await sendJson(c, 'POST', '/api/parts', testPart('Race pump'))).json<{
			part: { id: string; revision: number };
		}>();
		const first = await sendJson(c, 'PUT', `/api/parts/${made.part.id}`, {
			revision: 1,
			...testPart('Race pump, first')
		});
		expect(first.status).toBe(200);
		const second = await sendJson(c, 'PUT', `/api/parts/${made.part.id}`, {
			revision: 1,
			...testPart('Race pump, second')
		});
		expect(second.status).toBe(409);
		expect(second.json<{ conflict: { name: string; revision: number } }>().conflict).toMatchObject({
			name: 'Race pump, first',
			revision: 2
		});
		const [row] = await db.select().from(parts).where(eq(parts.id, made.part.id));
		expect(row.name).toBe('Race pump, first');
		expect(f.studio.id).toBe(row.studioId);
	});

	it('shows the enclosure form again with the user input and the newer save, without JavaScript', async () => {
		const { f, c } = await designer();
		const created = await c.postForm('/enclosures/new?/save', enclosureFields(0, 'Shared box'));
		expect(created.status).toBe(303);
		const path = created.location!.replace(/\?.*$/, '');
		expect(
			(await c.postForm(`${path}?/save`, enclosureFields(1, 'Saved by the first designer'))).status
		).toBe(303);
		const late = await c.postForm(`${path}?/save`, {
			...enclosureFields(1, 'Typed by the second designer'),
			outerX: '333'
		});
		expect(late.status).toBe(409);
		expect(late.text).toContain('Typed by the second designer');
		expect(late.text).toContain('Saved by the first designer');
		expect(late.text).toContain('Save mine over theirs');
		const [row] = await db.select().from(enclosures).where(eq(enclosures.studioId, f.studio.id));
		expect(row.name).toBe('Saved by the first designer');
		// Having seen the newer save, the user may save over it on purpose.
		const over = await c.postForm(`${path}?/save`, {
			...enclosureFields(1, 'Typed by the second designer'),
			overwriteRevision: '2'
		});
		expect(over.status).toBe(303);
	});
});

describe('bad input writes nothing', () => {
	it.each([
		['a negative width', { widthMm: '-5' }, 'Width must be greater than 0 mm'],
		['a zero depth', { depthMm: '0' }, 'Depth must be greater than 0 mm'],
		['a width that is not a number', { widthMm: 'NaN' }, 'Width must be a number in mm'],
		['more than 10 m', { heightMm: '10001' }, 'Height must be at most 10000 mm (10 m)'],
		['an unknown category', { category: 'toaster' }, 'Choose a category from the list'],
		[
			'a keep-out with no size',
			{
				geometry: JSON.stringify({
					bodies: [],
					ports: [],
					keepouts: [
						{
							id: 'k',
							label: 'k',
							kind: 'airflow',
							severity: 'warning',
							box: { min: [0, 0, 0], max: [0, 10, 10] }
						}
					]
				})
			},
			'problem with bodies, keep-outs or ports'
		]
	])('the part form refuses %s with a message on the field', async (_what, change, message) => {
		const { f, c } = await designer();
		const res = await c.postForm('/parts/new?/save', { ...partFields(), ...change });
		expect(res.status).toBe(400);
		expect(res.text).toContain(message);
		expect(await partRows(f.studio.id)).toBe(0);
	});

	it('the API answers 400 with the path of each problem', async () => {
		const { f, c } = await designer();
		const res = await sendJson(c, 'POST', '/api/parts', {
			...testPart(),
			category: 'toaster',
			bodies: [{ id: 'b', label: '', box: { min: [0, 0, 0], max: [10, 10, -1] } }]
		});
		expect(res.status).toBe(400);
		const paths = res.json<{ issues: { path: string }[] }>().issues.map((i) => i.path);
		expect(paths).toEqual(expect.arrayContaining(['category', 'bodies[0].box.max[2]']));
		expect(await partRows(f.studio.id)).toBe(0);
	});

	it('the enclosure form puts the engine’s message on the outer-size field', async () => {
		const { f, c } = await designer();
		const res = await c.postForm('/enclosures/new?/save', { ...enclosureFields(), outerX: '3' });
		expect(res.status).toBe(400);
		expect(res.text).toContain('Walls leave no inside on this axis');
		expect(
			(
				await db.select({ n: count() }).from(enclosures).where(eq(enclosures.studioId, f.studio.id))
			)[0].n
		).toBe(0);
	});
});

describe('CSV over HTTP', () => {
	it('previews, then commits the good rows, then exports what was written', async () => {
		const { f, c } = await designer();
		const csv =
			'name,category,width_mm,height_mm,depth_mm\nGood hub,other,60,15,40\nBad pump,pump,62,50,-1\n';
		const preview = await c.request('POST', '/api/parts/import', {
			body: csv,
			headers: { 'content-type': 'text/csv' }
		});
		expect(preview.status).toBe(200);
		expect(
			preview.json<{ report: { rows: { errors: string[] }[] } }>().report.rows[1].errors
		).toEqual(['row 3: depth must be a positive number in mm']);
		expect(await partRows(f.studio.id)).toBe(0);
		const commit = await c.request('POST', '/api/parts/import?commit=1', {
			body: csv,
			headers: { 'content-type': 'text/csv' }
		});
		expect(commit.json<{ report: { created: number } }>().report.created).toBe(1);
		const exported = await c.get('/api/parts/export?scope=studio');
		expect(exported.header('content-type')).toMatch(/^text\/csv/);
		expect(exported.header('content-disposition')).toMatch(
			/attachment; filename="parts-\d{4}-\d{2}-\d{2}\.csv"/
		);
		expect(exported.text).toContain('Good hub');
		expect(exported.text).not.toContain('Bad pump');
	});

	it('refuses a file that is not text and writes nothing', async () => {
		const { f, c } = await designer();
		const res = await c.request('POST', '/api/parts/import?commit=1', {
			body: Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0xff]),
			headers: { 'content-type': 'text/csv' }
		});
		expect(res.status).toBe(422);
		expect(res.json<{ message: string }>().message).toMatch(/not text/);
		expect(await partRows(f.studio.id)).toBe(0);
	});
});
