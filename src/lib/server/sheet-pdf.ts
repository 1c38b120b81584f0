/**
 * The build sheet as a PDF, made on the server with pdfkit (no browser involved): the same
 * content and drawings as the page. Space Grotesk is embedded from @fontsource's WOFF files
 * (pdfkit's font engine reads WOFF; it fails on these WOFF2 files); if they cannot be read the
 * PDF falls back to Helvetica.
 */
import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import PDFDocument from 'pdfkit';
import sharp from 'sharp';
import { BUDGET_MARK, STATUS_INK, INK, thirdAngleSymbol } from '$lib/builds/drawing-style';
import { layoutFits } from '$lib/builds/orthographic';
import type { FitStatus } from '$lib/geometry';
import { MARGIN_MM, PAPER, type SheetData } from './sheet';
import { readPhoto } from './sharing/photos';
import { PT, drawView, type Fonts } from './sheet-pdf-drawing';

type Doc = InstanceType<typeof PDFDocument>;

/** Two weights keep the PDF quick to make: each embedded font is subset when the file is written. */
const FONT_FILES = { regular: 400, bold: 600 } as const;

/** Photos the PDF carries at most; the page shows them all. */
const MAX_PDF_PHOTOS = 12;

function registerFonts(doc: Doc): Fonts {
	try {
		const require = createRequire(import.meta.url);
		for (const [name, weight] of Object.entries(FONT_FILES)) {
			const file = require.resolve(
				`@fontsource/space-grotesk/files/space-grotesk-latin-${weight}-normal.woff`
			);
			doc.registerFont(`SG-${name}`, readFileSync(file));
		}
		return { regular: 'SG-regular', medium: 'SG-bold', bold: 'SG-bold', text: (s) => s };
	} catch {
		// Helvetica's encoding has no thin space; a plain space reads the same.
		return {
			regular: 'Helvetica',
			medium: 'Helvetica',
			bold: 'Helvetica-Bold',
			text: (s) => s.replace(/[\u2009\u202f]/g, ' ')
		};
	}
}

const mmToPt = (mm: number) => mm * PT;

/** Text flow helpers over pdfkit, in millimetres from the page's top-left corner. */
class Writer {
	readonly left = MARGIN_MM;
	readonly width: number;
	readonly bottom: number;

	constructor(
		readonly doc: Doc,
		readonly fonts: Fonts,
		readonly page: { widthMm: number; heightMm: number }
	) {
		this.width = page.widthMm - 2 * MARGIN_MM;
		// Leaves room for the footer.
		this.bottom = page.heightMm - MARGIN_MM - 8;
	}

	get yMm() {
		return this.doc.y / PT;
	}

	set yMm(v: number) {
		this.doc.y = mmToPt(v);
	}

	newPage() {
		this.doc.addPage();
		this.yMm = MARGIN_MM;
	}

	/** Starts a new page when less than `mm` is left. */
	need(mm: number) {
		if (this.yMm + mm > this.bottom) this.newPage();
	}

	heightOf(text: string, sizePt: number, widthMm: number, font = this.fonts.regular) {
		this.doc.font(font).fontSize(sizePt);
		return this.doc.heightOfString(this.fonts.text(text), { width: mmToPt(widthMm) }) / PT;
	}

	text(
		text: string,
		opts: {
			size?: number;
			font?: string;
			color?: string;
			x?: number;
			width?: number;
			gapAfter?: number;
		} = {}
	) {
		const size = opts.size ?? 9.5;
		const width = opts.width ?? this.width - ((opts.x ?? this.left) - this.left);
		const font = opts.font ?? this.fonts.regular;
		this.need(this.heightOf(text, size, width, font));
		this.doc
			.font(font)
			.fontSize(size)
			.fillColor(opts.color ?? INK.text)
			.text(this.fonts.text(text), mmToPt(opts.x ?? this.left), this.doc.y, {
				width: mmToPt(width)
			});
		this.yMm += opts.gapAfter ?? 0.8;
	}

