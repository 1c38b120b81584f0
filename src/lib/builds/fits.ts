/**
 * What fits here: catalogue parts placed at a target (a mount, a compartment, a free-space box or
 * in place of a placed part) by the same rules as "add part", checked by the engine, ranked by
 * spare room. Also parts × positions (which positions of a control each candidate fits at) and
 * radiator + fan combinations for a radiator mount. Pure: browser and server run it alike.
 */
import {
	EPSILON_MM,
	FACE_AXES,
	placePart,
	SceneError,
	allowedPositions,
	controlDef,
	boxContains,
	checkScene,
	formatMm,
	mountAccepts,
	partClasses,
	plateNeeded,
	resolveScene,
	type Box,
	type BracketDef,
	type DividerDef,
	type EnclosureDef,
	type Face,
	type FitStatus,
	type MountDef,
	type PartDef,
	type Placement,
	type ResolvedScene,
	type Rotation,
	type Scene,
	type SceneInput,
	type Vec3
} from '$lib/geometry';
import {
	movingBoxAt,
	probe,
	probeAcross,
	probeBase,
	portUse,
	type MovingControl,
	type PortUse,
	type ProbeBase
} from '$lib/geometry/fit-probe';
import { reach } from '$lib/geometry/room';
import { flatAlong, landInRoom, landOnMount, nextPlacementId, placedBounds } from './placement';

export type FitTarget =
	| { kind: 'mount'; mountId: string }
	| { kind: 'compartment'; compartmentId: string }
	| { kind: 'space'; box: Box }
	| { kind: 'replace'; placementId: string };

export interface FitCandidate {
	part: PartDef;
	priceMinor?: number | null;
	isStandard?: boolean;
}

export type FitSort = 'spare' | 'price' | 'name';

export interface FitRow {
	partId: string;
	name: string;
	category: string;
	isStandard: boolean;
	priceMinor: number | null;
	status: FitStatus;
	/** Clear or tight: listed as fitting. */
	fits: boolean;
	spareMm: number | null;
	/**
	 * In a compartment or a free space: the free millimetres left on the part's tightest axis where
	 * it lands (the room it has to move, which ranks the list there, since a part dropped into a
	 * corner touches the panels and so has no spare of its own). Null on a mount or a replacement.
	 */
	roomToMoveMm: number | null;
	/** Free mm ahead of each face (null: nothing ahead or held contact). */
	spareByFace: Record<Face, number | null>;
	stack: { usedMm: number; budgetMm: number | null; spareMm: number | null } | null;
	ports: PortUse[];
	/** The placement to add (or to put in place of the replaced one); null when it cannot land. */
	placement: Placement | null;
	/** Why it does not fit, in words. */
	reason: string | null;
}

export interface Prepared {
	scene: Scene;
	resolved: ResolvedScene;
	base: ProbeBase;
	target: FitTarget;
	label: string;
	placementId: string;
	mount: MountDef | null;
	/** Whether where a part lands depends on the controls (compartments and boxes move with them). */
	movesWithControls: boolean;
	land(
		part: PartDef
	): { position: Vec3; rotation: Rotation; roomToMoveMm?: number } | { reason: string };
}

const FIT_STATUSES: FitStatus[] = ['clear', 'tight'];

function insideBox(inner: Box, box: Box): boolean {
	return boxContains(inner, box) && box.min.every((v, i) => box.max[i] - v > EPSILON_MM);
}

