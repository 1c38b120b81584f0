/**
 * Heavy engine work off the request thread: checks and sweeps run in a small pool of worker
 * threads (piscina) under a time budget, so one costly request never stalls the others. The cost
 * limits (src/lib/geometry/cost.ts) are applied before anything is queued, so what reaches the pool
 * is bounded; the budget is the backstop for a machine slower than expected.
 */
import { ServiceError } from '../errors';
import { availableParallelism } from 'node:os';
import { Piscina } from 'piscina';
import {
	MAX_CHECK_BOXES,
	SceneError,
	checkExcess,
	checkScene,
	resolveScene,
	sceneBoxCount,
	sceneCost,
	sceneExcess,
	sweepExcess,
	type CostExcess,
	type FieldIssue,
	type FitReport,
	type Scene,
	type SweepGridResult,
	type SweepResult
} from '$lib/geometry';
import { MAX_ROUTE_EXPANSIONS, routeExcess } from '$lib/geometry/cost';
import type { RouteInput, RouteResult } from '$lib/geometry/route';
// Types only: a value import would fold the worker into this chunk and change its import.meta.url.
import type { EngineAnswer, EngineTask } from './worker';

/** Wall time one task may take (ms); the heaviest scene the limits allow takes well under 1 s here. */
export const TIME_BUDGET_MS = Number(process.env.ENGINE_TIME_BUDGET_MS) || 15_000;
/** Tasks waiting beyond the running ones before new ones are refused as busy. */
const MAX_QUEUE = 64;

let pool: Piscina<EngineTask, EngineAnswer> | undefined;

/**
 * The worker module names its own file: a dynamic import makes it its own chunk in the build (and
 * adapter-node keeps it), so its `import.meta.url` is the built file; in development (vite dev,
 * Vitest) it is the TypeScript source, which the worker thread loads through tsx.
 */
async function enginePool() {
	if (pool) return pool;
	const worker = await import('./worker');
	// Naming the task function here also keeps bundlers from dropping it as unused.
	if (typeof worker.default !== 'function') {
		throw new Error('The engine worker has no task function.');
	}
	const workerUrl = worker.workerUrl;
	// One worker a spare core, at least one: the request thread keeps a core for answering pages.
	const threads =
		Number(process.env.ENGINE_THREADS) || Math.max(1, Math.min(4, availableParallelism() - 1));
	pool ??= new Piscina<EngineTask, EngineAnswer>({
		filename: workerUrl,
		execArgv: workerUrl.endsWith('.ts') ? ['--import', 'tsx'] : [],
		minThreads: 1,
		maxThreads: threads,
		maxQueue: MAX_QUEUE,
		idleTimeout: 60_000
	});
	return pool;
}

/** Ends the workers (tests, shutdown). */
export async function closeEnginePool() {
	const p = pool;
	pool = undefined;
	await p?.destroy();
}

/** Refuses with 422 ('over-limit') naming the limit and the field; nothing was computed. */
export function refuseCost(excess: CostExcess, prefix = ''): never {
	const issue: FieldIssue = {
		path: prefix ? `${prefix}.${excess.path}` : excess.path,
		message: excess.message
	};
	throw new ServiceError('over-limit', excess.message, {
		issues: [issue],
		detail: { limit: excess.limit, max: excess.max }
	});
}

/** The scene's cost limit it goes over, as a field issue for forms and saves, or null. */
export function costIssue(
	scene: Scene,
	path = 'placements'
): (FieldIssue & { excess: CostExcess }) | null {
	const excess = checkExcess(scene, path);
	return excess ? { path: excess.path, message: excess.message, excess } : null;
}

/** Rows a sweep answers per position: itself, each gap asked for, each compartment (as placed now). */
function rowsPerPoint(task: { scene: Scene; gaps?: unknown[] }) {
	return 1 + (task.gaps?.length ?? 0) + resolveScene(task.scene).compartments.length;
}

async function run(task: EngineTask): Promise<EngineAnswer> {
	try {
		return await (await enginePool()).run(task, { signal: AbortSignal.timeout(TIME_BUDGET_MS) });
	} catch (e) {
		const name = (e as Error)?.name;
		if (name === 'AbortError' || name === 'TimeoutError') {
			throw new ServiceError(
				'busy',
				`The check took longer than its ${TIME_BUDGET_MS / 1000} s budget and was stopped.`
			);
		}
		if (/queue is at limit/i.test(String((e as Error)?.message))) {
			throw new ServiceError('busy', 'The fit engine is busy. Try again in a moment.');
		}
		throw e;
	}
}