	heading(text: string) {
		this.need(16);
		this.yMm += 3;
		this.text(text, { size: 12, font: this.fonts.bold, gapAfter: 0.6 });
		this.rule(0.45, INK.dividerFill);
		this.yMm += 2.5;
	}

	/** A line across the column at the current height, `weightPt` points thick. */
	rule(weightPt: number, color: string) {
		this.doc
			.moveTo(mmToPt(this.left), this.doc.y)
			.lineTo(mmToPt(this.left + this.width), this.doc.y)
			.lineWidth(weightPt * PT)
			.stroke(color);
	}

	/** A status swatch with its pattern and word, then the text beside it. */
	statusRow(status: FitStatus, word: string, title: string, detail: string | null) {
		const x = this.left + 24;
		const h =
			this.heightOf(title, 9.5, this.width - 24, this.fonts.medium) +
			(detail ? this.heightOf(detail, 8.5, this.width - 24) : 0);
		this.need(h + 1.5);
		const y = this.yMm;
		swatch(this.doc, status, this.left, y + 0.6);
		this.doc
			.font(this.fonts.regular)
			.fontSize(8.5)
			.fillColor(INK.text)
			.text(this.fonts.text(word), mmToPt(this.left + 4.6), mmToPt(y + 0.4), { lineBreak: false });
		this.yMm = y;
		this.text(title, { x, font: this.fonts.medium, gapAfter: 0.2 });
		if (detail) this.text(detail, { x, size: 8.5, color: INK.muted, gapAfter: 0.2 });
		this.yMm += 1.5;
	}
}

function swatch(doc: Doc, status: FitStatus, xMm: number, yMm: number) {
	const ink = STATUS_INK[status];
	const x = mmToPt(xMm);
	const y = mmToPt(yMm);
	const s = mmToPt(3.2);
	doc.save();
	if (ink.pattern === 'dashed') {
		doc.rect(x, y, s, s).fill(ink.fill);
		doc
			.dash(1.2 * PT, { space: 0.8 * PT })
			.rect(x, y, s, s)
			.lineWidth(0.35 * PT)
			.stroke(ink.edge);
	} else {
		doc.rect(x, y, s, s).fill(ink.fill);
		if (ink.pattern === 'hatch') {
			doc.rect(x, y, s, s).clip();
			for (let k = -s; k < s; k += 1.1 * PT) {
				doc
					.moveTo(x + k, y + s)
					.lineTo(x + k + s, y)
					.lineWidth(0.35 * PT)
					.stroke(ink.edge);
			}
		} else if (ink.pattern === 'dots') {
			for (const [i, j] of [
				[0.25, 0.25],
				[0.75, 0.25],
				[0.25, 0.75],
				[0.75, 0.75],
				[0.5, 0.5]
			]) {
				doc.circle(x + i * s, y + j * s, 0.25 * PT).fill('#f4efff');
			}
		} else if (ink.pattern === 'crosshatch') {
			// Collides: lines both ways inside a heavy dark edge.
			doc.save();
			doc.rect(x, y, s, s).clip();
			for (let k = -s; k < s; k += 1.1 * PT) {
				doc
					.moveTo(x + k, y + s)
					.lineTo(x + k + s, y)
					.moveTo(x + k, y)
					.lineTo(x + k + s, y + s)
					.lineWidth(0.2 * PT)
					.stroke('#ff9a7a');
			}
			doc.restore();
			doc
				.rect(x, y, s, s)
				.lineWidth(0.6 * PT)
				.stroke(ink.edge);
		}
	}
	doc.restore();
}

