/**
 * The sheet's orthographic views drawn into a PDF with pdfkit, from the same primitives and the
 * same inks as the SVG on the page (drawing-style.ts). Paper millimetres in, PDF points out.
 */
import type PDFDocument from 'pdfkit';
import { BODY_OPACITY, INK, PATTERN_MM, STATUS_INK, WEIGHT } from '$lib/builds/drawing-style';
import type { OrthoView, SheetDrawing, ViewDim, ViewRect } from '$lib/builds/orthographic';

type Doc = InstanceType<typeof PDFDocument>;

/** PDF points per millimetre (72 points to the inch, 25.4 mm to the inch). */
export const PT = 72 / 25.4;

export type Fonts = { regular: string; medium: string; bold: string; text: (s: string) => string };

interface Place {
	/** Paper millimetres of the view frame's top-left corner. */
	leftMm: number;
	topMm: number;
	scale: number;
}

const px = (p: Place, view: OrthoView, x: number) => (p.leftMm + (x - view.frame.x) * p.scale) * PT;
const py = (p: Place, view: OrthoView, y: number) => (p.topMm + (y - view.frame.y) * p.scale) * PT;

/**
 * 45° lines across the rectangle, clipped to it, `stepMm` apart and `lineMm` wide: rising only
 * (hatch), or falling too (crosshatch, so grey-scale still tells the two apart).
 */
function diagonals(
	doc: Doc,
	rect: { x: number; y: number; w: number; h: number },
	color: string,
	style: { stepMm: number; lineMm: number; bothWays: boolean }
) {
	const { x, y, w, h } = rect;
	const step = style.stepMm * PT;
	doc.save();
	doc.rect(x, y, w, h).clip();
	doc
		.lineWidth(style.lineMm * PT)
		.strokeColor(color)
		.strokeOpacity(0.8);
	for (let k = -h; k < w; k += step) {
		doc
			.moveTo(x + k, y + h)
			.lineTo(x + k + h, y)
			.stroke();
		if (style.bothWays) {
			doc
				.moveTo(x + k, y)
				.lineTo(x + k + h, y + h)
				.stroke();
		}
	}
	doc.restore();
}

function dots(doc: Doc, x: number, y: number, w: number, h: number, color: string) {
	const step = PATTERN_MM.dots * PT;
	doc.save();
	doc.rect(x, y, w, h).clip();
	doc.fillColor(color).fillOpacity(0.8);
	for (let j = y + step / 2; j < y + h; j += step) {
		for (let i = x + step / 2; i < x + w; i += step) {
			doc.circle(i, j, PATTERN_MM.dotRadius * PT).fill();
		}
	}
	doc.restore();
}

function rect(doc: Doc, view: OrthoView, p: Place, r: ViewRect) {
	const x = px(p, view, r.x);
	const y = py(p, view, r.y);
	const w = r.w * p.scale * PT;
	const h = r.h * p.scale * PT;
	doc.save();
	if (r.kind === 'body' && r.status) {
		const ink = STATUS_INK[r.status];
		if (r.status !== 'outside') {
			doc.rect(x, y, w, h).fillOpacity(BODY_OPACITY[r.status]).fill(ink.fill);
		}
		if (ink.pattern === 'hatch') {
			diagonals(doc, { x, y, w, h }, ink.edge, {
				stepMm: PATTERN_MM.hatch,
				lineMm: 0.35,
				bothWays: false
			});
		}
		if (ink.pattern === 'dots') dots(doc, x, y, w, h, ink.edge);
		if (ink.pattern === 'crosshatch') {
			diagonals(doc, { x, y, w, h }, ink.edge, {
				stepMm: PATTERN_MM.crosshatch,
				lineMm: 0.3,
				bothWays: true
			});
		}
		if (r.status === 'outside') {
			doc.dash(PATTERN_MM.dash * PT, { space: PATTERN_MM.dash * 0.7 * PT });
		}
		doc
			.rect(x, y, w, h)
			.lineWidth((r.status === 'collides' ? WEIGHT.bodyCollides : WEIGHT.body) * PT)
			.strokeOpacity(1)
			.stroke(ink.edge);
	} else if (r.kind === 'keepout') {
		doc.dash(PATTERN_MM.dash * PT, { space: PATTERN_MM.dash * 0.7 * PT });
		doc
			.rect(x, y, w, h)
			.lineWidth(WEIGHT.keepout * PT)
			.stroke(INK.keepout);
	} else {
		const [fill, edge, weight, opacity] =
			r.kind === 'wall'
				? [INK.wallFill, INK.wallEdge, WEIGHT.wall, 0.7]
				: r.kind === 'divider'
					? [INK.dividerFill, INK.dividerEdge, WEIGHT.divider, 1]
					: r.kind === 'bracket'
						? [INK.bracketFill, INK.bracketEdge, WEIGHT.wall, 1]
						: [INK.interference, INK.interferenceEdge, WEIGHT.interference, 0.75];
		doc.rect(x, y, w, h).fillOpacity(opacity).fill(fill);
		doc
			.rect(x, y, w, h)
			.lineWidth(weight * PT)
			.strokeOpacity(1)
			.stroke(edge);
	}
	doc.restore();
}

