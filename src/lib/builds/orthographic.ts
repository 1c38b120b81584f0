/**
 * Three orthographic views of a resolved scene, as drawing primitives both the page (SVG) and the
 * PDF draw. The boxes are the engine's world boxes, the same the 3D view draws; nothing is
 * re-measured here.
 *
 * Views, as a builder sees the enclosure (the 3D view's preset cameras agree):
 * - front: from the front, X to the right, Y up;
 * - top: from above with the front at the bottom of the drawing, X to the right, Z up the page;
 * - side: from the right, Z to the right (front on the left), Y up.
 *
 * Primitives are in view millimetres with y growing down the page (SVG and PDF both work that
 * way): a world point (h, v) lands at (h, −v). One scale serves all three views so they can be
 * compared with a ruler; sizes meant for paper (text, dimension spacing) are given in paper
 * millimetres and converted with that scale.
 *
 * Our drawing conventions: structure in graphite, dividers in brass, parts filled in their status
 * colour with its pattern, keep-outs as thin dashed outlines, interference as its own solid box.
 * Dimensions end in small dots; overall sizes and positions run outside the enclosure, gaps run
 * inside between the two faces with a tag for the number.
 */

import {
	EPSILON_MM,
	type Axis,
	type Box,
	type Face,
	type FitReport,
	type FitStatus,
	type ResolvedScene,
	type Scene,
	type WorldBox
} from '$lib/geometry';
import { AXIS_WORDS, mm } from '../words/sheet';

export type ViewId = 'front' | 'top' | 'side';

export interface ViewRect {
	id: string;
	kind: 'wall' | 'divider' | 'bracket' | 'body' | 'keepout' | 'interference';
	label: string;
	placementId?: string;
	status?: FitStatus;
	x: number;
	y: number;
	w: number;
	h: number;
}

export interface ViewDim {
	id: string;
	kind: 'overall' | 'position' | 'gap';
	a: [number, number];
	b: [number, number];
	/** Thin lines from the drawing out to the dimension line. */
	extensions: [number, number, number, number][];
	label: string;
	labelAt: [number, number];
	anchor: 'start' | 'middle' | 'end';
	/** Text turned a quarter turn anticlockwise, to run along a vertical dimension line. */
	vertical: boolean;
	tight: boolean;
	/** Gaps: the tag the number sits in (the text is centred in it). */
	tagBox?: { x: number; y: number; w: number; h: number };
	/** Gaps: a thin line from a tag moved aside back to its dimension. */
	leader?: [number, number, number, number];
}

export interface ViewTag {
	placementId: string;
	/** The part's number in the part list. */
	text: string;
	x: number;
	y: number;
}

export interface OrthoView {
	id: ViewId;
	title: string;
	/** Axis to the right and axis up the page. */
	h: Axis;
	v: Axis;
	axisNote: string;
	/** What to draw in, view millimetres: includes the dimension lines. */
	frame: { x: number; y: number; w: number; h: number };
	rects: ViewRect[];
	dims: ViewDim[];
	tags: ViewTag[];
}

export interface SheetDrawing {
	/** Paper millimetres per world millimetre. */
	scale: number;
	/** "1:4". */
	scaleText: string;
	/** Paper millimetres for text and dimension spacing, to be divided by `scale` in view units. */
	paper: { textMm: number; tagMm: number; lineMm: number };
	views: OrthoView[];
}

interface ViewSpec {
	id: ViewId;
	title: string;
	h: 0 | 1 | 2;
	v: 0 | 1 | 2;
	/** The axis the viewer looks along, and which end of it is nearer. */
	depth: 0 | 1 | 2;
	nearHigh: boolean;
}

const SPECS: ViewSpec[] = [
	{ id: 'front', title: 'Front', h: 0, v: 1, depth: 2, nearHigh: false },
	{ id: 'top', title: 'Top', h: 0, v: 2, depth: 1, nearHigh: true },
	{ id: 'side', title: 'Side, from the right', h: 2, v: 1, depth: 0, nearHigh: true }
];

