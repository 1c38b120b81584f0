/**
 * Allowed positions of dividers and brackets. A divider's offset is where its low face sits along
 * its axis, from the inner origin; a bracket's offset is how far its box has slid along its axis
 * from where it is defined (offset 0).
 */

import { EPSILON_MM } from './box';
import type { BracketDef, DividerDef, EnclosureDef } from './schema';

/** Longest list of positions a range may expand to; keeps sweeps and forms bounded. */
export const MAX_POSITIONS = 10_000;

export interface AllowedPosition {
	label: string;
	offsetMm: number;
}

/** `63.0 mm`: one decimal (two when the value needs them), a thin space before the unit. */
export function formatMm(valueMm: number): string {
	const oneDecimal = Math.round(valueMm * 10) / 10;
	const digits = Math.abs(oneDecimal - valueMm) > EPSILON_MM ? 2 : 1;
	return `${valueMm.toFixed(digits)}\u2009mm`;
}

interface RangeSpec {
	minMm: number;
	maxMm: number;
	stepMm: number;
}

/** Number of steps in a range, counting both ends; tolerant of the rounding in (max − min) / step. */
export function rangeCount(range: RangeSpec): number {
	if (!(range.stepMm > 0) || range.maxMm < range.minMm - EPSILON_MM) {
		return 0;
	}
	return Math.floor((range.maxMm - range.minMm + EPSILON_MM) / range.stepMm) + 1;
}

function rangePositions(range: RangeSpec): AllowedPosition[] {
	const count = Math.min(rangeCount(range), MAX_POSITIONS);
	const out: AllowedPosition[] = [];
	for (let k = 0; k < count; k++) {
		const offsetMm = range.minMm + k * range.stepMm;
		out.push({ label: formatMm(offsetMm), offsetMm });
	}
	return out;
}

/** The divider or bracket a control names by kind and id, or undefined when there is none. */
export function controlDef(
	enclosure: EnclosureDef,
	control: { kind: 'divider' | 'bracket'; id: string }
): DividerDef | BracketDef | undefined {
	return control.kind === 'divider'
		? enclosure.dividers.find((d) => d.id === control.id)
		: enclosure.brackets.find((b) => b.id === control.id);
}

/** Every position a divider or bracket may take, in the order the definition gives them. */
export function allowedPositions(def: DividerDef | BracketDef): AllowedPosition[] {
	if ('travel' in def) {
		return rangePositions(def.travel);
	}
	if (def.positions.kind === 'list') {
		return def.positions.options.map((o) => ({ label: o.label, offsetMm: o.offsetMm }));
	}
	return rangePositions(def.positions);
}

/**
 * Index of `offsetMm` among the allowed positions, or -1. A match is within EPSILON_MM: the engine
 * never snaps a nearby value to the closest allowed one.
 */
export function allowedIndex(def: DividerDef | BracketDef, offsetMm: number): number {
	const range =
		'travel' in def ? def.travel : def.positions.kind === 'range' ? def.positions : null;
	if (range) {
		const k = Math.round((offsetMm - range.minMm) / range.stepMm);
		if (k < 0 || k >= Math.min(rangeCount(range), MAX_POSITIONS)) {
			return -1;
		}
		return Math.abs(range.minMm + k * range.stepMm - offsetMm) <= EPSILON_MM ? k : -1;
	}
	const options = (def as DividerDef & { positions: { kind: 'list' } }).positions.options;
	return options.findIndex((o) => Math.abs(o.offsetMm - offsetMm) <= EPSILON_MM);
}

/** The position a scene uses when it names none: the first allowed one. */
export function defaultOffset(def: DividerDef | BracketDef): number {
	const first = allowedPositions(def)[0];
	return first ? first.offsetMm : 0;
}
