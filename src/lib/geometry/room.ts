/**
 * The clearance table of an enclosure: for every allowed position of its dividers and brackets
 * (every combination when at most two of them move; one at a time, the others at their first
 * position, when more do), the room it leaves — per compartment and per mount — before any part
 * is chosen. Each figure says what bounds it. Millimetres, inner coordinates, Y up.
 */

import {
	AXES,
	EPSILON_MM,
	boxSize,
	panelOf,
	type AxisIndex,
	type Face,
	type PanelName
} from './box';
import {
	FACE_AXES,
	PANEL_LABELS,
	panelText,
	bracketBoxAt,
	compartmentsFor,
	dividerBoxAt,
	innerBoxOf
} from './enclosure';
import { SceneError } from './errors';
import { plateNeeded } from './mounts';
import { BOARD_THICKNESS_MM } from './standard-library';
import {
	byVolume,
	containerLabels,
	faceBound,
	maximalEmptyBoxes,
	panelUnder,
	sameLabels,
	type LabelledBox
} from './free-space';
import { allowedPositions, formatMm, type AllowedPosition } from './positions';
import { SLOT_PITCH_MM, type Box, type EnclosureDef, type MountDef, type Vec3 } from './schema';

/**
 * Board outlines by class, from the documents that define them. The thickness is not in them:
 * 1.6 mm (0.062 in) is the usual board, from memory (BOARD_THICKNESS_MM).
 */
export const BOARD_CLASSES: Record<string, { widthMm: number; depthMm: number; source: string }> = {
	'Mini-ITX': {
		widthMm: 170,
		depthMm: 170,
		source: 'Mini-ITX form factor addendum to the microATX specification (2001)'
	},
	microATX: {
		widthMm: 244,
		depthMm: 244,
		source: 'microATX Motherboard Interface Specification 1.2'
	},
	ATX: { widthMm: 305, depthMm: 244, source: 'ATX Specification 2.2' }
};

/** Common practice: a compact pump or reservoir stands on about 50 × 50 mm. */
export const PUMP_FOOTPRINT_MM = 50;

/** Most rows one table holds; a definition with more combinations gets the first ones and a note. */
export const MAX_ROOM_ROWS = 2_000;

export type RoomFigureKind =
	'free-box' | 'over-board' | 'card-length' | 'card-slots' | 'stack' | 'pump-depth';

export interface RoomFigure {
	/** Stable across rows: `free-box:<compartment>`, `stack:<mount>:<class>`, `pump:<compartment>:<face>`. */
	id: string;
	kind: RoomFigureKind;
	label: string;
	/** The figure in mm (for card slots, the width the slots come from); null when there is no room. */
	valueMm: number | null;
	sizeMm?: Vec3;
	slots?: number;
	/** What bounds it, in words: "to the Spine", "from the Card support bar at 0.0 mm to the Top panel". */
	boundedBy: string;
	/** What was taken off or assumed: standoffs, plate, board thickness, footprint. */
	note?: string;
	/** The box the figure measures, for drawing it. */
	box?: Box;
}

export interface RoomSetting {
	kind: 'divider' | 'bracket';
	id: string;
	label: string;
	offsetMm: number;
	positionLabel: string;
}

export interface RoomRow {
	/** `spine=65.68;bar=0`: the moving controls' offsets. */
	key: string;
	settings: RoomSetting[];
	figures: RoomFigure[];
}

export interface RoomControl {
	kind: 'divider' | 'bracket';
	id: string;
	label: string;
	positions: AllowedPosition[];
}

export interface RoomTable {
	controls: RoomControl[];
	/** The controls the rows vary (more than one allowed position). */
	moving: { kind: 'divider' | 'bracket'; id: string }[];
	rows: RoomRow[];
	/** Set when the table is incomplete or empty, in words. */
	note: string | null;
}

/** `box` cut to `to` (a fresh box). */
export function clip(box: Box, to: Box): Box {
	return {
		min: [
			Math.max(box.min[0], to.min[0]),
			Math.max(box.min[1], to.min[1]),
			Math.max(box.min[2], to.min[2])
		],
		max: [
			Math.min(box.max[0], to.max[0]),
			Math.min(box.max[1], to.max[1]),
			Math.min(box.max[2], to.max[2])
		]
	};
}

