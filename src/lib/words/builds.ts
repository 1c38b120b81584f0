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
import { countWords } from '$lib/words/format';

/** Which side of a part a gap is on, seen from the front. */
export const FACE_WORDS = faceWords('side');

/** Where a gap is from the part's point of view: "1.0 mm to the left panel, on its left". */
export const SIDE_OF_IT = faceWords('ofIt');

/** "the spine", "the CPU block": a label as a noun in a sentence (acronyms keep their capitals). */
export function theName(label: string): string {
	const lower = /^[A-Z][a-z]/.test(label) ? label.charAt(0).toLowerCase() + label.slice(1) : label;
	return `the ${lower}`;
}

export function mm(valueMm: number | null): string {
	return valueMm === null ? '—' : formatMm(valueMm);
}

/**
 * A gap with its worst case where tolerances apply: "2.0 mm (1.0 worst case)"; just "2.0 mm"
 * when neither side has a tolerance.
 */
export function gapWords(
	g: Pick<FaceGap, 'gapMm' | 'worstCaseMm'> & { against?: FaceGap['against'] | string }
): string {
	if (g.gapMm === null) return '—';
	// A negative gap is an overlap: say so, naming what it overlaps ("overlaps the spine by 0.96 mm").
	if (g.gapMm < -EPSILON_MM) {
		const what = typeof g.against === 'string' ? g.against : g.against?.label;
		return `overlaps ${what ? `${theName(what)} ` : ''}by ${formatMm(-g.gapMm)}`;
	}
	if (g.worstCaseMm === null || Math.abs(g.worstCaseMm - g.gapMm) <= EPSILON_MM) {
		return formatMm(g.gapMm);
	}
	// With tolerances taken off the faces may meet: an overlap at worst, said as one (no minus).
	if (g.worstCaseMm < -EPSILON_MM) {
		return `${formatMm(g.gapMm)} (overlaps by ${formatMm(-g.worstCaseMm).replace(/\u2009mm$/, '')} worst case)`;
	}
	return `${formatMm(g.gapMm)} (${formatMm(g.worstCaseMm).replace(/\u2009mm$/, '')} worst case)`;
}

/**
 * A face's gap as the gap table and the 3D labels tell it: an overlap reads as one, with the depth
 * that clears it (the overlap's thinnest extent), not as the face's negative reach into the other
 * box ("overlaps the spine by 0.96 mm", not "−195.0 mm").
 */