function headingBlock(w: Writer, data: SheetData) {
	const h = data.sheet.heading;
	w.text('BUILD SHEET', { size: 7.5, font: w.fonts.bold, color: INK.dividerEdge, gapAfter: 0.5 });
	w.text(h.buildName, { size: 18, font: w.fonts.bold, gapAfter: 0.6 });
	w.text(
		`${h.variantName}, ${h.versionText} · ${h.enclosureName}${h.clientName ? ` · for ${h.clientName}` : ''}`,
		{ size: 9.5, color: INK.muted }
	);
	w.text(
		`${data.generatedAt.toLocaleDateString('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' })} · ${PAPER[data.paper].label}`,
		{ size: 8.5, color: INK.muted, gapAfter: 1.5 }
	);
	w.rule(0.9, INK.text);
	w.yMm += 2;
}

function fitSection(w: Writer, data: SheetData) {
	const fit = data.sheet.fit;
	w.heading('Fit');
	w.text(fit.summary, { size: 11, font: w.fonts.bold, gapAfter: 0.4 });
	w.text(`Margin ${fit.marginText}: gaps under it count as tight.`, {
		size: 8.5,
		color: INK.muted,
		gapAfter: 2
	});
	for (const item of fit.items) w.statusRow(item.status, item.word, item.title, item.detail);
	if (!fit.items.length) {
		w.text('Nothing collides, is blocked, reaches outside or is tight.', {
			size: 8.5,
			color: INK.muted,
			gapAfter: 2
		});
	}
	w.text('Budgets', { font: w.fonts.bold, gapAfter: 1.2 });
	// Budgets carry their own words, not a status's swatch ("over" is not a collision).
	for (const b of fit.budgets) {
		w.text(
			`${BUDGET_MARK[b.status].word.toUpperCase()} · ${b.title}${b.key === 'heat' ? ' (estimate)' : ''}`,
			{ font: w.fonts.medium, gapAfter: 0.2 }
		);
		const detail = [b.text, b.estimateNote].filter(Boolean).join(' ');
		if (detail) w.text(detail, { size: 8.5, color: INK.muted, gapAfter: 1.2 });
	}
}

function enclosureSection(w: Writer, data: SheetData) {
	const e = data.sheet.enclosure;
	w.heading('Enclosure and settings');
	w.text(`Outside ${e.outerText}; inside ${e.innerText}, ${e.volumeText}.`);
	w.text(`Panels: ${e.walls.join(' · ')}.`, { size: 8.5, color: INK.muted, gapAfter: 2 });
	for (const s of e.settings) w.text(s.text, { gapAfter: 1 });
	if (e.compartments.length > 1) {
		w.text('Compartments', { font: w.fonts.bold, gapAfter: 0.6 });
		for (const c of e.compartments) w.text(`${c.label}: ${c.sizeText}`, { size: 9 });
	}
	if (e.mounts.length) {
		w.yMm += 1;
		w.text('Mounts', { font: w.fonts.bold, gapAfter: 1 });
		for (const m of e.mounts) w.statusRow(m.status, STATUS_INK[m.status].word, m.label, m.text);
	}
}

function drawingsPage(w: Writer, data: SheetData) {
	const d = data.drawing;
	w.newPage();
	w.heading(`Views · scale ${d.scaleText}`);
	w.text(
		'Millimetres; inner coordinates from the front-bottom-left inside corner. Numbers in circles are the part numbers of the part list.',
		{ size: 8, color: INK.muted, gapAfter: 2 }
	);
	const [front, top, side] = d.views;
	const gutter = 8;
	const top0 = w.yMm + 4;
	const caption = (text: string, x: number, y: number) => {
		w.doc
			.font(w.fonts.medium)
			.fontSize(8)
			.fillColor(INK.muted)
			.text(w.fonts.text(text), mmToPt(x), mmToPt(y - 3.6), { lineBreak: false });
	};
	// Third-angle projection, as on the screen: top above the front, the right side to its right.
	caption(`Top · ${top.axisNote}, front at the bottom`, w.left, top0);
	drawView(w.doc, w.fonts, d, top, w.left, top0);
	const rowTop = top0 + top.frame.h * d.scale + gutter;
	const rowH = Math.max(front.frame.h, side.frame.h) * d.scale;
	caption(`Front · ${front.axisNote}`, w.left, rowTop);
	drawView(w.doc, w.fonts, d, front, w.left, rowTop);
	const sideLeft = w.left + front.frame.w * d.scale + gutter;
	caption(`Side, from the right · ${side.axisNote}`, sideLeft, rowTop);
	drawView(w.doc, w.fonts, d, side, sideLeft, rowTop);
	if (
		!layoutFits(d.views, d.scale, { widthMm: w.width, heightMm: w.bottom - top0, gutterMm: gutter })
	) {
		w.yMm = rowTop + rowH + 4;
		w.text('The drawings are larger than the page at the smallest scale; they run past its edge.', {
			size: 8,
			color: INK.muted
		});
	}
	drawingKey(w, w.left + top.frame.w * d.scale + gutter, top0);
}