/** No face on a panel: faceBound's fallback, reached only when the panel word is empty. */
const NO_LABELS = sameLabels('');

/** The panel a face of `box` lies on, as containerLabels(box, inner, '') words it; '' when none. */
function panelWord(box: Box, inner: Box, f: Face): string {
	const panel = panelUnder(box, inner, f);
	return panel ? PANEL_LABELS[panel] : '';
}

function shares(a: Box, b: Box, axis: number): boolean {
	for (let i = 0; i < 3; i++) {
		if (i !== axis && Math.min(a.max[i], b.max[i]) - Math.max(a.min[i], b.min[i]) <= EPSILON_MM) {
			return false;
		}
	}
	return true;
}

/**
 * Free distance from `start` along `axis` (towards +1 or −1) over the cross-section of `cross`,
 * to the nearest obstacle ahead or the panel; an obstacle across the start gives 0.
 */
export function reach(
	inner: Box,
	cross: Box,
	axis: AxisIndex,
	dir: 1 | -1,
	start: number,
	obstacles: readonly LabelledBox[]
): { distanceMm: number; against: string } {
	const panelFace = FACE_NAMES_BY_AXIS[axis][dir > 0 ? 1 : 0];
	let best = {
		distanceMm: dir > 0 ? inner.max[axis] - start : start - inner.min[axis],
		against: PANEL_LABELS[panelFace]
	};
	for (const o of obstacles) {
		if (!shares(o.box, cross, axis)) continue;
		const near = dir > 0 ? o.box.min[axis] - start : start - o.box.max[axis];
		const far = dir > 0 ? o.box.max[axis] - start : start - o.box.min[axis];
		if (far <= EPSILON_MM) continue;
		const d = Math.max(0, near);
		if (d < best.distanceMm + EPSILON_MM) best = { distanceMm: d, against: o.label };
	}
	return best;
}

const FACE_NAMES_BY_AXIS: [PanelName, PanelName][] = [
	['left', 'right'],
	['bottom', 'top'],
	['front', 'back']
];

/** The axis a mount's panel is across, the way into the enclosure, and where the panel is. */
export function panelAt(
	mount: MountDef,
	inner: Box
): { axis: AxisIndex; dir: 1 | -1; panel: number } {
	const { axis, high } = FACE_AXES[mount.face];
	return { axis, dir: high ? -1 : 1, panel: high ? inner.max[axis] : inner.min[axis] };
}

/** A slab on a panel: the mount's region across, `depth` in from the panel. */
export function slabOn(mount: MountDef, inner: Box, depth: number): Box {
	const { axis, dir, panel } = panelAt(mount, inner);
	const box = clip(mount.region, inner);
	box.min[axis] = dir > 0 ? panel : panel - depth;
	box.max[axis] = dir > 0 ? panel + depth : panel;
	return box;
}

/** The plate a part of class `cls` (none: a part of no class) would need: the engine's rule. */
export function plateFor(mount: MountDef, cls: string | null): number {
	return plateNeeded(mount, cls === null ? [] : [cls]);
}

export function boardClassOf(mount: MountDef): string | null {
	return mount.accepts.find((c) => c in BOARD_CLASSES) ?? null;
}

/** Board on its tray: plate (when it applies) + standoffs + a board of the tray's class. */
export function boardDepth(mount: MountDef): number {
	return plateFor(mount, boardClassOf(mount)) + mount.standoffMm + BOARD_THICKNESS_MM;
}

/** The offsets one row uses. */
export interface RoomPositions {
	dividerPositions: Record<string, number>;
	bracketOffsets: Record<string, number>;
}

/** An obstacle with a number of its own: the same control at the same offset is the same number. */
interface Obstacle extends LabelledBox {
	id: string;
	serial: number;
}

interface NumberedCompartment {
	serial: number;
	id: string;
	label: string;
	box: Box;
}

/**
 * What the rows of one enclosure's table share. Each control's box and label are made once per
 * offset, the boards and stacks once, the compartments once per setting of the dividers; and
 * every group of figures is kept under a key naming the numbered obstacles it can see, so a row
 * whose moving control is out of a group's sight reuses that group's figures (the same objects).
 */