function valueOf<T>(answer: EngineAnswer, prefix: string): T {
	if (answer.ok) return answer.value as T;
	const path = prefix ? `${prefix}.${answer.path}` : answer.path;
	throw new ServiceError('invalid', answer.message, {
		issues: [{ path, message: answer.message }]
	});
}

/**
 * Checks this cheap run on the request thread: a few milliseconds at most (the 100-part benchmark
 * scene, about 300 boxes and a few thousand candidate pairs, takes under 2 ms), less than the
 * round trip to a worker costs in copying. Everything above goes to the pool.
 */
const INLINE_MAX_BOXES = 400;
const INLINE_MAX_PAIRS = 10_000;

function inline(scene: Scene): EngineAnswer {
	try {
		return { ok: true, value: checkScene(scene) };
	} catch (e) {
		if (e instanceof SceneError) return { ok: false, path: e.path, message: e.message };
		throw e;
	}
}

/**
 * The fit report of a parsed scene, refused with 422 when it is over a cost limit (`prefix` puts
 * the field under the request's own name, like `settings`); computed on the request thread when
 * it is cheap, in a worker otherwise.
 */
export async function checkInPool(scene: Scene, prefix = ''): Promise<FitReport> {
	const boxes = sceneBoxCount(scene);
	const cost =
		boxes > MAX_CHECK_BOXES ? { boxes, candidatePairs: 0, overlapPairsBound: 0 } : sceneCost(scene);
	const excess = sceneExcess(cost);
	if (excess) refuseCost(excess, prefix);
	if (cost.boxes <= INLINE_MAX_BOXES && cost.candidatePairs <= INLINE_MAX_PAIRS) {
		return valueOf<FitReport>(inline(scene), prefix);
	}
	return valueOf<FitReport>(await run({ kind: 'check', scene }), prefix);
}

/**
 * Refuses a sweep or grid task over the limits: the scene's own check limits first, then the sweep's
 * (a limit on the scene's boxes or pairs is reported at `prefix`, the others at the request).
 */
function refuseSweepOverLimits(
	task: Extract<EngineTask, { kind: 'sweep' | 'grid' }>,
	points: number,
	path: string,
	prefix: string
) {
	const excess =
		checkExcess(task.scene) ??
		sweepExcess({
			boxes: sceneBoxCount(task.scene),
			points,
			grid: task.kind === 'grid',
			path,
			rowsPerPoint: rowsPerPoint(task)
		});
	if (excess) {
		refuseCost(excess, excess.limit === 'boxes' || excess.limit === 'candidatePairs' ? prefix : '');
	}
}

/** A sweep of one control over `points` positions, refused over the limits, else in a worker. */
export async function sweepInPool(
	task: Extract<EngineTask, { kind: 'sweep' }>,
	points: number,
	prefix = 'scene'
): Promise<SweepResult> {
	refuseSweepOverLimits(task, points, task.positions ? 'positions' : 'control', prefix);
	return valueOf<SweepResult>(await run(task), '');
}

/** A grid sweep of two controls (`cells` = rows × columns), refused over the limits, else in a worker. */
export async function gridInPool(
	task: Extract<EngineTask, { kind: 'grid' }>,
	cells: number,
	prefix = 'scene'
): Promise<SweepGridResult> {
	refuseSweepOverLimits(task, cells, 'controlB', prefix);
	return valueOf<SweepGridResult>(await run(task), '');
}

/**
 * Route suggestions for one run, always in a worker: a search is bounded by its expansions
 * (MAX_ROUTE_EXPANSIONS, a few seconds at most here) but is too long for the request thread.
 */
export async function routeInPool(input: RouteInput, path = 'run.avoid'): Promise<RouteResult> {
	const excess = routeExcess(input.obstacles.length, path);
	if (excess) refuseCost(excess);
	const task = { kind: 'route' as const, input: { ...input, maxExpansions: MAX_ROUTE_EXPANSIONS } };
	return valueOf<RouteResult>(await run(task), '');
}
