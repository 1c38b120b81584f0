/** Dividers, brackets and mounts as the editor holds them, with the helpers its buttons use. */
import {
	SLOT_PITCH_MM,
	type BracketDef,
	type DividerDef,
	type MountDef,
	type Vec3,
	axisIndex
} from '$lib/geometry';

export type Features = { dividers: DividerDef[]; brackets: BracketDef[]; mounts: MountDef[] };

export function parseFeatures(text: string): Features {
	try {
		const v = JSON.parse(text) as Partial<Features>;
		return {
			dividers: Array.isArray(v.dividers) ? v.dividers : [],
			brackets: Array.isArray(v.brackets) ? v.brackets : [],
			mounts: Array.isArray(v.mounts) ? v.mounts : []
		};
	} catch {
		return { dividers: [], brackets: [], mounts: [] };
	}
}

function nextId(prefix: string, taken: { id: string }[]): string {
	let n = taken.length + 1;
	while (taken.some((t) => t.id === `${prefix}-${n}`)) n++;
	return `${prefix}-${n}`;
}

export function allIds(f: Features) {
	return [...f.dividers, ...f.brackets, ...f.mounts];
}

export function newDivider(f: Features, inner: Vec3): DividerDef {
	const mid = Math.round(inner[0] / 2);
	return {
		id: nextId('divider', allIds(f)),
		label: `Divider ${f.dividers.length + 1}`,
		axis: 'x',
		thicknessMm: 2,
		positions: { kind: 'list', options: [{ label: 'middle', offsetMm: mid }] },
		sides: { low: '', high: '' }
	};
}

export function newBracket(f: Features, inner: Vec3): BracketDef {
	return {
		id: nextId('bracket', allIds(f)),
		label: `Bracket ${f.brackets.length + 1}`,
		kind: 'card-support',
		box: { min: [inner[0] - 40, 0, inner[2] / 2], max: [inner[0], 10, inner[2] / 2 + 20] },
		axis: 'y',
		travel: { minMm: 0, maxMm: Math.max(10, Math.round(inner[1] / 3)), stepMm: 10 }
	};
}

export function newMount(f: Features, inner: Vec3): MountDef {
	return {
		id: nextId('mount', allIds(f)),
		label: `Mount ${f.mounts.length + 1}`,
		kind: 'radiator',
		face: 'front',
		region: { min: [0, 0, 0], max: [inner[0], inner[1], 64] },
		accepts: ['240', '280'],
		budgetMm: 64,
		standoffMm: 0,
		slotPitchMm: SLOT_PITCH_MM
	};
}

/**
 * Divider offsets named by how many expansion slots they leave on one side, at the PCI Express
 * CEM slot pitch of 20.32 mm. `high`: the slots are on the high side (offset = inner − thickness −
 * n × pitch); otherwise on the low side (offset = n × pitch).
 */
export function slotPositions(
	divider: Pick<DividerDef, 'axis' | 'thicknessMm'>,
	inner: Vec3,
	counts: number[],
	high: boolean,
	pitchMm = SLOT_PITCH_MM
): { label: string; offsetMm: number }[] {
	const axis = axisIndex(divider.axis);
	return counts
		.filter((n) => Number.isFinite(n) && n > 0)
		.map((n) => {
			const room = n * pitchMm;
			const offset = high ? inner[axis] - divider.thicknessMm - room : room;
			return {
				label: `${n} slot${n === 1 ? '' : 's'}`,
				offsetMm: Math.round(offset * 1000) / 1000
			};
		})
		.filter((p) => p.offsetMm >= 0 && p.offsetMm + divider.thicknessMm <= inner[axis]);
}