interface RoomContext {
	enclosure: EnclosureDef;
	inner: Box;
	next: number;
	dividerDefault: number[];
	dividerAt: Map<number, Obstacle>[];
	bracketAt: Map<number, Obstacle>[];
	trays: MountDef[];
	boards: Obstacle[];
	stacks: Obstacle[];
	/** By divider setting (the dividers' numbers). */
	compartments: Trie<NumberedCompartment[]>;
	/** Compartment numbers by id, label and box. */
	compartmentSerial: Map<string, number>;
	figures: Trie<RoomFigure[]>;
	mm: Map<number, string>;
	/** The room of a bracket in no compartment: the whole inside. */
	inside: NumberedCompartment;
}

function roomContext(enclosure: EnclosureDef): RoomContext {
	const inner = innerBoxOf(enclosure);
	const ctx: RoomContext = {
		enclosure,
		inner,
		next: 1,
		dividerDefault: enclosure.dividers.map((d) => allowedPositions(d)[0]?.offsetMm ?? 0),
		dividerAt: enclosure.dividers.map(() => new Map()),
		bracketAt: enclosure.brackets.map(() => new Map()),
		trays: enclosure.mounts.filter((m) => m.kind === 'board-tray'),
		boards: [],
		stacks: [],
		compartments: trie(),
		compartmentSerial: new Map(),
		figures: trie(),
		mm: new Map(),
		inside: { serial: 0, id: 'inside', label: 'Inside', box: inner }
	};
	ctx.boards = ctx.trays.map((m) => ({
		id: `board:${m.id}`,
		label: `board on the ${m.label}`,
		box: slabOn(m, inner, boardDepth(m)),
		serial: ctx.next++
	}));
	ctx.stacks = enclosure.mounts
		.filter((m) => m.kind === 'radiator' || m.kind === 'fan')
		.map((m) => {
			const { axis } = FACE_AXES[m.face];
			const regionDepth = clip(m.region, inner);
			const depth = Math.min(m.budgetMm ?? Infinity, regionDepth.max[axis] - regionDepth.min[axis]);
			return {
				id: `stack:${m.id}`,
				label: `${m.label} stack`,
				box: slabOn(m, inner, depth),
				serial: ctx.next++
			};
		});
	return ctx;
}

/** The value cached under `key`, made by `make` the first time it is asked for. */
function cached<V>(map: Map<number, V>, key: number, make: () => V): V {
	let v = map.get(key);
	if (v === undefined) {
		v = make();
		map.set(key, v);
	}
	return v;
}

/** formatMm, each value formatted once per table. */
function mmOf(ctx: RoomContext, valueMm: number): string {
	return cached(ctx.mm, valueMm, () => formatMm(valueMm));
}

function dividerAt(ctx: RoomContext, k: number, offsetMm: number): Obstacle {
	return cached(ctx.dividerAt[k], offsetMm, () => {
		const d = ctx.enclosure.dividers[k];
		return {
			id: `divider:${d.id}`,
			label: d.label,
			box: dividerBoxAt(ctx.enclosure, d, offsetMm),
			serial: ctx.next++
		};
	});
}

function bracketAt(ctx: RoomContext, k: number, offsetMm: number): Obstacle {
	return cached(ctx.bracketAt[k], offsetMm, () => {
		const b = ctx.enclosure.brackets[k];
		return {
			id: `bracket:${b.id}`,
			label: `${b.label} at ${mmOf(ctx, offsetMm)}`,
			box: bracketBoxAt(b, offsetMm),
			serial: ctx.next++
		};
	});
}

/** Overlapping or touching (closed boxes, within the tolerance): what a box's figures can see. */
function reaches(a: Box, b: Box): boolean {
	for (let i = 0; i < 3; i++) {
		if (Math.min(a.max[i], b.max[i]) - Math.max(a.min[i], b.min[i]) < -2 * EPSILON_MM) {
			return false;
		}
	}
	return true;
}

/**
 * Kept values under a path of keys: a group's tag, then numbers (obstacle numbers, distances) and
 * words the table made once. Maps of maps, so no key text is built and hashed per row.
 */