const AXIS_NAMES: Axis[] = ['x', 'y', 'z'];

/** Gap dimensions a view carries at most, smallest first, so the drawing stays readable. */
const MAX_GAPS = 8;

/** Paper sizes for everything that is not the drawing itself. */
const PAPER = { textMm: 2.4, tagMm: 2.2, lineMm: 0.25, dimGapMm: 4, dimStepMm: 4.5 };

/** Scales a sheet may print at, largest first: paper mm per world mm. */
export const SCALES = [
	1,
	1 / 2,
	1 / 2.5,
	1 / 3,
	1 / 4,
	1 / 5,
	1 / 6,
	1 / 8,
	1 / 10,
	1 / 15,
	1 / 20
];

function rectOf(box: Box, s: ViewSpec): { x: number; y: number; w: number; h: number } {
	return {
		x: box.min[s.h],
		y: -box.max[s.v],
		w: box.max[s.h] - box.min[s.h],
		h: box.max[s.v] - box.min[s.v]
	};
}

/** Farthest first, so nearer boxes are painted over farther ones. */
function farFirst(s: ViewSpec) {
	return (a: WorldBox, b: WorldBox) =>
		s.nearHigh ? a.box.max[s.depth] - b.box.max[s.depth] : b.box.min[s.depth] - a.box.min[s.depth];
}

const WALL_AXIS: Record<string, number> = {
	left: 0,
	right: 0,
	bottom: 1,
	top: 1,
	front: 2,
	back: 2
};

function structureRects(scene: Scene, resolved: ResolvedScene, s: ViewSpec): ViewRect[] {
	const out: ViewRect[] = [];
	for (const w of resolved.walls) {
		// A panel facing the viewer would hide everything behind it.
		if (w.face && WALL_AXIS[w.face] === s.depth) continue;
		out.push({ id: w.id, kind: 'wall', label: w.label, ...rectOf(w.box, s) });
	}
	for (const d of resolved.dividers) {
		// Likewise a divider that faces the viewer; the other two views show it.
		const def = scene.enclosure.dividers.find((x) => x.id === d.ownerId);
		if (def && AXIS_NAMES.indexOf(def.axis) === s.depth) continue;
		out.push({ id: d.id, kind: 'divider', label: d.label, ...rectOf(d.box, s) });
	}
	for (const b of resolved.brackets) {
		out.push({ id: b.id, kind: 'bracket', label: b.label, ...rectOf(b.box, s) });
	}
	// A mount's adapter plate or standoffs: fixed structure drawn like a bracket.
	for (const b of resolved.plates) {
		out.push({ id: b.id, kind: 'bracket', label: b.label, ...rectOf(b.box, s) });
	}
	return out;
}

function partRects(resolved: ResolvedScene, report: FitReport, s: ViewSpec): ViewRect[] {
	const status = new Map(report.parts.map((p) => [p.placementId, p.status]));
	const bodies = resolved.placements.flatMap((rp) => rp.bodies).sort(farFirst(s));
	const out: ViewRect[] = bodies.map((b) => ({
		id: b.id,
		kind: 'body',
		label: b.label,
		placementId: b.placementId,
		status: status.get(b.placementId!),
		...rectOf(b.box, s)
	}));
	for (const k of resolved.placements.flatMap((rp) => rp.keepouts)) {
		out.push({
			id: k.id,
			kind: 'keepout',
			label: k.label,
			placementId: k.placementId,
			...rectOf(k.box, s)
		});
	}
	for (const o of report.overlaps.filter((o) => o.kind === 'collides')) {
		out.push({
			id: `overlap:${o.a.id}|${o.b.id}`,
			kind: 'interference',
			label: `${o.a.label} × ${o.b.label}`,
			status: 'collides',
			...rectOf(o.box, s)
		});
	}
	return out;
}