/** Checks the target against the scene and prepares the landing rule; bad ids throw SceneError naming the field. */
export function prepareTarget(
	scene: Scene,
	resolved: ResolvedScene,
	target: FitTarget,
	moving?: MovingControl
): Prepared {
	const common = { scene, resolved, target };
	if (target.kind === 'mount') {
		const mount = scene.enclosure.mounts.find((m) => m.id === target.mountId);
		if (!mount) throw new SceneError('target.mountId', `No mount with id ${target.mountId}`);
		return {
			...common,
			base: probeBase(scene, resolved, undefined, moving),
			label: mount.label,
			placementId: nextPlacementId(scene.placements),
			mount,
			movesWithControls: false,
			land: (part) => landOnMount(resolved, mount, part)
		};
	}
	if (target.kind === 'compartment') {
		const room = resolved.compartments.find((c) => c.id === target.compartmentId);
		if (!room) {
			throw new SceneError(
				'target.compartmentId',
				`No compartment with id ${target.compartmentId}`
			);
		}
		return {
			...common,
			base: probeBase(scene, resolved),
			label: room.label,
			placementId: nextPlacementId(scene.placements),
			mount: null,
			movesWithControls: true,
			land: (part) => landInRoom(resolved, room.box, part)
		};
	}
	if (target.kind === 'space') {
		if (!insideBox(resolved.innerBox, target.box)) {
			throw new SceneError('target.box', 'The box is not inside the enclosure');
		}
		const size = target.box.max.map((v, i) => formatMm(v - target.box.min[i])).join(' × ');
		return {
			...common,
			base: probeBase(scene, resolved),
			label: `free space ${size}`,
			placementId: nextPlacementId(scene.placements),
			mount: null,
			movesWithControls: true,
			land: (part) => landInRoom(resolved, target.box, part)
		};
	}
	const old = resolved.placements.find((rp) => rp.placement.id === target.placementId);
	if (!old) {
		throw new SceneError('target.placementId', `No placement with id ${target.placementId}`);
	}
	const base = probeBase(scene, resolved, old.placement.id, moving);
	const mount =
		old.placement.mountId === undefined
			? null
			: (scene.enclosure.mounts.find((m) => m.id === old.placement.mountId) ?? null);
	return {
		...common,
		base,
		label: `in place of ${old.part.name}`,
		placementId: old.placement.id,
		mount,
		movesWithControls: false,
		// On a mount it lands as a new part would there; standing free it takes the old one's corner and turn.
		land: (part) =>
			mount
				? landOnMount(base.without, mount, part)
				: { position: [...old.placement.position] as Vec3, rotation: { ...old.placement.rotation } }
	};
}

function reasonOf(status: FitStatus, r: ReturnType<typeof probe>): string | null {
	if (status === 'clear' || status === 'tight') return null;
	if (r.partStatus === 'collides' || r.partStatus === 'blocked') {
		const first = r.overlaps.find(
			(o) => o.kind === (r.partStatus === 'collides' ? 'collides' : 'blocked')
		);
		return `${r.partStatus === 'collides' ? 'Runs into' : 'Its fitting or cable room is blocked by'} ${first ? first.label : 'another box'}.`;
	}
	if (r.partStatus === 'outside') {
		return `Reaches outside the enclosure (${r.outsideFaces.join(', ')}).`;
	}
	if (r.mount) {
		if (r.mount.unaccepted.length) return `The ${r.mount.label} does not take this class.`;
		if (r.mount.spareMm !== null && r.mount.spareMm < 0) {
			return `The stack is ${formatMm(-r.mount.spareMm)} over the ${r.mount.label}'s budget.`;
		}
		if (r.mount.overflow.length) return `Reaches past the ${r.mount.label}.`;
	}
	return 'Does not fit.';
}

/** One candidate at a prepared target. */
/** A part that cannot be placed at all: no spare room, no placement, only the reason. */
function refusedRow(
	common: Pick<FitRow, 'partId' | 'name' | 'category' | 'isStandard' | 'priceMinor'>,
	status: 'blocked' | 'outside',
	reason: string
): FitRow {
	return {
		...common,
		status,
		fits: false,
		spareMm: null,
		roomToMoveMm: null,
		spareByFace: { '-x': null, '+x': null, '-y': null, '+y': null, '-z': null, '+z': null },
		stack: null,
		ports: [],
		placement: null,
		reason
	};
}