interface Trie<T> {
	next: Map<number | string, Trie<T>>;
	value?: T;
}

const trie = <T>(): Trie<T> => ({ next: new Map() });

/** The node under `key`, made when missing. */
function child<T>(node: Trie<T>, key: number | string): Trie<T> {
	let n = node.next.get(key);
	if (!n) {
		n = trie<T>();
		node.next.set(key, n);
	}
	return n;
}

/** The node under the numbers of the obstacles `sees` keeps, in their order. */
function sight<T>(
	node: Trie<T>,
	obstacles: readonly Obstacle[],
	sees: (o: Obstacle) => boolean
): Trie<T> {
	for (const o of obstacles) if (sees(o)) node = child(node, o.serial);
	return node;
}

/** The figures of a group, made once per path. */
function kept(node: Trie<RoomFigure[]>, make: () => RoomFigure[]): RoomFigure[] {
	return (node.value ??= make());
}

function compartmentsAt(
	ctx: RoomContext,
	dividers: readonly Obstacle[],
	offsets: readonly number[]
): NumberedCompartment[] {
	const node = sight(ctx.compartments, dividers, () => true);
	let found = node.value;
	if (!found) {
		const positions: Record<string, number> = {};
		ctx.enclosure.dividers.forEach((d, k) => (positions[d.id] = offsets[k]));
		found = compartmentsFor(ctx.enclosure, positions).map((c) => {
			const id = `${c.id}|${c.label}|${c.box.min.join(',')},${c.box.max.join(',')}`;
			let serial = ctx.compartmentSerial.get(id);
			if (serial === undefined) {
				serial = ctx.next++;
				ctx.compartmentSerial.set(id, serial);
			}
			return { serial, id: c.id, label: c.label, box: c.box };
		});
		node.value = found;
	}
	return found;
}

/** The figures at one setting of the controls (each offset must be allowed). */
export function roomAt(enclosure: EnclosureDef, at: RoomPositions): RoomFigure[] {
	const ctx = roomContext(enclosure);
	// Validates the given divider offsets (a SceneError naming the field) before anything is made.
	compartmentsFor(enclosure, at.dividerPositions);
	return figuresAt(ctx, at);
}

