/**
 * CSV import and export of parts (docs/catalog-csv.md describes the columns). Import is two steps
 * with no state on the server: a preview checks every row and writes nothing; a commit checks the
 * same text again and writes the valid rows in one transaction.
 */
import Papa from 'papaparse';
import { and, eq, inArray } from 'drizzle-orm';
import type { PartDef, PartSpecs } from '$lib/geometry';
import { bodySizeMm, isOneBox, oneBody } from '$lib/catalog/part-shape';
import { MAX_CSV_BYTES, checkPart } from '$lib/catalog/schemas';
import { toCsv } from '$lib/csv';
import { db } from '../db';
import { parts } from '../db/schema';
import { insertPart, updatePart, type PartRecord } from './parts';

export { MAX_CSV_BYTES };
export const MAX_CSV_ROWS = 2_000;

export const CSV_COLUMNS = [
	'id',
	'revision',
	'name',
	'category',
	'width_mm',
	'height_mm',
	'depth_mm',
	'bodies',
	'keepouts',
	'ports',
	'heat_w',
	'power_draw_w',
	'radiator_class',
	'radiator_thickness_mm',
	'fan_size_mm',
	'fan_thickness_mm',
	'psu_form_factor',
	'psu_rating_w',
	'board_form_factor',
	'card_length_mm',
	'card_slots',
	'price',
	'currency',
	'supplier_note',
	'provenance',
	'tolerance_mm',
	'source'
] as const;
type Column = (typeof CSV_COLUMNS)[number];

const SPEC_COLUMNS: [Column, keyof PartSpecs, 'number' | 'text'][] = [
	['heat_w', 'heatW', 'number'],
	['power_draw_w', 'powerDrawW', 'number'],
	['radiator_class', 'radiatorClass', 'number'],
	['radiator_thickness_mm', 'radiatorThicknessMm', 'number'],
	['fan_size_mm', 'fanSizeMm', 'number'],
	['fan_thickness_mm', 'fanThicknessMm', 'number'],
	['psu_form_factor', 'psuFormFactor', 'text'],
	['psu_rating_w', 'psuRatingW', 'number'],
	['board_form_factor', 'boardFormFactor', 'text'],
	['card_length_mm', 'cardLengthMm', 'number'],
	['card_slots', 'cardSlots', 'number']
];

/* ---------- export ---------- */

function json(value: unknown[]): string {
	return value.length ? JSON.stringify(value) : '';
}

export function partToCsvRow(p: PartRecord): Record<Column, string> {
	const def = p.def;
	const [w, h, d] = bodySizeMm(def);
	const row = {
		id: p.id,
		revision: p.isStandard ? '' : String(p.revision),
		name: def.name,
		category: def.category,
		width_mm: String(w),
		height_mm: String(h),
		depth_mm: String(d),
		bodies: isOneBox(def) ? '' : json(def.bodies),
		keepouts: json(def.keepouts),
		ports: json(def.ports),
		price: p.priceMinor === null ? '' : (p.priceMinor / 100).toFixed(2),
		currency: p.currency,
		supplier_note: p.supplierNote,
		// A standard entry comes back as the studio's own copy, its numbers from the published document.
		provenance: def.provenance === 'standard' ? 'datasheet' : def.provenance,
		tolerance_mm: String(def.toleranceMm),
		source: def.source ?? ''
	} as Record<Column, string>;
	for (const [col, key] of SPEC_COLUMNS) {
		const v = def.specs[key];
		row[col] = v === undefined ? '' : String(v);
	}
	return row;
}

/** Through the one CSV writer, which neutralises cells a spreadsheet would run as formulas. */
export function partsToCsv(records: PartRecord[]): string {
	return toCsv(
		CSV_COLUMNS,
		records.map((r) => CSV_COLUMNS.map((c) => partToCsvRow(r)[c]))
	);
}

/* ---------- import ---------- */

