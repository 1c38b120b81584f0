/**
 * Part shapes shared by the browser and the server: the quick one-box entry, category templates
 * for the usual keep-outs and ports, and the bounding size the catalogue sorts by. Part frame:
 * millimetres, X width, Y height, Z depth, origin at the body's min corner.
 */
import { z } from 'zod';
import {
	boundsOf,
	boxSize,
	COORD_LIMIT_MM,
	partCategorySchema,
	type BodyDef,
	type Box,
	type KeepoutDef,
	type PartCategory,
	type PartDef,
	type PortDef,
	type Vec3
} from '$lib/geometry';
import { CATEGORY_LABELS } from '$lib/words/faces';
import { formatMoney } from '$lib/quotes/money';

export { CATEGORY_LABELS };
export const CATEGORIES = partCategorySchema.options;

export const KEEPOUT_KIND_LABELS: Record<KeepoutDef['kind'], string> = {
	fitting: 'Fitting access',
	airflow: 'Airflow',
	cable: 'Connector and cable',
	service: 'Service access'
};

export const PROVENANCES = ['datasheet', 'measured', 'estimate'] as const;
export type Provenance = (typeof PROVENANCES)[number] | 'standard';

/** A size in millimetres as typed into a form: finite, above zero, at most 10 m. */
export const sizeFieldMm = (label: string) =>
	z.coerce
		.number({ error: `${label} must be a number in mm` })
		.refine(Number.isFinite, `${label} must be a number in mm`)
		.gt(0, `${label} must be a positive number in mm`)
		.max(COORD_LIMIT_MM, `${label} must be at most ${COORD_LIMIT_MM} mm (10 m)`);

/** Common practice: room a G 1/4 fitting and the start of its tube need above a port. */
export const FITTING_ROOM_MM = 25;
/** Common practice: free air in front of a fan's intake before it starves. */
export const AIRFLOW_ROOM_MM = 15;
/** Common practice: room for connectors and the first bend of their cables. */
export const CABLE_ROOM_MM = 30;

function box(min: Vec3, max: Vec3): Box {
	return { min, max };
}

function topPorts(w: number, h: number, d: number, count: number): PortDef[] {
	return Array.from({ length: count }, (_, i) => ({
		id: `port-${i + 1}`,
		position: [(w * (i + 1)) / (count + 1), h, d / 2] as Vec3,
		direction: '+y' as const,
		thread: 'G 1/4'
	}));
}

/**
 * The usual keep-outs and ports of a category, for a one-box part of w × h × d. The user resizes
 * them afterwards; the values are common practice, not a standard.
 */
export function categoryTemplate(
	category: PartCategory,
	[w, h, d]: Vec3
): { keepouts: KeepoutDef[]; ports: PortDef[] } {
	const fittingsAbove: KeepoutDef = {
		id: 'fittings',
		label: 'Fittings above the ports',
		kind: 'fitting',
		severity: 'error',
		box: box([0, h, 0], [w, h + FITTING_ROOM_MM, d])
	};
	switch (category) {
		case 'pump':
		case 'pump-reservoir':
		case 'cpu-block':
			return { keepouts: [fittingsAbove], ports: topPorts(w, h, d, 2) };
		case 'reservoir':
			return { keepouts: [fittingsAbove], ports: topPorts(w, h, d, 1) };
		case 'radiator':
			// Length along Y (as the standard library stands radiators), ports on the top end tank.
			return {
				keepouts: [{ ...fittingsAbove, label: 'Fittings at the port end' }],
				ports: topPorts(w, h, d, 2)
			};
		case 'fan':
			return {
				keepouts: [
					{
						id: 'airflow',
						label: 'Airflow in front of the fan',
						kind: 'airflow',
						severity: 'warning',
						box: box([0, 0, -AIRFLOW_ROOM_MM], [w, h, 0])
					}
				],
				ports: []
			};
		case 'psu':
			return {
				keepouts: [
					{
						id: 'cables',
						label: 'Connector side',
						kind: 'cable',
						severity: 'error',
						box: box([0, 0, d], [w, h, d + CABLE_ROOM_MM])
					}
				],
				ports: []
			};
		case 'gpu':
			return {
				keepouts: [
					{
						id: 'power-cables',
						label: 'Power connector and cable bend',
						kind: 'cable',
						severity: 'warning',
						box: box([0, h, 0], [w, h + CABLE_ROOM_MM, d])
					}
				],
				ports: []
			};
		default:
			return { keepouts: [], ports: [] };
	}
}

export function oneBody([w, h, d]: Vec3): BodyDef[] {
	return [{ id: 'body', label: 'Body', box: box([0, 0, 0], [w, h, d]) }];
}

/** Bounding size of the bodies (keep-outs excluded): the width × height × depth shown in tables. */
export function bodySizeMm(part: Pick<PartDef, 'bodies'>): Vec3 {
	return boxSize(boundsOf(part.bodies.map((b) => b.box)));
}

/** True when a part is one body whose box starts at the origin: its size says everything. */
export function isOneBox(part: Pick<PartDef, 'bodies'>): boolean {
	if (part.bodies.length !== 1) {
		return false;
	}
	const { min } = part.bodies[0].box;
	return min[0] === 0 && min[1] === 0 && min[2] === 0;
}

/** `120.0 × 120.0 × 25.0 mm`: one decimal, thin space before the unit. */
export function formatSize([w, h, d]: Vec3): string {
	return `${w.toFixed(1)} × ${h.toFixed(1)} × ${d.toFixed(1)}\u2009mm`;
}

/** Price in minor units (cents) → `€12.50`, through the one money formatter; none → `—`. */
export function formatPrice(minor: number | null, currency: string): string {
	return minor === null ? '—' : formatMoney(minor, currency);
}
