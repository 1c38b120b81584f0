/** The fit report for one scene: overlaps, per-part status and gaps, mount stacks, budgets. */

import { AXES, EPSILON_MM, axisIndex, boxContains, boxSize, compareText, intersectBoxes, type Face } from './box';
import { heatBudget, powerBudget } from './budgets';
import { MAX_LISTED_OVERLAPS, firstPairsById } from './cost';
import { buildModel, FACE_ORDER, isHeldContact, statusCounts, tallyStatic, type FoundPair, type Model } from './model';
import { mountReports } from './mounts';
import { allowedPositions } from './positions';
import { resolveScene } from './resolve';
import type { Box, BracketDef, DividerDef, Scene } from './schema';
import type {
	ClearingMove,
	Compartment,
	FaceGap,
	FitReport,
	ItemRef,
	Overlap,
	PartReport,
	WorldBox
} from './types';

export function itemRef(box: WorldBox): ItemRef {
	const ref: ItemRef = { id: box.id, kind: box.kind, label: box.label, ownerId: box.ownerId };
	if (box.placementId !== undefined) ref.placementId = box.placementId;
	if (box.keepoutKind !== undefined) ref.keepoutKind = box.keepoutKind;
	return ref;
}

function isPlaced(box: WorldBox): boolean {
	return box.kind === 'body' || box.kind === 'keepout';
}

function isLocked(model: Model, box: WorldBox): boolean {
	const p = model.owner[model.indexOf.get(box.id)!];
	return p >= 0 && model.resolved.placements[p].placement.locked === true;
}

/**
 * Which of two overlapping boxes the clearing move proposes to move: a part rather than a wall,
 * divider or bracket; the intruding body rather than the keep-out it enters; otherwise the second
 * box (by id); never a locked part when the other may move; between fixed boxes, the bracket.
 */
function moverOf(model: Model, a: WorldBox, b: WorldBox): WorldBox {
	if (isPlaced(a) !== isPlaced(b)) {
		return isPlaced(a) ? a : b;
	}
	if (!isPlaced(a)) {
		return a.kind === 'bracket' ? a : b;
	}
	let mover = b;
	if (a.kind !== b.kind) {
		mover = a.kind === 'body' ? a : b;
	}
	const other = mover === a ? b : a;
	if (isLocked(model, mover) && !isLocked(model, other)) {
		return other;
	}
	return mover;
}

/** Smallest single-axis move of `mover` that leaves the boxes touching; ties go x, y, z, then +. */
function geometricMove(mover: WorldBox, other: WorldBox): ClearingMove {
	let best: ClearingMove | null = null;
	for (let a = 0; a < 3; a++) {
		const plus = other.box.max[a] - mover.box.min[a];
		const minus = mover.box.max[a] - other.box.min[a];
		for (const [sign, distanceMm] of [
			[1, plus],
			[-1, minus]
		] as const) {
			if (!best || distanceMm < best.distanceMm - EPSILON_MM) {
				best = {
					targetId: mover.ownerId,
					targetKind: isPlaced(mover) ? 'part' : (mover.kind as 'divider' | 'bracket'),
					axis: AXES[a],
					sign,
					distanceMm
				};
			}
		}
	}
	return best!;
}

function controlDef(model: Model, box: WorldBox): DividerDef | BracketDef | undefined {
	const enclosure = model.scene.enclosure;
	return box.kind === 'divider'
		? enclosure.dividers.find((d) => d.id === box.ownerId)
		: enclosure.brackets.find((b) => b.id === box.ownerId);
}

/**
 * The nearest allowed position of a divider or bracket that clears it from `partner`, with how
 * many allowed positions it steps over; null when no allowed position clears.
 */
function controlMove(model: Model, control: WorldBox, partner: Box): ClearingMove | undefined {
	const def = controlDef(model, control);
	if (!def) return undefined;
	const isDivider = control.kind === 'divider';
	const current = isDivider
		? model.resolved.dividerPositions[def.id]
		: model.resolved.bracketOffsets[def.id];
	const a = axisIndex(def.axis);
	const lo = control.box.min[a] - current;
	const hi = control.box.max[a] - current;
	const clears = (p: number) => hi + p <= partner.min[a] + EPSILON_MM || lo + p >= partner.max[a] - EPSILON_MM;
	const offsets = allowedPositions(def)
		.map((p) => p.offsetMm)
		.sort((x, y) => x - y);
	const here = offsets.findIndex((p) => Math.abs(p - current) <= EPSILON_MM);
	let best: ClearingMove | undefined;
	for (const sign of [1, -1] as const) {
		for (let k = here + sign; k >= 0 && k < offsets.length; k += sign) {
			if (!clears(offsets[k])) continue;
			const distanceMm = Math.abs(offsets[k] - current);
			if (!best || distanceMm < best.distanceMm - EPSILON_MM) {
				best = {
					targetId: def.id,
					targetKind: isDivider ? 'divider' : 'bracket',
					axis: def.axis,
					sign,
					distanceMm,
					steps: Math.abs(k - here),
					toOffsetMm: offsets[k]
				};
			}
			break;
		}
	}
	return best;
}