export type CsvRowResult = {
	/** Line in the file, counting the header as row 1 (as a spreadsheet numbers it). */
	row: number;
	name: string;
	action: 'create' | 'update';
	id?: string;
	errors: string[];
};

export type CsvReport = {
	fileError?: string;
	rows: CsvRowResult[];
	valid: number;
	invalid: number;
	committed: boolean;
	created: number;
	updated: number;
};

const COLUMN_WORDS: Record<string, string> = {
	width_mm: 'width',
	height_mm: 'height',
	depth_mm: 'depth',
	tolerance_mm: 'tolerance'
};

/** Text only: valid UTF-8, no NUL bytes, within the size limit. */
export function decodeCsv(bytes: Uint8Array): { text?: string; error?: string } {
	if (bytes.byteLength === 0) {
		return { error: 'The file is empty.' };
	}
	if (bytes.byteLength > MAX_CSV_BYTES) {
		return {
			error: `The file is ${(bytes.byteLength / 1024 / 1024).toFixed(1)} MB; at most 2 MB can be imported at once.`
		};
	}
	let text: string;
	try {
		text = new TextDecoder('utf-8', { fatal: true }).decode(bytes);
	} catch {
		return { error: 'The file is not text (UTF-8). Save it from your spreadsheet as CSV, UTF-8.' };
	}
	if (text.includes('\u0000')) {
		return { error: 'The file is not text: it contains NUL bytes. Save it as CSV, UTF-8.' };
	}
	return { text: text.replace(/^\uFEFF/, '') };
}

function unquoteFormula(cell: string): string {
	return /^'[=+\-@\t\r]/.test(cell) ? cell.slice(1) : cell;
}

function numberCell(cell: string, col: string, errors: string[]): number | undefined {
	if (cell === '') {
		return undefined;
	}
	const value = Number(cell.replace(',', '.'));
	if (!Number.isFinite(value)) {
		errors.push(
			`${COLUMN_WORDS[col] ?? col} must be a number${col.endsWith('_mm') ? ' in mm' : ''}`
		);
		return undefined;
	}
	return value;
}

function jsonCell(cell: string, col: string, errors: string[]): unknown[] | undefined {
	if (cell === '') {
		return undefined;
	}
	try {
		const value = JSON.parse(cell) as unknown;
		if (Array.isArray(value)) {
			return value;
		}
	} catch {
		/* reported below */
	}
	errors.push(`${col} must be a JSON list (see the column notes)`);
	return undefined;
}

/** Engine paths → column words for row messages. */
function describeIssue(path: string, message: string, oneBox: boolean): string {
	const size = /^bodies\[0\]\.box\.max\[(\d)\]/.exec(path);
	if (oneBox && size) {
		const word = ['width', 'height', 'depth'][Number(size[1])];
		return `${word} must be a positive number in mm${/at most/i.test(message) ? ' and at most 10000 mm (10 m)' : ''}`;
	}
	if (path === 'category') {
		return 'category must be one of board, cpu-block, gpu, pump, reservoir, pump-reservoir, radiator, fan, psu, fitting, drive, other';
	}
	if (path === 'priceMinor') {
		return `price: ${message.toLowerCase()}`;
	}
	const spec = SPEC_COLUMNS.find(([, key]) => path === `specs.${key}`);
	if (spec) {
		return `${spec[0]}: ${message}`;
	}
	return `${path || 'row'}: ${message}`;
}

type RowInput = { id: string; revision?: number; input: Record<string, unknown>; oneBox: boolean };