export function fitRow(prepared: Prepared, candidate: FitCandidate): FitRow {
	const part = candidate.part;
	const common = {
		partId: part.id,
		name: part.name,
		category: part.category,
		isStandard: candidate.isStandard ?? part.provenance === 'standard',
		priceMinor: candidate.priceMinor ?? null
	};
	if (prepared.mount && !mountAccepts(prepared.mount, part)) {
		const reason = `The ${prepared.mount.label} takes ${prepared.mount.accepts.join(', ')}.`;
		return refusedRow(common, 'blocked', reason);
	}
	const landing = prepared.land(part);
	if ('reason' in landing) return refusedRow(common, 'outside', landing.reason);
	const placement: Placement = {
		id: prepared.placementId,
		partId: part.id,
		position: landing.position,
		rotation: landing.rotation,
		...(prepared.mount ? { mountId: prepared.mount.id } : {})
	};
	return rowAt(prepared, candidate, placement, landing.roomToMoveMm ?? null);
}

function rowAt(
	prepared: Prepared,
	candidate: FitCandidate,
	placement: Placement,
	roomToMoveMm: number | null = null
): FitRow {
	const part = candidate.part;
	const r = probe(prepared.base, part, placement);
	const spareByFace = {} as Record<Face, number | null>;
	for (const [face, g] of Object.entries(r.gaps) as [Face, (typeof r.gaps)[Face]][]) {
		spareByFace[face] = g.gapMm === null || g.held ? null : g.gapMm;
	}
	return {
		partId: part.id,
		name: part.name,
		category: part.category,
		isStandard: candidate.isStandard ?? part.provenance === 'standard',
		priceMinor: candidate.priceMinor ?? null,
		status: r.status,
		fits: FIT_STATUSES.includes(r.status),
		spareMm: r.spareMm,
		roomToMoveMm,
		spareByFace,
		stack: r.mount
			? { usedMm: r.mount.usedMm, budgetMm: r.mount.budgetMm, spareMm: r.mount.spareMm }
			: null,
		ports: r.placed.ports.length ? portUse(prepared.base, r.placed) : [],
		placement,
		reason: reasonOf(r.status, r)
	};
}

export function sortRows(rows: FitRow[], sort: FitSort): FitRow[] {
	const name = (a: FitRow, b: FitRow) =>
		a.name.localeCompare(b.name, 'en') || (a.partId < b.partId ? -1 : a.partId > b.partId ? 1 : 0);
	const room = (r: FitRow) => r.roomToMoveMm ?? r.spareMm ?? Infinity;
	const spare = (a: FitRow, b: FitRow) => room(b) - room(a) || name(a, b);
	const price = (a: FitRow, b: FitRow) =>
		(a.priceMinor ?? Infinity) - (b.priceMinor ?? Infinity) || spare(a, b);
	const order = sort === 'name' ? name : sort === 'price' ? price : spare;
	// Clear before tight, then the chosen order.
	return [...rows].sort(
		(a, b) =>
			(a.status === b.status ? 0 : a.status === 'clear' ? -1 : b.status === 'clear' ? 1 : 0) ||
			order(a, b)
	);
}

export interface WhatFits {
	label: string;
	fits: FitRow[];
	/** Parts that do not fit, with why; the worst first is not needed, so by name. */
	left: FitRow[];
}

/** The candidates that fit at the target, ranked; the others with their reason. */
export function whatFits(
	scene: Scene,
	target: FitTarget,
	candidates: readonly FitCandidate[],
	sort: FitSort = 'spare',
	resolved = resolveScene(scene)
): WhatFits {
	const prepared = prepareTarget(scene, resolved, target);
	const rows = candidates.map((c) => fitRow(prepared, c));
	return {
		label: prepared.label,
		fits: sortRows(
			rows.filter((r) => r.fits),
			sort
		),
		left: sortRows(
			rows.filter((r) => !r.fits),
			'name'
		)
	};
}

// — parts × positions —

export interface PositionsControl {
	kind: 'divider' | 'bracket';
	id: string;
}

export interface PartsByPositions {
	control: PositionsControl & { label: string };
	positions: { label: string; offsetMm: number }[];
	rows: {
		partId: string;
		name: string;
		cells: { status: FitStatus; spareMm: number | null; fits: boolean }[];
	}[];
}

