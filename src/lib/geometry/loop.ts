/**
 * The coolant loop, checked like bodies: each run's straight pieces, bends and end fittings become
 * boxes (the tube, and the tube with its clearance), met against the scene's boxes and each other;
 * then the loop's own checks (reservoir feeds the pump, fill, drain, bends, ports, threads) and the
 * bill of tube and fittings. Millimetres, inner coordinates, Y up.
 */

import { EPSILON_MM, boxesOverlap, compareText, intersectBoxes, panelOf } from './box';
import { panelText } from './enclosure';
import {
	DEFAULT_THREAD,
	add,
	bendsOf,
	centreLineLengthMm,
	directionVector,
	isCoolantPort,
	loopLookup,
	mm,
	norm,
	portAt,
	runEnds,
	runGeometryIssues,
	segmentWord,
	sub,
	type LoopLookup,
	type RunEnds
} from './loop-path';
import type { Box, LoopDef, PortRef, RunDef, Scene, TubeKindDef, Vec3 } from './schema';
import type { FitStatus, ResolvedScene, WorldBox } from './types';

export { centreLineLengthMm } from './loop-path';

export type PieceKind = 'segment' | 'bend' | 'fitting';

/** One box of a run: the tube's own box and the same grown by the tube kind's clearance. */
export interface RunPiece {
	/** `run:<runId>/s2`, `run:<runId>/b1`, `run:<runId>/fit-from`. */
	id: string;
	kind: PieceKind;
	/** "second segment", "bend 1", "fitting at the pump end". */
	label: string;
	/** For a segment: its index from the start (0 = first); a bend: the corner's point index. */
	index: number;
	tube: Box;
	clear: Box;
	/** A fitting's placement: it screws into it, so it never collides with that part. */
	screwedInto?: string;
}

export type RunProblemKind = 'collides' | 'blocked' | 'warning' | 'tight';

export interface RunProblem {
	kind: RunProblemKind;
	pieceId: string;
	/** "Run 3, second segment, against the card support bar". */
	text: string;
	against: { id: string; label: string; kind: string; placementId?: string };
	/** Overlap box (collides/blocked/warning). */
	box?: Box;
	/** Free distance from the tube to the other box (tight), under the clearance. */
	gapMm?: number;
}

export interface RunReport {
	runId: string;
	loopId: string;
	/** 1-based across the scene's loops: "Run 3". */
	number: number;
	label: string;
	tubeKindId: string;
	fromLabel: string;
	toLabel: string;
	/** Null when a port it names is missing (then nothing else is computed). */
	points: Vec3[] | null;
	/** Centre line with bends of the tube's radius. */
	lengthMm: number;
	/** Centre line plus the insertion depth at both fittings. */
	cutLengthMm: number;
	/** Each bend's middle, measured along the cut tube from its `from` end; and its angle. */
	bends: { atMm: number; angleDeg: number }[];
	pieces: RunPiece[];
	problems: RunProblem[];
	status: FitStatus;
}

export type LoopCheckId =
	'closed' | 'reservoir' | 'fill' | 'drain' | 'bends' | 'ports' | 'threads' | 'fit';
export type LoopCheckStatus = 'pass' | 'fail' | 'warn' | 'advice';

export interface LoopCheck {
	id: LoopCheckId;
	status: LoopCheckStatus;
	/** What was checked, in words: "Reservoir feeds the pump inlet". */
	title: string;
	/** Why it passed or failed, with the numbers. */
	reason: string;
}

export interface LoopReport {
	loopId: string;
	label: string;
	runs: RunReport[];
	checks: LoopCheck[];
	/** Ports of the loop's parts neither joined nor plugged. */
	needsPlug: { placementId: string; portId: string; label: string; thread: string }[];
	/** The worst check: fail, else warn, else pass (advice never counts against it). */
	status: 'pass' | 'warn' | 'fail';
	/** Highest and lowest points of the centre lines and ports, mm up. */
	highestMm: number | null;
	lowestMm: number | null;
}

/** Per-run results that do not depend on the other runs, kept while the run does not change. */
export interface RunCacheEntry {
	key: string;
	ends: RunEnds | null;
	pieces: RunPiece[];
	/** Problems against the scene's boxes (runs against runs are met afresh each time). */
	problems: RunProblem[];
	geometry: string[];
}
export type RunCache = Map<string, RunCacheEntry>;

const STATUS_RANK: Record<FitStatus, number> = {
	collides: 0,
	blocked: 1,
	outside: 2,
	tight: 3,
	clear: 4
};

function grow(box: Box, by: number): Box {
	return {
		min: [box.min[0] - by, box.min[1] - by, box.min[2] - by],
		max: [box.max[0] + by, box.max[1] + by, box.max[2] + by]
	};
}

