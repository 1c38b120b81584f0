/**
 * The fit report in plain words for the client page: one headline ("Everything fits; the tightest
 * gap is 2.0 mm above the CPU block") and a few sentences. Millimetres with one decimal and a thin
 * space before the unit, as everywhere in Interstice.
 */
import {
	formatMm,
	type Face,
	type FitReport,
	type ItemRef,
	type ResolvedScene,
	axisIndex
} from '$lib/geometry';
import { AXIS_TABLE, CATEGORY_NOUNS, faceWords } from '$lib/words/faces';
import { gapWords, mountProblemDetail } from '$lib/words/builds';
import { categoryLabel } from '$lib/words/specs';
import type { FitSummary } from '$lib/sharing/types';

export type { FitSummary };

const mm = formatMm;

/** Plain names of part kinds; 'other' reads as "the part" in a sentence. */
export const CATEGORY_WORDS = CATEGORY_NOUNS;

/** Where the gap on a part's face lies, seen from the front. */
const FACE_WORDS = faceWords('besideFull');

const AXIS_WORDS = {
	x: AXIS_TABLE.x.along,
	y: AXIS_TABLE.y.along,
	z: AXIS_TABLE.z.along
} as const;

/**
 * Short names for placed parts the client can follow: "the CPU block" when there is one, "fan 2"
 * when there are several of a kind, numbered in placement order (as the parts list numbers them).
 */
export function placementNames(
	resolved: Pick<ResolvedScene, 'placements'>
): Map<string, { short: string; sentence: string; label: string }> {
	const perCategory = new Map<string, number>();
	for (const rp of resolved.placements) {
		perCategory.set(rp.part.category, (perCategory.get(rp.part.category) ?? 0) + 1);
	}
	const seen = new Map<string, number>();
	const out = new Map<string, { short: string; sentence: string; label: string }>();
	for (const rp of resolved.placements) {
		const word = CATEGORY_WORDS[rp.part.category];
		const n = (seen.get(rp.part.category) ?? 0) + 1;
		seen.set(rp.part.category, n);
		const several = (perCategory.get(rp.part.category) ?? 0) > 1;
		const short = several ? `${word} ${n}` : word;
		// A list entry or a table cell starts with the category's label ("Fan 2", "Graphics card").
		const label = several
			? `${categoryLabel(rp.part.category)} ${n}`
			: categoryLabel(rp.part.category);
		out.set(rp.placement.id, { short, sentence: several ? short : `the ${word}`, label });
	}
	return out;
}

function refName(ref: ItemRef, names: Map<string, { sentence: string }>): string {
	if (ref.placementId && names.has(ref.placementId)) {
		const base = names.get(ref.placementId)!.sentence;
		if (ref.kind === 'keepout') {
			return `the room kept free for ${base}’s ${keepoutWords(ref.keepoutKind)}`;
		}
		return base;
	}
	if (ref.kind === 'wall') return `the ${ref.label.toLowerCase()}`;
	if (ref.kind === 'divider') return `the divider (${ref.label})`;
	if (ref.kind === 'bracket') return `the bracket (${ref.label})`;
	return ref.label;
}

function keepoutWords(kind: ItemRef['keepoutKind']): string {
	switch (kind) {
		case 'fitting':
			return 'fittings';
		case 'airflow':
			return 'airflow';
		case 'cable':
			return 'cables';
		case 'service':
			return 'hands and tools';
		default:
			return 'clearance';
	}
}

const cap = (s: string) => s.charAt(0).toUpperCase() + s.slice(1);

/** The tightest free gap of any part face that is not resting or held against something. */
function tightestGap(report: FitReport) {
	let best: {
		placementId: string;
		face: Face;
		gapMm: number;
		worstCaseMm: number;
		against: ItemRef;
	} | null = null;
	for (const part of report.parts) {
		for (const [face, g] of Object.entries(part.gaps) as [
			Face,
			FitReport['parts'][number]['gaps'][Face]
		][]) {
			if (g.gapMm === null || g.against === null || g.held || g.gapMm < 0) continue;
			const worstCaseMm = g.worstCaseMm ?? g.gapMm;
			if (!best || worstCaseMm < best.worstCaseMm) {
				best = {
					placementId: part.placementId,
					face,
					gapMm: g.gapMm,
					worstCaseMm,
					against: g.against
				};
			}
		}
	}
	return best;
}

