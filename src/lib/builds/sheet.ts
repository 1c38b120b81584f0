/**
 * The build sheet's content: everything a builder needs at the bench, as plain data and finished
 * sentences, so the page and the PDF print the same words. Pure: a parsed scene, its resolved
 * boxes and its fit report in, the sheet out. Millimetres, Y up, inner coordinates.
 */

import { loopSheet, type LoopSheet } from '$lib/loop/sheet-lines';
import {
	EPSILON_MM,
	FACES,
	panelOf,
	allowedIndex,
	allowedPositions,
	innerSizeMm,
	innerVolumeLitres,
	rotateDirection,
	rotationMap,
	type BracketDef,
	type ClearingMove,
	type DividerDef,
	type Face,
	type FaceGap,
	type FitReport,
	type FitStatus,
	type ItemRef,
	type Overlap,
	type PartCategory,
	type ResolvedScene,
	type Scene,
	type StatusCounts,
	type Vec3
} from '$lib/geometry';
import {
	FROM_WORDS,
	assemblyPlan,
	fittingsByThread,
	type AssemblyStep,
	type OrderEdge
} from './assembly';
import { CAUTIONS, PLANNING_NOTE } from './cautions';
import { gapWords, mountProblemDetail } from '../words/builds';
import { countWords } from '../words/format';
import { cableWords } from '../words/sheet';
import {
	AXIS_ENDS,
	AXIS_WORDS,
	CATEGORY_WORDS,
	FACE_PANEL,
	FACE_SIDE,
	POINTS_WORDS,
	STATUS_WORDS,
	cm3,
	litres,
	mm,
	moveWord,
	plural,
	sizeText
} from '../words/sheet';

export interface SheetInput {
	buildName: string;
	clientName?: string;
	variantName: string;
	variantVersion: number;
	/** "version 3" unless given ("version 3, with changes not yet saved as a version"). */
	versionText?: string;
	scene: Scene;
	resolved: ResolvedScene;
	report: FitReport;
	/** The studio's cut allowance for tube, percent (the loop's bill). */
	cutAllowancePct?: number;
}

export interface SettingLine {
	/** Checklist key. */
	key: string;
	kind: 'divider' | 'bracket';
	id: string;
	label: string;
	/** The position's own name ("three slots") or its offset for a range. */
	positionLabel: string;
	/** 0-based among the allowed positions, low end first. */
	index: number;
	count: number;
	axis: 'x' | 'y' | 'z';
	/** Where the low face sits, inner coordinates. */
	coordinateMm: number;
	coordinateText: string;
	/** The sentence without its label, split around the position's name (for italics): `text` is label + ' ' + before + em + after. */
	rest: { before: string; em: string; after: string };
	text: string;
}

export interface PartLine {
	placementId: string;
	name: string;
	category: PartCategory;
	categoryWord: string;
	/** Outline as placed (turned), width × height × depth. */
	sizeMm: Vec3;
	sizeText: string;
	/** Min corner from the inner front-bottom-left corner. */
	positionMm: Vec3;
	positionText: string;
	orientation: string;
	mountLabel: string | null;
	compartmentLabel: string | null;
	status: FitStatus;
	provenance: string;
	/** The part's smallest free gap that is not where it is held, in words. */
	smallestGap: string | null;
	ports: number;
}

export interface FitItem {
	key: string;
	status: FitStatus;
	/** The status word, or "warning" for a warning keep-out. */
	word: string;
	title: string;
	detail: string;
}

export interface BudgetLine {
	key: 'heat' | 'power';
	title: string;
	status: 'clear' | 'tight' | 'over' | 'unknown';
	text: string;
	/** Set for figures that are rules of thumb, not measurements. */
	estimateNote: string | null;
}

export interface MountLine {
	mountId: string;
	label: string;
	status: FitStatus;
	text: string;
}

export interface StepLine {
	key: string;
	order: number;
	placementId: string;
	name: string;
	text: string;
	reasons: string[];
	conflict: string | null;
}