/** Every world box by id, to find what a gap is measured against. */
function boxIndex(resolved: ResolvedScene): Map<string, Box> {
	const all = [
		...resolved.walls,
		...resolved.dividers,
		...resolved.brackets,
		...resolved.plates,
		...resolved.placements.flatMap((rp) => rp.bodies)
	];
	return new Map(all.map((w) => [w.id, w.box]));
}

interface GapPick {
	placementId: string;
	face: Face;
	gapMm: number;
	against: Box;
	bounds: Box;
	tight: boolean;
}

/**
 * Gaps worth drawing in a view: for each part, its smallest free gap on a face that lies in the
 * view's plane, and every tight one; held contact is not a gap.
 */
function gapPicks(
	resolved: ResolvedScene,
	report: FitReport,
	s: ViewSpec,
	marginMm: number
): GapPick[] {
	const boxes = boxIndex(resolved);
	const picks: GapPick[] = [];
	const extra: GapPick[] = [];
	for (const pr of report.parts) {
		const rp = resolved.placements.find((p) => p.placement.id === pr.placementId)!;
		const candidates = (
			Object.entries(pr.gaps) as [Face, FitReport['parts'][number]['gaps'][Face]][]
		)
			.filter(([f, g]) => {
				const a = AXIS_NAMES.indexOf(f[1] as Axis);
				return (
					(a === s.h || a === s.v) &&
					g.gapMm !== null &&
					g.gapMm >= -EPSILON_MM &&
					!g.held &&
					g.against &&
					boxes.has(g.against.id)
				);
			})
			.map(([face, g]) => ({
				placementId: pr.placementId,
				face,
				gapMm: g.gapMm!,
				against: boxes.get(g.against!.id)!,
				bounds: rp.bounds,
				tight: (g.worstCaseMm ?? g.gapMm!) < marginMm - EPSILON_MM
			}))
			.sort((x, y) => x.gapMm - y.gapMm);
		candidates.forEach((c, i) => {
			if (i === 0) picks.push(c);
			else if (c.tight) extra.push(c);
		});
	}
	// Each part's smallest gap before a second tight one of the same part, so the cap drops repeats first.
	const byGap = (x: GapPick, y: GapPick) => x.gapMm - y.gapMm;
	return [...picks.sort(byGap), ...extra.sort(byGap)].slice(0, MAX_GAPS).sort(byGap);
}

type Area = { x: number; y: number; w: number; h: number };

const overlaps = (a: Area, b: Area) =>
	a.x < b.x + b.w && b.x < a.x + a.w && a.y < b.y + b.h && b.y < a.y + a.h;

/** The first candidate area that is clear of every area already taken (else the first). */
function firstClear(candidates: Area[], taken: Area[]): number {
	const i = candidates.findIndex((c) => !taken.some((t) => overlaps(c, t)));
	return i < 0 ? 0 : i;
}