/**
 * Box of a straight tube of radius r from p to q: along each axis its ends' span grown by
 * r·√(1 − dᵢ²) (the half-extent of the end circle on that axis, d the unit direction), so it holds
 * the circle of radius r at every point of the piece.
 */
export function cylinderBox(p: Vec3, q: Vec3, r: number): Box {
	const d = sub(q, p);
	const len = norm(d) || 1;
	const min = [0, 0, 0] as Vec3;
	const max = [0, 0, 0] as Vec3;
	for (let a = 0; a < 3; a++) {
		const u = d[a] / len;
		const e = r * Math.sqrt(Math.max(0, 1 - u * u));
		min[a] = Math.min(p[a], q[a]) - e;
		max[a] = Math.max(p[a], q[a]) + e;
	}
	return { min, max };
}

function pointsBox(points: readonly Vec3[], r: number): Box {
	const min = [Infinity, Infinity, Infinity] as Vec3;
	const max = [-Infinity, -Infinity, -Infinity] as Vec3;
	for (const p of points) {
		for (let a = 0; a < 3; a++) {
			min[a] = Math.min(min[a], p[a] - r);
			max[a] = Math.max(max[a], p[a] + r);
		}
	}
	return { min, max };
}

/** A diagonal (soft) piece is split so its boxes hug it: at most 8, each about 4 radii long. */
function splitCount(p: Vec3, q: Vec3, r: number): number {
	const d = sub(q, p);
	const moving = d.filter((v) => Math.abs(v) > EPSILON_MM).length;
	if (moving <= 1) return 1;
	return Math.max(1, Math.min(8, Math.ceil(norm(d) / Math.max(4 * r, 10))));
}

/**
 * A run's boxes: each straight piece between bends (the segment less the bends' tangent lengths),
 * each bend (the arc lies in the triangle of its tangent points and the corner, so the box of those
 * three grown by the radius holds the tube there), and each end fitting from the port face out to
 * its reach, as wide as the fitting.
 */
export function runPieces(
	run: Pick<RunDef, 'id' | 'from' | 'to'>,
	ends: RunEnds,
	tube: TubeKindDef,
	endWords: { from: string; to: string }
): RunPiece[] {
	const runId = run.id;
	const r = tube.outerMm / 2;
	const c = r + tube.clearanceMm;
	const pts = ends.points;
	const bends = bendsOf(pts, tube.minBendRadiusMm);
	const tangent = new Map(bends.map((b) => [b.point, b.tangentMm]));
	const pieces: RunPiece[] = [];
	// Tangent points, clamped to the segment when the bends overlap (a scene refused anyway).
	const cut: { start: Vec3; end: Vec3 }[] = [];
	for (let i = 1; i < pts.length; i++) {
		const a = pts[i - 1];
		const b = pts[i];
		const d = sub(b, a);
		const len = norm(d);
		let t0 = tangent.get(i - 1) ?? 0;
		let t1 = tangent.get(i) ?? 0;
		if (t0 + t1 > len) {
			const s = len / (t0 + t1);
			t0 *= s;
			t1 *= s;
		}
		const start = len > 0 ? add(a, d, t0 / len) : a;
		const end = len > 0 ? add(b, d, -t1 / len) : b;
		cut.push({ start, end });
		const n = splitCount(start, end, r);
		for (let k = 0; k < n; k++) {
			const p = add(start, sub(end, start), k / n);
			const q = add(start, sub(end, start), (k + 1) / n);
			if (norm(sub(q, p)) <= EPSILON_MM) continue;
			pieces.push({
				id: `run:${runId}/s${i}${n > 1 ? `.${k + 1}` : ''}`,
				kind: 'segment',
				label: segmentWord(i - 1),
				index: i - 1,
				tube: cylinderBox(p, q, r),
				clear: cylinderBox(p, q, c)
			});
		}
	}
	bends.forEach((b, k) => {
		const tri = [cut[b.point - 1].end, pts[b.point], cut[b.point].start];
		pieces.push({
			id: `run:${runId}/b${k + 1}`,
			kind: 'bend',
			label: `bend ${k + 1}`,
			index: b.point,
			tube: pointsBox(tri, r),
			clear: pointsBox(tri, c)
		});
	});
	for (const key of ['from', 'to'] as const) {
		const f = ends.fittings[key];
		if (f.reachMm <= 0 || f.widthMm <= 0) continue;
		const port = ends[key];
		const tip = add(port.position, directionVector(port.direction), f.reachMm);
		const box = cylinderBox(port.position, tip, f.widthMm / 2);
		pieces.push({
			id: `run:${runId}/fit-${key}`,
			kind: 'fitting',
			label: `fitting at the ${endWords[key]} end`,
			index: key === 'from' ? 0 : 1,
			tube: box,
			clear: grow(box, tube.clearanceMm),
			screwedInto: run[key].placementId
		});
	}
	return pieces;
}

