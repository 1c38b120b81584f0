/**
 * How the sheet's drawings look on paper, shared by the SVG on the page and the PDF so the two
 * match line for line. Our own conventions (see orthographic.ts); sizes in paper millimetres.
 * Status colours as in docs/look-and-words.md, each with its pattern and word.
 */
import type { FitStatus } from '$lib/geometry';

export type Pattern = 'plain' | 'hatch' | 'dots' | 'solid' | 'dashed';

export const STATUS_INK: Record<
	FitStatus,
	{ fill: string; edge: string; pattern: Pattern; word: string }
> = {
	clear: { fill: '#2e9d83', edge: '#1f6e5c', pattern: 'plain', word: 'clear' },
	tight: { fill: '#e0a526', edge: '#9c6f0e', pattern: 'hatch', word: 'tight' },
	blocked: { fill: '#8b5fd1', edge: '#5d3a99', pattern: 'dots', word: 'blocked' },
	collides: { fill: '#e4502c', edge: '#ff9a7a', pattern: 'solid', word: 'collides' },
	outside: { fill: '#8d939b', edge: '#5c6778', pattern: 'dashed', word: 'outside' }
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
export const PATTERN_MM = { hatch: 1.6, dots: 1.4, dotRadius: 0.28, dash: 1.2 } as const;
