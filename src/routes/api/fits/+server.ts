import { json } from '@sveltejs/kit';
import { z } from 'zod';
import {
	SceneError,
	allowedPositions,
	boxSchema,
	partCategorySchema,
	resolveScene,
	sceneSchema,
	type PartDef,
	type Scene
} from '$lib/geometry';
import {
	partsByPositions,
	radiatorCombinations,
	whatFits,
	type FitCandidate,
	type FitSort,
	type FitTarget
} from '$lib/builds/fits';
import { problem, readJson } from '$lib/server/api';
import { catalogAccess } from '$lib/server/catalog/http';
import { refuseCost } from '$lib/server/engine/pool';
import { checkExcess, sceneBoxCount } from '$lib/geometry/cost';
import { getPartsByIds, listPartsForStudio, type PartRecord } from '$lib/server/catalog/parts';
import type { RequestHandler } from './$types';
import { jsonRoute } from '$lib/server/errors';

const id = z.string().min(1).max(120);
const target = z.discriminatedUnion('kind', [
	z.object({ kind: z.literal('mount'), mountId: id }),
	z.object({ kind: z.literal('compartment'), compartmentId: z.string().min(1).max(400) }),
	z.object({ kind: z.literal('space'), box: boxSchema }),
	z.object({ kind: z.literal('replace'), placementId: id })
]);

/** Most candidates one call weighs, and most cells of a parts × positions table. */
const MAX_CANDIDATES = 200;
/** Most candidates a streamed call weighs, and how many go in each line of its answer. */
const MAX_STREAMED = 2_000;
const CHUNK = 100;
const MAX_CELLS = 20_000;
/** Radiators and fans tried for combinations (each pair is placed and checked). */
const MAX_COMBINATION_PARTS = 30;
/** Boxes × candidate placements one call may weigh: the same bound as a sweep's positions × boxes. */
const MAX_BOX_PLACEMENTS = 2_000_000;

const body = z.object({
	scene: sceneSchema,
	target,
	filters: z
		.object({
			category: partCategorySchema.optional(),
			q: z.string().max(200).optional(),
			/** Exactly these parts (the studio's or the standard library's), in place of a search. */
			partIds: z.array(id).max(MAX_CANDIDATES).optional()
		})
		.default({}),
	sort: z.enum(['spare', 'price', 'name']).default('spare'),
	limit: z.number().int().min(1).max(MAX_CANDIDATES).default(50),
	/** Parts × positions: every allowed position of this control. */
	positions: z.object({ kind: z.enum(['divider', 'bracket']), id }).optional(),
	/** Radiator + fan combinations for a radiator or fan mount. */
	combinations: z.boolean().default(false),
	/**
	 * Answer as NDJSON, a line per 100 candidates checked (up to 2,000 from a search), so the
	 * editor shows results as they come; not with positions or combinations.
	 */
	stream: z.boolean().default(false)
});

const candidateOf = (p: PartRecord): FitCandidate => ({
	part: { ...p.def, id: p.id, name: p.name },
	priceMinor: p.priceMinor,
	isStandard: p.isStandard
});

/**
 * A scene and a target (a mount, a compartment, a free-space box, a placed part to replace) → the
 * studio's parts and the standard library ranked by what fits there, each placed by the same
 * rules as "add part" and checked by the engine. Reads only; nothing is stored.
 */
