/**
 * CSV import and export against the real PostgreSQL: row-level errors, one transaction per commit,
 * file limits, and a round trip that loses nothing.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { count, eq, sql } from 'drizzle-orm';
import Papa from 'papaparse';
import { closeDb, db } from '../db';
import { parts } from '../db/schema';
import { createStudio } from '../testing/factories';
import { testDatabaseUrl } from '../testing/env';
import {
	CSV_COLUMNS,
	decodeCsv,
	importPartsCsv,
	MAX_CSV_BYTES,
	MAX_CSV_ROWS,
	partsToCsv
} from './csv';
import { allParts, createPart, getPartsByIds } from './parts';

let studioId = '';
beforeAll(async () => {
	testDatabaseUrl();
	studioId = (await createStudio()).id;
});
afterAll(closeDb);

const rowsIn = async (id: string) =>
	(await db.select({ n: count() }).from(parts).where(eq(parts.studioId, id)))[0].n;

const HEADER = 'name,category,width_mm,height_mm,depth_mm,price,provenance';

describe('CSV import', () => {
	it('previews row errors in words, writes nothing, then commits only the good rows', async () => {
		const id = (await createStudio()).id;
		const text = [
			HEADER,
			'Fan hub,other,60,15,40,19.90,measured',
			'Short pump,pump,62,50,-3,,estimate',
			'Tube reservoir,reservoir,60,150,60,,',
			'Toaster,appliance,10,10,10,,',
			'Thin fitting,fitting,21,abc,21,,'
		].join('\n');
		const preview = await importPartsCsv(id, text, false);
		expect(preview.fileError).toBeUndefined();
		expect(preview.valid).toBe(2);
		expect(preview.invalid).toBe(3);
		// Rows count as a spreadsheet shows them: the header is row 1.
		expect(preview.rows[1].errors).toEqual(['row 3: depth must be a positive number in mm']);
		expect(preview.rows[3].errors[0]).toMatch(/^row 5: category must be one of board, /);
		expect(preview.rows[4].errors).toEqual(['row 6: height must be a number in mm']);
		expect(await rowsIn(id)).toBe(0);

		const commit = await importPartsCsv(id, text, true);
		expect(commit.committed).toBe(true);
		expect(commit.created).toBe(2);
		expect(await rowsIn(id)).toBe(2);
		const stored = await allParts(id, { scope: 'studio' });
		expect(stored.map((p) => p.name).sort()).toEqual(['Fan hub', 'Tube reservoir']);
		expect(stored.find((p) => p.name === 'Fan hub')?.priceMinor).toBe(1990);
	});

	it('commits in one transaction: a row the database refuses undoes every row before it', async () => {
		const id = (await createStudio()).id;
		// A trigger that refuses one name stands in for any failure half-way through a commit.
		await db.execute(sql`create or replace function test_refuse_part() returns trigger language plpgsql as $$
			begin if new.name = 'refused by the database' then raise exception 'refused'; end if; return new; end $$`);
		await db.execute(sql`drop trigger if exists test_refuse_part on part`);
		await db.execute(
			sql`create trigger test_refuse_part before insert on part for each row execute function test_refuse_part()`
		);
		try {
			const text = [
				HEADER,
				'First,other,10,10,10,,',
				'Second,other,10,10,10,,',
				'refused by the database,other,10,10,10,,'
			].join('\n');
			await expect(importPartsCsv(id, text, true)).rejects.toThrow();
			expect(await rowsIn(id)).toBe(0);
		} finally {
			await db.execute(sql`drop trigger if exists test_refuse_part on part`);
			await db.execute(sql`drop function if exists test_refuse_part()`);
		}
	});

	it.each([
		['an unknown column', 'name,category,colour\nA,other,red', /Unknown column: colour/],
		['no category column', 'name,width_mm\nA,10', /no "category" column/],
		['a header and no rows', HEADER + '\n', /no rows/],
		[
			'too many rows',
			HEADER + '\n' + 'A,other,1,1,1,,\n'.repeat(MAX_CSV_ROWS + 1),
			new RegExp(`at most ${MAX_CSV_ROWS}`)
		]
	])('refuses a file with %s and writes nothing', async (_what, text, message) => {
		const id = (await createStudio()).id;
		const report = await importPartsCsv(id, text, true);
		expect(report.fileError).toMatch(message);
		expect(report.committed).toBe(false);
		expect(await rowsIn(id)).toBe(0);
	});

	it('takes text only, within 2 MB', () => {
		expect(decodeCsv(new Uint8Array([0x89, 0x50, 0x4e, 0x47, 0xff, 0xfe])).error).toMatch(
			/not text/
		);
		expect(decodeCsv(new TextEncoder().encode('name\u0000,category')).error).toMatch(/NUL/);
		expect(decodeCsv(new Uint8Array(MAX_CSV_BYTES + 1).fill(0x41)).error).toMatch(/at most 2 MB/);
		expect(decodeCsv(new Uint8Array()).error).toMatch(/empty/);
		expect(decodeCsv(new TextEncoder().encode('\uFEFFname,category\n')).text).toBe(
			'name,category\n'
		);
	});

	it('refuses to update a part that changed since the file was exported', async () => {
		const made = await createPart(studioId, {
			name: 'Changing fan',
			category: 'fan',
			bodies: [{ id: 'body', label: 'Body', box: { min: [0, 0, 0], max: [120, 120, 25] } }],
			specs: { fanSizeMm: 120, fanThicknessMm: 25 }
		});
		if (!made.ok) throw new Error('create failed');
		const exported = partsToCsv([made.value]);
		const renamed = exported.replace('Changing fan', 'Changing fan renamed');
		const first = await importPartsCsv(studioId, renamed, true);
		expect(first.rows[0].errors).toEqual([]);
		expect(first.updated).toBe(1);
		const again = await importPartsCsv(studioId, exported, false);
		expect(again.rows[0].errors[0]).toMatch(
			/changed since this file was exported \(now change 2, the file has change 1\)/
		);
	});
});

describe('CSV round trip', () => {
	it('export → import into another studio → export gives the same parts, column for column', async () => {
		const from = (await createStudio()).id;
		const into = (await createStudio()).id;
		const multi = await createPart(from, {
			name: '=Formula-looking, "quoted" name',
			category: 'pump-reservoir',
			bodies: [
				{ id: 'base', label: 'Pump base', box: { min: [0, 0, 0], max: [80, 40, 80] } },
				{ id: 'tube', label: 'Tube', box: { min: [10, 40, 10], max: [70, 160, 70] } }
			],
			keepouts: [
				{
					id: 'fittings',
					label: 'Fittings',
					kind: 'fitting',
					severity: 'error',
					box: { min: [10, 160, 10], max: [70, 185, 70] }
				}
			],
			ports: [{ id: 'in', position: [40, 160, 40], direction: '+y', thread: 'G 1/4' }],
			specs: { powerDrawW: 18, heatW: 5 },
			provenance: 'measured',
			toleranceMm: 0.3,
			source: 'Calipers, bench 2',
			priceMinor: 15990,
			currency: 'GBP',
			supplierNote: 'line one, with comma'
		});
		const card = await createPart(from, {
			name: 'Two-slot card',
			category: 'gpu',
			bodies: [{ id: 'body', label: 'Body', box: { min: [0, 0, 0], max: [267.5, 112, 40.64] } }],
			specs: { cardLengthMm: 267.5, cardSlots: 2, powerDrawW: 220 }
		});
		if (!multi.ok || !card.ok) throw new Error('create failed');
		const exported = partsToCsv(await allParts(from, { scope: 'studio' }));
		// The file's columns are the documented set (docs/catalog-csv.md), in order.
		expect(Papa.parse<string[]>(exported).data[0]).toEqual([...CSV_COLUMNS]);
		// A cell a spreadsheet would run as a formula is written with a leading apostrophe.
		expect(exported).toContain(`"'=Formula-looking, ""quoted"" name"`);

		const report = await importPartsCsv(into, exported, true);
		expect(report.invalid).toBe(0);
		expect(report.created).toBe(2);
		const imported = await allParts(into, { scope: 'studio' });
		const strip = (csv: string) =>
			Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true }).data.map(
				({ id: _id, revision: _r, ...rest }) => rest
			);
		expect(strip(partsToCsv(imported))).toEqual(strip(exported));
		const [original] = await getPartsByIds(from, [multi.value.id]);
		const copy = imported.find((p) => p.def.category === 'pump-reservoir')!;
		expect({ ...copy.def, id: 'x' }).toEqual({ ...original.def, id: 'x' });
	});
});
