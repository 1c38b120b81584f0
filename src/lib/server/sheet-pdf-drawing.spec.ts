/**
 * The PDF's drawings mark a colliding body on the drawing itself, not only in the key: its
 * cross-hatch is real line work in the page (drawn with pdfkit uncompressed, then the content
 * stream's path operators counted), so a grey-scale print tells collides from clear.
 */
import PDFDocument from 'pdfkit';
import { describe, expect, it } from 'vitest';
import type { FitStatus } from '$lib/geometry';
import type { OrthoView, SheetDrawing } from '$lib/builds/orthographic';
import { PATTERN_MM } from '$lib/builds/drawing-style';
import { PT, drawView } from './sheet-pdf-drawing';

/** One front view at 1:1 holding one 40 × 20 mm body of the given status. */
function oneBody(status: FitStatus): SheetDrawing {
	const view: OrthoView = {
		id: 'front',
		title: 'Front',
		h: 'x',
		v: 'y',
		axisNote: 'X to the right, Y up',
		frame: { x: 0, y: 0, w: 60, h: 40 },
		rects: [{ id: 'b', kind: 'body', label: 'Card', status, x: 10, y: 10, w: 40, h: 20 }],
		dims: [],
		tags: []
	} as unknown as OrthoView;
	return {
		scale: 1,
		scaleText: '1:1',
		paper: { textMm: 2.5, tagMm: 2.2, lineMm: 0.25 },
		views: [view]
	};
}

async function contentOf(status: FitStatus): Promise<string> {
	const doc = new PDFDocument({ size: 'A4', compress: false, margin: 0 });
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<void>((resolve) => doc.on('end', () => resolve()));
	const drawing = oneBody(status);
	const fonts = {
		regular: 'Helvetica',
		medium: 'Helvetica',
		bold: 'Helvetica-Bold',
		text: (s: string) => s
	};
	drawView(doc, fonts, drawing, drawing.views[0], 10, 10);
	doc.end();
	await done;
	return Buffer.concat(chunks).toString('latin1');
}

/** Straight segments stroked one by one: "x y m x y l S". */
const segments = (pdf: string) => (pdf.match(/ m\n[-\d.]+ [-\d.]+ l\nS/g) ?? []).length;

describe('collides on the PDF drawing', () => {
	it('a colliding body is cross-hatched: lines both ways across it', async () => {
		const lines = segments(await contentOf('collides'));
		// Lines start every PATTERN_MM.crosshatch across the width plus the height (40 + 20 mm), both
		// ways: 2 × 60 / 1.4 ≈ 86 segments (a few more for the ends).
		const expected = (2 * (40 + 20)) / PATTERN_MM.crosshatch;
		expect(lines).toBeGreaterThanOrEqual(Math.floor(expected));
		expect(lines).toBeLessThanOrEqual(Math.ceil(expected) + 4);
		expect(PT).toBeCloseTo(72 / 25.4, 9);
	});

	it('a clear body has no line work inside, and tight has its hatch one way only', async () => {
		expect(segments(await contentOf('clear'))).toBe(0);
		const tight = segments(await contentOf('tight'));
		expect(tight).toBeGreaterThan(0);
		expect(tight).toBeLessThan(segments(await contentOf('collides')));
	});
});