/** Euclidean distance between two boxes (0 when they touch or overlap). */
export function boxDistance(a: Box, b: Box): number {
	let s = 0;
	for (let i = 0; i < 3; i++) {
		const g = Math.max(a.min[i] - b.max[i], b.min[i] - a.max[i], 0);
		s += g * g;
	}
	return Math.sqrt(s);
}

function lowerFirst(text: string): string {
	return text.charAt(0).toLowerCase() + text.slice(1);
}

/** How a piece of tube meets a scene box, or null when it does not matter. */
function meetKind(piece: RunPiece, box: WorldBox): RunProblemKind | 'clearance' | null {
	if (piece.screwedInto !== undefined && box.placementId === piece.screwedInto) return null;
	if (box.kind === 'keepout') {
		// Fitting keep-outs are the room kept for exactly these fittings and tubes.
		if (box.keepoutKind === 'fitting') return null;
		return box.severity === 'warning' ? 'warning' : 'blocked';
	}
	return 'collides';
}

function problemText(
	run: string,
	piece: RunPiece,
	kind: RunProblemKind,
	label: string,
	gap = 0,
	isRun = false
) {
	const against = isRun ? label : `the ${lowerFirst(label)}`;
	switch (kind) {
		case 'collides':
			return `${run}, ${piece.label}, against ${against}`;
		case 'blocked':
			return `${run}, ${piece.label}, in ${against} (kept clear)`;
		case 'warning':
			return `${run}, ${piece.label}, in ${against} (best kept clear)`;
		default:
			return `${run}, ${piece.label}, ${mm(gap)} from ${against}`;
	}
}

/** Each piece against the scene's boxes: the tube's box first, then its clearance. */
function sceneProblems(runLabel: string, pieces: RunPiece[], boxes: readonly WorldBox[]) {
	const out: RunProblem[] = [];
	for (const piece of pieces) {
		for (const wb of boxes) {
			if (!boxesOverlap(piece.clear, wb.box)) continue;
			const kind = meetKind(piece, wb);
			if (kind === null || kind === 'clearance') continue;
			const against = { id: wb.id, label: wb.label, kind: wb.kind, placementId: wb.placementId };
			const hit = intersectBoxes(piece.tube, wb.box);
			if (hit) {
				out.push({
					kind,
					pieceId: piece.id,
					text: problemText(runLabel, piece, kind, wb.label),
					against,
					box: hit
				});
			} else if (kind === 'collides') {
				const gapMm = boxDistance(piece.tube, wb.box);
				out.push({
					kind: 'tight',
					pieceId: piece.id,
					text: problemText(runLabel, piece, 'tight', wb.label, gapMm),
					against,
					gapMm
				});
			}
		}
	}
	return out;
}

function worstStatus(problems: readonly RunProblem[]): FitStatus {
	let best: FitStatus = 'clear';
	for (const p of problems) {
		const s: FitStatus = p.kind === 'warning' ? 'tight' : p.kind;
		if (STATUS_RANK[s] < STATUS_RANK[best]) best = s;
	}
	return best;
}

/** "pump-reservoir" → "pump", the word for a run's end: the part's category, plainly. */
function endWord(category: string): string {
	return category === 'pump-reservoir' ? 'pump' : category === 'cpu-block' ? 'block' : category;
}

function portLabel(lookup: LoopLookup, ref: PortRef): string {
	const placement = lookup.placements.get(ref.placementId);
	const part = placement && lookup.parts.get(placement.partId);
	return `${part?.name ?? ref.placementId} · ${ref.portId}`;
}

function categoryOf(lookup: LoopLookup, placementId: string): string {
	const placement = lookup.placements.get(placementId);
	return (placement && lookup.parts.get(placement.partId)?.category) ?? 'other';
}

export interface LoopCheckContext {
	scene: Scene;
	lookup: LoopLookup;
	/** Scene boxes a run can meet: walls, dividers, brackets, plates, bodies and keep-outs. */
	boxes: WorldBox[];
	innerBox: Box;
}

export function loopContext(scene: Scene, resolved: ResolvedScene): LoopCheckContext {
	// Runs meet a divider's solid pieces: its openings are where tubes pass.
	const boxes: WorldBox[] = [
		...resolved.walls,
		...resolved.dividerPieces,
		...resolved.brackets,
		...resolved.plates
	];
	for (const rp of resolved.placements) boxes.push(...rp.bodies, ...rp.keepouts);
	return { scene, lookup: loopLookup(scene), boxes, innerBox: resolved.innerBox };
}

