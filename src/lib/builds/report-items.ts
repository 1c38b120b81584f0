/**
 * The editor's fit report as one list of problems: the chips above the list and the list itself
 * both come from here, so a chip never counts something the list doesn't show. Parts' own
 * statuses are shown per part (parts panel), not as chip counts.
 */
import { formatMm, type FitReport, type FitStatus } from '$lib/geometry';
import {
	SIDE_OF_IT,
	gapWords,
	mountProblemDetail,
	mountProblemWords,
	overlapSentence,
	theName,
	tightestGap
} from '$lib/words/builds';
import { faceWords } from '$lib/words/faces';

/** Which end of the inside a part reaches past: "at the bottom and the front". */
const INSIDE_END = faceWords('end');
const listWords = (xs: string[]) =>
	xs.length <= 1 ? (xs[0] ?? '') : `${xs.slice(0, -1).join(', ')} and ${xs[xs.length - 1]}`;

/** A status, or 'note': a part in a warning keep-out still fits (its own status is unchanged). */
export type ReportKind = FitStatus | 'note';
export const REPORT_KINDS: readonly ReportKind[] = [
	'collides',
	'blocked',
	'outside',
	'tight',
	'note',
	'clear'
];
/** count: how many problems the item stands for (1, or the overlaps past the listing cap). */
export type ReportItem = {
	key: string;
	status: ReportKind;
	text: string;
	ids: string[];
	count: number;
};
export type ReportGroup = { status: ReportKind; items: ReportItem[]; count: number };

export function reportItems(r: FitReport, marginMm: number): ReportItem[] {
	const out: ReportItem[] = [];
	for (const o of r.overlaps) {
		// A warning keep-out is a note: the part still fits, the keep-out is worth a look.
		const status: ReportKind =
			o.kind === 'collides' ? 'collides' : o.kind === 'warning' ? 'note' : 'blocked';
		const ids = [o.a.placementId, o.b.placementId].filter((x): x is string => !!x);
		out.push({
			key: `o:${o.a.id}|${o.b.id}`,
			status,
			text: `${overlapSentence(o)} ${(o.volumeMm3 / 1000).toFixed(1)} cm³.`,
			ids,
			count: 1
		});
	}
	if (r.overlapsNotListed > 0) {
		const named = new Set(out.flatMap((i) => i.ids));
		// Their kinds are not known past the cap: filed under the worst, as the totals count them.
		out.push({
			key: 'o:more',
			status: 'collides',
			text: `…and ${r.overlapsNotListed} more overlaps, not listed (the counts include them).`,
			// The parts in trouble that no listed overlap names: the unlisted ones are theirs.
			ids: r.parts
				.filter(
					(p) => (p.status === 'collides' || p.status === 'blocked') && !named.has(p.placementId)
				)
				.map((p) => p.placementId),
			count: r.overlapsNotListed
		});
	}
	for (const p of r.parts) {
		// A part marked by its mount's stack: one item naming the mount, in the part's status.
		const mp = p.mountProblems[0];
		if (mp && p.status === mp.status && (p.status === 'collides' || p.status === 'blocked')) {
			out.push({
				key: `pm:${p.placementId}`,
				status: p.status,
				text: `${p.label}: ${mountProblemWords(mp)}.`,
				ids: [p.placementId],
				count: 1
			});
			continue;
		}
		if (p.status === 'outside' && mp && mp.status === 'outside' && p.outsideFaces.length === 0) {
			out.push({
				key: `p:${p.placementId}`,
				status: 'outside',
				text: `${p.label}: ${mountProblemWords(mp)}.`,
				ids: [p.placementId],
				count: 1
			});
			continue;
		}
		if (p.status === 'outside') {
			out.push({
				key: `p:${p.placementId}`,
				status: 'outside',
				text: `${p.label} reaches past the inside at ${listWords(p.outsideFaces.map((f) => `the ${INSIDE_END[f]}`))}.`,
				ids: [p.placementId],
				count: 1
			});
		}
		if (p.status === 'tight') {
			const g = tightestGap(p);
			const why =
				g && g.worstCaseMm < marginMm
					? `only ${gapWords(g)} to ${theName(g.against)}, ${SIDE_OF_IT[g.face]}`
					: mp
						? mountProblemWords(mp)
						: 'tight';
			out.push({
				key: `p:${p.placementId}`,
				status: 'tight',
				text: `${p.label}: ${why} (margin ${formatMm(marginMm)}).`,
				ids: [p.placementId],
				count: 1
			});
		}
		if (p.status === 'clear') {
			const g = tightestGap(p);
			out.push({
				key: `p:${p.placementId}`,
				status: 'clear',
				text: g
					? `${p.label}: fits; closest ${gapWords(g)} to ${theName(g.against)}, ${SIDE_OF_IT[g.face]}.`
					: `${p.label}: fits.`,
				ids: [p.placementId],
				count: 1
			});
		}
	}
	for (const m of r.mounts) {
		if (m.status !== 'clear' && m.stack.length) {
			out.push({
				key: `m:${m.mountId}`,
				status: m.status,
				text: `${m.label}: stack ${formatMm(m.usedMm)} in ${m.budgetMm === null ? 'no set budget' : formatMm(m.budgetMm)}${m.spareMm !== null ? (m.spareMm < 0 ? `, ${formatMm(-m.spareMm)} over` : `, ${formatMm(m.spareMm)} spare`) : ''}${
					m.problems.length > 1
						? `; also ${m.problems
								.slice(1)
								.map((q) => mountProblemDetail(q))
								.join('; ')}`
						: m.unaccepted.length
							? '; a part here is not a class this mount takes'
							: ''
				}.`,
				ids: m.stack.map((s) => s.placementId),
				count: 1
			});
		}
	}
	return out;
}

/** The list, worst status first; empty groups left out. */
export function reportGroups(items: readonly ReportItem[]): ReportGroup[] {
	return REPORT_KINDS.map((s) => {
		const mine = items.filter((i) => i.status === s);
		return { status: s, items: mine, count: mine.reduce((n, i) => n + i.count, 0) };
	}).filter((g) => g.items.length > 0);
}

/** The chips: how many problems each group lists (0 for a status with none). */
export function reportChips(items: readonly ReportItem[]): Record<ReportKind, number> {
	const c = Object.fromEntries(REPORT_KINDS.map((s) => [s, 0])) as Record<ReportKind, number>;
	for (const i of items) c[i.status] += i.count;
	return c;
}
