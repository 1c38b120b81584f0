/**
 * What changed between two versions of a variant, in words for the client: positions moved, parts
 * added, removed, moved or turned, and fit items whose status changed. The fit part comes from the
 * compare view's own difference engine (compareVariants), so both say the same thing.
 */
import {
	allowedPositions,
	formatMm,
	type EnclosureDef,
	type FitReport,
	type PartDef
} from '$lib/geometry';
import { compareVariants } from './compare';
import type { VariantSettings } from './settings';

export type VersionSide = { settings: VariantSettings; report: FitReport };

const AXIS_WAYS: [string, string][] = [
	['left', 'right'],
	['down', 'up'],
	['to the front', 'to the back']
];
const EPS = 1e-6;

/** "3 slots (86.0 mm)" for a named list position, else just the millimetres. */
function positionWords(def: Parameters<typeof allowedPositions>[0], offsetMm: number): string {
	const named =
		'positions' in def && def.positions.kind === 'list'
			? allowedPositions(def).find((p) => Math.abs(p.offsetMm - offsetMm) <= EPS)
			: undefined;
	return named && named.label !== formatMm(offsetMm)
		? `${named.label} (${formatMm(offsetMm)})`
		: formatMm(offsetMm);
}

/** Sentences, most telling first: controls, then parts, then fit. Empty when nothing changed. */
export function versionChanges(
	enclosure: EnclosureDef,
	parts: readonly PartDef[],
	before: VersionSide,
	after: VersionSide
): string[] {
	const out: string[] = [];
	for (const d of enclosure.dividers) {
		const a = before.settings.dividerPositions[d.id];
		const b = after.settings.dividerPositions[d.id];
		if (a !== undefined && b !== undefined && Math.abs(a - b) > EPS) {
			out.push(`${d.label} moved from ${positionWords(d, a)} to ${positionWords(d, b)}.`);
		}
	}
	for (const br of enclosure.brackets) {
		const a = before.settings.bracketOffsets[br.id];
		const b = after.settings.bracketOffsets[br.id];
		if (a !== undefined && b !== undefined && Math.abs(a - b) > EPS) {
			out.push(`${br.label} moved from ${formatMm(a)} to ${formatMm(b)}.`);
		}
	}
	if (Math.abs(before.settings.marginMm - after.settings.marginMm) > EPS) {
		out.push(
			`The clearance asked for changed from ${formatMm(before.settings.marginMm)} to ${formatMm(after.settings.marginMm)}.`
		);
	}

	const nameOf = (partId: string) => parts.find((p) => p.id === partId)?.name ?? 'A part';
	const beforeById = new Map(before.settings.placements.map((p) => [p.id, p]));
	const afterById = new Map(after.settings.placements.map((p) => [p.id, p]));
	for (const p of after.settings.placements) {
		if (!beforeById.has(p.id)) out.push(`Added: ${nameOf(p.partId)}.`);
	}
	for (const p of before.settings.placements) {
		if (!afterById.has(p.id)) out.push(`Removed: ${nameOf(p.partId)}.`);
	}
	for (const p of after.settings.placements) {
		const was = beforeById.get(p.id);
		if (!was) continue;
		if (was.partId !== p.partId) {
			out.push(`${nameOf(was.partId)} was replaced by ${nameOf(p.partId)}.`);
			continue;
		}
		const moves = [0, 1, 2]
			.map((a) => ({ a, d: p.position[a] - was.position[a] }))
			.filter(({ d }) => Math.abs(d) > EPS)
			.map(({ a, d }) => `${formatMm(Math.abs(d))} ${AXIS_WAYS[a][d > 0 ? 1 : 0]}`);
		const turned = (['x', 'y', 'z'] as const).some(
			(k) => (((was.rotation[k] - p.rotation[k]) % 4) + 4) % 4 !== 0
		);
		if (moves.length || turned) {
			out.push(
				`${nameOf(p.partId)} ${[moves.length ? `moved ${moves.join(', ')}` : '', turned ? 'turned' : ''].filter(Boolean).join(' and ')}.`
			);
		}
	}

	// Fit: the compare engine's rows between the two reports; statuses and the interference total.
	const rows = compareVariants([
		{ id: 'before', name: 'before', report: before.report, marginMm: before.settings.marginMm },
		{ id: 'after', name: 'after', report: after.report, marginMm: after.settings.marginMm }
	]);
	for (const r of rows) {
		if (!r.differs) continue;
		if (r.key.endsWith(':status')) {
			const [was, now] = r.cells.map((c) => c.status);
			// Added and removed parts are said above already.
			if (was && now) out.push(`${r.label.replace(/ — status$/, '')}: now ${now} (was ${was}).`);
		} else if (r.key === 'total:interference') {
			out.push(`Interference: now ${r.cells[1].text} (was ${r.cells[0].text}).`);
		}
	}
	return out;
}