export interface FittingLine {
	key: string;
	thread: string;
	ports: number;
	text: string;
}

export interface ChecklistItem {
	/** Stable within a variant: ticks are stored against it. */
	key: string;
	text: string;
	detail: string | null;
}

export interface ChecklistGroup {
	id: 'settings' | 'order' | 'fittings' | 'loop' | 'cables' | 'cautions';
	title: string;
	items: ChecklistItem[];
}

export interface SheetModel {
	heading: {
		buildName: string;
		clientName: string;
		variantName: string;
		variantVersion: number;
		versionText: string;
		enclosureName: string;
	};
	enclosure: {
		outerText: string;
		innerText: string;
		volumeText: string;
		walls: string[];
		settings: SettingLine[];
		compartments: { id: string; label: string; sizeText: string }[];
		mounts: MountLine[];
	};
	parts: PartLine[];
	fit: {
		summary: string;
		counts: StatusCounts;
		items: FitItem[];
		budgets: BudgetLine[];
		marginText: string;
	};
	assembly: { steps: StepLine[]; rule: string[] };
	fittings: FittingLine[];
	/** The coolant loop's cut list, tube and checks; null when the variant has no loop. */
	loop: LoopSheet | null;
	checklist: ChecklistGroup[];
	planningNote: string;
}

/** The rule behind the assembly order, in the sheet's words (see assembly.ts). */
export const ORDER_RULE: readonly string[] = [
	'A part on a mount comes in along the mount, towards its panel; any other part from the open side of its compartment with the fewest parts in the way.',
	'A part goes in before anything that would cover its way in, its fitting, cable or service room, or that rests on it; a fitting goes in after the part it screws into.',
	'Where the placements leave it open: board, CPU block, power supply, graphics card, radiator, fans, pump and reservoir, drives, fittings last (common practice).'
];

function settingLines(scene: Scene, resolved: ResolvedScene): SettingLine[] {
	const lines: SettingLine[] = [];
	for (const d of scene.enclosure.dividers) {
		lines.push(dividerLine(d, resolved.dividerPositions[d.id]));
	}
	for (const b of scene.enclosure.brackets) {
		const box = resolved.brackets.find((w) => w.ownerId === b.id)!.box;
		lines.push(bracketLine(b, resolved.bracketOffsets[b.id], box.min['xyz'.indexOf(b.axis)]));
	}
	return lines;
}

function dividerLine(d: DividerDef, offsetMm: number): SettingLine {
	const positions = allowedPositions(d);
	const index = allowedIndex(d, offsetMm);
	const named = d.positions.kind === 'list';
	const positionLabel = positions[index]?.label ?? mm(offsetMm);
	const coordinateText = `${d.axis} = ${mm(offsetMm)}`;
	const thick = `; ${mm(d.thicknessMm)} thick.`;
	// One position only: "Bulkhead fixed at z = 64.0 mm", not "at position fixed".
	const rest =
		positions.length === 1
			? { before: `fixed at ${coordinateText}${thick}`, em: '', after: '' }
			: named
				? { before: 'at position ', em: positionLabel, after: `, ${coordinateText}${thick}` }
				: {
						before: `at ${coordinateText} (position ${index + 1} of ${positions.length})${thick}`,
						em: '',
						after: ''
					};
	return {
		key: `setting:divider:${d.id}`,
		kind: 'divider',
		id: d.id,
		label: d.label,
		positionLabel,
		index,
		count: positions.length,
		axis: d.axis,
		coordinateMm: offsetMm,
		coordinateText,
		rest,
		text: `${d.label} ${rest.before}${rest.em}${rest.after}`
	};
}

