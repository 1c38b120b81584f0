/**
 * Shapes the engine answers with. Millimetres, Y up, inner-origin coordinates; volumes in mm³.
 * Every list is sorted by id so the same scene always gives the same report.
 */

import type { Axis, Face, PanelName } from './box';
import type { LoopReport } from './loop';
import type { CableReport } from './cables';
import type { Box, KeepoutDef, PartDef, Placement, PortDef, Vec3 } from './schema';

/** Precedence, worst first: collides > blocked > outside > tight > clear. */
export const STATUS_ORDER = ['collides', 'blocked', 'outside', 'tight', 'clear'] as const;
export type FitStatus = (typeof STATUS_ORDER)[number];
export type StatusCounts = Record<FitStatus, number>;

/** `plate`: a mount's adapter plate or standoff layer, a fixed box once a mounted class needs it. */
export type WorldBoxKind = 'wall' | 'divider' | 'bracket' | 'plate' | 'body' | 'keepout';

/** One resolved box in inner coordinates. */
export interface WorldBox {
	/**
	 * Unique in the scene: `wall:left`, `divider:<id>`, `bracket:<id>`, `plate:<mountId>`,
	 * `standoff:<mountId>`, and for placed parts
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
	face?: PanelName;
	/** For a plate or standoff layer: the mount it belongs to. */
	mountId?: string;
	/** ± mm a placed part's dimensions may be off by (its part's toleranceMm). */
	toleranceMm?: number;
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
	ports: {
		id: string;
		position: Vec3;
		direction: PortDef['direction'];
		thread: string;
		/** Set on power ports (a cable's plug, no fitting); coolant ports have none. */
		kind?: 'power';
	}[];
	/** Bounding box of the placed bodies (keep-outs excluded). */
	bounds: Box;
}

export interface ResolvedScene {
	innerBox: Box;
	walls: WorldBox[];
	/** One box per divider, its whole slab: parts are checked against it, openings or not. */
	dividers: WorldBox[];
	/**
	 * Each divider's solid pieces, its slab minus its openings (ids from dividerPieceId): what
	 * tube runs and routes meet and the 3D view draws. The same boxes as `dividers` without openings.
	 */
	dividerPieces: WorldBox[];
	brackets: WorldBox[];
	/** Adapter plates and standoff layers of mounts whose parts need them (see mountPlates). */
	plates: WorldBox[];
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
	/** The axis the overlap is thinnest along: the one its depth is told on. */
	axis: Axis;
	/**
	 * The best two single-axis moves of one movable thing (an unlocked part, or a divider or
	 * bracket to an allowed position) that clear this pair without creating a collision or block
	 * or deepening one the moved thing already has, checked against the whole scene; shortest first.
	 */
	moves: ClearingMove[];
	/** moves[0], or null when no single-axis move clears it (then `noMove` says why). */
	clearingMove: ClearingMove | null;
	/** Words when `moves` is empty: "No move along depth clears this; the part is deeper than the space …". */
	noMove?: string;
}

export interface FaceGap {
	/**
	 * Free distance to the nearest box ahead of this face (one that reaches past the face in its
	 * direction); negative when that box overlaps the face: then it is how far the face has gone in.
	 */
	gapMm: number | null;
	/** gapMm − the part's toleranceMm − the other side's (0 for walls, dividers, brackets, plates). */
	worstCaseMm: number | null;
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
	/** Problems of the mount stack this part is on (over budget, overhang, class, tight), worst first. */
	mountProblems: MountProblem[];
}

export type MountProblemKind = 'over-budget' | 'unaccepted' | 'overhang' | 'tight';

export interface MountProblem {
	mountId: string;
	/** The mount's label, so a part's item can name it. */
	label: string;
	kind: MountProblemKind;
	/** over-budget → collides, unaccepted → blocked, overhang → outside, tight → tight. */
	status: FitStatus;
	/** The placements it marks: the whole stack for budget problems, the parts concerned otherwise. */
	placementIds: string[];
	/** For over-budget and tight: mm over the budget / under the margin; for overhang: the largest overhang. */
	amountMm: number;
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
	/** Every problem the mount has, worst first; its status is the first one's (clear when none). */
	problems: MountProblem[];
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
		/**
		 * Volume of the union of all 'collides' overlap boxes: a point where several obstacles overlap
		 * a body counts once (per-pair volumes in `overlaps` stay pairwise).
		 */
		interferenceVolumeMm3: number;
		/** Sum of 'blocked' and 'warning' overlap volumes. */
		keepoutVolumeMm3: number;
		counts: StatusCounts;
	};
	compartments: Compartment[];
	/** The scene's coolant loops checked (loop.ts); missing when the scene has none. */
	loops?: LoopReport[];
	/** The scene's power cable bundles checked (cables.ts); missing when the scene has none. */
	cables?: CableReport[];
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
