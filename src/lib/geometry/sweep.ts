/**
 * Sweeps: the fit report's numbers at every allowed position of one control (or a grid of two).
 * Everything the control does not move is tallied once; each step adds only the moved box: its
 * overlaps with the rest, and the gaps it may now be nearest to.
 */

import { FACES, compareText, type Face } from './box';
import { bracketBoxAt, cutCompartments, dividerBoxAt, slabsFor } from './enclosure';
import { SceneError } from './errors';
import {
	buildModel,
	emptyTally,
	interferenceUnion,
	slideIndex,
	statusCounts,
	stepCounts,
	tallyMoving,
	tallyStatic,
	type Model,
	type MovingStep,
	type Tally
} from './model';
import { BOX_STRIDE, writePacked, type BoxRef } from './packed';
import { allowedIndex, allowedPositions, controlDef, type AllowedPosition } from './positions';
import { resolveScene } from './resolve';
import type { Box, BracketDef, DividerDef, Scene } from './schema';
import type {
	FeasibleInterval,
	GapRequest,
	SweepControl,
	SweepGridResult,
	SweepMetrics,
	SweepOptions,
	SweepPoint,
	SweepResult
} from './types';

interface Moving {
	control: SweepControl;
	def: DividerDef | BracketDef;
	index: number;
	boxAt: (offsetMm: number) => Box;
}

function movingOf(scene: Scene, model: Model, control: SweepControl, path: string): Moving {
	const enclosure = scene.enclosure;
	const def = controlDef(enclosure, control);
	if (!def) throw new SceneError(`${path}.id`, `No ${control.kind} with id ${control.id}`);
	return {
		control,
		def,
		index: model.indexOf.get(`${control.kind}:${def.id}`)!,
		boxAt: 'travel' in def ? (o) => bracketBoxAt(def, o) : (o) => dividerBoxAt(enclosure, def, o)
	};
}

function positionsOf(moving: Moving, given: number[] | undefined, path: string): AllowedPosition[] {
	const allowed = allowedPositions(moving.def);
	if (!given) return allowed;
	return given.map((offsetMm, i) => {
		const k = allowedIndex(moving.def, offsetMm);
		if (k < 0) throw new SceneError(`${path}[${i}]`, `${offsetMm} mm is not an allowed position`);
		return allowed[k];
	});
}

function gapSlots(
	model: Model,
	gaps: GapRequest[] | undefined
): { request: GapRequest; slot: number }[] {
	const byId = new Map(model.resolved.placements.map((rp, p) => [rp.placement.id, p]));
	return (gaps ?? []).map((request, i) => {
		const p = byId.get(request.placementId);
		if (p === undefined) {
			throw new SceneError(`gaps[${i}].placementId`, `No placement with id ${request.placementId}`);
		}
		const f = FACES.indexOf(request.face as Face);
		if (f < 0) throw new SceneError(`gaps[${i}].face`, `No face ${request.face}`);
		return { request, slot: p * 6 + f };
	});
}