function bracketLine(b: BracketDef, offsetMm: number, lowFaceMm: number): SettingLine {
	const positions = allowedPositions(b);
	const index = allowedIndex(b, offsetMm);
	const [low, high] = AXIS_ENDS[b.axis];
	const coordinateText = `${b.axis} = ${mm(lowFaceMm)}`;
	const where =
		index === 0
			? `at the ${low} of its travel`
			: index === positions.length - 1 && positions.length > 1
				? `at the ${high} of its travel, ${plural(index, 'step')} from the ${low}`
				: `${plural(index, 'step')} from the ${low}`;
	return {
		key: `setting:bracket:${b.id}`,
		kind: 'bracket',
		id: b.id,
		label: b.label,
		positionLabel: positions[index]?.label ?? mm(offsetMm),
		index,
		count: positions.length,
		axis: b.axis,
		coordinateMm: lowFaceMm,
		coordinateText,
		rest: {
			before: `${where}, ${coordinateText} (steps of ${mm(b.travel.stepMm)}).`,
			em: '',
			after: ''
		},
		text: `${b.label} ${where}, ${coordinateText} (steps of ${mm(b.travel.stepMm)}).`
	};
}

/** "as drawn", or the turns and where the part's own top now points. */
export function orientationText(rotation: { x: number; y: number; z: number }): string {
	const turns = (['x', 'y', 'z'] as const)
		.filter((a) => rotation[a] % 4 !== 0)
		.map((a) => `${(rotation[a] % 4) * 90}° about ${a.toUpperCase()}`);
	if (turns.length === 0) return 'as drawn';
	const map = rotationMap(rotation);
	return `turned ${turns.join(', then ')}; its top points ${POINTS_WORDS[rotateDirection(map, '+y')]}, its front ${POINTS_WORDS[rotateDirection(map, '-z')]}`;
}

function gapText(face: Face, g: FaceGap): string {
	return `${gapWords(g)} ${FACE_SIDE[face]}${g.against ? ` (${g.against.label})` : ''}`;
}

/** The gap a tight check reads: the worst case (gap less both sides' tolerances). */
const worst = (g: FaceGap) => g.worstCaseMm ?? g.gapMm!;

/** Free gaps that count: something is ahead, and it is not where the part is held. */
function freeGaps(gaps: Record<Face, FaceGap>): [Face, FaceGap][] {
	return FACES.map((f) => [f, gaps[f]] as [Face, FaceGap]).filter(
		([, g]) => g.gapMm !== null && !g.held
	);
}

function partLines(scene: Scene, resolved: ResolvedScene, report: FitReport): PartLine[] {
	const mounts = new Map(scene.enclosure.mounts.map((m) => [m.id, m.label]));
	const compartments = new Map(report.compartments.map((c) => [c.id, c.label]));
	return resolved.placements.map((rp) => {
		const pr = report.parts.find((p) => p.placementId === rp.placement.id)!;
		const size = [0, 1, 2].map((i) => rp.bounds.max[i] - rp.bounds.min[i]) as Vec3;
		const smallest = freeGaps(pr.gaps)
			.filter(([, g]) => g.gapMm! >= -EPSILON_MM)
			.sort((a, b) => worst(a[1]) - worst(b[1]))[0];
		return {
			placementId: rp.placement.id,
			name: rp.part.name,
			category: rp.part.category,
			categoryWord: CATEGORY_WORDS[rp.part.category],
			sizeMm: size,
			sizeText: sizeText(size),
			positionMm: [...rp.bounds.min] as Vec3,
			positionText: `x ${mm(rp.bounds.min[0])}, y ${mm(rp.bounds.min[1])}, z ${mm(rp.bounds.min[2])}`,
			orientation: orientationText(rp.placement.rotation),
			mountLabel: rp.placement.mountId ? (mounts.get(rp.placement.mountId) ?? null) : null,
			compartmentLabel: pr.compartmentId ? (compartments.get(pr.compartmentId) ?? null) : null,
			status: pr.status,
			provenance:
				rp.part.toleranceMm > 0
					? `${rp.part.provenance}, ±${mm(rp.part.toleranceMm)}`
					: rp.part.provenance,
			smallestGap: smallest ? gapText(smallest[0], smallest[1]) : null,
			ports: rp.ports.filter((p) => p.kind !== 'power').length
		};
	});
}

