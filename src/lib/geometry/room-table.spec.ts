/**
 * The clearance table's shared work (pieces computed once per control position, figures kept by
 * what they depend on) must give exactly the rows a fresh, row-by-row computation gives. The
 * oracle below is that computation as it stood before the table shared anything: every row
 * resolves its dividers, brackets, compartments and figures from nothing. Checked over the two
 * demo enclosures and random variations of them (fast-check).
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { AXES, EPSILON_MM, boxSize, panelOf, type AxisIndex, type Face } from './box';
import {
	FACE_AXES,
	PANEL_LABELS,
	bracketBoxAt,
	compartmentsFor,
	dividerBoxAt,
	innerBoxOf
} from './enclosure';
import { BOARD_THICKNESS_MM, demoEnclosure, demoTowerEnclosure } from './standard-library';
import {
	byVolume,
	containerLabels,
	faceBound,
	maximalEmptyBoxes,
	type LabelledBox
} from './free-space';
import { allowedPositions, formatMm } from './positions';
import {
	PUMP_FOOTPRINT_MM,
	boardClassOf,
	boardDepth,
	clip,
	panelAt,
	plateFor,
	reach,
	roomAt,
	roomTable,
	slabOn,
	type RoomFigure,
	type RoomPositions
} from './room';
import {
	SLOT_PITCH_MM,
	enclosureDefSchema,
	type Box,
	type EnclosureDef,
	type Vec3
} from './schema';
import { listPositions } from '../server/testing/engine-factories';

// — the oracle: one row from nothing —

/** What the obstacles reaching into a box are, as text: rows with the same key have the same figures there. */
function keyOf(container: Box, obstacles: readonly LabelledBox[]): string {
	let key = `${container.min[0]},${container.min[1]},${container.min[2]},${container.max[0]},${container.max[1]},${container.max[2]}`;
	for (const o of obstacles) {
		const b = o.box;
		if (Math.min(b.max[0], container.max[0]) - Math.max(b.min[0], container.min[0]) <= EPSILON_MM) {
			continue;
		}
		if (Math.min(b.max[1], container.max[1]) - Math.max(b.min[1], container.min[1]) <= EPSILON_MM) {
			continue;
		}
		if (Math.min(b.max[2], container.max[2]) - Math.max(b.min[2], container.min[2]) <= EPSILON_MM) {
			continue;
		}
		key += `|${o.label}:${b.min[0]},${b.min[1]},${b.min[2]},${b.max[0]},${b.max[1]},${b.max[2]}`;
	}
	return key;
}