export const POST: RequestHandler = jsonRoute(async (event) => {
	const access = await catalogAccess(event, 'catalog.view');
	const input = await readJson(event.request, body);
	// The same cost limits as /api/check, decided before any work.
	const excess = checkExcess(input.scene);
	if (excess) refuseCost(excess, 'scene');
	let records: PartRecord[];
	if (input.filters.partIds) {
		records = await getPartsByIds(access.studioId, input.filters.partIds);
		const found = new Set(records.map((r) => r.id));
		const missing = input.filters.partIds.findIndex((p) => !found.has(p));
		if (missing >= 0) {
			return problem(400, 'No such part.', [
				{
					path: `filters.partIds[${missing}]`,
					message: `No part with id ${input.filters.partIds[missing]}`
				}
			]);
		}
		const order = new Map(input.filters.partIds.map((p, i) => [p, i]));
		records.sort((a, b) => order.get(a.id)! - order.get(b.id)!);
	} else {
		const limit = input.stream ? MAX_STREAMED : MAX_CANDIDATES;
		records = await listPartsForStudio(access.studioId, {
			q: input.filters.q,
			category: input.filters.category,
			limit,
			maxLimit: limit
		});
	}
	const candidates = records.map(candidateOf);
	if (input.stream) {
		if (input.positions || input.combinations) {
			return problem(400, 'A streamed answer has no positions or combinations.', [
				{ path: 'stream', message: 'Ask for positions and combinations without stream' }
			]);
		}
		return streamed(input.scene, input.target, candidates, input.sort);
	}
	try {
		const resolved = resolveScene(input.scene);
		const found = whatFits(input.scene, input.target, candidates, input.sort, resolved);
		const out: Record<string, unknown> = {
			label: found.label,
			counts: { fits: found.fits.length, left: found.left.length },
			fits: found.fits.slice(0, input.limit),
			left: found.left.slice(0, input.limit)
		};
		// The listed parts' definitions, so the editor can place one without another request.
		const byId = new Map(candidates.map((c) => [c.part.id, c.part]));
		const parts: Record<string, PartDef> = {};
		for (const r of found.fits.slice(0, input.limit)) parts[r.partId] = byId.get(r.partId)!;
		out.parts = parts;
		if (input.positions) {
			const control = input.positions;
			const def =
				control.kind === 'divider'
					? input.scene.enclosure.dividers.find((d) => d.id === control.id)
					: input.scene.enclosure.brackets.find((b) => b.id === control.id);
			if (!def) {
				return problem(400, 'No such control.', [
					{ path: 'positions.id', message: `No ${control.kind} with id ${control.id}` }
				]);
			}
			const picked = candidates.slice(0, input.limit);
			if (allowedPositions(def).length * picked.length > MAX_CELLS) {
				return problem(400, 'Too many cells.', [
					{
						path: 'positions.id',
						message: `${allowedPositions(def).length} positions × ${picked.length} parts is more than ${MAX_CELLS} cells; pick fewer parts`
					}
				]);
			}
			const boxPlacements =
				sceneBoxCount(input.scene) * allowedPositions(def).length * picked.length;
			if (boxPlacements > MAX_BOX_PLACEMENTS) {
				return problem(422, 'Too much work for one call.', [
					{
						path: 'positions.id',
						message: `${boxPlacements} box placements (boxes × positions × parts) is more than ${MAX_BOX_PLACEMENTS}; pick fewer parts`
					}
				]);
			}
			out.partsByPositions = partsByPositions(input.scene, input.target, picked, control);
		}
		if (input.combinations) {
			if (input.target.kind !== 'mount') {
				return problem(400, 'Combinations are for a mount.', [
					{ path: 'target.kind', message: 'Combinations need a radiator or fan mount' }
				]);
			}
			const [rads, fans] = await Promise.all(
				(['radiator', 'fan'] as const).map((category) =>
					listPartsForStudio(access.studioId, { category, limit: MAX_COMBINATION_PARTS })
				)
			);
			const pool = [...rads, ...fans].map(candidateOf);
			const combinations = radiatorCombinations(input.scene, input.target.mountId, pool, resolved);
			for (const c of combinations) {
				for (const p of pool) {
					if (p.part.id === c.radiator.partId || p.part.id === c.fan.partId) {
						parts[p.part.id] = p.part;
					}
				}
			}
			out.combinations = combinations;
		}
		return json(out);
	} catch (e) {
		if (e instanceof SceneError) {
			return problem(400, e.message, [{ path: e.path, message: e.message }]);
		}
		throw e;
	}
});

/**
 * The candidates in chunks of CHUNK, a JSON line each ({ label, fits, left, parts, done, total },
 * rows ranked within the chunk; the client merges them), the event loop let go between chunks so
 * each line leaves as soon as it is ready. The target is checked before the first byte: a bad id
 * is still a 400 naming the field.
 */
function streamed(
	scene: Scene,
	target: FitTarget,
	candidates: FitCandidate[],
	sort: FitSort
): Response {
	let resolved;
	let label: string;
	try {
		resolved = resolveScene(scene);
		label = whatFits(scene, target, [], sort, resolved).label;
	} catch (e) {
		if (e instanceof SceneError) {
			return problem(400, e.message, [{ path: e.path, message: e.message }]);
		}
		throw e;
	}
	const encoder = new TextEncoder();
	let done = 0;
	const stream = new ReadableStream<Uint8Array>({
		async pull(controller) {
			const chunk = candidates.slice(done, done + CHUNK);
			const found = whatFits(scene, target, chunk, sort, resolved);
			done += chunk.length;
			const parts: Record<string, PartDef> = {};
			for (const r of found.fits) parts[r.partId] = chunk.find((c) => c.part.id === r.partId)!.part;
			const line = {
				label,
				fits: found.fits,
				left: found.left,
				parts,
				done,
				total: candidates.length
			};
			controller.enqueue(encoder.encode(`${JSON.stringify(line)}\n`));
			if (done >= candidates.length) controller.close();
			else await new Promise((r) => setTimeout(r, 0));
		}
	});
	return new Response(stream, {
		headers: { 'content-type': 'application/x-ndjson; charset=utf-8', 'cache-control': 'no-store' }
	});
}