function moveText(move: ClearingMove, names: Map<string, string>): string {
	const who = names.get(move.targetId) ?? move.targetId;
	if (move.steps !== undefined) {
		// A divider moves between slots, a bracket by its travel's steps (as the editor says).
		const unit = move.targetKind === 'divider' ? 'slot' : 'step';
		return `move ${who} ${plural(move.steps, unit)} ${moveWord(move.axis, move.sign)}${move.toOffsetMm !== undefined ? ` (to ${mm(move.toOffsetMm)})` : ''}`;
	}
	return `move ${who} ${mm(move.distanceMm)} ${moveWord(move.axis, move.sign)} (${AXIS_WORDS[move.axis]})`;
}

/**
 * A box of the report in the builder's words: a part by its name (with the body's name when it
 * has several), a keep-out as "the <room> of <part>", structure by its own label.
 */
function refText(ref: ItemRef, resolved: ResolvedScene): string {
	const rp = ref.placementId
		? resolved.placements.find((p) => p.placement.id === ref.placementId)
		: undefined;
	if (!rp) return ref.label;
	const own = ref.id.slice(rp.placement.id.length + 1);
	if (ref.kind === 'keepout') {
		return `the ${rp.part.keepouts.find((k) => k.id === own)?.label ?? 'keep-out'} of ${rp.part.name}`;
	}
	return rp.part.bodies.length > 1
		? `${rp.part.name} (${rp.part.bodies.find((b) => b.id === own)?.label ?? own})`
		: rp.part.name;
}

function overlapItem(o: Overlap, names: Map<string, string>, resolved: ResolvedScene): FitItem {
	const [a, b] = o.a.kind === 'keepout' ? [o.b, o.a] : [o.a, o.b];
	const depth = o.depthMm.map((d) => mm(d)).join(' × ');
	const clears = o.moves.map((m) => moveText(m, names));
	const sentence = clears.length
		? `Overlap ${depth} (${cm3(o.volumeMm3)}); to clear it, ${clears.join(', or ')}.`
		: `Overlap ${depth} (${cm3(o.volumeMm3)}). ${o.noMove ?? 'No single move clears it.'}`;
	const key = `overlap:${o.a.id}|${o.b.id}`;
	if (o.kind === 'collides') {
		return {
			key,
			status: 'collides',
			word: STATUS_WORDS.collides,
			title: `${refText(a, resolved)} collides with ${refText(b, resolved)}`,
			detail: sentence
		};
	}
	const blocked = o.kind === 'blocked';
	return {
		key,
		status: blocked ? 'blocked' : 'tight',
		word: blocked ? STATUS_WORDS.blocked : 'warning',
		title: `${refText(a, resolved)} reaches into ${refText(b, resolved)}`,
		detail: sentence
	};
}

