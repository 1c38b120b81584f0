/**
 * Words for the editor's labels: faces, millimetres, the move that clears an overlap.
 * Shared by the editor, the client page and the build sheet.
 */
import { formatMm, type ClearingMove, type Face, type FitReport, type Overlap, type PartReport } from '$lib/geometry';

/** Which side of a part a gap is on, seen from the front. */
export const FACE_WORDS: Record<Face, string> = {
	'-x': 'left',
	'+x': 'right',
	'-y': 'below',
	'+y': 'above',
	'-z': 'front',
	'+z': 'behind'
};

export function mm(valueMm: number | null): string {
	return valueMm === null ? '—' : formatMm(valueMm);
}

const MOVE_WORDS: Record<ClearingMove['axis'], [string, string]> = { x: ['left', 'right'], y: ['down', 'up'], z: ['forward', 'back'] };

function moveText(move: ClearingMove): string {
	const way = MOVE_WORDS[move.axis][move.sign > 0 ? 1 : 0];
	const noun = move.targetKind === 'part' ? 'the part' : `the ${move.targetKind}`;
	if (move.steps !== undefined) {
		return `move ${noun} ${move.steps} ${move.steps === 1 ? 'step' : 'steps'} ${way}`;
	}
	return `move ${noun} ${formatMm(move.distanceMm)} ${way}`;
}

/** "Move the part 3.5 mm back", with the divider or bracket step that would clear it too. */
export function moveSentence(clearing: ClearingMove, control?: ClearingMove): string {
	const first = moveText(clearing);
	const sentence = first.charAt(0).toUpperCase() + first.slice(1);
	if (control && (control.targetId !== clearing.targetId || control.steps !== clearing.steps)) {
		return `${sentence}, or ${moveText(control)}`;
	}
	return sentence;
}

const AXIS_WORDS = { x: 'width', y: 'height', z: 'depth' } as const;

/** Where a gap is, as a preposition: "2.0 mm above the CPU block". */
const BESIDE_WORDS: Record<Face, string> = { '-x': 'left of', '+x': 'right of', '-y': 'below', '+y': 'above', '-z': 'in front of', '+z': 'behind' };

/** "Card and support bracket overlap by 3.5 mm along depth; move the bracket 1 step back." */
export function overlapSentence(o: Overlap): string {
	const axis = o.clearingMove.axis;
	const depth = o.depthMm[axis === 'x' ? 0 : axis === 'y' ? 1 : 2];
	const keepout = o.a.kind === 'keepout' ? o.a : o.b.kind === 'keepout' ? o.b : null;
	const other = keepout === o.a ? o.b : o.a;
	const lead = keepout && o.kind !== 'collides' ? `${other.label} is in the keep-out ${keepout.label}` : `${o.a.label} and ${o.b.label} overlap`;
	const move = moveSentence(o.clearingMove, o.controlMove);
	return `${lead} by ${formatMm(depth)} along ${AXIS_WORDS[axis]}; ${move.charAt(0).toLowerCase()}${move.slice(1)}.`;
}

/** The smallest free gap of a part (contacts where it rests are left out) and what it faces. */
export function tightestGap(p: PartReport): { face: Face; gapMm: number; against: string } | null {
	let best: { face: Face; gapMm: number; against: string } | null = null;
	for (const face of Object.keys(p.gaps) as Face[]) {
		const g = p.gaps[face];
		if (g.gapMm === null || g.held) continue;
		if (!best || g.gapMm < best.gapMm) best = { face, gapMm: g.gapMm, against: g.against?.label ?? 'the wall' };
	}
	return best;
}

/** One line for a client: "Everything fits; the tightest gap is 2.0 mm above the CPU block." */
export function fitSummary(report: FitReport): string {
	const c = report.totals.counts;
	if (c.collides + c.blocked + c.outside > 0) {
		const parts = [
			c.collides ? `${c.collides} part${c.collides === 1 ? '' : 's'} collide` : '',
			c.blocked ? `${c.blocked} blocked` : '',
			c.outside ? `${c.outside} outside the enclosure` : ''
		].filter(Boolean);
		return `Not yet: ${parts.join(', ')}.`;
	}
	let best: { label: string; face: Face; gapMm: number } | null = null;
	for (const p of report.parts) {
		const g = tightestGap(p);
		if (g && (!best || g.gapMm < best.gapMm)) best = { label: p.label, face: g.face, gapMm: g.gapMm };
	}
	if (!best) return 'Everything fits.';
	return `Everything fits; the tightest gap is ${formatMm(best.gapMm)} ${BESIDE_WORDS[best.face]} the ${best.label}.`;
}