function oldRoomAt(
	enclosure: EnclosureDef,
	at: RoomPositions,
	cache: Map<string, RoomFigure[]> = new Map()
): RoomFigure[] {
	const inner = innerBoxOf(enclosure);
	const dividers: LabelledBox[] = enclosure.dividers.map((d) => ({
		id: `divider:${d.id}`,
		label: d.label,
		box: dividerBoxAt(
			enclosure,
			d,
			at.dividerPositions[d.id] ?? allowedPositions(d)[0]?.offsetMm ?? 0
		)
	}));
	const bracketOffset = (id: string) => at.bracketOffsets[id] ?? 0;
	const brackets: LabelledBox[] = enclosure.brackets.map((b) => ({
		id: `bracket:${b.id}`,
		label: `${b.label} at ${formatMm(bracketOffset(b.id))}`,
		box: bracketBoxAt(b, bracketOffset(b.id))
	}));
	const trays = enclosure.mounts.filter((m) => m.kind === 'board-tray');
	const boards: LabelledBox[] = trays.map((m) => ({
		id: `board:${m.id}`,
		label: `board on the ${m.label}`,
		box: slabOn(m, inner, boardDepth(m))
	}));
	const stacks: LabelledBox[] = enclosure.mounts
		.filter((m) => m.kind === 'radiator' || m.kind === 'fan')
		.map((m) => {
			const { axis } = FACE_AXES[m.face];
			const regionDepth = clip(m.region, inner);
			const depth = Math.min(m.budgetMm ?? Infinity, regionDepth.max[axis] - regionDepth.min[axis]);
			return { id: `stack:${m.id}`, label: `${m.label} stack`, box: slabOn(m, inner, depth) };
		});
	const fixed = [...dividers, ...brackets, ...boards];
	const reachObstacles = [...fixed, ...stacks];
	const compartments = compartmentsFor(enclosure, at.dividerPositions);
	const figures: RoomFigure[] = [];

	// Per compartment: its free box, and the depth for a pump or reservoir from each of its panels.
	// Rows share most compartments (one control moves at a time), so these are kept by what they
	// depend on: the compartment and the obstacles that reach into it.
	const perCompartment: RoomFigure[] = [];
	for (const c of compartments) {
		const key = `${c.id}#${keyOf(c.box, reachObstacles)}#${keyOf(c.box, fixed)}`;
		let found = cache.get(key);
		if (!found) {
			found = compartmentFigures(c, inner, fixed, reachObstacles);
			cache.set(key, found);
		}
		for (const f of found) (f.kind === 'free-box' ? figures : perCompartment).push(f);
	}

	// Height over a board on each tray.
	for (const m of trays) {
		const { axis, dir, panel } = panelAt(m, inner);
		const depth = boardDepth(m);
		const cls = boardClassOf(m);
		const cross = clip(m.region, inner);
		const others = fixed.filter((o) => o.id !== `board:${m.id}`);
		const r = reach(inner, cross, axis, dir, panel + dir * depth, others);
		const plate = plateFor(m, cls);
		figures.push({
			id: `over-board:${m.id}`,
			kind: 'over-board',
			label: `Over the ${cls ?? ''} board on the ${m.label}`.replace('  ', ' '),
			valueMm: r.distanceMm,
			boundedBy: `to the ${r.against}`,
			note: `${plate ? `${formatMm(plate)} plate + ` : ''}${formatMm(m.standoffMm)} standoffs + ${formatMm(BOARD_THICKNESS_MM)} board taken off`
		});
	}

	// Cards: standing on a support bracket, or hanging from an expansion-slot mount.
	const stackAxis = trays.length ? FACE_AXES[trays[0].face].axis : null;
	// Slots run along the board's stack axis, or else the narrower of the box's two other axes.
	const slotAxis = (along: AxisIndex, box: Box): AxisIndex =>
		stackAxis !== null && stackAxis !== along
			? stackAxis
			: ([0, 1, 2]
					.filter((i) => i !== along)
					.sort((p, q) => box.max[p] - box.min[p] - (box.max[q] - box.min[q]))[0] as AxisIndex);
	for (const b of enclosure.brackets.filter((x) => x.kind === 'card-support')) {
		const box = bracketBoxAt(b, bracketOffset(b.id));
		const L = AXES.indexOf(b.axis) as AxisIndex;
		const centre = box.min.map((v, i) => (v + box.max[i]) / 2);
		const room = compartments.find((c) =>
			c.box.min.every(
				(v, i) => v - EPSILON_MM <= centre[i] && centre[i] <= c.box.max[i] + EPSILON_MM
			)
		) ?? { box: inner, label: 'Inside', id: 'inside' };
		const up = box.min[L] - room.box.min[L] <= room.box.max[L] - box.max[L];
		const dir: 1 | -1 = up ? 1 : -1;
		const cross = clip(box, room.box);
		const others = reachObstacles.filter((o) => o.id !== `bracket:${b.id}`);
		const r = reach(inner, cross, L, dir, up ? box.max[L] : box.min[L], others);
		const label = `${b.label} at ${formatMm(bracketOffset(b.id))}`;
		figures.push({
			id: `card-length:${b.id}`,
			kind: 'card-length',
			label: `Longest card, standing on the ${b.label}`,
			valueMm: r.distanceMm,
			boundedBy: `from the ${label} to the ${r.against}`
		});
		const S = slotAxis(L, room.box);
		const width = room.box.max[S] - room.box.min[S];
		const labels = containerLabels(room.box, inner, '');
		const lo =
			labels[`-${AXES[S]}` as Face] ||
			faceBound(
				room.box,
				`-${AXES[S]}` as Face,
				dividers.map((d) => ({ ...d, box: d.box })),
				labels
			);
		const hi =
			labels[`+${AXES[S]}` as Face] || faceBound(room.box, `+${AXES[S]}` as Face, dividers, labels);
		figures.push({
			id: `card-slots:${b.id}`,
			kind: 'card-slots',
			label: `Widest card in ${room.label}`,
			valueMm: width,
			slots: Math.floor(width / SLOT_PITCH_MM + 1e-9),
			boundedBy: `${lo || 'edge'} to ${hi || 'edge'}`,
			note: `slots of ${formatMm(SLOT_PITCH_MM)} (PCI Express CEM)`
		});
	}
	for (const m of enclosure.mounts.filter((x) => x.kind === 'slots')) {
		const { axis, dir, panel } = panelAt(m, inner);
		const cross = clip(m.region, inner);
		const r = reach(inner, cross, axis, dir, panel, reachObstacles);
		figures.push({
			id: `card-length:${m.id}`,
			kind: 'card-length',
			label: `Longest card in the ${m.label}`,
			valueMm: r.distanceMm,
			boundedBy: `from the ${PANEL_LABELS[m.face]} to the ${r.against}`
		});
		const S = slotAxis(axis, cross);
		const width = cross.max[S] - cross.min[S];
		const pitch = m.slotPitchMm || SLOT_PITCH_MM;
		const byRoom = Math.floor(width / pitch + 1e-9);
		const slots = m.slotCount !== undefined ? Math.min(m.slotCount, byRoom) : byRoom;
		figures.push({
			id: `card-slots:${m.id}`,
			kind: 'card-slots',
			label: `Widest card in the ${m.label}`,
			valueMm: width,
			slots,
			boundedBy:
				m.slotCount !== undefined && m.slotCount <= byRoom
					? `${m.slotCount} slots on the mount`
					: `the mount's ${formatMm(width)} across`,
			note: `slots of ${formatMm(pitch)} (PCI Express CEM)`
		});
	}

	// Stack budget on each radiator or fan mount, per class it takes, after its plate.
	for (const m of enclosure.mounts.filter((x) => x.kind === 'radiator' || x.kind === 'fan')) {
		const { axis, dir, panel } = panelAt(m, inner);
		const cross = clip(m.region, inner);
		const r = reach(inner, cross, axis, dir, panel, [...dividers, ...brackets]);
		for (const cls of m.accepts.length ? m.accepts : [null]) {
			const plate = plateFor(m, cls);
			const budget = m.budgetMm;
			const byBudget = budget !== undefined && budget <= r.distanceMm + EPSILON_MM;
			const limit = byBudget ? budget! : r.distanceMm;
			const why = byBudget
				? Math.abs(budget! - r.distanceMm) <= EPSILON_MM
					? `to the ${r.against} (the ${formatMm(budget!)} budget)`
					: `the ${formatMm(budget!)} stack budget`
				: `to the ${r.against}`;
			const after = [
				plate ? `the ${formatMm(plate)} adapter plate` : '',
				m.standoffMm ? `${formatMm(m.standoffMm)} standoffs` : ''
			]
				.filter(Boolean)
				.join(' and ');
			figures.push({
				id: `stack:${m.id}:${cls ?? 'any'}`,
				kind: 'stack',
				label: `${m.label}${cls ? `, ${cls}` : ''}: ${m.kind === 'radiator' ? 'radiator + fans' : 'fans'}`,
				valueMm: Math.max(0, limit - plate - m.standoffMm),
				boundedBy: after ? `${why}, after ${after}` : why
			});
		}
	}

	return figures.concat(perCompartment);
}