/** A divider or bracket with more than one allowed position: what a parts × positions table runs along. */
export interface SlidingControl extends PositionsControl {
	/** `divider:<id>` or `bracket:<id>`, unique among the enclosure's controls. */
	key: string;
	label: string;
	positionCount: number;
}

/** The enclosure's dividers, then its brackets, that have more than one allowed position. */
export function slidingControls(enclosure: EnclosureDef): SlidingControl[] {
	const control = (kind: SlidingControl['kind'], def: DividerDef | BracketDef): SlidingControl => ({
		key: `${kind}:${def.id}`,
		kind,
		id: def.id,
		label: def.label,
		positionCount: allowedPositions(def).length
	});
	return [
		...enclosure.dividers.map((d) => control('divider', d)),
		...enclosure.brackets.map((b) => control('bracket', b))
	].filter((c) => c.positionCount > 1);
}

/**
 * A place picker's key as a fit target: `mount:<id>`, `room:<compartment id>` or
 * `replace:<placement id>`; null for any other key (free-space boxes are the picker's own).
 */
export function targetOfKey(key: string): FitTarget | null {
	if (key.startsWith('mount:')) return { kind: 'mount', mountId: key.slice('mount:'.length) };
	if (key.startsWith('room:')) {
		return { kind: 'compartment', compartmentId: key.slice('room:'.length) };
	}
	if (key.startsWith('replace:')) {
		return { kind: 'replace', placementId: key.slice('replace:'.length) };
	}
	return null;
}

/** The `/api/fits` body for a parts × positions table: the picked parts at every position of one control. */
export function positionsRequest(
	scene: SceneInput,
	target: FitTarget,
	partIds: string[],
	control: PositionsControl
) {
	return {
		scene,
		target,
		filters: { partIds },
		positions: { kind: control.kind, id: control.id },
		limit: Math.max(1, partIds.length)
	};
}

/**
 * Each candidate at every allowed position of one control: status and spare mm per cell. Where a
 * part lands on a mount (or in place of a part) does not depend on the controls, so it lands once.
 */
export function partsByPositions(
	scene: Scene,
	target: FitTarget,
	candidates: readonly FitCandidate[],
	control: PositionsControl
): PartsByPositions {
	const def = controlDef(scene.enclosure, control);
	if (!def) throw new SceneError('control.id', `No ${control.kind} with id ${control.id}`);
	const positions = allowedPositions(def);
	const key = control.kind === 'divider' ? 'dividerPositions' : 'bracketOffsets';
	const rows: PartsByPositions['rows'] = candidates.map((c) => ({
		partId: c.part.id,
		name: c.part.name,
		cells: []
	}));
	const outside = { status: 'outside' as const, spareMm: null, fits: false };
	if (target.kind === 'mount' || target.kind === 'replace') {
		// Where a part lands does not depend on the control: land and probe each part once against
		// the fixed boxes, then add the control's box at each position (probeAcross).
		const prepared = prepareTarget(scene, resolveScene(scene), target, control);
		const at = positions.map((p) => movingBoxAt(prepared.base, p.offsetMm));
		candidates.forEach((c, i) => {
			if (prepared.mount && !mountAccepts(prepared.mount, c.part)) {
				rows[i].cells = positions.map(() => ({ ...outside, status: 'blocked' as const }));
				return;
			}
			const l = prepared.land(c.part);
			if ('reason' in l) {
				rows[i].cells = positions.map(() => ({ ...outside }));
				return;
			}
			const placed = placePart(c.part, {
				id: prepared.placementId,
				partId: c.part.id,
				position: l.position,
				rotation: l.rotation,
				...(prepared.mount ? { mountId: prepared.mount.id } : {})
			});
			rows[i].cells = probeAcross(prepared.base, placed, at);
		});
	} else {
		// In a compartment or a free-space box the landing moves with the control: each position anew.
		for (const p of positions) {
			const at: Scene = { ...scene, [key]: { ...scene[key], [control.id]: p.offsetMm } };
			const prepared = prepareTarget(at, resolveScene(at), target);
			candidates.forEach((c, i) => {
				const row = fitRow(prepared, c);
				rows[i].cells.push(
					row.placement
						? { status: row.status, spareMm: row.spareMm, fits: row.fits }
						: { ...outside }
				);
			});
		}
	}
	return {
		control: { ...control, label: def.label },
		positions: positions.map((p) => ({ label: p.label, offsetMm: p.offsetMm })),
		rows
	};
}