/** What the inks and marks of the drawings mean, beside the top view. */
function drawingKey(w: Writer, left: number, top: number) {
	if (left + 40 > w.left + w.width) return;
	const doc = w.doc;
	let y = top;
	const label = (text: string) => {
		doc
			.font(w.fonts.regular)
			.fontSize(8)
			.fillColor(INK.text)
			.text(w.fonts.text(text), mmToPt(left + 5.2), mmToPt(y - 0.1), { lineBreak: false });
		y += 5;
	};
	// The third-angle symbol (ISO 5456-2), the same lines as on the screen (thirdAngleSymbol).
	const mm = (v: number) => mmToPt(v);
	const sym = thirdAngleSymbol(2.5);
	doc.save();
	doc.lineWidth(sym.lineMm * PT).strokeColor(INK.text);
	for (const c of sym.circles) doc.circle(mm(left + c.cx), mm(y + c.cy), mm(c.r)).stroke();
	const [first, ...rest] = sym.outline;
	doc.moveTo(mm(left + first[0]), mm(y + first[1]));
	for (const [px, py] of rest) doc.lineTo(mm(left + px), mm(y + py));
	doc.closePath().stroke();
	doc
		.lineWidth((sym.lineMm / 2) * PT)
		.dash(sym.lineMm * 12 * PT, { space: sym.lineMm * 3 * PT })
		.moveTo(mm(left + sym.axis[0]), mm(y + sym.axis[1]))
		.lineTo(mm(left + sym.axis[2]), mm(y + sym.axis[3]))
		.stroke()
		.undash();
	doc.restore();
	doc
		.font(w.fonts.regular)
		.fontSize(8)
		.fillColor(INK.text)
		.text(w.fonts.text('Third-angle projection'), mm(left + sym.widthMm + 1.5), mm(y + 1), {
			lineBreak: false
		});
	y += 6;
	for (const s of ['collides', 'blocked', 'outside', 'tight', 'clear'] as const) {
		swatch(doc, s, left, y);
		label(STATUS_INK[s].word);
	}
	y += 2;
	const box = (fill: string | null, edge: string, dashed = false) => {
		doc.save();
		if (dashed) doc.dash(0.9 * PT, { space: 0.6 * PT });
		doc.rect(mmToPt(left), mmToPt(y), mmToPt(3.2), mmToPt(3.2)).lineWidth(0.3 * PT);
		if (fill) doc.fillAndStroke(fill, edge);
		else doc.stroke(edge);
		doc.restore();
	};
	box(INK.dividerFill, INK.dividerEdge);
	label('divider');
	box(INK.bracketFill, INK.bracketEdge);
	label('bracket');
	box(null, INK.keepout, true);
	label('keep-out');
	box(INK.interference, INK.interferenceEdge);
	label('interference');
	doc.save();
	doc
		.circle(mmToPt(left + 1.6), mmToPt(y + 1.6), mmToPt(1.8))
		.lineWidth(0.2 * PT)
		.fillAndStroke(INK.paper, INK.line);
	doc.restore();
	doc
		.font(w.fonts.bold)
		.fontSize(6.5)
		.fillColor(INK.text)
		.text('1', mmToPt(left + 0.9), mmToPt(y + 0.4), { lineBreak: false });
	label('part number, as in the part list');
	doc.save();
	doc
		.roundedRect(mmToPt(left - 0.4), mmToPt(y), mmToPt(4.2), mmToPt(3.2), 0.6 * PT)
		.lineWidth(0.15 * PT)
		.fillAndStroke(INK.gapTag, INK.gap);
	doc.restore();
	label('free gap between two faces');
}