function runKey(lookup: LoopLookup, run: RunDef, number: number): string {
	const tube = lookup.tubes.get(run.tube);
	const parts = [run.fittings.from, run.fittings.to].map((id) =>
		id ? lookup.parts.get(id) : null
	);
	const placements = [run.from.placementId, run.to.placementId].map((id) =>
		lookup.placements.get(id)
	);
	return JSON.stringify([number, run, tube, parts, placements]);
}

function runEntry(ctx: LoopCheckContext, run: RunDef, number: number, cache?: RunCache) {
	const key = runKey(ctx.lookup, run, number);
	const hit = cache?.get(run.id);
	if (hit && hit.key === key) return hit;
	const ends = runEnds(ctx.lookup, run);
	const tube = ctx.lookup.tubes.get(run.tube);
	let pieces: RunPiece[] = [];
	let problems: RunProblem[] = [];
	let geometry: string[] = [];
	if (ends && tube) {
		const words = {
			from: endWord(categoryOf(ctx.lookup, run.from.placementId)),
			to: endWord(categoryOf(ctx.lookup, run.to.placementId))
		};
		pieces = runPieces(run, ends, tube, words);
		problems = sceneProblems(`Run ${number}`, pieces, ctx.boxes);
		geometry = runGeometryIssues([], run, ends, tube).map((i) => `Run ${number}: ${i.message}`);
	}
	const entry: RunCacheEntry = { key, ends, pieces, problems, geometry };
	cache?.set(run.id, entry);
	return entry;
}

/** Along the cut tube from its `from` end (insertion depth included) to each bend's middle. */
function bendPositions(ends: RunEnds, tube: TubeKindDef): { atMm: number; angleDeg: number }[] {
	const pts = ends.points;
	const bends = bendsOf(pts, tube.minBendRadiusMm);
	const out: { atMm: number; angleDeg: number }[] = [];
	let along = ends.fittings.from.insertionDepthMm;
	let prevTangent = 0;
	let b = 0;
	for (let i = 1; i < pts.length; i++) {
		const len = norm(sub(pts[i], pts[i - 1]));
		const bend = bends[b]?.point === i ? bends[b] : null;
		along += len - prevTangent - (bend?.tangentMm ?? 0);
		if (bend) {
			out.push({ atMm: along + bend.arcMm / 2, angleDeg: (bend.angleRad * 180) / Math.PI });
			along += bend.arcMm;
			prevTangent = bend.tangentMm;
			b++;
		} else prevTangent = 0;
	}
	return out;
}

interface BuiltRun {
	def: RunDef;
	entry: RunCacheEntry;
	report: RunReport;
}

function buildRuns(ctx: LoopCheckContext, cache?: RunCache): BuiltRun[][] {
	let number = 0;
	return (ctx.scene.loops ?? []).map((loop) =>
		loop.runs.map((def) => {
			number++;
			const entry = runEntry(ctx, def, number, cache);
			const tube = ctx.lookup.tubes.get(def.tube);
			const ends = entry.ends;
			const lengthMm = ends && tube ? centreLineLengthMm(ends.points, tube.minBendRadiusMm) : 0;
			const insert = ends
				? ends.fittings.from.insertionDepthMm + ends.fittings.to.insertionDepthMm
				: 0;
			const report: RunReport = {
				runId: def.id,
				loopId: loop.id,
				number,
				label: `Run ${number}`,
				tubeKindId: def.tube,
				fromLabel: portLabel(ctx.lookup, def.from),
				toLabel: portLabel(ctx.lookup, def.to),
				points: ends?.points ?? null,
				lengthMm,
				cutLengthMm: lengthMm + insert,
				bends: ends && tube ? bendPositions(ends, tube) : [],
				pieces: entry.pieces,
				problems: [...entry.problems],
				status: 'clear'
			};
			return { def, entry, report };
		})
	);
}

/** Runs against runs: tubes and fittings of different runs (a run never meets itself). */
function runAgainstRuns(all: BuiltRun[]): void {
	for (let i = 0; i < all.length; i++) {
		for (let j = i + 1; j < all.length; j++) {
			const a = all[i];
			const b = all[j];
			for (const pa of a.entry.pieces) {
				for (const pb of b.entry.pieces) {
					if (!boxesOverlap(pa.clear, pb.tube) && !boxesOverlap(pa.tube, pb.clear)) continue;
					const hit = intersectBoxes(pa.tube, pb.tube);
					const gapMm = hit ? 0 : boxDistance(pa.tube, pb.tube);
					const kind: RunProblemKind = hit ? 'collides' : 'tight';
					const pairs = [
						[a, pa, b, pb],
						[b, pb, a, pa]
					] as const;
					for (const [x, px, y, py] of pairs) {
						const label = `${y.report.label.toLowerCase()}, ${py.label}`;
						x.report.problems.push({
							kind,
							pieceId: px.id,
							text: problemText(x.report.label, px, kind, label, gapMm, true),
							against: { id: py.id, label, kind: 'run' },
							...(hit ? { box: hit } : { gapMm })
						});
					}
				}
			}
		}
	}
}