/** Tallies the static part once and returns an evaluator for offsets of the moving controls. */
function prepare(scene: Scene, controls: SweepControl[], gaps: GapRequest[] | undefined) {
	const resolved = resolveScene(scene);
	const model = buildModel(scene, resolved);
	const moving = controls.map((c, i) =>
		movingOf(scene, model, c, controls.length === 1 ? 'control' : `control${'AB'[i]}`)
	);
	const included = new Uint8Array(model.boxes.length).fill(1);
	for (const m of moving) included[m.index] = 0;
	const base: Tally = tallyStatic(model, included).tally;
	const slots = gapSlots(model, gaps);
	const slides = moving.map((m) => slideIndex(model, included, 'xyz'.indexOf(m.def.axis)));
	const reported = [...new Set(slots.map((s) => (s.slot / 6) | 0))];
	const movesDivider = moving.some((m) => m.control.kind === 'divider');
	// The moved boxes' geometry for the current step, one slot each, rewritten by every step.
	const movingCoords = new Float64Array(moving.length * BOX_STRIDE);
	const step: MovingStep = {
		moved: moving.map((m, slot): BoxRef => ({ index: m.index, coords: movingCoords, slot })),
		slides,
		marginMm: scene.marginMm,
		reportedPlacements: reported
	};
	const scratch = emptyTally(model.bodiesOf.length, true);
	const baseStatus = statusCounts(model, base, scene.marginMm);
	const slabs = slabsFor(scene.enclosure, resolved.dividerPositions);
	const labels = new Map<string, string>();

	return {
		moving,
		evaluate(offsets: number[]): SweepMetrics {
			moving.forEach((m, k) => writePacked(movingCoords, k, m.boxAt(offsets[k])));
			const tally = tallyMoving(model, base, step, scratch);
			const counts = stepCounts(model, tally, scene.marginMm, baseStatus);
			let compartments = resolved.compartments;
			if (movesDivider) {
				moving.forEach((m, k) => {
					const slab = slabs.find((s) => s.def.id === m.def.id);
					if (m.control.kind === 'divider' && slab) slab.box = m.boxAt(offsets[k]);
				});
				compartments = cutCompartments(resolved.innerBox, slabs, labels);
			}
			return {
				interferenceVolumeMm3: interferenceUnion(tally),
				collisions: tally.collisions,
				counts,
				compartments: compartments.map((c) => ({ id: c.id, label: c.label, sizeMm: c.sizeMm })),
				gaps: slots.map(({ request, slot }) => {
					const idx = tally.against[slot];
					return {
						placementId: request.placementId,
						face: request.face,
						gapMm: idx < 0 ? null : tally.gap[slot],
						againstId: idx < 0 ? null : model.boxes[idx].id
					};
				})
			};
		}
	};
}

/** Runs of consecutive points (already in offset order) with no collision. */
export function feasibleIntervals(
	points: readonly { offsetMm: number; collisions: number }[]
): FeasibleInterval[] {
	const out: FeasibleInterval[] = [];
	let start = -1;
	points.forEach((p, i) => {
		if (p.collisions === 0 && start < 0) start = i;
		if (start >= 0 && (p.collisions > 0 || i === points.length - 1)) {
			const end = p.collisions > 0 ? i - 1 : i;
			out.push({
				fromMm: points[start].offsetMm,
				toMm: points[end].offsetMm,
				fromIndex: start,
				toIndex: end
			});
			start = -1;
		}
	});
	return out;
}

/**
 * The fit report's numbers at each position of one divider or bracket (every allowed one unless
 * `positions` names some), in offset order, with the runs of positions where nothing collides.
 */
export function sweep(scene: Scene, options: SweepOptions): SweepResult {
	const prepared = prepare(scene, [options.control], options.gaps);
	const positions = positionsOf(prepared.moving[0], options.positions, 'positions');
	const points: SweepPoint[] = positions
		.map((pos) => ({
			offsetMm: pos.offsetMm,
			label: pos.label,
			...prepared.evaluate([pos.offsetMm])
		}))
		.sort((a, b) => a.offsetMm - b.offsetMm || compareText(a.label, b.label));
	return { control: options.control, points, feasibleIntervals: feasibleIntervals(points) };
}

/** Every combination of two controls' positions; cells[i * positionsB.length + j]. */
export function sweepGrid(
	scene: Scene,
	controlA: SweepControl,
	controlB: SweepControl,
	options: { positionsA?: number[]; positionsB?: number[]; gaps?: GapRequest[] } = {}
): SweepGridResult {
	if (controlA.kind === controlB.kind && controlA.id === controlB.id) {
		throw new SceneError('controlB.id', 'The two controls must differ');
	}
	const prepared = prepare(scene, [controlA, controlB], options.gaps);
	const byOffset = (a: AllowedPosition, b: AllowedPosition) => a.offsetMm - b.offsetMm;
	const positionsA = positionsOf(prepared.moving[0], options.positionsA, 'positionsA').sort(
		byOffset
	);
	const positionsB = positionsOf(prepared.moving[1], options.positionsB, 'positionsB').sort(
		byOffset
	);
	const cells = positionsA.flatMap((a) =>
		positionsB.map((b) => ({
			offsetAMm: a.offsetMm,
			offsetBMm: b.offsetMm,
			labelA: a.label,
			labelB: b.label,
			...prepared.evaluate([a.offsetMm, b.offsetMm])
		}))
	);
	return { controlA, controlB, positionsA, positionsB, cells };
}
