/** Plain words and numbers for clearance-table figures: one decimal and a thin space, "63.0 mm". */
import type { RoomFigure } from '$lib/geometry/room';

export const mm1 = (v: number) => `${v.toFixed(1)}\u2009mm`;

export function figureValue(f: RoomFigure): string {
	if (f.sizeMm) return `${f.sizeMm.map((v) => v.toFixed(1)).join(' × ')}\u2009mm`;
	if (f.valueMm === null) return 'no room';
	if (f.slots !== undefined) {
		return `${f.slots} slot${f.slots === 1 ? '' : 's'} (${mm1(f.valueMm)})`;
	}
	return mm1(f.valueMm);
}