// — radiator + fans on a radiator mount —

/** Radiator classes are named by the fans they carry (common practice): a 240 takes two 120 mm fans. */
export function fanSizeOf(radiatorClass: number): number | null {
	if (radiatorClass % 140 === 0) return 140;
	if (radiatorClass % 120 === 0) return 120;
	return null;
}

export interface RadiatorCombination {
	key: string;
	radiator: { partId: string; name: string; thicknessMm: number; radiatorClass: number };
	fan: { partId: string; name: string; thicknessMm: number; count: number };
	plateMm: number;
	standoffMm: number;
	/** Room for radiator + fans: the budget (or the room to the nearest divider or bracket, when less) less plate and standoffs. */
	availableMm: number;
	boundedBy: string;
	stackMm: number;
	spareMm: number;
	/** By the arithmetic above, under the scene's margin. */
	status: FitStatus;
	/** The whole scene checked with the combination in place of what the mount holds now. */
	checkedStatus: FitStatus;
	/** Estimate (common practice): wattsPer120mm per 120 mm of radiator. */
	heatCapacityW: number;
	priceMinor: number | null;
	/** Placements to put on the mount in place of what it holds. */
	placements: Placement[];
	/** Ids of the placements they replace. */
	replaces: string[];
}

/** The part's thickness along the mount's normal when laid flat on it, as landOnMount turns it. */
function thicknessAlong(part: PartDef, axis: 0 | 1 | 2): number {
	const b = placedBounds(part, {
		id: 'probe',
		partId: part.id,
		position: [0, 0, 0],
		rotation: flatAlong(part, axis)
	});
	return b.max[axis] - b.min[axis];
}

const STATUS_RANK: FitStatus[] = ['collides', 'blocked', 'outside', 'tight', 'clear'];

/**
 * Every radiator the mount takes × every fan of its size, a layer of fans on the radiator: the
 * stack against the mount's room by arithmetic, then checked in the scene in place of what the
 * mount holds now. Best spare first.
 */