function figuresAt(ctx: RoomContext, at: RoomPositions): RoomFigure[] {
	const { enclosure, inner, trays } = ctx;
	const offsets = enclosure.dividers.map(
		(d, k) => at.dividerPositions[d.id] ?? ctx.dividerDefault[k]
	);
	const dividers = offsets.map((off, k) => dividerAt(ctx, k, off));
	const bracketOffset = (id: string) => at.bracketOffsets[id] ?? 0;
	const brackets = enclosure.brackets.map((b, k) => bracketAt(ctx, k, bracketOffset(b.id)));
	const fixed = [...dividers, ...brackets, ...ctx.boards];
	const reachObstacles = [...fixed, ...ctx.stacks];
	const compartments = compartmentsAt(ctx, dividers, offsets);
	const figures: RoomFigure[] = [];

	// Per compartment: its free box, and the depth for a pump or reservoir from each of its panels.
	const perCompartment: RoomFigure[] = [];
	for (const c of compartments) {
		const node = sight(child(child(ctx.figures, 'c'), c.serial), reachObstacles, (o) =>
			reaches(o.box, c.box)
		);
		const found = kept(node, () => compartmentFigures(ctx, c, fixed, reachObstacles));
		for (const f of found) (f.kind === 'free-box' ? figures : perCompartment).push(f);
	}

	// Height over a board on each tray. The reaches below are cheap; their figures (the words) are
	// kept under what the reach found, so a row with the same distance and bound reuses them.
	trays.forEach((m, t) => {
		const { axis, dir, panel } = panelAt(m, inner);
		const cross = clip(m.region, inner);
		const others = fixed.filter((o) => o.id !== `board:${m.id}`);
		const r = reach(inner, cross, axis, dir, panel + dir * boardDepth(m), others);
		const [figure] = kept(path(ctx, 'o', t, r), () => {
			const cls = boardClassOf(m);
			const plate = plateFor(m, cls);
			return [
				{
					id: `over-board:${m.id}`,
					kind: 'over-board',
					label: `Over the ${cls ?? ''} board on the ${m.label}`.replace('  ', ' '),
					valueMm: r.distanceMm,
					boundedBy: `to the ${r.against}`,
					note: `${plate ? `${mmOf(ctx, plate)} plate + ` : ''}${mmOf(ctx, m.standoffMm)} standoffs + ${mmOf(ctx, BOARD_THICKNESS_MM)} board taken off`
				}
			];
		});
		figures.push(figure);
	});

	// Cards: standing on a support bracket, or hanging from an expansion-slot mount.
	const stackAxis = trays.length ? FACE_AXES[trays[0].face].axis : null;
	enclosure.brackets.forEach((b, k) => {
		if (b.kind !== 'card-support') return;
		const self = brackets[k];
		const box = self.box;
		const L = AXES.indexOf(b.axis) as AxisIndex;
		const room = compartments.find((c) => holdsCentre(c.box, box)) ?? ctx.inside;
		const up = box.min[L] - room.box.min[L] <= room.box.max[L] - box.max[L];
		const dir: 1 | -1 = up ? 1 : -1;
		const cross = clip(box, room.box);
		const others = reachObstacles.filter((o) => o.id !== `bracket:${b.id}`);
		const r = reach(inner, cross, L, dir, up ? box.max[L] : box.min[L], others);
		figures.push(
			...kept(child(path(ctx, 'L', k, r), self.serial), () => [
				{
					id: `card-length:${b.id}`,
					kind: 'card-length',
					label: `Longest card, standing on the ${b.label}`,
					valueMm: r.distanceMm,
					boundedBy: `from the ${self.label} to the ${r.against}`
				}
			]),
			// The width across depends on the compartment and the dividers bounding it alone.
			...kept(
				sight(child(child(child(ctx.figures, 'W'), k), room.serial), dividers, () => true),
				() => [cardSlots(ctx, b, L, room, dividers, stackAxis)]
			)
		);
	});
	enclosure.mounts.forEach((m, k) => {
		if (m.kind !== 'slots') return;
		const { axis, dir, panel } = panelAt(m, inner);
		const cross = clip(m.region, inner);
		const r = reach(inner, cross, axis, dir, panel, reachObstacles);
		figures.push(...kept(path(ctx, 's', k, r), () => slotFigures(ctx, m, r, stackAxis)));
	});

	// Stack budget on each radiator or fan mount, per class it takes, after its plate.
	const controls = [...dividers, ...brackets];
	enclosure.mounts.forEach((m, k) => {
		if (m.kind !== 'radiator' && m.kind !== 'fan') return;
		const { axis, dir, panel } = panelAt(m, inner);
		const cross = clip(m.region, inner);
		const r = reach(inner, cross, axis, dir, panel, controls);
		figures.push(...kept(path(ctx, 'r', k, r), () => stackFigures(ctx, m, r)));
	});

	return figures.concat(perCompartment);
}

type Reach = ReturnType<typeof reach>;

/** Where a reach's figures are kept: the group's tag and index, then what the reach found. */
function path(ctx: RoomContext, tag: string, index: number, r: Reach): Trie<RoomFigure[]> {
	return child(child(child(child(ctx.figures, tag), index), r.distanceMm), r.against);
}

/** Whether `box`'s centre lies in `room` (within the tolerance). */
function holdsCentre(room: Box, box: Box): boolean {
	for (let i = 0; i < 3; i++) {
		const centre = (box.min[i] + box.max[i]) / 2;
		if (room.min[i] - EPSILON_MM > centre || centre > room.max[i] + EPSILON_MM) return false;
	}
	return true;
}

/**
 * The axis cards stack along (slot after slot) in `box`, for cards whose length runs along
 * `lengthAxis`: the scene's stack axis where it is another axis, else the box's narrowest other axis.
 */
function slotAxis(box: Box, lengthAxis: AxisIndex, stackAxis: AxisIndex | null): AxisIndex {
	if (stackAxis !== null && stackAxis !== lengthAxis) return stackAxis;
	const extent = (a: number) => box.max[a] - box.min[a];
	return [0, 1, 2]
		.filter((a) => a !== lengthAxis)
		.sort((p, q) => extent(p) - extent(q))[0] as AxisIndex;
}