function fitItems(
	scene: Scene,
	resolved: ResolvedScene,
	report: FitReport,
	names: Map<string, string>
): FitItem[] {
	const items = report.overlaps.map((o) => overlapItem(o, names, resolved));
	if (report.overlapsNotListed > 0) {
		items.push({
			key: 'overlap:more',
			status: 'collides',
			word: STATUS_WORDS.collides,
			title: `…and ${report.overlapsNotListed} more overlaps`,
			detail: 'Not listed one by one; the totals include them.'
		});
	}
	for (const pr of report.parts) {
		const rp = resolved.placements.find((p) => p.placement.id === pr.placementId)!;
		if (pr.outsideFaces.length > 0) {
			const crossed = pr.outsideFaces.map((f) => {
				const a = 'xyz'.indexOf(f[1]);
				const by =
					f[0] === '+'
						? rp.bounds.max[a] - resolved.innerBox.max[a]
						: resolved.innerBox.min[a] - rp.bounds.min[a];
				return `the ${FACE_PANEL[f]} by ${mm(by)}`;
			});
			items.push({
				key: `outside:${pr.placementId}`,
				status: 'outside',
				word: STATUS_WORDS.outside,
				title: `${pr.label} reaches outside the enclosure`,
				detail: `It crosses ${crossed.join(' and ')}.`
			});
		}
		const tight = freeGaps(pr.gaps).filter(
			([, g]) => g.gapMm! >= -EPSILON_MM && worst(g) < scene.marginMm - EPSILON_MM
		);
		for (const [face, g] of tight) {
			items.push({
				key: `gap:${pr.placementId}:${face}`,
				status: 'tight',
				word: STATUS_WORDS.tight,
				title: `${pr.label}: ${gapText(face, g)}`,
				detail: `Under the ${mm(scene.marginMm)} margin by ${mm(scene.marginMm - worst(g))}${worst(g) !== g.gapMm ? ' in the worst case of the tolerances' : ''}.`
			});
		}
		for (const problem of pr.mountProblems) {
			items.push({
				key: `mount-part:${pr.placementId}:${problem.mountId}:${problem.kind}`,
				status: problem.status,
				word: STATUS_WORDS[problem.status],
				title: `${pr.label}: on the ${problem.label}`,
				detail: `${mountProblemDetail(problem).replace(/^./, (c) => c.toUpperCase())}.`
			});
		}
	}
	for (const m of report.mounts.filter((m) => m.status !== 'clear')) {
		items.push({
			key: `mount:${m.mountId}`,
			status: m.status,
			word: STATUS_WORDS[m.status],
			title: `${m.label}: the stack does not fit as it should`,
			detail: mountText(m, names)
		});
	}
	const rank = (s: FitStatus) => ['collides', 'blocked', 'outside', 'tight', 'clear'].indexOf(s);
	return items.sort((x, y) => rank(x.status) - rank(y.status));
}

function mountText(m: FitReport['mounts'][number], names: Map<string, string>): string {
	const parts = m.stack.map((s) => names.get(s.placementId) ?? s.placementId);
	const bits = [parts.length ? `Holds ${parts.join(' + ')}` : 'Empty'];
	if (m.budgetMm !== null) {
		bits.push(
			`stack ${mm(m.usedMm)} of ${mm(m.budgetMm)}${m.plateMm ? ` (plate ${mm(m.plateMm)} included)` : ''}`
		);
		bits.push(m.spareMm! >= 0 ? `${mm(m.spareMm!)} to spare` : `${mm(-m.spareMm!)} too thick`);
	}
	if (m.unaccepted.length) {
		bits.push(`not made for ${m.unaccepted.map((id) => names.get(id) ?? id).join(', ')}`);
	}
	if (m.problems.length > 1) {
		bits.push(`problems, worst first: ${m.problems.map(mountProblemDetail).join(', ')}`);
	}
	for (const o of m.overflow) {
		const over = Object.entries(o.overflowMm).map(
			([f, v]) => `${mm(v!)} past its ${FACE_SIDE[f as Face].replace(/^to the /, '')} edge`
		);
		bits.push(`${names.get(o.placementId) ?? o.placementId} reaches ${over.join(', ')}`);
	}
	return `${bits.join('; ')}.`;
}

function budgetLines(report: FitReport): BudgetLine[] {
	const { heat, power } = report.budgets;
	const heatLine: BudgetLine = {
		key: 'heat',
		title: 'Heat against radiators',
		status: heat.status,
		text:
			heat.status === 'unknown'
				? `${heat.heatW}\u2009W of heat; no radiator placed, so the loop's capacity is not known.`
				: `${heat.heatW}\u2009W of heat against about ${Math.round(heat.capacityW)}\u2009W of radiator capacity (${heat.radiatorLengthMm}\u2009mm of radiator at ${heat.wattsPer120mm}\u2009W per 120\u2009mm).`,
		estimateNote:
			'Estimate: watts per 120 mm of radiator is a rule of thumb (common practice), not a measurement.'
	};
	const powerLine: BudgetLine = {
		key: 'power',
		title: 'Power draw against supply',
		status: power.status,
		text:
			power.status === 'unknown'
				? `${power.drawW}\u2009W of sustained draw; no power supply rating given.`
				: `${power.drawW}\u2009W of sustained draw; with ${power.headroomPct}\u2009% headroom ${Math.round(power.requiredW)}\u2009W needed; supply rated ${power.ratingW}\u2009W.`,
		estimateNote:
			power.headroomPct > 0
				? 'The headroom for transient spikes is a rule of thumb (common practice).'
				: null
	};
	return [heatLine, powerLine];
}

