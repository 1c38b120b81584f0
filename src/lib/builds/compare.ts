/**
 * Differences between variants of one build, from their fit reports (the same engine numbers the
 * editor shows). The first variant is the reference; every other column says how far it moved.
 */
import {
	FACES,
	STATUS_ORDER,
	type Face,
	type FitReport,
	type FitStatus,
	type MountReport
} from '$lib/geometry';
import { toCsv } from '$lib/csv';
import { faceGapWords } from '../words/builds';
import { faceWords } from '$lib/words/faces';

/** A divider or bracket as set in a variant: its offset and the position's name. */
export type ControlSetting = { key: string; label: string; offsetMm: number; position: string };
export type CompareInput = {
	id: string;
	name: string;
	report: FitReport;
	marginMm: number;
	/** The dividers' and brackets' settings, shown as the first rows. */
	controls?: ControlSetting[];
};

export type Cell = {
	value: number | null;
	text: string;
	status?: FitStatus;
	delta: number | null;
	best: boolean;
};

export type DiffRow = {
	key: string;
	group: 'setting' | 'part' | 'compartment' | 'mount' | 'loop' | 'total';
	label: string;
	/** Which is better: a bigger number (a gap, spare room) or a smaller one (interference). */
	better: 'higher' | 'lower' | 'status' | 'none';
	cells: Cell[];
	differs: boolean;
	/** Placement ids to highlight in the 3D views when the row is hovered. */
	highlight: string[];
};

const EPS = 1e-6;
/** STATUS_ORDER runs worst first, so a higher index is a better status. */
const rank = (s: FitStatus) => STATUS_ORDER.indexOf(s);

function numberRow(
	key: string,
	group: DiffRow['group'],
	label: string,
	values: (number | null)[],
	better: DiffRow['better'],
	format: (v: number) => string,
	highlight: string[] = [],
	statuses?: (FitStatus | undefined)[]
): DiffRow {
	const ref = values[0];
	const present = values.filter((v): v is number => v !== null);
	const bestValue =
		present.length < 2 || better === 'none'
			? null
			: better === 'higher'
				? Math.max(...present)
				: Math.min(...present);
	const spread = present.length ? Math.max(...present) - Math.min(...present) : 0;
	const differs =
		values.some((v) => (v === null) !== (ref === null)) ||
		spread > EPS ||
		(statuses ? new Set(statuses).size > 1 : false);
	const cells = values.map((v, i) => ({
		value: v,
		text: v === null ? '—' : format(v),
		status: statuses?.[i],
		delta: i === 0 || v === null || ref === null ? null : v - ref,
		best:
			differs && bestValue !== null && v !== null && Math.abs(v - bestValue) <= EPS && spread > EPS
	}));
	return { key, group, label, better, cells, differs, highlight };
}

function statusRow(
	key: string,
	label: string,
	statuses: (FitStatus | undefined)[],
	highlight: string[],
	group: DiffRow['group'] = 'part'
): DiffRow {
	const present = statuses.filter((s): s is FitStatus => !!s);
	const bestRank = present.length ? Math.max(...present.map(rank)) : 0;
	const differs = new Set(statuses).size > 1;
	return {
		key,
		group,
		label,
		better: 'status',
		differs,
		highlight,
		cells: statuses.map((s) => ({
			value: null,
			text: s ?? 'not placed',
			status: s,
			delta: null,
			best: differs && !!s && rank(s) === bestRank
		}))
	};
}

const mmText = (v: number) => `${v.toFixed(1)}\u2009mm`;

type MountFigure = {
	key: string;
	/** The row label's last word, after the mount's label. */
	word: string;
	valueOf: (m: MountReport) => number | null;
	better: DiffRow['better'];
	format: (v: number) => string;
	/** Whether the row carries the mount's status (the stack row does; the spare row does not). */
	withStatus: boolean;
};

/** Each mount's two rows: the stack it holds (with its status) and the room it has to spare. */
const MOUNT_FIGURES: readonly MountFigure[] = [
	{
		key: 'used',
		word: 'stack',
		valueOf: (m) => m.usedMm,
		better: 'none',
		format: mmText,
		withStatus: true
	},
	// Less than no spare room is an overrun, said as one.
	{
		key: 'spare',
		word: 'spare',
		valueOf: (m) => m.spareMm,
		better: 'higher',
		format: (v) => (v < -EPS ? `${mmText(-v)} over` : mmText(v)),
		withStatus: false
	}
];