function gapDim(p: GapPick, s: ViewSpec, k: number, scale: number, taken: Area[]): ViewDim {
	const a = AXIS_NAMES.indexOf(p.face[1] as Axis);
	const high = p.face[0] === '+';
	const end = high ? p.against.min[a] : p.against.max[a];
	const start = high ? end - p.gapMm : end + p.gapMm;
	const other = a === s.h ? s.v : s.h;
	const lo = Math.max(p.bounds.min[other], p.against.min[other]);
	const hi = Math.min(p.bounds.max[other], p.against.max[other]);
	const across = (lo + hi) / 2;
	const point = (along: number, perp: number): [number, number] =>
		a === s.h ? [along, -perp] : [perp, -along];
	const pa = point(start, across);
	const pb = point(end, across);
	const mid = point((start + end) / 2, across);
	const label = `${mm(p.gapMm)}${p.tight ? ' tight' : ''}`;
	const tag = PAPER.tagMm / scale;
	const w = labelWidth(label, tag) + 1.2 / scale;
	const h = tag * 1.3;
	// Beside the line first (above a horizontal one, right of a vertical one), then further out.
	const offsets: [number, number][] =
		a === s.h
			? [
					[0, -1],
					[0, 1],
					[0, -2],
					[0, 2],
					[0, -3],
					[0, 3],
					[-1, -1],
					[1, -1]
				]
			: [
					[1, 0],
					[-1, 0],
					[1, -1],
					[1, 1],
					[-1, -1],
					[-1, 1],
					[1, -2],
					[1, 2]
				];
	const candidates = offsets.map(([dx, dy]) => {
		const cx = a === s.h ? mid[0] + dx * w : mid[0] + dx * (w / 2 + tag * 0.6);
		const cy =
			a === s.h
				? mid[1] + dy * (h * 0.5 + tag * 0.25) * (Math.abs(dy) > 1 ? 1.4 : 1)
				: mid[1] + dy * h * 1.1;
		return { x: cx - w / 2, y: cy - h / 2, w, h };
	});
	const pick = firstClear(candidates, taken);
	const box = candidates[pick];
	taken.push(box);
	const cx = box.x + w / 2;
	const cy = box.y + h / 2;
	const near: [number, number] = [
		Math.min(Math.max(mid[0], box.x), box.x + w),
		Math.min(Math.max(mid[1], box.y), box.y + h)
	];
	const moved = Math.hypot(near[0] - mid[0], near[1] - mid[1]) > tag * 0.8;
	return {
		id: `gap:${p.placementId}:${p.face}:${k}`,
		kind: 'gap',
		a: pa,
		b: pb,
		extensions: [],
		label,
		labelAt: [cx, cy + tag * 0.35],
		anchor: 'middle',
		vertical: false,
		tight: p.tight,
		tagBox: box,
		...(moved
			? { leader: [near[0], near[1], mid[0], mid[1]] as [number, number, number, number] }
			: {})
	};
}

/** Part-number tags at the centre of each part's outline, moved aside when they would overlap. */
function partTags(
	resolved: ResolvedScene,
	s: ViewSpec,
	scale: number,
	numbers: Map<string, number>,
	taken: Area[]
): ViewTag[] {
	const r = (PAPER.tagMm * 0.85) / scale;
	return resolved.placements.map((rp) => {
		const o = rectOf(rp.bounds, s);
		const c: [number, number] = [o.x + o.w / 2, o.y + o.h / 2];
		const offsets: [number, number][] = [
			[0, 0],
			[0, -2.4],
			[0, 2.4],
			[2.4, 0],
			[-2.4, 0],
			[0, -4.8],
			[0, 4.8]
		];
		const candidates = offsets.map(([dx, dy]) => ({
			x: c[0] + dx * r - r,
			y: c[1] + dy * r - r,
			w: 2 * r,
			h: 2 * r
		}));
		const box = candidates[firstClear(candidates, taken)];
		taken.push(box);
		return {
			placementId: rp.placement.id,
			text: String(numbers.get(rp.placement.id) ?? ''),
			x: box.x + r,
			y: box.y + r
		};
	});
}