function summaryOf(counts: StatusCounts, items: FitItem[]): string {
	const problems = counts.collides + counts.blocked + counts.outside;
	const mountProblems = items.filter(
		(i) => i.key.startsWith('mount:') && i.status !== 'tight'
	).length;
	if (problems + mountProblems === 0) {
		return counts.tight > 0
			? `Everything fits; ${plural(counts.tight, 'part is', 'parts are')} tight.`
			: 'Everything fits with the margin to spare.';
	}
	const words = (['collides', 'blocked', 'outside', 'tight', 'clear'] as const)
		.filter((s) => counts[s] > 0)
		.map((s) =>
			s === 'collides'
				? countWords(counts[s], { one: 'part collides', other: 'parts collide' })
				: `${counts[s]} ${STATUS_WORDS[s]}`
		);
	return `Not ready to build: ${words.join(', ')}${mountProblems ? `; ${plural(mountProblems, 'mount')} over budget` : ''}.`;
}

function reasonText(e: OrderEdge, names: Map<string, string>): string {
	const other = names.get(e.before) ?? e.before;
	switch (e.reason.kind) {
		case 'path':
			return `After ${other}: this part would be in its way in (${FROM_WORDS[e.reason.direction]}).`;
		case 'access':
			return `After ${other}: this part would cover its ${e.reason.keepoutLabel || e.reason.keepoutKind + ' room'}.`;
		case 'rests':
			return `After ${other}: this part rests on it.`;
		case 'port':
			return `After ${other}: this part screws into its port “${e.reason.portId}”.`;
	}
}

function stepLine(
	step: AssemblyStep,
	names: Map<string, string>,
	mounts: Map<string, { label: string; face: string }>
): StepLine {
	const mount = step.mountId ? mounts.get(step.mountId) : undefined;
	const where = mount
		? `onto ${mount.label}, moving it towards the ${mount.face} panel`
		: step.direction === '+y'
			? 'lowered in from above'
			: `in ${FROM_WORDS[step.direction]}`;
	return {
		key: `part:${step.placementId}`,
		order: step.order,
		placementId: step.placementId,
		name: step.name,
		text: `${step.name} — ${where}.`,
		reasons: step.after.map((e) => reasonText(e, names)),
		conflict: step.conflicts.length
			? `${step.conflicts.map((id) => names.get(id) ?? id).join(', ')} and ${step.name} stand in each other's way: plan how to fit them together.`
			: null
	};
}