/** One CSV row → the part it describes, or the reasons it cannot be one. */
export function rowToInput(cells: Record<string, string>): { value?: RowInput; errors: string[] } {
	const errors: string[] = [];
	const cell = (c: Column) => unquoteFormula((cells[c] ?? '').trim());
	const w = numberCell(cell('width_mm'), 'width_mm', errors);
	const h = numberCell(cell('height_mm'), 'height_mm', errors);
	const d = numberCell(cell('depth_mm'), 'depth_mm', errors);
	const bodies = jsonCell(cell('bodies'), 'bodies', errors);
	const keepouts = jsonCell(cell('keepouts'), 'keepouts', errors) ?? [];
	const ports = jsonCell(cell('ports'), 'ports', errors) ?? [];
	const specs: Record<string, unknown> = {};
	for (const [col, key, kind] of SPEC_COLUMNS) {
		const v = kind === 'number' ? numberCell(cell(col), col, errors) : cell(col) || undefined;
		if (v !== undefined) {
			specs[key] = v;
		}
	}
	const priceText = cell('price');
	let priceMinor: number | null = null;
	if (priceText) {
		const price = numberCell(priceText, 'price', errors);
		if (price !== undefined) {
			priceMinor = Math.round(price * 100);
		}
	}
	const toleranceMm = numberCell(cell('tolerance_mm'), 'tolerance_mm', errors) ?? 0;
	const revisionText = cell('revision');
	const revision = revisionText ? numberCell(revisionText, 'revision', errors) : undefined;
	if (!bodies) {
		for (const [v, word] of [
			[w, 'width'],
			[h, 'height'],
			[d, 'depth']
		] as const) {
			if (v === undefined && !errors.some((e) => e.startsWith(word))) {
				errors.push(`${word} must be a positive number in mm`);
			}
		}
	}
	if (errors.length) {
		return { errors };
	}
	const input: Record<string, unknown> = {
		name: cell('name'),
		category: cell('category'),
		bodies: bodies ?? oneBody([w!, h!, d!]),
		keepouts,
		ports,
		specs,
		provenance: cell('provenance') || 'estimate',
		toleranceMm,
		source: cell('source') || undefined,
		priceMinor,
		currency: cell('currency') || 'EUR',
		supplierNote: cell('supplier_note')
	};
	return { value: { id: cell('id'), revision, input, oneBox: !bodies }, errors };
}

function checkSizes(value: RowInput, def: PartDef, cells: Record<string, string>): string[] {
	if (value.oneBox) {
		return [];
	}
	const size = bodySizeMm(def);
	const out: string[] = [];
	(['width_mm', 'height_mm', 'depth_mm'] as const).forEach((col, i) => {
		const given = cells[col]?.trim();
		if (given && Math.abs(Number(given) - size[i]) > 1e-6) {
			out.push(`${COLUMN_WORDS[col]} ${given} mm does not match the bodies (${size[i]} mm)`);
		}
	});
	return out;
}

type Parsed = { fileError?: string; rows: { row: number; cells: Record<string, string> }[] };

export function parseCsvText(text: string): Parsed {
	const parsed = Papa.parse<Record<string, string>>(text, {
		header: true,
		skipEmptyLines: 'greedy',
		transformHeader: (h) => h.trim().toLowerCase()
	});
	const fields = parsed.meta.fields ?? [];
	const unknown = fields.filter((f) => !(CSV_COLUMNS as readonly string[]).includes(f));
	if (unknown.length) {
		return {
			rows: [],
			fileError: `Unknown column${unknown.length > 1 ? 's' : ''}: ${unknown.slice(0, 5).join(', ')}. The columns are listed in the CSV notes.`
		};
	}
	for (const required of ['name', 'category'] as const) {
		if (!fields.includes(required)) {
			return {
				rows: [],
				fileError: `The file has no "${required}" column. The first line must name the columns.`
			};
		}
	}
	const broken = parsed.errors.find((e) => e.type === 'Quotes' || e.type === 'Delimiter');
	if (broken) {
		return {
			rows: [],
			fileError: `The file is not valid CSV near row ${(broken.row ?? 0) + 2}: ${broken.message}.`
		};
	}
	if (parsed.data.length === 0) {
		return { rows: [], fileError: 'The file has a header but no rows.' };
	}
	if (parsed.data.length > MAX_CSV_ROWS) {
		return {
			rows: [],
			fileError: `The file has ${parsed.data.length} rows; at most ${MAX_CSV_ROWS} can be imported at once.`
		};
	}
	// Papaparse numbers rows from 0 without the header; a spreadsheet shows the header as row 1.
	let line = 1;
	const rows = parsed.data.map((cells) => {
		line += 1;
		return { row: line, cells };
	});
	const fieldCountErrors = parsed.errors.filter((e) => e.type === 'FieldMismatch');
	for (const e of fieldCountErrors) {
		const r = rows[e.row ?? -1];
		if (r) {
			r.cells.__shape = e.message;
		}
	}
	return { rows };
}

