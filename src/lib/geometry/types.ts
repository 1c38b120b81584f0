/**
 * Shapes the engine answers with. Millimetres, Y up, inner-origin coordinates; volumes in mm³.
 * Every list is sorted by id so the same scene always gives the same report.
 */

import type { Axis, Face } from './box';
import type { Box, FaceName, KeepoutDef, PartDef, Placement, PortDef, Vec3 } from './schema';

/** Precedence, worst first: collides > blocked > outside > tight > clear. */
export const STATUS_ORDER = ['collides', 'blocked', 'outside', 'tight', 'clear'] as const;
export type FitStatus = (typeof STATUS_ORDER)[number];
export type StatusCounts = Record<FitStatus, number>;

export type WorldBoxKind = 'wall' | 'divider' | 'bracket' | 'body' | 'keepout';

/** One resolved box in inner coordinates. */
export interface WorldBox {
	/**
	 * Unique in the scene: `wall:left`, `divider:<id>`, `bracket:<id>`, and for placed parts
	 * `<placementId>/<bodyId>` or `<placementId>/<keepoutId>`.
	 */
	id: string;
	kind: WorldBoxKind;
	label: string;
	box: Box;
	/** The thing that moves with this box: a placement id, divider id, bracket id or wall face. */
	ownerId: string;
	placementId?: string;
	partId?: string;
	keepoutKind?: KeepoutDef['kind'];
	severity?: KeepoutDef['severity'];
	wallKind?: 'solid' | 'mesh';
	face?: FaceName;
}

export interface Compartment {
	/** Divider sides that bound it, sorted: `main.high`, `main.low+shelf.high`; `inside` with no dividers. */
	id: string;
	label: string;
	box: Box;
	sizeMm: Vec3;
}

export interface ResolvedPlacement {
	placement: Placement;
	part: PartDef;
	bodies: WorldBox[];
	keepouts: WorldBox[];
	/** Ports in inner coordinates, directions turned with the part. */
	ports: { id: string; position: Vec3; direction: PortDef['direction']; thread: string }[];
	/** Bounding box of the placed bodies (keep-outs excluded). */
	bounds: Box;
}

export interface ResolvedScene {
	innerBox: Box;
	walls: WorldBox[];
	dividers: WorldBox[];
	brackets: WorldBox[];
	placements: ResolvedPlacement[];
	compartments: Compartment[];
	/** Offsets actually used, after defaults for controls the scene left out. */
	dividerPositions: Record<string, number>;
	bracketOffsets: Record<string, number>;
}

export interface ItemRef {
	id: string;
	kind: WorldBoxKind;
	label: string;
	ownerId: string;
	placementId?: string;
	keepoutKind?: KeepoutDef['kind'];
}

export interface ClearingMove {
	/** Placement, divider or bracket id: the thing to move. */
	targetId: string;
	targetKind: 'part' | 'divider' | 'bracket';
	axis: Axis;
	sign: 1 | -1;
	distanceMm: number;
	/** For a divider or bracket: allowed positions to step over, and the offset that clears. */
	steps?: number;
	toOffsetMm?: number;
}

export type OverlapKind = 'collides' | 'blocked' | 'warning';

export interface Overlap {
	/** a.id < b.id. */
	a: ItemRef;
	b: ItemRef;
	kind: OverlapKind;
	box: Box;
	volumeMm3: number;
	/** Overlap extent per axis. */
	depthMm: Vec3;
	/** The smallest single-axis move that clears the pair. */
	clearingMove: ClearingMove;
	/** When a divider or bracket is involved: the nearest allowed position of it that clears. */
	controlMove?: ClearingMove;
}

export interface FaceGap {
	/** Free distance to the nearest box ahead of this face; negative when that box overlaps. */
	gapMm: number | null;
	against: ItemRef | null;
	/**
	 * Contact where the part is held (resting on what is below it, against its mount's panel or the
	 * rest of its stack): shown, but not counted as tight.
	 */
	held: boolean;
}