function check(id: LoopCheckId, status: LoopCheckStatus, title: string, reason: string): LoopCheck {
	return { id, status, title, reason };
}

/** A ray from a port along its direction to the panel: what stands in the way, if anything. */
function reachability(ctx: LoopCheckContext, ref: PortRef): string | null {
	const port = portAt(ctx.lookup, ref);
	if (!port) return 'the port is missing';
	const d = directionVector(port.direction);
	const axis = d.findIndex((v) => v !== 0);
	const far = d[axis] > 0 ? ctx.innerBox.max[axis] : ctx.innerBox.min[axis];
	const end: Vec3 = [...port.position];
	end[axis] = far;
	// A filling funnel's spout, about 10 mm across (common practice).
	const column = cylinderBox(port.position, end, 5);
	if (Math.abs(far - port.position[axis]) <= EPSILON_MM) return null;
	for (const wb of ctx.boxes) {
		if (wb.kind === 'keepout' || wb.kind === 'wall') continue;
		if (wb.placementId === ref.placementId) continue;
		if (boxesOverlap(column, wb.box)) return `the ${lowerFirst(wb.label)} is in the way`;
	}
	return null;
}

/** Near enough to the lowest point to drain nearly all of the loop, mm (common practice). */
export const DRAIN_NEAR_MM = 20;