/** The widest card in the compartment a support bracket stands in, in slots. */
function cardSlots(
	ctx: RoomContext,
	b: EnclosureDef['brackets'][number],
	L: AxisIndex,
	room: { box: Box; label: string },
	dividers: readonly Obstacle[],
	stackAxis: AxisIndex | null
): RoomFigure {
	const S = slotAxis(room.box, L, stackAxis);
	const width = room.box.max[S] - room.box.min[S];
	const labels = containerLabels(room.box, ctx.inner, '');
	const lo =
		labels[`-${AXES[S]}` as Face] || faceBound(room.box, `-${AXES[S]}` as Face, dividers, labels);
	const hi =
		labels[`+${AXES[S]}` as Face] || faceBound(room.box, `+${AXES[S]}` as Face, dividers, labels);
	return {
		id: `card-slots:${b.id}`,
		kind: 'card-slots',
		label: `Widest card in ${room.label}`,
		valueMm: width,
		slots: Math.floor(width / SLOT_PITCH_MM + 1e-9),
		boundedBy: `${lo || 'edge'} to ${hi || 'edge'}`,
		note: `slots of ${mmOf(ctx, SLOT_PITCH_MM)} (PCI Express CEM)`
	};
}

/** The longest card in an expansion-slot mount (`r`: its reach from the panel), and the widest it takes. */
function slotFigures(
	ctx: RoomContext,
	m: MountDef,
	r: Reach,
	stackAxis: AxisIndex | null
): RoomFigure[] {
	const { axis } = panelAt(m, ctx.inner);
	const cross = clip(m.region, ctx.inner);
	const S = slotAxis(cross, axis, stackAxis);
	const width = cross.max[S] - cross.min[S];
	const pitch = m.slotPitchMm || SLOT_PITCH_MM;
	const byRoom = Math.floor(width / pitch + 1e-9);
	const slots = m.slotCount !== undefined ? Math.min(m.slotCount, byRoom) : byRoom;
	return [
		{
			id: `card-length:${m.id}`,
			kind: 'card-length',
			label: `Longest card in the ${m.label}`,
			valueMm: r.distanceMm,
			boundedBy: `from the ${PANEL_LABELS[m.face]} to the ${r.against}`
		},
		{
			id: `card-slots:${m.id}`,
			kind: 'card-slots',
			label: `Widest card in the ${m.label}`,
			valueMm: width,
			slots,
			boundedBy:
				m.slotCount !== undefined && m.slotCount <= byRoom
					? `${m.slotCount} slots on the mount`
					: `the mount's ${mmOf(ctx, width)} across`,
			note: `slots of ${mmOf(ctx, pitch)} (PCI Express CEM)`
		}
	];
}

/** The stack budget on a radiator or fan mount (`r`: its reach from the panel), per class, after its plate. */
function stackFigures(ctx: RoomContext, m: MountDef, r: Reach): RoomFigure[] {
	const out: RoomFigure[] = [];
	for (const cls of m.accepts.length ? m.accepts : [null]) {
		const plate = plateFor(m, cls);
		const budget = m.budgetMm;
		const byBudget = budget !== undefined && budget <= r.distanceMm + EPSILON_MM;
		const limit = byBudget ? budget! : r.distanceMm;
		const why = byBudget
			? Math.abs(budget! - r.distanceMm) <= EPSILON_MM
				? `to the ${r.against} (the ${mmOf(ctx, budget!)} budget)`
				: `the ${mmOf(ctx, budget!)} stack budget`
			: `to the ${r.against}`;
		const after = [
			plate ? `the ${mmOf(ctx, plate)} adapter plate` : '',
			m.standoffMm ? `${mmOf(ctx, m.standoffMm)} standoffs` : ''
		]
			.filter(Boolean)
			.join(' and ');
		out.push({
			id: `stack:${m.id}:${cls ?? 'any'}`,
			kind: 'stack',
			label: `${m.label}${cls ? `, ${cls}` : ''}: ${m.kind === 'radiator' ? 'radiator + fans' : 'fans'}`,
			valueMm: Math.max(0, limit - plate - m.standoffMm),
			boundedBy: after ? `${why}, after ${after}` : why
		});
	}
	return out;
}