export function fitSummary(
	report: FitReport,
	resolved: Pick<ResolvedScene, 'placements'>,
	marginMm: number
): FitSummary {
	const names = placementNames(resolved);
	const nameOf = (placementId: string) => names.get(placementId)?.sentence ?? 'a part';
	const c = report.totals.counts;
	const details: string[] = [];

	for (const o of report.overlaps) {
		const depth = o.depthMm[axisIndex(o.axis)];
		const a = refName(o.a, names);
		const b = refName(o.b, names);
		if (o.kind === 'collides') {
			details.push(`${cap(a)} and ${b} run into each other by ${mm(depth)} ${AXIS_WORDS[o.axis]}.`);
		} else if (o.kind === 'blocked') {
			details.push(
				`${cap(o.a.kind === 'keepout' ? a : b)} is blocked by ${o.a.kind === 'keepout' ? b : a}, by ${mm(depth)}.`
			);
		} else {
			details.push(
				`${cap(o.a.kind === 'keepout' ? a : b)} is partly taken by ${o.a.kind === 'keepout' ? b : a} (${mm(depth)}); it still fits, but is worth a look.`
			);
		}
	}
	if (report.overlapsNotListed > 0) {
		details.push(`…and ${report.overlapsNotListed} more places where parts overlap.`);
	}
	for (const p of report.parts) {
		if (p.outsideFaces.length) {
			details.push(`${cap(nameOf(p.placementId))} reaches outside the enclosure.`);
		}
	}
	for (const m of report.mounts) {
		if (m.status === 'collides' || m.status === 'outside' || m.unaccepted.length) {
			details.push(
				`The ${m.label.toLowerCase()} stack does not fit its mount${m.budgetMm !== null ? ` (${mm(m.usedMm)} of ${mm(m.budgetMm)})` : ''}: ${m.problems
					.filter((q) => q.kind !== 'tight')
					.map(mountProblemDetail)
					.join(', ')}.`
			);
		}
	}

	const tight: string[] = [];
	for (const p of report.parts) {
		if (p.status !== 'tight') continue;
		// Tight reads the worst case: the gap less both sides' tolerances.
		const worst = (g: FitReport['parts'][number]['gaps'][Face]) => g.worstCaseMm ?? g.gapMm ?? 0;
		const smallest = Object.entries(p.gaps)
			.filter(([, g]) => g.gapMm !== null && !g.held && g.gapMm >= 0 && worst(g) < marginMm)
			.sort((x, y) => worst(x[1]) - worst(y[1]))[0];
		if (smallest) {
			tight.push(
				`${gapWords(smallest[1])} ${FACE_WORDS[smallest[0] as Face]} ${nameOf(p.placementId)}`
			);
		}
	}

	const problems = c.collides + c.blocked + c.outside;
	let verdict: FitSummary['verdict'];
	let headline: string;
	if (report.parts.length === 0) {
		verdict = 'fits';
		headline = 'No parts are placed yet.';
	} else if (problems > 0) {
		verdict = 'problems';
		const n = problems;
		headline = `Not everything fits yet: ${n} part${n === 1 ? ' needs' : 's need'} changes before this build can be made.`;
	} else if (tight.length > 0) {
		verdict = 'tight';
		headline = `Everything fits, but ${tight.length === 1 ? 'one place is' : `${tight.length} places are`} closer than the ${mm(marginMm)} of breathing room we aim for: ${tight.join('; ')}.`;
	} else {
		verdict = 'fits';
		const t = tightestGap(report);
		headline = t
			? `Everything fits; the tightest gap is ${gapWords(t)} ${FACE_WORDS[t.face]} ${nameOf(t.placementId)}.`
			: 'Everything fits.';
	}

	return { verdict, headline, details, budgets: budgetSentences(report) };
}

function budgetSentences(report: FitReport): string[] {
	const out: string[] = [];
	const h = report.budgets.heat;
	if (h.status !== 'unknown' && h.heatW > 0) {
		const w = Math.round(h.capacityW);
		out.push(
			h.status === 'over'
				? `Cooling: the radiators take about ${w} W, less than the ${Math.round(h.heatW)} W of heat the parts give off (an estimate).`
				: `Cooling: the radiators take about ${w} W for ${Math.round(h.heatW)} W of heat (an estimate, at quiet fan speeds).`
		);
	}
	const p = report.budgets.power;
	if (p.status !== 'unknown' && p.drawW > 0) {
		const rating = Math.round(p.ratingW);
		const draw = Math.round(p.drawW);
		const need = Math.round(p.requiredW);
		out.push(
			p.status === 'over'
				? `Power: the ${rating} W supply is smaller than the ${draw} W the parts draw.`
				: p.status === 'tight'
					? `Power: the ${rating} W supply covers the ${draw} W the parts draw, but not the ${p.headroomPct} % reserve for short peaks (${need} W).`
					: `Power: the ${rating} W supply covers the ${draw} W the parts draw with the ${p.headroomPct} % reserve for short peaks (${need} W).`
		);
	}
	return out;
}