type Column = { title: string; widthMm: number; cell: (i: number) => string };

function table(w: Writer, rows: number, columns: Column[], size = 8) {
	/** The height of a row of cells in `font`: its tallest cell. */
	const heightOf = (text: (c: Column) => string, font: string) =>
		Math.max(...columns.map((c) => w.heightOf(text(c), size, c.widthMm - 1.5, font)));
	/** One row of cells `h` high in `font` at the current line, then a rule under it. */
	const row = (
		text: (c: Column) => string,
		font: string,
		h: number,
		rule: { widthPt: number; color: string }
	) => {
		const y = w.yMm;
		let x = w.left;
		for (const c of columns) {
			w.doc
				.font(font)
				.fontSize(size)
				.fillColor(INK.text)
				.text(w.fonts.text(text(c)), mmToPt(x), mmToPt(y), { width: mmToPt(c.widthMm - 1.5) });
			x += c.widthMm;
		}
		w.yMm = y + h + 0.8;
		w.doc
			.moveTo(mmToPt(w.left), w.doc.y)
			.lineTo(mmToPt(w.left + w.width), w.doc.y)
			.lineWidth(rule.widthPt)
			.stroke(rule.color);
		w.yMm += 1;
	};
	const title = (c: Column) => c.title;
	const headerH = heightOf(title, w.fonts.bold);
	const drawHeader = () =>
		row(title, w.fonts.bold, headerH, { widthPt: 0.4 * PT, color: INK.line });
	w.need(14);
	drawHeader();
	for (let i = 0; i < rows; i++) {
		const cell = (c: Column) => c.cell(i);
		const h = heightOf(cell, w.fonts.regular);
		if (w.yMm + h > w.bottom) {
			w.newPage();
			drawHeader();
		}
		row(cell, w.fonts.regular, h, { widthPt: 0.15 * PT, color: '#ddd3c0' });
	}
}

function partsSection(w: Writer, data: SheetData) {
	const parts = data.sheet.parts;
	w.newPage();
	w.heading('Parts');
	const k = w.width / 186;
	table(w, parts.length, [
		{ title: '#', widthMm: 7 * k, cell: (i) => String(i + 1) },
		{
			title: 'Part',
			widthMm: 52 * k,
			cell: (i) =>
				`${parts[i].name}\n${parts[i].categoryWord}${parts[i].mountLabel ? ` · on ${parts[i].mountLabel}` : ''}${parts[i].compartmentLabel ? ` · ${parts[i].compartmentLabel}` : ''}\ndimensions: ${parts[i].provenance}`
		},
		{ title: 'Size as placed (W × H × D)', widthMm: 33 * k, cell: (i) => parts[i].sizeText },
		{ title: 'Position (min corner)', widthMm: 32 * k, cell: (i) => parts[i].positionText },
		{ title: 'Orientation', widthMm: 32 * k, cell: (i) => parts[i].orientation },
		{
			title: 'Fit',
			widthMm: 30 * k,
			cell: (i) =>
				`${parts[i].status}${parts[i].smallestGap ? `\nnearest: ${parts[i].smallestGap}` : ''}`
		}
	]);
}