function loopChecks(ctx: LoopCheckContext, loop: LoopDef, runs: BuiltRun[]): LoopReport {
	const lookup = ctx.lookup;
	const checks: LoopCheck[] = [];
	const reports = runs.map((r) => r.report);
	// Closed: each run starts on the part the run before ends on, the last ends where the first starts.
	const breaks: string[] = [];
	runs.forEach((r, i) => {
		const next = runs[(i + 1) % runs.length];
		if (r.def.to.placementId !== next.def.from.placementId) {
			breaks.push(
				`${r.report.label} ends on ${portLabel(lookup, r.def.to)} but ${next.report.label} starts on ${portLabel(lookup, next.def.from)}`
			);
		}
	});
	checks.push(
		check(
			'closed',
			breaks.length ? 'fail' : 'pass',
			'The loop closes',
			breaks.length
				? `Open: ${breaks.join('; ')}.`
				: `${runs.length} runs, each from the part the run before ends on.`
		)
	);
	// Reservoir feeds the pump inlet and sits at or above it (common practice: a pump must never
	// run dry, so coolant falls into its inlet from the reservoir).
	const pumpRuns = runs.filter((r) => {
		const cat = categoryOf(lookup, r.def.to.placementId);
		return cat === 'pump' || cat === 'pump-reservoir';
	});
	const title = 'The reservoir feeds the pump inlet from at or above it';
	if (!pumpRuns.length) {
		checks.push(check('reservoir', 'fail', title, 'No run ends at a pump inlet.'));
	} else {
		const reasons: string[] = [];
		let ok = true;
		for (const r of pumpRuns) {
			if (categoryOf(lookup, r.def.to.placementId) === 'pump-reservoir') {
				reasons.push(`${r.report.toLabel}: the pump has its own reservoir.`);
				continue;
			}
			const fromCat = categoryOf(lookup, r.def.from.placementId);
			if (fromCat !== 'reservoir' && fromCat !== 'pump-reservoir') {
				ok = false;
				reasons.push(
					`${r.report.label} feeds the pump inlet from ${r.report.fromLabel}, not from a reservoir: the pump could be starved (common practice).`
				);
				continue;
			}
			const inlet = portAt(lookup, r.def.to);
			const outlet = portAt(lookup, r.def.from);
			if (!inlet || !outlet) continue;
			const above = outlet.position[1] - inlet.position[1];
			if (above < -EPSILON_MM) {
				ok = false;
				reasons.push(
					`The reservoir's outlet is ${mm(-above)} below the pump inlet: the pump would be starved while filling (common practice: reservoir at or above the inlet).`
				);
			} else {
				reasons.push(`The reservoir's outlet is ${mm(above)} above the pump inlet.`);
			}
		}
		checks.push(check('reservoir', ok ? 'pass' : 'fail', title, reasons.join(' ')));
	}
	// Highest and lowest points: the centre lines and every port of the loop.
	const ys: number[] = [];
	for (const r of runs) {
		if (r.entry.ends) for (const p of r.entry.ends.points) ys.push(p[1]);
		for (const ref of [r.def.from, r.def.to]) {
			const p = portAt(lookup, ref);
			if (p) ys.push(p.position[1]);
		}
	}
	const highest = ys.length ? Math.max(...ys) : null;
	const lowest = ys.length ? Math.min(...ys) : null;
	// Fill port: at the loop's highest point, or on the reservoir's top; reachable through a panel.
	const fillTitle = "A fill port at the loop's highest point or on the reservoir top";
	if (!loop.fill) {
		checks.push(
			check(
				'fill',
				'warn',
				fillTitle,
				'No fill port chosen: plug a port at the highest point or on the reservoir top and mark it as the fill port.'
			)
		);
	} else {
		const port = portAt(lookup, loop.fill);
		const cat = categoryOf(lookup, loop.fill.placementId);
		const onTop =
			port !== null && port.direction === '+y' && (cat === 'reservoir' || cat === 'pump-reservoir');
		const below = port && highest !== null ? highest - port.position[1] : 0;
		const blocked = reachability(ctx, loop.fill);
		const where = onTop
			? 'on the reservoir top'
			: below <= 0.5
				? "at the loop's highest point"
				: `${mm(below)} below the loop's highest point`;
		const ok = (onTop || below <= 0.5) && blocked === null;
		const reach = port
			? blocked === null
				? `reachable through the ${panelText(panelOf(port.direction))}`
				: `not reachable: ${blocked}`
			: 'missing';
		checks.push(
			check(
				'fill',
				ok ? 'pass' : 'warn',
				fillTitle,
				`${portLabel(lookup, loop.fill)} is ${where}, ${reach}.${ok ? '' : ' Air gathers at the top: fill and bleed from the highest point.'}`
			)
		);
	}
	// Drain: advice only.
	const drainTitle = "A drain at or near the loop's lowest point";
	if (!loop.drain) {
		checks.push(
			check(
				'drain',
				'advice',
				drainTitle,
				'No drain port: the loop is emptied by tipping the build; a plugged port at the lowest point makes it easier.'
			)
		);
	} else {
		const port = portAt(lookup, loop.drain);
		const above = port && lowest !== null ? port.position[1] - lowest : 0;
		checks.push(
			check(
				'drain',
				above <= DRAIN_NEAR_MM ? 'pass' : 'advice',
				drainTitle,
				above <= DRAIN_NEAR_MM
					? `${portLabel(lookup, loop.drain)} is ${mm(above)} above the lowest point.`
					: `${portLabel(lookup, loop.drain)} is ${mm(above)} above the lowest point: coolant below it stays in the loop (within ${DRAIN_NEAR_MM} mm is common practice).`
			)
		);
	}
	// Bends and the way tubes leave their fittings.
	const geometry = runs.flatMap((r) => r.entry.geometry);
	const missing = runs.filter((r) => !r.entry.ends || !lookup.tubes.get(r.def.tube));
	checks.push(
		check(
			'bends',
			geometry.length || missing.length ? 'fail' : 'pass',
			"Every bend respects its tube's bend radius",
			geometry.length || missing.length
				? [
						...geometry,
						...missing.map((r) => `${r.report.label}: a port or tube kind it names is missing.`)
					].join(' ')
				: `${runs.reduce((n, r) => n + r.report.bends.length, 0)} bends, none tighter than its tube allows.`
		)
	);
	// Every port of the loop's parts is joined or plugged.
	const joined = new Set<string>();
	for (const r of runs) {
		joined.add(`${r.def.from.placementId}/${r.def.from.portId}`);
		joined.add(`${r.def.to.placementId}/${r.def.to.portId}`);
	}
	for (const p of loop.plugs) joined.add(`${p.placementId}/${p.portId}`);
	const loopParts = [
		...new Set(runs.flatMap((r) => [r.def.from.placementId, r.def.to.placementId]))
	];
	const needsPlug: LoopReport['needsPlug'] = [];
	for (const placementId of loopParts.sort(compareText)) {
		const placement = lookup.placements.get(placementId);
		const part = placement && lookup.parts.get(placement.partId);
		if (!part) continue;
		for (const port of part.ports) {
			if (!isCoolantPort(port) || joined.has(`${placementId}/${port.id}`)) continue;
			needsPlug.push({
				placementId,
				portId: port.id,
				label: `${part.name} · ${port.id}`,
				thread: port.thread || DEFAULT_THREAD
			});
		}
	}
	checks.push(
		check(
			'ports',
			needsPlug.length ? 'fail' : 'pass',
			'Every port joined or plugged',
			needsPlug.length
				? `Open, needs a plug: ${needsPlug.map((p) => `${p.label} (${p.thread})`).join('; ')}.`
				: 'Every port of the loop’s parts is joined by a run or closed with a plug.'
		)
	);
	// Threads: each fitting's thread matches its port's (ISO 228-1 G threads by default).
	const mismatches: string[] = [];
	for (const r of runs) {
		const ends = r.entry.ends;
		if (!ends) continue;
		for (const key of ['from', 'to'] as const) {
			const f = ends.fittings[key];
			if (f.partId && f.thread !== ends[key].thread) {
				mismatches.push(
					`${r.report.label}: ${f.name} is ${f.thread}, ${key === 'from' ? r.report.fromLabel : r.report.toLabel} is ${ends[key].thread}`
				);
			}
		}
	}
	for (const p of loop.plugs) {
		const part = p.fitting ? lookup.parts.get(p.fitting) : undefined;
		const port = portAt(lookup, p);
		const thread = part?.ports[0]?.thread || DEFAULT_THREAD;
		if (part && port && thread !== port.thread) {
			mismatches.push(`${part.name} is ${thread}, ${portLabel(lookup, p)} is ${port.thread}`);
		}
	}
	checks.push(
		check(
			'threads',
			mismatches.length ? 'fail' : 'pass',
			'Every fitting matches its port’s thread',
			mismatches.length
				? `${mismatches.join('; ')}.`
				: 'Every fitting and plug has its port’s thread (ISO 228-1 G threads).'
		)
	);
	// The runs' own fit.
	const hits = reports.flatMap((r) => r.problems.filter((p) => p.kind !== 'tight'));
	const tight = reports.flatMap((r) => r.problems.filter((p) => p.kind === 'tight'));
	checks.push(
		check(
			'fit',
			hits.some((p) => p.kind !== 'warning')
				? 'fail'
				: hits.length || tight.length
					? 'warn'
					: 'pass',
			'Every run and fitting clear of the rest',
			hits.length || tight.length
				? [...hits, ...tight].map((p) => `${p.text}.`).join(' ')
				: 'No run or fitting meets a part, panel or another run.'
		)
	);
	const status = checks.some((c) => c.status === 'fail')
		? 'fail'
		: checks.some((c) => c.status === 'warn')
			? 'warn'
			: 'pass';
	return {
		loopId: loop.id,
		label: loop.label || loop.id,
		runs: reports,
		checks,
		needsPlug,
		status,
		highestMm: highest,
		lowestMm: lowest
	};
}