/** Overall inner sizes and divider/bracket positions, outside the drawing. */
function outsideDims(
	scene: Scene,
	resolved: ResolvedScene,
	s: ViewSpec,
	scale: number,
	shell: Box
): ViewDim[] {
	const inner = resolved.innerBox;
	const gap = PAPER.dimGapMm / scale;
	const step = PAPER.dimStepMm / scale;
	const text = PAPER.textMm / scale;
	const dims: ViewDim[] = [];
	const bottom = -shell.min[s.v] + gap;
	const left = shell.min[s.h] - gap;
	dims.push({
		id: `overall:${AXIS_NAMES[s.h]}`,
		kind: 'overall',
		a: [inner.min[s.h], bottom],
		b: [inner.max[s.h], bottom],
		extensions: [
			[inner.min[s.h], -inner.min[s.v], inner.min[s.h], bottom + text * 0.3],
			[inner.max[s.h], -inner.min[s.v], inner.max[s.h], bottom + text * 0.3]
		],
		label: `inside ${AXIS_WORDS[AXIS_NAMES[s.h]]} ${mm(inner.max[s.h] - inner.min[s.h])}`,
		labelAt: [(inner.min[s.h] + inner.max[s.h]) / 2, bottom + text * 1.3],
		anchor: 'middle',
		vertical: false,
		tight: false
	});
	dims.push({
		id: `overall:${AXIS_NAMES[s.v]}`,
		kind: 'overall',
		a: [left, -inner.min[s.v]],
		b: [left, -inner.max[s.v]],
		extensions: [
			[inner.min[s.h], -inner.min[s.v], left - text * 0.3, -inner.min[s.v]],
			[inner.min[s.h], -inner.max[s.v], left - text * 0.3, -inner.max[s.v]]
		],
		label: `inside ${AXIS_WORDS[AXIS_NAMES[s.v]]} ${mm(inner.max[s.v] - inner.min[s.v])}`,
		labelAt: [left - text * 0.45, -(inner.min[s.v] + inner.max[s.v]) / 2],
		anchor: 'middle',
		vertical: true,
		tight: false
	});
	const axisOf = new Map<string, Axis>(
		[...scene.enclosure.dividers, ...scene.enclosure.brackets].map((d) => [d.id, d.axis])
	);
	let above = 0;
	let right = 0;
	for (const c of [...resolved.dividers, ...resolved.brackets]) {
		// Dividers by where their low face sits, brackets by where they have slid to.
		const axis = AXIS_NAMES.indexOf(axisOf.get(c.ownerId) ?? 'x');
		const at = c.box.min[axis];
		if (at - inner.min[axis] <= EPSILON_MM) continue;
		const label = `${c.label} ${AXIS_NAMES[axis]} = ${mm(at)}`;
		if (axis === s.h) {
			const y = -shell.max[s.v] - gap - step * above++;
			dims.push({
				id: `position:${c.id}`,
				kind: 'position',
				a: [inner.min[s.h], y],
				b: [at, y],
				extensions: [[at, -c.box.max[s.v], at, y - text * 0.3]],
				label,
				labelAt: [at + text * 0.4, y - text * 0.35],
				anchor: 'start',
				vertical: false,
				tight: false
			});
		} else if (axis === s.v) {
			const x = shell.max[s.h] + gap + step * right++;
			dims.push({
				id: `position:${c.id}`,
				kind: 'position',
				a: [x, -inner.min[s.v]],
				b: [x, -at],
				extensions: [[c.box.max[s.h], -at, x + text * 0.3, -at]],
				label,
				labelAt: [x + text * 1.1, -at],
				anchor: 'start',
				vertical: true,
				tight: false
			});
		}
	}
	return dims;
}

function shellBox(resolved: ResolvedScene): Box {
	const all = [resolved.innerBox, ...resolved.walls.map((w) => w.box)];
	return {
		min: [0, 1, 2].map((a) => Math.min(...all.map((b) => b.min[a]))) as Box['min'],
		max: [0, 1, 2].map((a) => Math.max(...all.map((b) => b.max[a]))) as Box['max']
	};
}

/** Width a label takes on paper, roughly: Space Grotesk averages about 0.55 em a character. */
function labelWidth(text: string, sizeMm: number): number {
	return text.length * sizeMm * 0.56;
}