/** Rows for every part (status + six gaps), compartment, mount stack and the totals. */
export function compareVariants(inputs: CompareInput[]): DiffRow[] {
	const rows: DiffRow[] = [];
	// The settings first: what was changed between the variants, before what it did.
	const controlKeys = [...new Set(inputs.flatMap((v) => (v.controls ?? []).map((c) => c.key)))];
	for (const key of controlKeys) {
		const found = inputs.map((v) => v.controls?.find((c) => c.key === key));
		const label = found.find((c) => c)?.label ?? key;
		const row = numberRow(
			`setting:${key}`,
			'setting',
			label,
			found.map((c) => c?.offsetMm ?? null),
			'none',
			(v) => mmText(v)
		);
		row.cells = row.cells.map((cell, i) => ({
			...cell,
			// "3 slots · 86.0 mm"; a bracket's position is its offset, said once.
			text:
				found[i] && found[i].position !== cell.text
					? `${found[i].position} · ${cell.text}`
					: cell.text
		}));
		rows.push(row);
	}
	const placementIds = [
		...new Set(inputs.flatMap((v) => v.report.parts.map((p) => p.placementId)))
	].sort();
	// Repeated parts are numbered in placement order ("140 mm fan #2") so rows never share a name.
	const baseLabel = (id: string) =>
		inputs.map((v) => v.report.parts.find((p) => p.placementId === id)).find((r) => r)?.label ?? id;
	const seen = new Map<string, number>();
	const total = new Map<string, number>();
	for (const id of placementIds) total.set(baseLabel(id), (total.get(baseLabel(id)) ?? 0) + 1);
	for (const id of placementIds) {
		const reports = inputs.map((v) => v.report.parts.find((p) => p.placementId === id));
		const base = baseLabel(id);
		const n = (seen.get(base) ?? 0) + 1;
		seen.set(base, n);
		const label = (total.get(base) ?? 1) > 1 ? `${base} #${n}` : base;
		rows.push(
			statusRow(
				`part:${id}:status`,
				`${label} — status`,
				reports.map((r) => r?.status),
				[id]
			)
		);
		for (const face of FACES as readonly Face[]) {
			const values = reports.map((r) => r?.gaps[face].gapMm ?? null);
			if (values.every((v) => v === null)) continue;
			const row = numberRow(
				`part:${id}:gap:${face}`,
				'part',
				`${label} — gap ${FACE_LABEL[face]}`,
				values,
				'higher',
				mmText,
				[id]
			);
			// "2.0 mm (1.0 worst case)" where tolerances apply; an overlap reads as one ("overlaps the
			// spine by 0.96 mm", its depth from the report's overlaps), never as a negative gap, and a
			// change to or from an overlap has no number (a gap minus a depth means nothing).
			row.cells.forEach((c, i) => {
				const g = reports[i]?.gaps[face];
				if (g && g.gapMm !== null) c.text = faceGapWords(g, inputs[i].report.overlaps, id);
				const overlapped = (v: number | null) => v !== null && v < -EPS;
				if (overlapped(c.value) || (i > 0 && overlapped(values[0]))) c.delta = null;
			});
			rows.push(row);
		}
	}
	const compartmentIds = [
		...new Set(inputs.flatMap((v) => v.report.compartments.map((c) => c.id)))
	].sort();
	for (const id of compartmentIds) {
		const found = inputs.map((v) => v.report.compartments.find((c) => c.id === id));
		const label = found.find((c) => c)?.label ?? id;
		(['width', 'height', 'depth'] as const).forEach((dim, axis) => {
			rows.push(
				numberRow(
					`room:${id}:${dim}`,
					'compartment',
					`${label} — ${dim}`,
					found.map((c) => c?.sizeMm[axis] ?? null),
					'none',
					mmText
				)
			);
		});
	}
	const mountIds = [
		...new Set(
			inputs.flatMap((v) => v.report.mounts.filter((m) => m.stack.length).map((m) => m.mountId))
		)
	].sort();
	for (const id of mountIds) {
		const found = inputs.map((v) => v.report.mounts.find((m) => m.mountId === id));
		const label = found.find((m) => m)?.label ?? id;
		const ids = [...new Set(found.flatMap((m) => m?.stack.map((s) => s.placementId) ?? []))];
		for (const f of MOUNT_FIGURES) {
			const values = found.map((m) => (m ? f.valueOf(m) : null));
			const statuses = f.withStatus ? found.map((m) => m?.status) : undefined;
			const row = numberRow(
				`mount:${id}:${f.key}`,
				'mount',
				`${label} — ${f.word}`,
				values,
				f.better,
				f.format,
				ids,
				statuses
			);
			rows.push(row);
		}
	}
	rows.push(...loopRows(inputs));
	rows.push(
		numberRow(
			'total:interference',
			'total',
			'Interference volume',
			inputs.map((v) => v.report.totals.interferenceVolumeMm3 / 1000),
			'lower',
			(v) => `${v.toFixed(1)}\u2009cm³`
		)
	);
	// Better is judged on the worst status; the counts are shown but never judged alone (five
	// tight parts becoming four is worse when the fifth now collides).
	rows.push(
		statusRow(
			'total:worst',
			'Worst status',
			inputs.map((v) => STATUS_ORDER.find((s) => v.report.totals.counts[s] > 0) ?? 'clear'),
			[],
			'total'
		)
	);
	for (const s of STATUS_ORDER) {
		rows.push(
			numberRow(
				`total:count:${s}`,
				'total',
				`Parts ${s}`,
				inputs.map((v) => v.report.totals.counts[s]),
				'none',
				(v) => String(v)
			)
		);
	}
	rows.push(
		numberRow(
			'total:heat-spare',
			'total',
			'Radiator capacity minus heat',
			inputs.map((v) => v.report.budgets.heat.capacityW - v.report.budgets.heat.heatW),
			'higher',
			(v) => `${Math.round(v)}\u2009W (estimate)`
		)
	);
	rows.push(
		numberRow(
			'total:power-spare',
			'total',
			'Supply rating minus draw with headroom',
			inputs.map((v) => v.report.budgets.power.ratingW - v.report.budgets.power.requiredW),
			'higher',
			(v) => `${Math.round(v)}\u2009W`
		)
	);
	return rows;
}