/**
 * Every loop of the scene checked: runs against the scene's boxes and each other, then the loop's
 * own checks. With a cache, a run whose definition, tube, fittings and end placements did not change
 * keeps its boxes and its problems against the scene (a dragged waypoint re-checks only its run).
 */
export function checkLoopsIn(ctx: LoopCheckContext, cache?: RunCache): LoopReport[] {
	const built = buildRuns(ctx, cache);
	runAgainstRuns(built.flat());
	for (const r of built.flat()) {
		r.report.problems.sort(
			(a, b) =>
				STATUS_RANK[a.kind === 'warning' ? 'tight' : a.kind] -
					STATUS_RANK[b.kind === 'warning' ? 'tight' : b.kind] ||
				compareText(a.pieceId, b.pieceId) ||
				compareText(a.against.id, b.against.id)
		);
		r.report.status = worstStatus(r.report.problems);
	}
	if (cache) {
		const live = new Set(built.flat().map((r) => r.def.id));
		for (const id of cache.keys()) if (!live.has(id)) cache.delete(id);
	}
	return (ctx.scene.loops ?? []).map((loop, i) => loopChecks(ctx, loop, built[i]));
}

export function checkLoops(scene: Scene, resolved: ResolvedScene, cache?: RunCache): LoopReport[] {
	return checkLoopsIn(loopContext(scene, resolved), cache);
}

/** Placements a run's tube or fitting collides with or blocks, with the worst kind. */
export function partsHitByRuns(loops: readonly LoopReport[]): Map<string, 'collides' | 'blocked'> {
	const out = new Map<string, 'collides' | 'blocked'>();
	for (const loop of loops) {
		for (const run of loop.runs) {
			for (const p of run.problems) {
				const id = p.against.placementId;
				if (!id || (p.kind !== 'collides' && p.kind !== 'blocked')) continue;
				if (out.get(id) !== 'collides') out.set(id, p.kind);
			}
		}
	}
	return out;
}

// ——— Bill of tube and fittings ———

export interface TubeTotal {
	tubeKindId: string;
	name: string;
	kind: 'soft' | 'hard';
	/** Sum of the runs' cut lengths. */
	cutMm: number;
	/** With the studio's cut allowance (cutMm × (1 + pct / 100)): what to buy. */
	withAllowanceMm: number;
	runs: number;
}