/** A compartment's free box (after fixed obstacles) and its pump depths per panel (after stacks too). */
function compartmentFigures(
	ctx: RoomContext,
	c: { id: string; label: string; box: Box },
	fixed: readonly LabelledBox[],
	reachObstacles: readonly LabelledBox[]
): RoomFigure[] {
	const { inner } = ctx;
	const figures: RoomFigure[] = [];
	const free = maximalEmptyBoxes(
		c.box,
		fixed.map((o) => o.box),
		1
	).boxes.sort(byVolume);
	const best = free[0];
	if (!best) {
		figures.push({
			id: `free-box:${c.id}`,
			kind: 'free-box',
			label: `${c.label}: free box`,
			valueMm: null,
			boundedBy: 'no free room'
		});
		return figures;
	}
	const side = (f: Face) =>
		panelWord(best, inner, f) || faceBound(best, f, fixed, NO_LABELS) || 'the compartment edge';
	const size = boxSize(best);
	figures.push({
		id: `free-box:${c.id}`,
		kind: 'free-box',
		label: `${c.label}: free box`,
		valueMm: null,
		sizeMm: size,
		boundedBy: `${side('-x')} to ${side('+x')}, ${side('-y')} to ${side('+y')}, ${side('-z')} to ${side('+z')}`,
		box: best
	});
	// The stacks count for a pump too; when none reaches into the compartment the boxes are the same.
	const boxes = reachObstacles.some((o) => !fixed.includes(o) && reaches(o.box, c.box))
		? maximalEmptyBoxes(
				c.box,
				reachObstacles.map((o) => o.box),
				1
			).boxes.sort(byVolume)
		: free;
	for (const f of ['-x', '+x', '-y', '+y', '-z', '+z'] as const) {
		const { axis, high } = FACE_AXES[panelOf(f)];
		const panel = high ? inner.max[axis] : inner.min[axis];
		if (Math.abs((high ? c.box.max[axis] : c.box.min[axis]) - panel) > EPSILON_MM) continue;
		// The two axes across the panel: the footprint's sides.
		const u = (axis + 1) % 3;
		const v = (axis + 2) % 3;
		let deep: Box | null = null;
		for (const b of boxes) {
			if (Math.abs((high ? b.max[axis] : b.min[axis]) - panel) > EPSILON_MM) continue;
			if (
				b.max[u] - b.min[u] < PUMP_FOOTPRINT_MM - EPSILON_MM ||
				b.max[v] - b.min[v] < PUMP_FOOTPRINT_MM - EPSILON_MM
			) {
				continue;
			}
			const d = b.max[axis] - b.min[axis];
			if (
				!deep ||
				d > deep.max[axis] - deep.min[axis] + EPSILON_MM ||
				(Math.abs(d - (deep.max[axis] - deep.min[axis])) <= EPSILON_MM && byVolume(b, deep) < 0)
			) {
				deep = b;
			}
		}
		if (!deep) continue;
		const far = `${high ? '-' : '+'}${AXES[axis]}` as Face;
		const bound =
			panelWord(deep, inner, far) ||
			faceBound(deep, far, reachObstacles, NO_LABELS) ||
			'the compartment edge';
		const p = deep.max[u] - deep.min[u];
		const q = deep.max[v] - deep.min[v];
		figures.push({
			id: `pump:${c.id}:${panelOf(f)}`,
			kind: 'pump-depth',
			label: `${c.label}: pump or reservoir on the ${panelText(panelOf(f))}`,
			valueMm: deep.max[axis] - deep.min[axis],
			boundedBy: `to the ${bound}`,
			note: `over ${mmOf(ctx, Math.min(p, q))} × ${mmOf(ctx, Math.max(p, q))} (a footprint of at least ${PUMP_FOOTPRINT_MM} × ${PUMP_FOOTPRINT_MM} mm)`,
			box: deep
		});
	}
	return figures;
}

