/**
 * The route search in a Web Worker, so the editor stays responsive while it runs. One message in
 * (a RouteInput), one answer out (a RouteResult). Start it with `new Worker(new URL(
 * './route-worker.ts', import.meta.url), { type: 'module' })` through `suggestRoute` below;
 * cancelling terminates the worker (the search has no yield points to stop at).
 */
import { findRoute, type RouteInput, type RouteResult } from '$lib/geometry/route';

interface WorkerScope {
	onmessage: ((e: MessageEvent<RouteInput>) => void) | null;
	postMessage(answer: RouteResult): void;
}

// In a worker `self` is the worker's scope; on the main thread this module only exports.
const scope = (typeof self !== 'undefined' ? self : undefined) as unknown as
	WorkerScope | undefined;
if (scope && typeof (globalThis as { document?: unknown }).document === 'undefined') {
	scope.onmessage = (e) => scope.postMessage(findRoute(e.data));
}

/** A search running in its own worker: `result` settles with the answer; `cancel()` stops it. */
export function suggestRoute(input: RouteInput): { result: Promise<RouteResult>; cancel(): void } {
	const worker = new Worker(new URL('./route-worker.ts', import.meta.url), { type: 'module' });
	let settle: (r: RouteResult) => void = () => {};
	const result = new Promise<RouteResult>((resolve, reject) => {
		settle = resolve;
		worker.onmessage = (e: MessageEvent<RouteResult>) => {
			worker.terminate();
			resolve(e.data);
		};
		worker.onerror = (e) => {
			worker.terminate();
			reject(new Error(e.message || 'The route search failed.'));
		};
	});
	worker.postMessage(input);
	return {
		result,
		cancel() {
			worker.terminate();
			settle({ ok: false, reason: 'Cancelled.' });
		}
	};
}
