/**
 * Label placement in screen space (CSS pixels, y down): each label wants to sit near its anchor
 * (a point projected from 3D). Greedy, in the order given (most important first): the first
 * candidate spot that stays inside the view and touches no placed label or reserved area wins; a
 * label with no such spot is left unplaced, for the caller to list instead of piling it up.
 * A label placed away from its anchor gets a leader line from the anchor to its nearest edge.
 */
export type Rect = { x: number; y: number; w: number; h: number };
export type Point = { x: number; y: number };
export type LabelRequest = { id: string; anchor: Point; w: number; h: number };
export type PlacedLabel = { id: string; rect: Rect; anchor: Point; leaderTo: Point | null };
export type Placement = { placed: PlacedLabel[]; unplaced: string[] };

/** Distances from the anchor to try, in px: close first, then further out. */
const RINGS_PX = [10, 24, 44, 70, 100, 140, 190, 250, 320];
/** Free room kept between two labels, px. */
const PAD_PX = 3;

export function overlaps(a: Rect, b: Rect, pad = 0): boolean {
	return (
		a.x < b.x + b.w + pad && b.x < a.x + a.w + pad && a.y < b.y + b.h + pad && b.y < a.y + a.h + pad
	);
}

function inside(r: Rect, bounds: Rect): boolean {
	return (
		r.x >= bounds.x &&
		r.y >= bounds.y &&
		r.x + r.w <= bounds.x + bounds.w &&
		r.y + r.h <= bounds.y + bounds.h
	);
}

/** The spots around an anchor, nearest first: above, below, right, left, then the corners. */
function candidates(a: Point, w: number, h: number): Rect[] {
	const out: Rect[] = [];
	for (const d of RINGS_PX) {
		out.push(
			{ x: a.x - w / 2, y: a.y - d - h, w, h },
			{ x: a.x - w / 2, y: a.y + d, w, h },
			{ x: a.x + d, y: a.y - h / 2, w, h },
			{ x: a.x - d - w, y: a.y - h / 2, w, h },
			{ x: a.x + d * 0.7, y: a.y - d * 0.7 - h, w, h },
			{ x: a.x - d * 0.7 - w, y: a.y - d * 0.7 - h, w, h },
			{ x: a.x + d * 0.7, y: a.y + d * 0.7, w, h },
			{ x: a.x - d * 0.7 - w, y: a.y + d * 0.7, w, h }
		);
	}
	return out;
}

/** The point of a rectangle nearest to p (p itself when inside). */
export function nearestPoint(r: Rect, p: Point): Point {
	return {
		x: Math.min(Math.max(p.x, r.x), r.x + r.w),
		y: Math.min(Math.max(p.y, r.y), r.y + r.h)
	};
}

export function placeLabels(
	requests: readonly LabelRequest[],
	bounds: Rect,
	reserved: readonly Rect[] = []
): Placement {
	const taken: Rect[] = [];
	const placed: PlacedLabel[] = [];
	const unplaced: string[] = [];
	for (const req of requests) {
		const spot = candidates(req.anchor, req.w, req.h).find(
			(r) =>
				inside(r, bounds) &&
				!taken.some((t) => overlaps(r, t, PAD_PX)) &&
				!reserved.some((t) => overlaps(r, t, PAD_PX))
		);
		if (!spot) {
			unplaced.push(req.id);
			continue;
		}
		taken.push(spot);
		const end = nearestPoint(spot, req.anchor);
		const far = Math.hypot(end.x - req.anchor.x, end.y - req.anchor.y) > 2;
		placed.push({ id: req.id, rect: spot, anchor: req.anchor, leaderTo: far ? end : null });
	}
	return { placed, unplaced };
}

/** A label the 3D view wants drawn: a callout on an interference, or a gap of the selected part. */
export type SceneLabel = {
	id: string;
	kind: 'callout' | 'gap';
	text: string;
	/** A gap under the margin (drawn in the tight colour). */
	tight?: boolean;
	/** Where it points, in three.js world coordinates (the engine's Z already mirrored). */
	world: [number, number, number];
};
/** The same label with its anchor projected onto the view (null when behind the camera). */
export type ProjectedLabel = SceneLabel & { anchor: Point | null };