/** Every row of the enclosure's clearance table; `note` says when there is no allowed position. */
export function roomTable(enclosure: EnclosureDef): RoomTable {
	const controls: RoomControl[] = [
		...enclosure.dividers.map((d) => ({
			kind: 'divider' as const,
			id: d.id,
			label: d.label,
			positions: allowedPositions(d)
		})),
		...enclosure.brackets.map((b) => ({
			kind: 'bracket' as const,
			id: b.id,
			label: b.label,
			positions: allowedPositions(b)
		}))
	];
	const empty = controls.filter((c) => c.positions.length === 0);
	if (empty.length) {
		return {
			controls,
			moving: [],
			rows: [],
			note: `${empty.map((c) => c.label).join(', ')} ${empty.length === 1 ? 'has' : 'have'} no allowed position, so there is no room to list.`
		};
	}
	const moving = controls.filter((c) => c.positions.length > 1);
	const settingsList: RoomSetting[][] = [];
	const base = controls.map((c) => ({
		kind: c.kind,
		id: c.id,
		label: c.label,
		offsetMm: c.positions[0].offsetMm,
		positionLabel: c.positions[0].label
	}));
	const withPos = (set: RoomSetting[], c: RoomControl, p: AllowedPosition) =>
		set.map((s) =>
			s.kind === c.kind && s.id === c.id
				? { ...s, offsetMm: p.offsetMm, positionLabel: p.label }
				: s
		);
	let note: string | null = null;
	if (moving.length <= 2) {
		let sets: RoomSetting[][] = [base];
		for (const c of moving) {
			const next: RoomSetting[][] = [];
			for (const s of sets) for (const p of c.positions) next.push(withPos(s, c, p));
			sets = next;
		}
		settingsList.push(...sets);
	} else {
		note = `${moving.length} controls move: each one's positions are listed with the others at their first position.`;
		settingsList.push(base);
		for (const c of moving) {
			for (const p of c.positions.slice(1)) settingsList.push(withPos(base, c, p));
		}
	}
	if (settingsList.length > MAX_ROOM_ROWS) {
		note = `${note ? `${note} ` : ''}Only the first ${MAX_ROOM_ROWS} of ${settingsList.length} combinations are listed.`;
		settingsList.length = MAX_ROOM_ROWS;
	}
	const ctx = roomContext(enclosure);
	const rows = settingsList.map((settings) => {
		const at: RoomPositions = { dividerPositions: {}, bracketOffsets: {} };
		for (const s of settings) {
			(s.kind === 'divider' ? at.dividerPositions : at.bracketOffsets)[s.id] = s.offsetMm;
		}
		const key = settings
			.filter((s) => moving.some((m) => m.kind === s.kind && m.id === s.id))
			.map((s) => `${s.id}=${s.offsetMm}`)
			.join(';');
		return { key, settings, figures: figuresAt(ctx, at) };
	});
	return { controls, moving: moving.map((m) => ({ kind: m.kind, id: m.id })), rows, note };
}

/** The row of a table for the offsets a scene uses (controls left out take their first position). */
export function roomRowFor(
	table: RoomTable,
	dividerPositions: Record<string, number>,
	bracketOffsets: Record<string, number>
): RoomRow | null {
	return (
		table.rows.find((r) =>
			r.settings.every((s) => {
				const given = (s.kind === 'divider' ? dividerPositions : bracketOffsets)[s.id];
				return given === undefined ? true : Math.abs(given - s.offsetMm) <= EPSILON_MM;
			})
		) ?? null
	);
}

/** Throws SceneError naming the field when a requested offset is not allowed. */
export function checkRoomPositions(enclosure: EnclosureDef, at: RoomPositions): void {
	for (const [key, list] of [
		['dividerPositions', enclosure.dividers],
		['bracketOffsets', enclosure.brackets]
	] as const) {
		const given = at[key];
		for (const [id, offset] of Object.entries(given)) {
			const def = list.find((d) => d.id === id);
			if (!def) throw new SceneError(`${key}.${id}`, 'No such control in this enclosure');
			if (!allowedPositions(def).some((p) => Math.abs(p.offsetMm - offset) <= EPSILON_MM)) {
				throw new SceneError(`${key}.${id}`, `${offset} mm is not an allowed position`);
			}
		}
	}
}
