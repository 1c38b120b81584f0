/** The fit report for one scene: overlaps, per-part status and gaps, mount stacks, budgets. */

import { adviceCache, adviseOverlap, type AdviceCache } from './advice';
import {
	AXES,
	EPSILON_MM,
	FACES,
	boxContains,
	boxSize,
	compareText,
	intersectBoxes,
	type AxisIndex,
	type Face
} from './box';
import { heatBudget, powerBudget } from './budgets';
import { MAX_LISTED_OVERLAPS, firstPairsById } from './cost';
import {
	buildModel,
	interferenceUnion,
	isHeldContact,
	statusCounts,
	tallyStatic,
	worstCaseGap,
	type FoundPair,
	type Model
} from './model';
import type { RunCache } from './loop';
import { withLoops } from './loop-report';
import { resolveScene } from './resolve';
import type { Box, Scene } from './schema';
import type {
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

/** The axis an overlap is thinnest along (ties go x, y, z): its depth is told on that axis. */
function thinnestAxis(depth: readonly number[]): AxisIndex {
	let best: AxisIndex = 0;
	for (const a of [1, 2] as const) if (depth[a] < depth[best] - EPSILON_MM) best = a;
	return best;
}

function overlapOf(model: Model, cache: AdviceCache, pair: FoundPair): Overlap {
	let a = model.boxes[pair.i];
	let b = model.boxes[pair.j];
	let [ia, ib] = [pair.i, pair.j];
	if (compareText(a.id, b.id) > 0) {
		[a, b] = [b, a];
		[ia, ib] = [ib, ia];
	}
	const box = intersectBoxes(a.box, b.box)!;
	const depthMm = boxSize(box);
	const axis = thinnestAxis(depthMm);
	const advice = adviseOverlap(model, cache, ia, ib, axis);
	const overlap: Overlap = {
		a: itemRef(a),
		b: itemRef(b),
		kind: pair.kind,
		box,
		volumeMm3: pair.volumeMm3,
		depthMm,
		axis: AXES[axis],
		moves: advice.moves,
		clearingMove: advice.moves[0] ?? null
	};
	if (advice.noMove !== undefined) overlap.noMove = advice.noMove;
	return overlap;
}

/** The compartment holding the bounds, else the one holding their centre, else null. */
export function compartmentOf(compartments: readonly Compartment[], bounds: Box): string | null {
	const holding = compartments.find((c) => boxContains(c.box, bounds));
	if (holding) return holding.id;
	const centre = bounds.min.map((v, i) => (v + bounds.max[i]) / 2);
	const around = compartments.find((c) =>
		c.box.min.every((v, i) => v <= centre[i] && centre[i] <= c.box.max[i])
	);
	return around ? around.id : null;
}

function gapsOf(
	model: Model,
	gap: Float64Array,
	against: Int32Array,
	p: number
): Record<Face, FaceGap> {
	const out = {} as Record<Face, FaceGap>;
	FACES.forEach((face, f) => {
		const g = gap[p * 6 + f];
		const idx = against[p * 6 + f];
		out[face] =
			idx < 0
				? { gapMm: null, worstCaseMm: null, against: null, held: false }
				: {
						gapMm: g,
						worstCaseMm: worstCaseGap(model, p, g, idx),
						against: itemRef(model.boxes[idx]),
						held: isHeldContact(model, p, f, g, idx)
					};
	});
	return out;
}

export interface ReportOptions {
	/** Overlaps listed at most (default MAX_LISTED_OVERLAPS); totals and statuses count them all. */
	maxListedOverlaps?: number;
	/**
	 * Runs checked before, by run id, for a scene whose everything but its loops is unchanged (a
	 * waypoint dragged): a run whose key is unchanged is not rebuilt (loop.ts, runEntry).
	 */
	runCache?: RunCache;
}

/** Report for a scene already resolved (so callers that resolved once need not do it again). */
export function reportFor(
	scene: Scene,
	resolved = resolveScene(scene),
	options: ReportOptions = {}
): FitReport {
	const model = buildModel(scene, resolved);
	const { tally, pairs } = tallyStatic(model, null);
	// The clearing search runs only for the problems listed; movers' contacts are shared between them.
	const cache = adviceCache();
	const maxListed = options.maxListedOverlaps ?? MAX_LISTED_OVERLAPS;
	const overlaps = firstPairsById(model.boxes, pairs, maxListed)
		.map((pair) => overlapOf(model, cache, pair))
		.sort((x, y) => compareText(x.a.id, y.a.id) || compareText(x.b.id, y.b.id));
	const { statuses, counts } = statusCounts(model, tally, scene.marginMm);
	const parts: PartReport[] = resolved.placements.map((rp, p) => ({
		placementId: rp.placement.id,
		partId: rp.part.id,
		label: rp.part.name,
		status: statuses[p],
		gaps: gapsOf(model, tally.gap, tally.against, p),
		outsideFaces: model.outsideFaces[p],
		compartmentId: compartmentOf(resolved.compartments, rp.bounds),
		mountProblems: model.mountProblemsOf[p]
	}));
	return withLoops(scene, resolved, options.runCache, {
		overlaps,
		overlapsNotListed: pairs.length - overlaps.length,
		parts,
		mounts: model.mounts,
		budgets: { heat: heatBudget(scene, resolved), power: powerBudget(scene, resolved) },
		totals: {
			interferenceVolumeMm3: interferenceUnion(tally),
			keepoutVolumeMm3: tally.keepoutMm3,
			counts
		},
		compartments: resolved.compartments
	});
}

/** The fit report of a parsed scene (see sceneSchema). Throws SceneError for positions not allowed. */
export function checkScene(scene: Scene, options: ReportOptions = {}): FitReport {
	return reportFor(scene, resolveScene(scene), options);
}