/** The coolant loops' totals: tube per kind, fittings, bends, run problems and loop checks. */
function loopRows(inputs: CompareInput[]): DiffRow[] {
	if (!inputs.some((v) => v.report.loops?.length)) return [];
	const runs = inputs.map((v) => (v.report.loops ?? []).flatMap((l) => l.runs));
	const checks = inputs.map((v) => (v.report.loops ?? []).flatMap((l) => l.checks));
	const kinds = [...new Set(runs.flat().map((r) => r.tubeKindId))].sort();
	const rows = kinds.map((kind) =>
		numberRow(
			`loop:tube:${kind}`,
			'loop',
			`Tube ${kind}, cut length`,
			runs.map((list) => {
				const of = list.filter((r) => r.tubeKindId === kind);
				return of.length ? of.reduce((n, r) => n + r.cutLengthMm, 0) : null;
			}),
			'none',
			mmText
		)
	);
	const count = (label: string, key: string, values: number[], better: DiffRow['better']) =>
		numberRow(`loop:${key}`, 'loop', label, values, better, (v) => String(v));
	rows.push(
		count(
			'Fittings on the runs',
			'fittings',
			runs.map((list) =>
				list.reduce((n, r) => n + r.pieces.filter((p) => p.kind === 'fitting').length, 0)
			),
			'none'
		),
		count(
			'Bends',
			'bends',
			runs.map((list) => list.reduce((n, r) => n + r.bends.length, 0)),
			'lower'
		),
		count(
			'Run collisions and blocks',
			'problems',
			runs.map((list) =>
				list.reduce(
					(n, r) =>
						n + r.problems.filter((p) => p.kind === 'collides' || p.kind === 'blocked').length,
					0
				)
			),
			'lower'
		),
		count(
			'Loop checks failed',
			'checks-failed',
			checks.map((list) => list.filter((c) => c.status === 'fail').length),
			'lower'
		),
		count(
			'Loop checks to look at',
			'checks-warn',
			checks.map((list) => list.filter((c) => c.status === 'warn').length),
			'lower'
		)
	);
	return rows;
}

const FACE_LABEL = faceWords('side');

/** "+2.0" / "−20.3": the change against the first variant, in the row's unit. */
export function deltaText(delta: number | null): string {
	if (delta === null || Math.abs(delta) <= EPS) return '';
	return `${delta > 0 ? '+' : '−'}${Math.abs(delta).toFixed(1)}`;
}

/** The difference table as CSV: one column per variant and one change column per later variant. */
export function compareCsv(inputs: CompareInput[], rows: DiffRow[]): string {
	const header = [
		'group',
		'item',
		...inputs.map((v) => v.name),
		...inputs.slice(1).map((v) => `change in ${v.name}`)
	];
	const round = (x: number) => Math.round(x * 1000) / 1000;
	const lines = rows.map((r) => [
		r.group,
		r.label,
		// An overlap is written as words, like on the screen: a negative gap is not a gap.
		...r.cells.map((c) =>
			c.value === null || (r.key.includes(':gap:') && c.value < -EPS) ? c.text : round(c.value)
		),
		...r.cells.slice(1).map((c) => (c.delta === null ? '' : round(c.delta)))
	]);
	return toCsv(header, lines);
}