function quoteSection(w: Writer, data: SheetData) {
	const q = data.quote;
	if (!q) return;
	w.heading('Quote');
	if (q.draft) {
		w.text(
			`Draft: not yet sent to the client.${q.unpriced ? ` ${q.unpriced} line(s) still without a price.` : ''}`,
			{ size: 8.5, color: INK.muted, gapAfter: 1.5 }
		);
	}
	const rows = [
		...q.lines.map((l) => [l.description, String(l.quantity), l.unit, l.total]),
		...(q.labour ? [[q.labour.note, '1', q.labour.amount, q.labour.amount]] : [])
	];
	rows.push(['Subtotal', '', '', q.subtotal]);
	if (q.tax) rows.push([`Tax ${q.tax.rate}`, '', '', q.tax.amount]);
	rows.push(['Total', '', '', q.total], ['Deposit', '', '', q.deposit]);
	const k = w.width / 186;
	table(w, rows.length, [
		{ title: 'Line', widthMm: 100 * k, cell: (i) => rows[i][0] },
		{ title: 'Qty', widthMm: 16 * k, cell: (i) => rows[i][1] },
		{ title: 'Unit', widthMm: 35 * k, cell: (i) => rows[i][2] },
		{ title: 'Amount', widthMm: 35 * k, cell: (i) => rows[i][3] }
	]);
}

function tickBox(doc: Doc, xMm: number, yMm: number, ticked: boolean) {
	const s = mmToPt(4.2);
	const x = mmToPt(xMm);
	const y = mmToPt(yMm);
	doc.save();
	doc
		.roundedRect(x, y, s, s, 0.8 * PT)
		.lineWidth(0.45 * PT)
		.stroke(INK.line);
	if (ticked) {
		doc
			.moveTo(x + s * 0.2, y + s * 0.55)
			.lineTo(x + s * 0.42, y + s * 0.78)
			.lineTo(x + s * 0.82, y + s * 0.22)
			.lineWidth(0.7 * PT)
			.stroke(STATUS_INK.clear.edge);
	}
	doc.restore();
}

function checklistSection(w: Writer, data: SheetData) {
	w.newPage();
	w.heading('Assembly checklist');
	w.text(data.sheet.planningNote, { size: 8.5, color: INK.dividerEdge, gapAfter: 2 });
	for (const group of data.sheet.checklist) {
		w.need(14);
		w.yMm += 1.5;
		w.text(group.title, { font: w.fonts.bold, gapAfter: 1.2 });
		for (const item of group.items) {
			const x = w.left + 7;
			const h =
				w.heightOf(item.text, 9, w.width - 7) +
				(item.detail ? w.heightOf(item.detail, 8, w.width - 7) : 0);
			w.need(Math.max(h, 5) + 1.5);
			const y = w.yMm;
			const tick = data.ticks[item.key];
			tickBox(w.doc, w.left, y, !!tick);
			w.text(item.text, { x, size: 9, gapAfter: 0.2 });
			if (item.detail) w.text(item.detail, { x, size: 8, color: INK.muted, gapAfter: 0.2 });
			if (tick) {
				w.text(
					`Ticked${tick.by ? ` by ${tick.by}` : ''}${tick.earlierVersion ? ', before the variant last changed: check it again' : ''}`,
					{ x, size: 7.5, color: INK.dividerEdge, gapAfter: 0.2 }
				);
			}
			w.yMm = Math.max(w.yMm, y + 4.6) + 1.4;
		}
	}
	w.yMm += 2;
	w.text('How the order is worked out', { font: w.fonts.bold, size: 9, gapAfter: 0.8 });
	for (const r of data.sheet.assembly.rule) w.text(r, { size: 8, color: INK.muted });
}

