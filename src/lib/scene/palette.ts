/**
 * Interstice's colours for 3D and 2D drawings (docs/look-and-words.md). A status is never
 * colour alone: each also has a surface pattern and a word.
 */
import type { FitStatus, WorldBoxKind } from '$lib/geometry';
import type { PreviewRole } from './preview-boxes';
import { STATUS_FILL, STATUS_MARK, byStatus } from '$lib/builds/drawing-style';

/** Edges on the dark 3D ground: lighter than each fill. */
const SCREEN_EDGE: Record<FitStatus, string> = {
	clear: '#7fdcc3',
	tight: '#9c6f0e',
	blocked: '#c9b0f2',
	collides: '#ff9a7a',
	outside: '#434d5c'
};

export const STATUS_STYLE = byStatus((s) => ({
	color: STATUS_FILL[s],
	edge: SCREEN_EDGE[s],
	...STATUS_MARK[s]
}));

/** Structure: walls, dividers, brackets and mount plates in the graphite ground, the divider in brass. */
export const STRUCTURE_STYLE: Record<
	Exclude<WorldBoxKind, 'body' | 'keepout'>,
	{ color: string; opacity: number }
> = {
	wall: { color: '#5c6778', opacity: 0.18 },
	divider: { color: '#c1964a', opacity: 0.85 },
	bracket: { color: '#aab3c0', opacity: 0.9 },
	/** A mount's adapter plate or standoff layer: structure, a little lighter than a bracket. */
	plate: { color: '#8a94a3', opacity: 0.7 }
};

export const KEEPOUT_STYLE = { color: '#d5dae1', opacity: 0.1 };
export const INTERFERENCE_COLOR = '#ff5a36';
export const GROUND = '#12161c';
export const ACCENT = '#c1964a';

/** Catalogue previews: structure as in the build view, allowed positions and travel as ghosts. */
export const PREVIEW_STYLE: Record<
	PreviewRole,
	{ color: string; opacity: number; dashed?: boolean }
> = {
	wall: { color: '#5c6778', opacity: 0.22 },
	'wall-mesh': { color: '#7f8b9c', opacity: 0.08, dashed: true },
	divider: { color: '#c1964a', opacity: 0.85 },
	'divider-ghost': { color: '#e2c07d', opacity: 0.12, dashed: true },
	bracket: { color: '#aab3c0', opacity: 0.9 },
	'bracket-travel': { color: '#aab3c0', opacity: 0.07, dashed: true },
	mount: { color: '#2e9d83', opacity: 0.06, dashed: true },
	body: { color: '#aab3c0', opacity: 0.92 },
	keepout: { color: '#d5dae1', opacity: 0.14, dashed: true },
	'keepout-warning': { color: '#e0a526', opacity: 0.1, dashed: true }
};