/** A compartment's free box (after fixed obstacles) and its pump depths per panel (after stacks too). */
function compartmentFigures(
	c: { id: string; label: string; box: Box },
	inner: Box,
	fixed: readonly LabelledBox[],
	reachObstacles: readonly LabelledBox[]
): RoomFigure[] {
	const figures: RoomFigure[] = [];
	const best = maximalEmptyBoxes(
		c.box,
		fixed.map((o) => o.box),
		1
	).boxes.sort(byVolume)[0];
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
	const labels = containerLabels(best, inner, '');
	const side = (f: Face) =>
		labels[f] || faceBound(best, f, fixed, labels) || 'the compartment edge';
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
	const boxes = maximalEmptyBoxes(
		c.box,
		reachObstacles.map((o) => o.box),
		1
	).boxes.sort(byVolume);
	for (const f of ['-x', '+x', '-y', '+y', '-z', '+z'] as const) {
		const { axis, high } = FACE_AXES[panelOf(f)];
		const panel = high ? inner.max[axis] : inner.min[axis];
		if (Math.abs((high ? c.box.max[axis] : c.box.min[axis]) - panel) > EPSILON_MM) continue;
		let deep: Box | null = null;
		for (const b of boxes) {
			if (Math.abs((high ? b.max[axis] : b.min[axis]) - panel) > EPSILON_MM) continue;
			const wide = [0, 1, 2].every(
				(i) => i === axis || b.max[i] - b.min[i] >= PUMP_FOOTPRINT_MM - EPSILON_MM
			);
			if (!wide) continue;
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
		const edges = containerLabels(deep, inner, '');
		const bound =
			edges[far] || faceBound(deep, far, reachObstacles, edges) || 'the compartment edge';
		figures.push({
			id: `pump:${c.id}:${panelOf(f)}`,
			kind: 'pump-depth',
			label: `${c.label}: pump or reservoir on the ${PANEL_LABELS[panelOf(f)].toLowerCase()}`,
			valueMm: deep.max[axis] - deep.min[axis],
			boundedBy: `to the ${bound}`,
			note: `over ${formatMm(Math.min(...[0, 1, 2].filter((i) => i !== axis).map((i) => deep!.max[i] - deep!.min[i])))} × ${formatMm(Math.max(...[0, 1, 2].filter((i) => i !== axis).map((i) => deep!.max[i] - deep!.min[i])))} (a footprint of at least ${PUMP_FOOTPRINT_MM} × ${PUMP_FOOTPRINT_MM} mm)`,
			box: deep
		});
	}
	return figures;
}

// — the comparison —

function positionsOf(settings: { kind: string; id: string; offsetMm: number }[]): RoomPositions {
	const at: RoomPositions = { dividerPositions: {}, bracketOffsets: {} };
	for (const s of settings) {
		(s.kind === 'divider' ? at.dividerPositions : at.bracketOffsets)[s.id] = s.offsetMm;
	}
	return at;
}

/** Every row of the table equals the oracle's row, figure for figure, word for word. */
function expectSameAsOracle(enclosure: EnclosureDef): number {
	const table = roomTable(enclosure);
	for (const row of table.rows) {
		const at = positionsOf(row.settings);
		const old = oldRoomAt(enclosure, at);
		expect(row.figures).toEqual(old);
		expect(roomAt(enclosure, at)).toEqual(old);
	}
	return table.rows.length;
}

/**
 * A variation of a demo enclosure: other divider positions, another bracket travel and box,
 * other budgets, standoffs and plates; sometimes a third moving control (the one-at-a-time rows).
 */
const variation = fc
	.record({
		tower: fc.boolean(),
		spread: fc.array(fc.integer({ min: 1, max: 95 }), { minLength: 1, maxLength: 4 }),
		travel: fc.record({
			min: fc.integer({ min: -40, max: 40 }),
			steps: fc.integer({ min: 0, max: 6 }),
			step: fc.integer({ min: 1, max: 30 })
		}),
		bracketShift: fc.tuple(
			fc.integer({ min: -30, max: 30 }),
			fc.integer({ min: -30, max: 30 }),
			fc.integer({ min: -30, max: 30 })
		),
		budget: fc.integer({ min: 10, max: 80 }),
		standoff: fc.integer({ min: 0, max: 12 }),
		plate: fc.integer({ min: 0, max: 3 }),
		third: fc.boolean()
	})
	.map((v) => {
		const e = v.tower ? demoTowerEnclosure() : demoEnclosure();
		const inner = innerBoxOf(e).max;
		// The last divider (the one that moves) at percentages of the inner size along its axis.
		const d = e.dividers[e.dividers.length - 1];
		const along = inner[AXES.indexOf(d.axis)];
		const offsets = [...new Set(v.spread.map((p) => Math.round((along * p) / 100)))];
		e.dividers[e.dividers.length - 1] = {
			...d,
			positions: listPositions(Object.fromEntries(offsets.map((o) => [`at ${o}`, o])))
		};
		const b = e.brackets[0];
		e.brackets[0] = {
			...b,
			box: {
				min: b.box.min.map((x, i) => x + v.bracketShift[i]) as Vec3,
				max: b.box.max.map((x, i) => x + v.bracketShift[i]) as Vec3
			},
			travel: {
				minMm: v.travel.min,
				maxMm: v.travel.min + v.travel.steps * v.travel.step,
				stepMm: v.travel.step
			}
		};
		e.mounts = e.mounts.map((m) => ({
			...m,
			...(m.budgetMm !== undefined ? { budgetMm: v.budget } : {}),
			standoffMm: m.kind === 'board-tray' ? v.standoff : m.standoffMm,
			...(m.plateMm !== undefined ? { plateMm: v.plate } : {})
		}));
		if (v.third && !v.tower) {
			e.dividers[0] = { ...e.dividers[0], positions: listPositions({ a: 64, b: 40 }) };
		}
		return e;
	});

describe('the shared clearance table equals the row-by-row one', () => {
	it('the demo sandwich: all 48 rows', () => {
		expect(expectSameAsOracle(demoEnclosure())).toBe(48);
	});

	it('the demo tower: all 28 rows', () => {
		expect(expectSameAsOracle(demoTowerEnclosure())).toBe(28);
	});

	it('random variations of both (positions, travel, bracket box, budgets, a third control)', () => {
		fc.assert(
			fc.property(variation, (e) => {
				const parsed = enclosureDefSchema.safeParse(e);
				fc.pre(parsed.success);
				expectSameAsOracle(parsed.data!);
			}),
			{ numRuns: 60, seed: 20_261_202 }
		);
	});
});