export interface FittingCount {
	/** Fitting part id, or null for a generic stop plug. */
	partId: string | null;
	name: string;
	kind: string;
	thread: string;
	count: number;
}

export interface CutListRow {
	runNumber: number;
	tubeKindId: string;
	tubeName: string;
	cutLengthMm: number;
	bendsAtMm: number[];
	fromLabel: string;
	toLabel: string;
	/** "Run 3: 142.0 mm of 16 mm hard tube, bends at 35.0 and 98.0 mm from the pump end". */
	text: string;
}

export interface LoopBill {
	cutList: CutListRow[];
	tubes: TubeTotal[];
	fittings: FittingCount[];
	cutAllowancePct: number;
	bends: number;
}

function listWords(items: string[]): string {
	return items.length <= 1
		? (items[0] ?? '')
		: `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

/** The tube's words in a cut list: "16 mm hard tube", "10/13 mm soft tube". */
export function tubeWords(t: TubeKindDef): string {
	return t.kind === 'hard' || t.innerMm === undefined
		? `${t.outerMm} mm ${t.kind} tube`
		: `${t.innerMm}/${t.outerMm} mm soft tube`;
}

/**
 * Cut list, tube to buy per kind (with the cut allowance, a percentage the studio sets) and
 * fittings and plugs per part and thread, from the loop reports of one scene.
 */
export function loopBill(
	scene: Scene,
	loops: readonly LoopReport[],
	cutAllowancePct = 0
): LoopBill {
	const lookup = loopLookup(scene);
	const cutList: CutListRow[] = [];
	const tubes = new Map<string, TubeTotal>();
	const fittings = new Map<string, FittingCount>();
	let bends = 0;
	const countFitting = (partId: string | null, thread: string, plug: boolean) => {
		const part = partId ? lookup.parts.get(partId) : undefined;
		if (partId && !part) return;
		const key = `${partId ?? (plug ? 'plug' : 'none')}|${thread}`;
		const row = fittings.get(key) ?? {
			partId,
			name: part?.name ?? 'Stop plug',
			kind: part?.specs.fittingKind ?? 'plug',
			thread,
			count: 0
		};
		row.count++;
		fittings.set(key, row);
	};
	const defs = new Map((scene.loops ?? []).flatMap((l) => l.runs.map((r) => [r.id, r] as const)));
	for (const loop of loops) {
		for (const run of loop.runs) {
			const tube = lookup.tubes.get(run.tubeKindId);
			const def = defs.get(run.runId);
			if (!tube || !def || !run.points) continue;
			bends += run.bends.length;
			const at = run.bends.map((b) => b.atMm);
			const fromEnd = endWord(categoryOf(lookup, def.from.placementId));
			const text =
				`${run.label}: ${mm(run.cutLengthMm)} of ${tubeWords(tube)}` +
				(at.length
					? `, ${at.length === 1 ? 'bend' : 'bends'} at ${listWords(at.map((v) => v.toFixed(1)))} mm from the ${fromEnd} end`
					: ', no bends');
			cutList.push({
				runNumber: run.number,
				tubeKindId: tube.id,
				tubeName: tube.name,
				cutLengthMm: run.cutLengthMm,
				bendsAtMm: at,
				fromLabel: run.fromLabel,
				toLabel: run.toLabel,
				text
			});
			const total = tubes.get(tube.id) ?? {
				tubeKindId: tube.id,
				name: tube.name,
				kind: tube.kind,
				cutMm: 0,
				withAllowanceMm: 0,
				runs: 0
			};
			total.cutMm += run.cutLengthMm;
			total.withAllowanceMm = total.cutMm * (1 + cutAllowancePct / 100);
			total.runs++;
			tubes.set(tube.id, total);
			for (const key of ['from', 'to'] as const) {
				const id = def.fittings[key];
				const port = portAt(lookup, def[key]);
				if (id) countFitting(id, port?.thread ?? DEFAULT_THREAD, false);
			}
		}
	}
	for (const loop of scene.loops ?? []) {
		for (const plug of loop.plugs) {
			const port = portAt(lookup, plug);
			countFitting(plug.fitting, port?.thread ?? DEFAULT_THREAD, true);
		}
	}
	return {
		cutList: cutList.sort((a, b) => a.runNumber - b.runNumber),
		tubes: [...tubes.values()].sort((a, b) => compareText(a.tubeKindId, b.tubeKindId)),
		fittings: [...fittings.values()].sort(
			(a, b) => compareText(a.thread, b.thread) || compareText(a.name, b.name)
		),
		cutAllowancePct,
		bends
	};
}