function frameOf(rects: ViewRect[], dims: ViewDim[], scale: number): OrthoView['frame'] {
	const text = PAPER.textMm / scale;
	let x0 = Infinity;
	let y0 = Infinity;
	let x1 = -Infinity;
	let y1 = -Infinity;
	const take = (x: number, y: number) => {
		x0 = Math.min(x0, x);
		y0 = Math.min(y0, y);
		x1 = Math.max(x1, x);
		y1 = Math.max(y1, y);
	};
	for (const r of rects.filter((r) => r.kind !== 'keepout')) {
		take(r.x, r.y);
		take(r.x + r.w, r.y + r.h);
	}
	for (const d of dims) {
		take(...d.a);
		take(...d.b);
		if (d.tagBox) {
			take(d.tagBox.x, d.tagBox.y);
			take(d.tagBox.x + d.tagBox.w, d.tagBox.y + d.tagBox.h);
			continue;
		}
		const w = labelWidth(d.label, text);
		const start = d.anchor === 'start' ? 0 : d.anchor === 'end' ? -w : -w / 2;
		if (d.vertical) {
			// Turned text runs up the page from labelAt: its length is along y.
			take(d.labelAt[0] - text, d.labelAt[1] - start - w);
			take(d.labelAt[0] + text * 0.3, d.labelAt[1] - start);
		} else {
			take(d.labelAt[0] + start, d.labelAt[1] - text);
			take(d.labelAt[0] + start + w, d.labelAt[1] + text * 0.3);
		}
	}
	const pad = 1.5 / scale;
	return { x: x0 - pad, y: y0 - pad, w: x1 - x0 + 2 * pad, h: y1 - y0 + 2 * pad };
}

function viewAt(
	s: ViewSpec,
	scene: Scene,
	resolved: ResolvedScene,
	report: FitReport,
	scale: number,
	numbers: Map<string, number>
): OrthoView {
	const shell = shellBox(resolved);
	const rects = [...structureRects(scene, resolved, s), ...partRects(resolved, report, s)];
	const taken: Area[] = [];
	const tags = partTags(resolved, s, scale, numbers, taken);
	const dims = [
		...outsideDims(scene, resolved, s, scale, shell),
		...gapPicks(resolved, report, s, scene.marginMm).map((p, k) => gapDim(p, s, k, scale, taken))
	];
	const h = AXIS_NAMES[s.h];
	const v = AXIS_NAMES[s.v];
	return {
		id: s.id,
		title: s.title,
		h,
		v,
		axisNote: `${h.toUpperCase()} to the right, ${v.toUpperCase()} up`,
		frame: frameOf(rects, dims, scale),
		rects,
		dims,
		tags
	};
}

/** Room for the drawings on the sheet's first page, paper millimetres. */
export interface DrawingRoom {
	widthMm: number;
	heightMm: number;
	/** Paper millimetres between views. */
	gutterMm: number;
}

/**
 * The layout the page and PDF use: front and side side by side, top under the front (so the front
 * and top share their X). Fits when both rows fit the width and the two rows the height.
 */
export function layoutFits(views: OrthoView[], scale: number, room: DrawingRoom): boolean {
	const [front, top, side] = views;
	const w = Math.max(front.frame.w + side.frame.w, top.frame.w) * scale + room.gutterMm;
	const h = (Math.max(front.frame.h, side.frame.h) + top.frame.h) * scale + room.gutterMm;
	return w <= room.widthMm && h <= room.heightMm;
}

/**
 * The three views at the largest scale from a fixed list (1:1, 1:2, 1:2.5, …) that fits `room`.
 * `numbers` labels each part with its number in the part list.
 */
export function orthographicViews(
	scene: Scene,
	resolved: ResolvedScene,
	report: FitReport,
	room: DrawingRoom,
	numbers: Map<string, number> = new Map()
): SheetDrawing {
	for (const scale of SCALES) {
		const drawing = viewsAt(scene, resolved, report, scale, numbers);
		if (layoutFits(drawing.views, scale, room)) return drawing;
	}
	return viewsAt(scene, resolved, report, SCALES[SCALES.length - 1], numbers);
}

/** The three views at one scale (paper mm per world mm), whether or not they fit a page. */
export function viewsAt(
	scene: Scene,
	resolved: ResolvedScene,
	report: FitReport,
	scale: number,
	numbers: Map<string, number> = new Map()
): SheetDrawing {
	const views = SPECS.map((s) => viewAt(s, scene, resolved, report, scale, numbers));
	const denominator = Math.round((1 / scale) * 10) / 10;
	return {
		scale,
		scaleText: `1:${denominator}`,
		paper: { textMm: PAPER.textMm, tagMm: PAPER.tagMm, lineMm: PAPER.lineMm },
		views
	};
}
