/**
 * The one CSV writer for every export (parts, comparison, …). RFC 4180 quoting by papaparse, CRLF
 * line ends, and formula neutralising: a text cell that starts with `= + - @`, a tab or a carriage
 * return is written with a leading apostrophe, so a spreadsheet shows it as text and never runs it
 * (the mitigation OWASP's "CSV Injection" page gives). Numbers go in as numbers and stay as they
 * are, so a negative change like -3.5 still reads as a number.
 */
import Papa from 'papaparse';

export type CsvCell = string | number | null | undefined;

/**
 * No `.*$` after the class (papaparse's own pattern has one): `.` stops at a newline, so a cell like
 * "=HYPERLINK(…)\nx" would slip through it.
 */
const FORMULA_START = /^[=+\-@\t\r]/;

export function neutraliseCell(cell: CsvCell): string | number {
	if (cell === null || cell === undefined) return '';
	if (typeof cell === 'number') return Number.isFinite(cell) ? cell : '';
	return FORMULA_START.test(cell) ? `'${cell}` : cell;
}

export function toCsv(header: readonly string[], rows: readonly (readonly CsvCell[])[]): string {
	const text = Papa.unparse(
		{
			fields: header.map(neutraliseCell) as string[],
			data: rows.map((r) => r.map(neutraliseCell))
		},
		// Already neutralised above; papaparse only quotes.
		{ newline: '\r\n', escapeFormulae: false, quotes: false }
	);
	// papaparse ends a header-only file with a line break and a longer one without; always end with one.
	return text.endsWith('\r\n') ? text : text + '\r\n';
}