export function faceGapWords(
	g: FaceGap,
	overlaps: readonly Overlap[],
	placementId: string
): string {
	if (g.gapMm !== null && g.gapMm < -EPSILON_MM && g.against) {
		const otherId = g.against.id;
		const o = overlaps.find(
			(x) =>
				(x.a.placementId === placementId && x.b.id === otherId) ||
				(x.b.placementId === placementId && x.a.id === otherId)
		);
		const depth = o ? Math.min(...o.depthMm) : -g.gapMm;
		return gapWords({ gapMm: -depth, worstCaseMm: null, against: g.against });
	}
	return gapWords(g);
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

function moveText(move: ClearingMove, names?: ReadonlyMap<string, string>): string {
	const way = MOVE_WORDS[move.axis][move.sign > 0 ? 1 : 0];
	const named = names?.get(move.targetId);
	const noun = named
		? theName(named)
		: move.targetKind === 'part'
			? 'the part'
			: `the ${move.targetKind}`;
	if (move.steps !== undefined) {
		// A divider moves between slots; a bracket by its travel's steps.
		const unit = move.targetKind === 'divider' ? 'slot' : 'step';
		return `move ${noun} ${move.steps === 1 ? `one ${unit}` : `${move.steps} ${unit}s`} ${way}`;
	}
	return `move ${noun} ${formatMm(move.distanceMm)} ${way}`;
}

/** "Move the card 3.5 mm back, or the spine one slot left": the best two moves, the verb once. */
export function moveSentence(
	moves: readonly ClearingMove[],
	noMove?: string,
	names?: ReadonlyMap<string, string>
): string {
	if (moves.length === 0) return noMove ?? 'No single move clears this.';
	const text = moves
		.map((m, i) => (i === 0 ? moveText(m, names) : moveText(m, names).replace(/^move /, '')))
		.join(', or ');
	return text.charAt(0).toUpperCase() + text.slice(1);
}

const AXIS_WORDS = { x: 'width', y: 'height', z: 'depth' } as const;

/** Where a gap is, as a preposition: "2.0 mm above the CPU block". */
const BESIDE_WORDS = faceWords('beside');

/** The things an overlap can move, by the id a move names (placement, divider or bracket id). */
function overlapNames(o: Overlap): Map<string, string> {
	const names = new Map<string, string>();
	for (const side of [o.a, o.b]) {
		// A part by its name, not its body's: "Card · body" moves as "the card".
		if (side.placementId) names.set(side.placementId, side.label.split(' · ')[0]);
		const m = /^(divider|bracket):(.+)$/.exec(side.id);
		if (m) names.set(m[2], side.label);
	}
	return names;
}

/** The two things an overlap is between, by the names a builder knows (a part by its name). */
export function overlapParties(o: Overlap): [string, string] {
	const names = overlapNames(o);
	const nameOf = (side: Overlap['a']) =>
		side.kind === 'body' && side.placementId
			? (names.get(side.placementId) ?? side.label)
			: side.label;
	return [nameOf(o.a), nameOf(o.b)];
}

/**
 * A 3D callout naming both things and the fix:
 * "Card ↔ spine: 21.3 cm³, 1.0 mm deep — move the card 0.96 mm right, or the spine one slot left".
 */
export function calloutSentence(o: Overlap): string {
	const [nameA, nameB] = overlapParties(o);
	const deepest = Math.min(...o.depthMm);
	const fix = moveSentence(o.moves, o.noMove, overlapNames(o));
	return `${nameA} ↔ ${theName(nameB).slice(4)}: ${(o.volumeMm3 / 1000).toFixed(1)}\u2009cm³, ${formatMm(deepest)} deep — ${fix.charAt(0).toLowerCase()}${fix.slice(1)}`;
}

/**
 * "The spine is in the room kept free for the compact graphics card’s power cable bend": a keep-out
 * by its owner's name and its own label (the engine labels it "<part> · <keep-out>").
 */
function keepoutLead(keepout: Overlap['a'], otherName: string): string {
	const cut = keepout.label.indexOf(' · ');
	const owner = cut < 0 ? 'the part' : theName(keepout.label.slice(0, cut));
	const what = cut < 0 ? keepout.label : keepout.label.slice(cut + 3);
	const room = what.charAt(0).toLowerCase() + what.slice(1);
	const lead = theName(otherName);
	return `${lead.charAt(0).toUpperCase()}${lead.slice(1)} is in the room kept free for ${owner}’s ${room},`;
}

/** "Card and support bracket overlap by 3.5 mm along depth; move the bracket 1 step back." */
export function overlapSentence(o: Overlap): string {
	const axis = o.axis;
	const depth = o.depthMm[axisIndex(axis)];
	const keepout = o.a.kind === 'keepout' ? o.a : o.b.kind === 'keepout' ? o.b : null;
	const other = keepout === o.a ? o.b : o.a;
	const [nameA, nameB] = overlapParties(o);
	const lead =
		keepout && o.kind !== 'collides'
			? keepoutLead(keepout, other === o.a ? nameA : nameB)
			: `${nameA} and ${theName(nameB)} overlap`;
	if (o.moves.length === 0) {
		return `${lead} by ${formatMm(depth)} along ${AXIS_WORDS[axis]}. ${o.noMove ?? 'No single move clears this.'}`;
	}
	const move = moveSentence(o.moves, undefined, overlapNames(o));
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
			best = { face, gapMm: g.gapMm, worstCaseMm: worst, against: g.against?.label ?? 'wall' };
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
			c.collides ? countWords(c.collides, { one: 'part collides', other: 'parts collide' }) : '',
			c.blocked ? countWords(c.blocked, { one: 'part blocked', other: 'parts blocked' }) : '',
			c.outside
				? countWords(c.outside, { one: 'part outside', other: 'parts outside' }) + ' the enclosure'
				: ''
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

/**
 * A copy's name, unique among `taken`: "Tall loop — copy", then "Tall loop — copy 2", … A copy of
 * a copy counts on from its source's name ("Tall loop — copy 2" → "Tall loop — copy 3"), never
 * "— copy — copy". At most `maxLength` characters: the source name is cut to leave room.
 */
export function copyName(source: string, taken: readonly string[], maxLength = 80): string {
	const base = source.replace(/ — copy(?: \d+)?$/, '');
	const used = new Set(taken);
	for (let n = 1; ; n++) {
		const suffix = n === 1 ? ' — copy' : ` — copy ${n}`;
		const name = `${base.slice(0, maxLength - suffix.length)}${suffix}`;
		if (!used.has(name)) return name;
	}
}
