/**
 * Words for the editor's labels: faces, millimetres, the move that clears an overlap.
 * Shared by the editor, the client page and the build sheet.
 */
import {
	EPSILON_MM,
	formatMm,
	type ClearingMove,
	type Face,
	type FaceGap,
	type FitReport,
	type MountProblem,
	type Overlap,
	type PartReport,
	axisIndex
} from '$lib/geometry';
import { faceWords } from './faces';

/** Which side of a part a gap is on, seen from the front. */
export const FACE_WORDS = faceWords('side');

export function mm(valueMm: number | null): string {
	return valueMm === null ? '—' : formatMm(valueMm);
}

/**
 * A gap with its worst case where tolerances apply: "2.0 mm (1.0 worst case)"; just "2.0 mm"
 * when neither side has a tolerance.
 */
export function gapWords(g: Pick<FaceGap, 'gapMm' | 'worstCaseMm'>): string {
	if (g.gapMm === null) return '—';
	if (g.worstCaseMm === null || Math.abs(g.worstCaseMm - g.gapMm) <= EPSILON_MM) {
		return formatMm(g.gapMm);
	}
	return `${formatMm(g.gapMm)} (${formatMm(g.worstCaseMm).replace(/\u2009mm$/, '')} worst case)`;
}

/** What is wrong with a mount's stack, in words: "stack 7.0 mm over its budget". */
export function mountProblemDetail(m: MountProblem): string {
	switch (m.kind) {
		case 'over-budget':
			return `stack ${formatMm(m.amountMm)} over its budget`;
		case 'unaccepted':
			return 'not a class this mount takes';
		case 'overhang':
			return `reaches ${formatMm(m.amountMm)} past the mount`;
		case 'tight':
			return `stack under the margin by ${formatMm(m.amountMm)}`;
	}
}

/** A mount problem as a part's report item names it: "Front radiator mount: stack 7.0 mm over its budget". */
export function mountProblemWords(m: MountProblem): string {
	return `${m.label}: ${mountProblemDetail(m)}`;
}

const MOVE_WORDS: Record<ClearingMove['axis'], [string, string]> = {
	x: ['left', 'right'],
	y: ['down', 'up'],
	z: ['forward', 'back']
};

function moveText(move: ClearingMove): string {
	const way = MOVE_WORDS[move.axis][move.sign > 0 ? 1 : 0];
	const noun = move.targetKind === 'part' ? 'the part' : `the ${move.targetKind}`;
	if (move.steps !== undefined) {
		return `move ${noun} ${move.steps} ${move.steps === 1 ? 'step' : 'steps'} ${way}`;
	}
	return `move ${noun} ${formatMm(move.distanceMm)} ${way}`;
}

/** "Move the part 3.5 mm back, or move the divider 1 step left": the best two moves. */
export function moveSentence(moves: readonly ClearingMove[], noMove?: string): string {
	if (moves.length === 0) return noMove ?? 'No single move clears this.';
	const text = moves.map(moveText).join(', or ');
	return text.charAt(0).toUpperCase() + text.slice(1);
}

const AXIS_WORDS = { x: 'width', y: 'height', z: 'depth' } as const;

/** Where a gap is, as a preposition: "2.0 mm above the CPU block". */
const BESIDE_WORDS = faceWords('beside');

/** "Card and support bracket overlap by 3.5 mm along depth; move the bracket 1 step back." */
export function overlapSentence(o: Overlap): string {
	const axis = o.axis;
	const depth = o.depthMm[axisIndex(axis)];
	const keepout = o.a.kind === 'keepout' ? o.a : o.b.kind === 'keepout' ? o.b : null;
	const other = keepout === o.a ? o.b : o.a;
	const lead =
		keepout && o.kind !== 'collides'
			? `${other.label} is in the keep-out ${keepout.label}`
			: `${o.a.label} and ${o.b.label} overlap`;
	if (o.moves.length === 0) {
		return `${lead} by ${formatMm(depth)} along ${AXIS_WORDS[axis]}. ${o.noMove ?? 'No single move clears this.'}`;
	}
	const move = moveSentence(o.moves);
	return `${lead} by ${formatMm(depth)} along ${AXIS_WORDS[axis]}; ${move.charAt(0).toLowerCase()}${move.slice(1)}.`;
}

/**
 * The smallest free gap of a part by its worst case (contacts where it rests are left out), and
 * what it faces.
 */
export function tightestGap(
	p: PartReport
): { face: Face; gapMm: number; worstCaseMm: number; against: string } | null {
	let best: { face: Face; gapMm: number; worstCaseMm: number; against: string } | null = null;
	for (const face of Object.keys(p.gaps) as Face[]) {
		const g = p.gaps[face];
		if (g.gapMm === null || g.held) continue;
		const worst = g.worstCaseMm ?? g.gapMm;
		if (!best || worst < best.worstCaseMm) {
			best = { face, gapMm: g.gapMm, worstCaseMm: worst, against: g.against?.label ?? 'the wall' };
		}
	}
	return best;
}

/**
 * The one-line verdict on a report, for lists (the comparison page): "Everything fits; the tightest
 * gap is 2.0 mm above the CPU block." The client page's fuller summary (headline and sentences) is
 * fitSummary in $lib/sharing/summary.ts.
 */
export function fitVerdict(report: FitReport): string {
	const c = report.totals.counts;
	if (c.collides + c.blocked + c.outside > 0) {
		const parts = [
			c.collides ? `${c.collides} part${c.collides === 1 ? '' : 's'} collide` : '',
			c.blocked ? `${c.blocked} blocked` : '',
			c.outside ? `${c.outside} outside the enclosure` : ''
		].filter(Boolean);
		return `Not yet: ${parts.join(', ')}.`;
	}
	let best: { label: string; face: Face; gapMm: number; worstCaseMm: number } | null = null;
	for (const p of report.parts) {
		const g = tightestGap(p);
		if (g && (!best || g.worstCaseMm < best.worstCaseMm)) {
			best = { label: p.label, face: g.face, gapMm: g.gapMm, worstCaseMm: g.worstCaseMm };
		}
	}
	if (!best) return 'Everything fits.';
	return `Everything fits; the tightest gap is ${gapWords(best)} ${BESIDE_WORDS[best.face]} the ${best.label}.`;
}