function overlapOf(model: Model, pair: FoundPair): Overlap {
	let a = model.boxes[pair.i];
	let b = model.boxes[pair.j];
	if (compareText(a.id, b.id) > 0) [a, b] = [b, a];
	const box = intersectBoxes(a.box, b.box)!;
	const mover = moverOf(model, a, b);
	const other = mover === a ? b : a;
	const overlap: Overlap = {
		a: itemRef(a),
		b: itemRef(b),
		kind: pair.kind,
		box,
		volumeMm3: pair.volumeMm3,
		depthMm: boxSize(box),
		clearingMove: geometricMove(mover, other)
	};
	const control = [a, b].find((x) => x.kind === 'divider' || x.kind === 'bracket');
	if (control) {
		const move = controlMove(model, control, (control === a ? b : a).box);
		if (move) overlap.controlMove = move;
		if (move && !isPlaced(mover)) overlap.clearingMove = move;
	}
	return overlap;
}

/** The compartment holding the bounds, else the one holding their centre, else null. */
export function compartmentOf(compartments: readonly Compartment[], bounds: Box): string | null {
	const holding = compartments.find((c) => boxContains(c.box, bounds));
	if (holding) return holding.id;
	const centre = bounds.min.map((v, i) => (v + bounds.max[i]) / 2);
	const around = compartments.find((c) => c.box.min.every((v, i) => v <= centre[i] && centre[i] <= c.box.max[i]));
	return around ? around.id : null;
}

function gapsOf(model: Model, gap: Float64Array, against: Int32Array, p: number): Record<Face, FaceGap> {
	const out = {} as Record<Face, FaceGap>;
	FACE_ORDER.forEach((face, f) => {
		const g = gap[p * 6 + f];
		const idx = against[p * 6 + f];
		out[face] =
			idx < 0
				? { gapMm: null, against: null, held: false }
				: { gapMm: g, against: itemRef(model.boxes[idx]), held: isHeldContact(model, p, f, g, idx) };
	});
	return out;
}

export interface ReportOptions {
	/** Overlaps listed at most (default MAX_LISTED_OVERLAPS); totals and statuses count them all. */
	maxListedOverlaps?: number;
}

/** Report for a scene already resolved (so callers that resolved once need not do it again). */
export function reportFor(scene: Scene, resolved = resolveScene(scene), options: ReportOptions = {}): FitReport {
	const model = buildModel(scene, resolved);
	const { tally, pairs } = tallyStatic(model, null);
	const maxListed = options.maxListedOverlaps ?? MAX_LISTED_OVERLAPS;
	const overlaps = firstPairsById(model.boxes, pairs, maxListed)
		.map((pair) => overlapOf(model, pair))
		.sort((x, y) => compareText(x.a.id, y.a.id) || compareText(x.b.id, y.b.id));
	const { statuses, counts } = statusCounts(model, tally, scene.marginMm);
	const parts: PartReport[] = resolved.placements.map((rp, p) => ({
		placementId: rp.placement.id,
		partId: rp.part.id,
		label: rp.part.name,
		status: statuses[p],
		gaps: gapsOf(model, tally.gap, tally.against, p),
		outsideFaces: model.outsideFaces[p],
		compartmentId: compartmentOf(resolved.compartments, rp.bounds)
	}));
	return {
		overlaps,
		overlapsNotListed: pairs.length - overlaps.length,
		parts,
		mounts: mountReports(scene, resolved),
		budgets: { heat: heatBudget(scene, resolved), power: powerBudget(scene, resolved) },
		totals: {
			interferenceVolumeMm3: tally.interferenceMm3,
			keepoutVolumeMm3: tally.keepoutMm3,
			counts
		},
		compartments: resolved.compartments
	};
}

/** The fit report of a parsed scene (see sceneSchema). Throws SceneError for positions not allowed. */
export function checkScene(scene: Scene, options: ReportOptions = {}): FitReport {
	return reportFor(scene, resolveScene(scene), options);
}
