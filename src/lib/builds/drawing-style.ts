/**
 * How the sheet's drawings look on paper, shared by the SVG on the page and the PDF so the two
 * match line for line. Our own conventions (see orthographic.ts); sizes in paper millimetres.
 * Status colours as in docs/look-and-words.md, each with its pattern and word.
 */
import { STATUS_ORDER, type FitStatus } from '$lib/geometry';

export type Pattern = 'plain' | 'hatch' | 'dots' | 'crosshatch' | 'dashed';

/**
 * One fill per status for screen, sheet and PDF, spaced in lightness so a grey-scale print or a
 * colour-blind reader still tells them apart: CIE 1976 L* (D65) of about 30 (collides), 47
 * (blocked), 64 (clear), 81 (tight) and 97 (outside), each at least 15 from every other
 * (drawing-style.spec.ts computes it). Each also has its own pattern and word.
 */
export const STATUS_FILL: Record<FitStatus, string> = {
	collides: '#8a1c12',
	blocked: '#8357cc',
	clear: '#3aae90',
	tight: '#f0c24a',
	outside: '#f4f5f6'
};

/** Each status's surface pattern and word, the same on paper and on screen. */
export const STATUS_MARK: Record<FitStatus, { pattern: Pattern; word: string }> = {
	clear: { pattern: 'plain', word: 'clear' },
	tight: { pattern: 'hatch', word: 'tight' },
	blocked: { pattern: 'dots', word: 'blocked' },
	collides: { pattern: 'crosshatch', word: 'collides' },
	outside: { pattern: 'dashed', word: 'outside' }
};

/** A table by status built from a function of the status. */
export function byStatus<T>(of: (s: FitStatus) => T): Record<FitStatus, T> {
	return Object.fromEntries(STATUS_ORDER.map((s) => [s, of(s)])) as Record<FitStatus, T>;
}

/** Edges on paper: darker than each fill. Collides has a heavy dark edge with its cross-hatch, so it
 * reads as the worst without colour. */
const PAPER_EDGE: Record<FitStatus, string> = {
	clear: '#1f6e5c',
	tight: '#9c6f0e',
	blocked: '#4a2a80',
	collides: '#2a0603',
	outside: '#434d5c'
};

export const STATUS_INK = byStatus((s) => ({
	fill: STATUS_FILL[s],
	edge: PAPER_EDGE[s],
	...STATUS_MARK[s]
}));

/**
 * Budgets (stack, heat, power) have marks of their own, a symbol and a word, never a status's
 * swatch: "over" is not a collision, "not known" is not outside.
 */
export const BUDGET_MARK: Record<
	'clear' | 'tight' | 'over' | 'unknown',
	{ symbol: string; word: string }
> = {
	clear: { symbol: '✓', word: 'within' },
	tight: { symbol: '≈', word: 'near the limit' },
	over: { symbol: '▲', word: 'over' },
	unknown: { symbol: '?', word: 'not known' }
};

export const INK = {
	paper: '#fffdf8',
	text: '#12161c',
	muted: '#5c6778',
	line: '#262d38',
	wallFill: '#d5dae1',
	wallEdge: '#5c6778',
	dividerFill: '#c1964a',
	dividerEdge: '#8f6a2b',
	bracketFill: '#aab3c0',
	bracketEdge: '#434d5c',
	keepout: '#7f8b9c',
	gap: '#8f6a2b',
	gapTag: '#fbf3df',
	interference: '#e4502c',
	interferenceEdge: '#ff9a7a'
} as const;

/** Line weights in paper millimetres: structure heavier than parts, dimensions lightest. */
export const WEIGHT = {
	wall: 0.35,
	divider: 0.3,
	body: 0.3,
	/** A colliding body's heavy dark edge, with its cross-hatch the mark that survives grey-scale. */
	bodyCollides: 0.6,
	keepout: 0.18,
	dimension: 0.18,
	gap: 0.25,
	interference: 0.4
} as const;

/**
 * Fill opacity of part bodies, so what lies behind still shows through: faint where all is well,
 * stronger where something needs the builder's eye.
 */
export const BODY_OPACITY: Record<FitStatus, number> = {
	clear: 0.13,
	tight: 0.3,
	blocked: 0.3,
	collides: 0.55,
	outside: 0
};

/** Pattern spacing in paper millimetres. */
export const PATTERN_MM = {
	hatch: 1.6,
	crosshatch: 1.4,
	dots: 1.4,
	dotRadius: 0.28,
	dash: 1.2
} as const;

/** A projection symbol's lines in paper millimetres, from its bounding box's top-left corner. */
export interface ProjectionSymbol {
	widthMm: number;
	heightMm: number;
	/** Line width of the outlines. */
	lineMm: number;
	/** The cone's end view: its large and its small end, concentric. */
	circles: { cx: number; cy: number; r: number }[];
	/** The cone's side view, a trapezoid: small end first, then the large end. */
	outline: [number, number][];
	/** The axis as a thin chain line through both views, past each by a little. */
	axis: [number, number, number, number];
}

/**
 * The third-angle projection symbol of ISO 128 / ISO 5456-2 for lettering height h (mm): a
 * truncated cone seen from its small end (two full circles) and from the side (a trapezoid).
 * Proportions from memory of the standard's figure (not checked against the text): H = 2h; the
 * cone's ends are H and h across and it is H long; lines h/10 wide; the two views h apart; the axis
 * runs h/2 past each. Third-angle places the end view on the side it is seen from, so the circles sit
 * to the left of the side view's small end (first-angle would put them beyond its large end).
 */
export function thirdAngleSymbol(hMm: number): ProjectionSymbol {
	const h = hMm;
	const H = 2 * h;
	const over = h / 2;
	const cx = over + H / 2;
	const cy = H / 2;
	const small = over + H + h;
	const large = small + H;
	return {
		widthMm: large + over,
		heightMm: H,
		lineMm: h / 10,
		circles: [
			{ cx, cy, r: H / 2 },
			{ cx, cy, r: h / 2 }
		],
		outline: [
			[small, cy - h / 2],
			[large, 0],
			[large, H],
			[small, cy + h / 2]
		],
		axis: [0, cy, large + over, cy]
	};
}