export function radiatorCombinations(
	scene: Scene,
	mountId: string,
	candidates: readonly FitCandidate[],
	resolved = resolveScene(scene)
): RadiatorCombination[] {
	const mount = scene.enclosure.mounts.find((m) => m.id === mountId);
	if (!mount) throw new SceneError('target.mountId', `No mount with id ${mountId}`);
	if (mount.kind !== 'radiator' && mount.kind !== 'fan') return [];
	const { axis, high } = FACE_AXES[mount.face];
	const inner = resolved.innerBox;
	const region: Box = {
		min: [0, 1, 2].map((i) => Math.max(mount.region.min[i], inner.min[i])) as Vec3,
		max: [0, 1, 2].map((i) => Math.min(mount.region.max[i], inner.max[i])) as Vec3
	};
	const room = reach(
		inner,
		region,
		axis,
		high ? -1 : 1,
		high ? inner.max[axis] : inner.min[axis],
		[...resolved.dividers, ...resolved.brackets].map((b) => ({
			box: b.box,
			label: b.label,
			id: b.id
		}))
	);
	const budget = mount.budgetMm ?? Infinity;
	const limit = Math.min(budget, room.distanceMm);
	const boundedBy =
		budget <= room.distanceMm + EPSILON_MM
			? `the ${formatMm(budget)} budget`
			: `the room to the ${room.against}`;
	const radiators = candidates.filter(
		(c) =>
			c.part.category === 'radiator' &&
			c.part.specs.radiatorClass !== undefined &&
			mountAccepts(mount, c.part)
	);
	const fans = candidates.filter(
		(c) => c.part.category === 'fan' && c.part.specs.fanSizeMm !== undefined
	);
	const replaces = scene.placements.filter((p) => p.mountId === mount.id).map((p) => p.id);
	const emptied: Scene = {
		...scene,
		placements: scene.placements.filter((p) => p.mountId !== mount.id)
	};
	const out: RadiatorCombination[] = [];
	for (const rad of radiators) {
		const cls = rad.part.specs.radiatorClass!;
		const fanSize = fanSizeOf(cls);
		const radT = thicknessAlong(rad.part, axis);
		for (const fan of fans) {
			if (fan.part.specs.fanSizeMm !== fanSize) continue;
			// The plate as the engine counts it for this radiator and these fans.
			const plateMm = plateNeeded(mount, [...partClasses(rad.part), ...partClasses(fan.part)]);
			const availableMm = limit - plateMm - mount.standoffMm;
			const count = Math.max(1, Math.round(cls / fanSize!));
			const fanT = thicknessAlong(fan.part, axis);
			const stackMm = radT + fanT;
			const spareMm = availableMm - stackMm;
			const status: FitStatus =
				spareMm < -EPSILON_MM
					? 'collides'
					: spareMm < scene.marginMm - EPSILON_MM
						? 'tight'
						: 'clear';
			// Place it: radiator on the panel (past plate and standoffs), then the fans on it.
			const parts = [
				...emptied.parts.filter((p) => p.id !== rad.part.id && p.id !== fan.part.id),
				rad.part,
				fan.part
			];
			let working: Scene = { ...emptied, parts };
			const placed: Placement[] = [];
			let landedAll = true;
			for (const part of [rad.part, ...Array.from({ length: count }, () => fan.part)]) {
				const r = resolveScene(working);
				const l = landOnMount(r, mount, part);
				if ('reason' in l) {
					landedAll = false;
					break;
				}
				const p: Placement = {
					id: nextPlacementId([...scene.placements, ...working.placements]),
					partId: part.id,
					position: l.position,
					rotation: l.rotation,
					mountId: mount.id
				};
				placed.push(p);
				working = { ...working, placements: [...working.placements, p] };
			}
			let checkedStatus: FitStatus = 'outside';
			if (landedAll) {
				// A radiator sits centred on its mount (common practice): the stack moves as one.
				const bounds = placed.map((p) =>
					placedBounds(p.partId === rad.part.id ? rad.part : fan.part, p)
				);
				const shift = [0, 1, 2].map((i) =>
					i === axis
						? 0
						: (region.min[i] + region.max[i]) / 2 -
							(Math.min(...bounds.map((b) => b.min[i])) +
								Math.max(...bounds.map((b) => b.max[i]))) /
								2
				);
				const centred = placed.map((p) => ({
					...p,
					position: p.position.map((v, i) => v + shift[i]) as Vec3
				}));
				placed.splice(0, placed.length, ...centred);
				working = { ...working, placements: [...emptied.placements, ...centred] };
				const report = checkScene(working);
				const ids = new Set(placed.map((p) => p.id));
				const statuses = [
					...report.parts.filter((p) => ids.has(p.placementId)).map((p) => p.status),
					report.mounts.find((m) => m.mountId === mount.id)!.status
				];
				checkedStatus = STATUS_RANK.find((s) => statuses.includes(s)) ?? 'clear';
			}
			const price =
				rad.priceMinor == null || fan.priceMinor == null
					? null
					: rad.priceMinor + count * fan.priceMinor;
			out.push({
				key: `${rad.part.id}+${count}x${fan.part.id}`,
				radiator: {
					partId: rad.part.id,
					name: rad.part.name,
					thicknessMm: radT,
					radiatorClass: cls
				},
				fan: { partId: fan.part.id, name: fan.part.name, thicknessMm: fanT, count },
				plateMm,
				standoffMm: mount.standoffMm,
				availableMm,
				boundedBy,
				stackMm,
				spareMm,
				status,
				checkedStatus,
				heatCapacityW: (cls / 120) * scene.budgets.wattsPer120mm,
				priceMinor: price,
				placements: placed,
				replaces
			});
		}
	}
	return out.sort((a, b) => b.spareMm - a.spareMm || (a.key < b.key ? -1 : a.key > b.key ? 1 : 0));
}