async function photosSection(w: Writer, data: SheetData) {
	if (!data.photos.length) return;
	w.heading('Photos');
	const cell = 42;
	const perRow = Math.max(1, Math.floor((w.width + 4) / (cell + 4)));
	let col = 0;
	for (const p of data.photos.slice(0, MAX_PDF_PHOTOS)) {
		const img = await readPhoto(data.build.id, p.id, 'thumb');
		if (!img) continue;
		// pdfkit embeds JPEG and PNG only; thumbnails are stored as WebP.
		const png = await sharp(img.bytes).png().toBuffer();
		if (col === 0) w.need(cell + 8);
		const x = w.left + col * (cell + 4);
		const y = w.yMm;
		w.doc.image(png, mmToPt(x), mmToPt(y), { fit: [mmToPt(cell), mmToPt(cell)] });
		if (p.caption) {
			w.doc
				.font(w.fonts.regular)
				.fontSize(7)
				.fillColor(INK.muted)
				.text(w.fonts.text(p.caption), mmToPt(x), mmToPt(y + cell + 0.8), {
					width: mmToPt(cell),
					height: mmToPt(6),
					ellipsis: true
				});
		}
		col = (col + 1) % perRow;
		w.yMm = col === 0 ? y + cell + 8 : y;
	}
	if (col !== 0) w.yMm += cell + 8;
	if (data.photos.length > MAX_PDF_PHOTOS) {
		w.text(`${data.photos.length - MAX_PDF_PHOTOS} more photos on the sheet page.`, {
			size: 8,
			color: INK.muted
		});
	}
}

function footers(
	doc: Doc,
	fonts: Fonts,
	data: SheetData,
	page: { widthMm: number; heightMm: number }
) {
	const range = doc.bufferedPageRange();
	for (let i = range.start; i < range.start + range.count; i++) {
		doc.switchToPage(i);
		const y = mmToPt(page.heightMm - MARGIN_MM - 4);
		const left = mmToPt(MARGIN_MM);
		const width = mmToPt(page.widthMm - 2 * MARGIN_MM);
		// The footer sits in the bottom margin: keep pdfkit from starting a page for it.
		const bottom = doc.page.margins.bottom;
		doc.page.margins.bottom = 0;
		doc.font(fonts.regular).fontSize(7).fillColor(INK.muted);
		doc.text(
			fonts.text(
				`${data.sheet.heading.buildName} · ${data.sheet.heading.variantName} v${data.sheet.heading.variantVersion} · page ${i + 1} of ${range.count}`
			),
			left,
			y,
			{ width, lineBreak: false }
		);
		doc.text(fonts.text(data.sheet.planningNote), left, y + 9, {
			width,
			lineBreak: false,
			ellipsis: true
		});
		doc.page.margins.bottom = bottom;
	}
}

/** The sheet as PDF bytes. */
export async function renderSheetPdf(data: SheetData): Promise<Buffer> {
	const page = PAPER[data.paper];
	const doc = new PDFDocument({
		size: [mmToPt(page.widthMm), mmToPt(page.heightMm)],
		margins: {
			top: mmToPt(MARGIN_MM),
			bottom: mmToPt(MARGIN_MM),
			left: mmToPt(MARGIN_MM),
			right: mmToPt(MARGIN_MM)
		},
		bufferPages: true,
		info: {
			Title: `Build sheet · ${data.build.name} · ${data.variant.name}`,
			Creator: 'Interstice',
			Producer: 'Interstice'
		}
	});
	const chunks: Buffer[] = [];
	doc.on('data', (c: Buffer) => chunks.push(c));
	const done = new Promise<void>((resolve, reject) => {
		doc.on('end', () => resolve());
		doc.on('error', reject);
	});
	const fonts = registerFonts(doc);
	const w = new Writer(doc, fonts, page);
	w.yMm = MARGIN_MM;
	headingBlock(w, data);
	fitSection(w, data);
	enclosureSection(w, data);
	drawingsPage(w, data);
	partsSection(w, data);
	quoteSection(w, data);
	checklistSection(w, data);
	await photosSection(w, data);
	footers(doc, fonts, data, page);
	doc.end();
	await done;
	return Buffer.concat(chunks);
}
