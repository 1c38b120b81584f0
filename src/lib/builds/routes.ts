/**
 * A route request: a scene and one run between two ports (a coolant tube or a power cable bundle)
 * → the route search's input. Shared by the browser's worker and POST /api/routes so both ask the
 * engine the same question. Millimetres.
 */
import { z } from 'zod';
import { resolveScene, type ResolvedScene, type Scene, type FieldIssue } from '$lib/geometry';
import type { RouteInput } from '$lib/geometry/route';
import { portEnd, routeObstacles } from '$lib/geometry/route-scene';

const id = z.string().min(1).max(120);
const mm = (max: number) => z.number({ error: 'Must be a finite number' }).min(0).max(max);
const positiveMm = (max: number) =>
	z.number({ error: 'Must be a finite number' }).gt(0, 'Must be greater than 0').max(max);

export const routeSectionSchema = z.discriminatedUnion('kind', [
	z.object({ kind: z.literal('round'), outerDiameterMm: positiveMm(100) }),
	z.object({ kind: z.literal('flat'), widthMm: positiveMm(200), thicknessMm: positiveMm(100) })
]);

const endSchema = z.object({
	placementId: id,
	portId: id,
	/** How far the fitting or plug reaches out of the port face along its direction. */
	reachMm: mm(200).default(0)
});

export const routeRunSchema = z.object({
	from: endSchema,
	to: endSchema,
	section: routeSectionSchema,
	bendRadiusMm: mm(1_000),
	clearanceMm: mm(50).default(2),
	/** Fewest bends first by default: one bend costs as much as 100 mm of tube. */
	bendPenaltyMm: mm(10_000).default(100),
	mode: z.enum(['hard', 'soft']).default('hard'),
	maxAlternatives: z.union([z.literal(1), z.literal(2), z.literal(3)]).default(3),
	/** Other runs' boxes to keep clear of (runs already placed). */
	avoid: z
		.array(
			z.object({
				min: z.tuple([z.number(), z.number(), z.number()]),
				max: z.tuple([z.number(), z.number(), z.number()])
			})
		)
		.max(2_000)
		.default([])
});
export type RouteRun = z.infer<typeof routeRunSchema>;

/**
 * The search input for one run in a scene, or the field that is wrong. The run's own fitting and
 * plug room at both ends is not an obstacle: that is where the run starts and ends.
 */
export function routeInputFor(
	scene: Scene,
	run: RouteRun,
	resolved: ResolvedScene = resolveScene(scene),
	prefix = 'run'
): { ok: true; input: RouteInput } | { ok: false; issue: FieldIssue } {
	const ends = (['from', 'to'] as const).map((key) => {
		const e = run[key];
		return portEnd(resolved, e.placementId, e.portId, e.reachMm);
	});
	for (const [i, key] of (['from', 'to'] as const).entries()) {
		if (!ends[i]) {
			const e = run[key];
			const placed = resolved.placements.some((p) => p.placement.id === e.placementId);
			return {
				ok: false,
				issue: placed
					? { path: `${prefix}.${key}.portId`, message: `No port ${e.portId} on ${e.placementId}` }
					: { path: `${prefix}.${key}.placementId`, message: `No placement ${e.placementId}` }
			};
		}
	}
	const obstacles = [
		...routeObstacles(resolved, { skipKeepoutsOf: [run.from.placementId, run.to.placementId] }),
		...run.avoid.map((box, i) => ({ box, id: `avoid[${i}]`, label: 'another run' }))
	].filter((o) => !o.id?.startsWith('wall:'));
	return {
		ok: true,
		input: {
			start: ends[0]!,
			end: ends[1]!,
			bounds: resolved.innerBox,
			obstacles,
			section: run.section,
			clearanceMm: run.clearanceMm,
			bendRadiusMm: run.bendRadiusMm,
			bendPenaltyMm: run.bendPenaltyMm,
			mode: run.mode,
			maxAlternatives: run.maxAlternatives
		}
	};
}

/**
 * A suggested cable's length for the build sheet, in words: the centre-line length plus both
 * plugs' reach, rounded up to the next 10 mm ("24-pin: about 250 mm, behind the board tray").
 */
export function cableLengthWords(
	label: string,
	lengthMm: number,
	plugReachMm: number,
	where?: string
): string {
	const about = Math.ceil((lengthMm + plugReachMm) / 10) * 10;
	return `${label}: about ${about} mm${where ? `, ${where}` : ''}`;
}
