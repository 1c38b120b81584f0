/**
 * What changed between two versions of an enclosure, in words a builder reads before moving a
 * build on: "Outer width 154.0 mm → 160.0 mm", "Spine: positions changed". Pure; runs anywhere.
 */
import { formatMm, PANELS, type EnclosureDef } from '$lib/geometry';
import { PANEL_WORDS } from './schemas';

const AXIS_WORDS = ['width', 'height', 'depth'];

function listChanges<T extends { id: string; label: string }>(
	noun: string,
	before: T[],
	after: T[]
): string[] {
	const out: string[] = [];
	const old = new Map(before.map((x) => [x.id, x]));
	const now = new Map(after.map((x) => [x.id, x]));
	for (const [id, x] of now) {
		const was = old.get(id);
		if (!was) out.push(`${noun} added: ${x.label || id}`);
		else if (JSON.stringify(was) !== JSON.stringify(x)) {
			out.push(`${noun} changed: ${x.label || id}`);
		}
	}
	for (const [id, x] of old) if (!now.has(id)) out.push(`${noun} removed: ${x.label || id}`);
	return out;
}

export function enclosureChanges(before: EnclosureDef, after: EnclosureDef): string[] {
	const out: string[] = [];
	if (before.name !== after.name) out.push(`Renamed to ${after.name}`);
	before.outerMm.forEach((v, i) => {
		if (v !== after.outerMm[i]) {
			out.push(`Outer ${AXIS_WORDS[i]} ${formatMm(v)} → ${formatMm(after.outerMm[i])}`);
		}
	});
	for (const face of PANELS) {
		const a = before.walls[face];
		const b = after.walls[face];
		if (a.thicknessMm !== b.thicknessMm) {
			out.push(
				`${PANEL_WORDS[face]} panel ${formatMm(a.thicknessMm)} → ${formatMm(b.thicknessMm)}`
			);
		}
		if (a.kind !== b.kind) out.push(`${PANEL_WORDS[face]} panel ${a.kind} → ${b.kind}`);
		if (a.offsetMm !== b.offsetMm) {
			out.push(
				`${PANEL_WORDS[face]} panel offset ${formatMm(a.offsetMm)} → ${formatMm(b.offsetMm)}`
			);
		}
	}
	out.push(...listChanges('Divider', before.dividers, after.dividers));
	out.push(...listChanges('Bracket', before.brackets, after.brackets));
	out.push(...listChanges('Mount', before.mounts, after.mounts));
	return out;
}