export interface PartReport {
	placementId: string;
	partId: string;
	label: string;
	status: FitStatus;
	gaps: Record<Face, FaceGap>;
	/** Faces of the enclosure's inner box that the part's bodies cross. */
	outsideFaces: Face[];
	compartmentId: string | null;
}

export interface StackEntry {
	placementId: string;
	thicknessMm: number;
	/** Parts side by side (two fans on one radiator) share a layer; layers add up. */
	layer: number;
}

export interface MountReport {
	mountId: string;
	label: string;
	kind: string;
	stack: StackEntry[];
	/** Plate counted in this stack: the mount's plateMm when a mounted class needs it, else 0. */
	plateMm: number;
	standoffMm: number;
	/** budgetMm − plateMm − standoffMm: room left for the stacked parts themselves. */
	availableMm: number | null;
	/** plateMm + standoffMm + the stack's layers. */
	usedMm: number;
	budgetMm: number | null;
	spareMm: number | null;
	/** Placements whose class the mount does not list in `accepts`. */
	unaccepted: string[];
	/** Placements that reach past the mount's region, with how far per face. */
	overflow: { placementId: string; overflowMm: Partial<Record<Face, number>> }[];
	status: FitStatus;
}

export type BudgetStatus = 'clear' | 'tight' | 'over' | 'unknown';

export interface HeatBudget {
	heatW: number;
	capacityW: number;
	radiatorLengthMm: number;
	wattsPer120mm: number;
	/** Always true: W per 120 mm of radiator is a rule of thumb, not a measurement. */
	isEstimate: true;
	status: BudgetStatus;
}

export interface PowerBudget {
	drawW: number;
	ratingW: number;
	headroomPct: number;
	/** drawW × (1 + headroomPct / 100). */
	requiredW: number;
	status: BudgetStatus;
}

export interface FitReport {
	/** The first overlaps by id (at most the report's cap; see MAX_LISTED_OVERLAPS). */
	overlaps: Overlap[];
	/** Overlaps found but not listed; the totals and statuses count them all. */
	overlapsNotListed: number;
	parts: PartReport[];
	mounts: MountReport[];
	budgets: { heat: HeatBudget; power: PowerBudget };
	totals: {
		/** Sum of 'collides' overlap volumes. */
		interferenceVolumeMm3: number;
		/** Sum of 'blocked' and 'warning' overlap volumes. */
		keepoutVolumeMm3: number;
		counts: StatusCounts;
	};
	compartments: Compartment[];
}

export interface SweepControl {
	kind: 'divider' | 'bracket';
	id: string;
}

export interface GapRequest {
	placementId: string;
	face: Face;
}

export interface SweepOptions {
	control: SweepControl;
	/** Offsets to run; each must be allowed. Default: every allowed position. */
	positions?: number[];
	gaps?: GapRequest[];
}

export interface SweepMetrics {
	interferenceVolumeMm3: number;
	/** Number of 'collides' overlaps. */
	collisions: number;
	counts: StatusCounts;
	compartments: { id: string; label: string; sizeMm: Vec3 }[];
	gaps: { placementId: string; face: Face; gapMm: number | null; againstId: string | null }[];
}

export interface SweepPoint extends SweepMetrics {
	offsetMm: number;
	label: string;
}

export interface FeasibleInterval {
	fromMm: number;
	toMm: number;
	/** Indexes into `points`, inclusive. */
	fromIndex: number;
	toIndex: number;
}

export interface SweepResult {
	control: SweepControl;
	points: SweepPoint[];
	/** Runs of consecutive positions (in offset order) with no collision. */
	feasibleIntervals: FeasibleInterval[];
}

export interface SweepGridCell extends SweepMetrics {
	offsetAMm: number;
	offsetBMm: number;
	labelA: string;
	labelB: string;
}

export interface SweepGridResult {
	controlA: SweepControl;
	controlB: SweepControl;
	positionsA: { label: string; offsetMm: number }[];
	positionsB: { label: string; offsetMm: number }[];
	/** Row-major: cells[i * positionsB.length + j] is A at i, B at j. */
	cells: SweepGridCell[];
}