function textAt(
	doc: Doc,
	fonts: Fonts,
	s: string,
	x: number,
	y: number,
	sizePt: number,
	anchor: ViewDim['anchor'],
	font = fonts.regular
) {
	const text = fonts.text(s);
	doc.font(font).fontSize(sizePt);
	const w = doc.widthOfString(text);
	const left = anchor === 'start' ? x : anchor === 'end' ? x - w : x - w / 2;
	doc.text(text, left, y, { lineBreak: false, baseline: 'alphabetic' });
}

function dim(
	doc: Doc,
	fonts: Fonts,
	view: OrthoView,
	p: Place,
	d: ViewDim,
	paper: SheetDrawing['paper']
) {
	const color = d.kind === 'gap' ? INK.gap : INK.line;
	doc.save();
	for (const e of d.extensions) {
		doc
			.moveTo(px(p, view, e[0]), py(p, view, e[1]))
			.lineTo(px(p, view, e[2]), py(p, view, e[3]))
			.lineWidth(WEIGHT.dimension * 0.7 * PT)
			.stroke(INK.muted);
	}
	const ax = px(p, view, d.a[0]);
	const ay = py(p, view, d.a[1]);
	const bx = px(p, view, d.b[0]);
	const by = py(p, view, d.b[1]);
	doc
		.moveTo(ax, ay)
		.lineTo(bx, by)
		.lineWidth((d.kind === 'gap' ? WEIGHT.gap : WEIGHT.dimension) * PT)
		.stroke(color);
	doc.circle(ax, ay, 0.45 * PT).fill(color);
	doc.circle(bx, by, 0.45 * PT).fill(color);
	const lx = px(p, view, d.labelAt[0]);
	const ly = py(p, view, d.labelAt[1]);
	if (d.tagBox) {
		const size = paper.tagMm * PT;
		if (d.leader) {
			doc
				.moveTo(px(p, view, d.leader[0]), py(p, view, d.leader[1]))
				.lineTo(px(p, view, d.leader[2]), py(p, view, d.leader[3]))
				.lineWidth(0.12 * PT)
				.stroke(INK.gap);
		}
		const bx = px(p, view, d.tagBox.x);
		const by = py(p, view, d.tagBox.y);
		doc
			.roundedRect(bx, by, d.tagBox.w * p.scale * PT, d.tagBox.h * p.scale * PT, 0.6 * PT)
			.lineWidth(0.15 * PT)
			.fillAndStroke(d.tight ? STATUS_INK.tight.fill : INK.gapTag, INK.gap);
		doc.fillColor(INK.text);
		textAt(doc, fonts, d.label, lx, ly, size, 'middle');
	} else {
		doc.fillColor(INK.text);
		if (d.vertical) {
			doc.save();
			doc.rotate(-90, { origin: [lx, ly] });
			textAt(doc, fonts, d.label, lx, ly, paper.textMm * PT, d.anchor);
			doc.restore();
		} else {
			textAt(doc, fonts, d.label, lx, ly, paper.textMm * PT, d.anchor);
		}
	}
	doc.restore();
}

/** One view with its frame's top-left at (leftMm, topMm) on the page. */
export function drawView(
	doc: Doc,
	fonts: Fonts,
	drawing: SheetDrawing,
	view: OrthoView,
	leftMm: number,
	topMm: number
) {
	const p: Place = { leftMm, topMm, scale: drawing.scale };
	for (const r of view.rects) rect(doc, view, p, r);
	for (const d of view.dims) dim(doc, fonts, view, p, d, drawing.paper);
	const size = drawing.paper.tagMm * PT;
	for (const t of view.tags) {
		const x = px(p, view, t.x);
		const y = py(p, view, t.y);
		doc.save();
		doc
			.circle(x, y, size * 0.85)
			.lineWidth(0.2 * PT)
			.fillAndStroke(INK.paper, INK.line);
		doc.fillColor(INK.text);
		textAt(doc, fonts, t.text, x, y + size * 0.36, size, 'middle', fonts.bold);
		doc.restore();
	}
}