/** The whole sheet for one variant. */
export function buildSheet(input: SheetInput): SheetModel {
	const { scene, resolved, report } = input;
	const enclosure = scene.enclosure;
	const names = new Map<string, string>(
		resolved.placements.map((rp) => [rp.placement.id, rp.part.name])
	);
	for (const d of enclosure.dividers) names.set(d.id, d.label);
	for (const b of enclosure.brackets) names.set(b.id, b.label);
	const mountNames = new Map(enclosure.mounts.map((m) => [m.id, { label: m.label, face: m.face }]));

	const settings = settingLines(scene, resolved);
	const items = fitItems(scene, resolved, report, names);
	const plan = assemblyPlan(scene, resolved, report);
	const steps = plan.steps.map((s) => stepLine(s, names, mountNames));
	const loop = loopSheet(scene, report, input.cutAllowancePct ?? 0);
	const threads = fittingsByThread(resolved);
	// With a loop, its bill counts the fittings and plugs per thread; without, the ports do.
	const fittings: FittingLine[] = loop
		? loop.fittings.map((f) => ({ key: f.key, thread: f.thread, ports: f.count, text: f.text }))
		: threads.map((t) => ({
				key: `fittings:${t.thread}`,
				thread: t.thread,
				ports: t.ports,
				text: `${t.ports} × ${t.thread} fittings or stop plugs${t.withPlacedFitting ? ` (${t.withPlacedFitting} placed in the plan)` : ''}: ${t.byPart.map((p) => `${p.ports} on ${p.name}`).join('; ')}.`
			}));
	const walls = FACES.map((f) => {
		const w = enclosure.walls[panelOf(f)];
		return `${FACE_PANEL[f].replace(/^./, (c) => c.toUpperCase())}: ${mm(w.thicknessMm)} ${w.kind}${w.offsetMm ? `, ${mm(w.offsetMm)} offset` : ''}`;
	});

	return {
		heading: {
			buildName: input.buildName,
			clientName: input.clientName ?? '',
			variantName: input.variantName,
			variantVersion: input.variantVersion,
			versionText: input.versionText ?? `version ${input.variantVersion}`,
			enclosureName: enclosure.name
		},
		enclosure: {
			outerText: sizeText(enclosure.outerMm as Vec3),
			innerText: sizeText(innerSizeMm(enclosure)),
			volumeText: litres(innerVolumeLitres(enclosure)),
			walls,
			settings,
			compartments: report.compartments.map((c) => ({
				id: c.id,
				label: c.label,
				sizeText: sizeText(c.sizeMm)
			})),
			mounts: report.mounts
				.filter((m) => m.stack.length > 0)
				.map((m) => ({
					mountId: m.mountId,
					label: m.label,
					status: m.status,
					text: mountText(m, names)
				}))
		},
		parts: partLines(scene, resolved, report),
		fit: {
			summary: summaryOf(report.totals.counts, items),
			counts: report.totals.counts,
			items,
			budgets: budgetLines(report),
			marginText: mm(scene.marginMm)
		},
		assembly: { steps, rule: [...ORDER_RULE] },
		fittings,
		loop,
		checklist: [
			{
				id: 'settings',
				title: 'Set the enclosure',
				items: settings.map((s) => ({ key: s.key, text: s.text, detail: null }))
			},
			{
				id: 'order',
				title: 'Fit the parts in this order',
				items: steps.map((s) => ({
					key: s.key,
					text: `${s.order}. ${s.text}`,
					detail: [s.conflict, ...s.reasons].filter(Boolean).join(' ') || null
				}))
			},
			{
				id: 'fittings',
				title: loop ? 'Fittings and plugs per thread' : 'Fittings per port thread',
				items: fittings.map((f) => ({ key: f.key, text: f.text, detail: null }))
			},
			{
				id: 'loop',
				title: 'Cut the tube and check the loop',
				items: loop
					? [
							...loop.cutList.map((c) => ({ key: c.key, text: c.text, detail: null })),
							...loop.tubes.map((t) => ({ ...t, detail: null })),
							...loop.checks
						]
					: []
			},
			{
				id: 'cables',
				title: 'Power cables to order',
				items: (report.cables ?? []).map((c) => ({
					key: `cable:${c.cableId}`,
					text: `${cableWords(c.label, c.lengthMm + c.plugReachMm, c.where)}.`,
					detail: c.problems.length ? c.problems.map((p) => `${p.text}.`).join(' ') : null
				}))
			},
			{
				id: 'cautions',
				title: 'Before power-on, and always',
				items: CAUTIONS.map((c) => ({ key: `caution:${c.id}`, text: c.text, detail: c.detail }))
			}
		].filter((g) => g.items.length > 0) as ChecklistGroup[],
		planningNote: PLANNING_NOTE
	};
}

/** Every key a tick may be stored against for this sheet. */
export function checklistKeys(sheet: SheetModel): Set<string> {
	return new Set(sheet.checklist.flatMap((g) => g.items.map((i) => i.key)));
}
