/**
 * The route search in a Web Worker, so the editor stays responsive while it runs. One message in
 * (one run's RouteInput, or several runs to route one after another), progress and one answer
 * out. Start it through `suggestRoute` / `suggestRoutes` below; cancelling terminates the worker
 * (the search has no yield points to stop at).
 */
import {
	findRoute,
	routeEach,
	routeMany,
	type ManyRun,
	type RouteInput,
	type RouteResult
} from '$lib/geometry/route';

type Shared = Omit<RouteInput, 'start' | 'end' | 'section' | 'bendRadiusMm' | 'mode'>;
type Request =
	| { kind: 'one'; input: RouteInput }
	| { kind: 'many'; runs: ManyRun[]; shared: Shared; each: boolean };
export type ManyAnswer = { order: string[]; results: Record<string, RouteResult> };
type Reply =
	| { kind: 'progress'; done: number; total: number }
	| { kind: 'one'; answer: RouteResult }
	| { kind: 'many'; answer: ManyAnswer };

interface WorkerScope {
	onmessage: ((e: MessageEvent<Request>) => void) | null;
	postMessage(reply: Reply): void;
}

// In a worker `self` is the worker's scope; on the main thread this module only exports.
const scope = (typeof self !== 'undefined' ? self : undefined) as unknown as
	WorkerScope | undefined;
if (scope && typeof (globalThis as { document?: unknown }).document === 'undefined') {
	scope.onmessage = (e) => {
		const req = e.data;
		if (req.kind === 'one') {
			scope.postMessage({ kind: 'one', answer: findRoute(req.input) });
		} else {
			const route = req.each ? routeEach : routeMany;
			const answer = route(req.runs, req.shared, (done, total) =>
				scope.postMessage({ kind: 'progress', done, total })
			);
			scope.postMessage({ kind: 'many', answer });
		}
	};
}

/** A search running in its own worker: `result` settles with the answer; `cancel()` stops it. */
function start<T>(
	req: Request,
	cancelled: T,
	onProgress?: (done: number, total: number) => void
): { result: Promise<T>; cancel(): void } {
	const worker = new Worker(new URL('./route-worker.ts', import.meta.url), { type: 'module' });
	let settle: (r: T) => void = () => {};
	const result = new Promise<T>((resolve, reject) => {
		settle = resolve;
		worker.onmessage = (e: MessageEvent<Reply>) => {
			const reply = e.data;
			if (reply.kind === 'progress') {
				onProgress?.(reply.done, reply.total);
				return;
			}
			worker.terminate();
			resolve(reply.answer as T);
		};
		worker.onerror = (e) => {
			worker.terminate();
			reject(new Error(e.message || 'The route search failed.'));
		};
	});
	// Svelte state proxies do not clone: send plain data.
	worker.postMessage(JSON.parse(JSON.stringify(req)));
	return {
		result,
		cancel() {
			worker.terminate();
			settle(cancelled);
		}
	};
}

/** One run's routes (up to its maxAlternatives), in a worker. */
export function suggestRoute(input: RouteInput): { result: Promise<RouteResult>; cancel(): void } {
	return start<RouteResult>({ kind: 'one', input }, { ok: false, reason: 'Cancelled.' });
}

/**
 * Several runs in a worker: hardest first, each clear of the ones before (routeMany); or with
 * `each`, every one on its own (routeEach: cable bundles may lie together).
 */
export function suggestRoutes(
	runs: ManyRun[],
	shared: Shared,
	onProgress?: (done: number, total: number) => void,
	each = false
): { result: Promise<ManyAnswer | null>; cancel(): void } {
	return start<ManyAnswer | null>({ kind: 'many', runs, shared, each }, null, onProgress);
}