/**
 * Checks a CSV and, with `commit`, writes its valid rows in one transaction. Rows whose id is one
 * of the studio's parts update it (refused when the file's revision is older); others create new
 * parts. A file-level problem writes nothing.
 */
export async function importPartsCsv(
	studioId: string,
	text: string,
	commit: boolean
): Promise<CsvReport> {
	const empty: CsvReport = {
		rows: [],
		valid: 0,
		invalid: 0,
		committed: false,
		created: 0,
		updated: 0
	};
	const parsed = parseCsvText(text);
	if (parsed.fileError) {
		return { ...empty, fileError: parsed.fileError };
	}
	const ids = parsed.rows.map((r) => (r.cells.id ?? '').trim()).filter(Boolean);
	const existing = new Map(
		ids.length
			? (
					await db
						.select({ id: parts.id, revision: parts.revision })
						.from(parts)
						.where(and(eq(parts.studioId, studioId), inArray(parts.id, [...new Set(ids)])))
				).map((r) => [r.id, r.revision])
			: []
	);
	const checked = parsed.rows.map(({ row, cells }) => {
		const { value, errors } = rowToInput(cells);
		if (cells.__shape) {
			errors.unshift(`has the wrong number of cells (${cells.__shape})`);
		}
		const name = (cells.name ?? '').trim();
		const update = value && existing.has(value.id);
		const result: CsvRowResult = { row, name, action: update ? 'update' : 'create', errors };
		if (!value || errors.length) {
			return { result };
		}
		const check = checkPart(value.input, value.id || 'new');
		if (!check.ok) {
			result.errors.push(
				...check.issues.map((i) => describeIssue(i.path, i.message, value.oneBox))
			);
			return { result };
		}
		result.errors.push(...checkSizes(value, check.def, cells));
		const stored = existing.get(value.id);
		if (update && value.revision !== undefined && stored !== value.revision) {
			result.errors.push(
				`the part changed since this file was exported (now change ${stored}, the file has change ${value.revision})`
			);
		}
		return { result, value, stored };
	});
	const seen = new Set<string>();
	for (const c of checked) {
		const id = c.value?.id;
		if (id && c.result.action === 'update') {
			if (seen.has(id)) {
				c.result.errors.push(`id ${id} appears on an earlier row too`);
			}
			seen.add(id);
		}
	}
	const rows = checked.map((c) => c.result);
	for (const r of rows) {
		r.errors = r.errors.map((e) => `row ${r.row}: ${e}`);
	}
	const good = checked.filter((c) => c.result.errors.length === 0);
	const report: CsvReport = {
		...empty,
		rows,
		valid: good.length,
		invalid: rows.length - good.length
	};
	if (!commit || good.length === 0) {
		return report;
	}
	await db.transaction(async (tx) => {
		for (const c of good) {
			const v = c.value!;
			const saved =
				c.result.action === 'update'
					? await updatePart(studioId, v.id, c.stored!, v.input, tx)
					: await insertPart(tx, studioId, v.input);
			if (!saved.ok) {
				// Checked above; a failure here means the data changed under us: undo every row.
				throw new Error(`row ${c.result.row} could not be saved (${saved.status})`);
			}
			c.result.id = saved.value.id;
			if (c.result.action === 'update') {
				report.updated += 1;
			} else {
				report.created += 1;
			}
		}
	});
	report.committed = true;
	return report;
}
