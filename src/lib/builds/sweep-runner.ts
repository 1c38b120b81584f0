/**
 * Runs the engine's sweeps in slices, yielding between them, so a long sweep shows progress and
 * never freezes the page. The numbers are the engine's own; only the scheduling is here.
 */
import {
	allowedPositions,
	controlDef,
	feasibleIntervals,
	sweep,
	sweepGrid,
	type Scene,
	type SweepControl,
	type SweepGridCell,
	type SweepGridResult,
	type SweepPoint,
	type SweepResult
} from '$lib/geometry';

const SLICE = 24;
const pause = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

/** How a caller follows a long sweep: told slices done of the total, and able to abort it. */
type Progress = [onProgress: (done: number, total: number) => void, signal?: AbortSignal];

/**
 * Runs `work` over [0, total) a slice of `size` at a time, telling progress and yielding after
 * each; false when the signal aborted it before the end.
 */
async function inSlices(
	total: number,
	size: number,
	work: (from: number, to: number) => void,
	[onProgress, signal]: Progress
): Promise<boolean> {
	for (let i = 0; i < total; i += size) {
		if (signal?.aborted) return false;
		const to = Math.min(total, i + size);
		work(i, to);
		onProgress(to, total);
		await pause();
	}
	return true;
}

export async function sweepInSlices(
	scene: Scene,
	control: SweepControl,
	...progress: Progress
): Promise<SweepResult | null> {
	const def = controlDef(scene.enclosure, control);
	if (!def) return null;
	const offsets = allowedPositions(def).map((p) => p.offsetMm);
	const points: SweepPoint[] = [];
	const slice = (from: number, to: number) =>
		points.push(...sweep(scene, { control, positions: offsets.slice(from, to) }).points);
	if (!(await inSlices(offsets.length, SLICE, slice, progress))) return null;
	points.sort((a, b) => a.offsetMm - b.offsetMm);
	return { control, points, feasibleIntervals: feasibleIntervals(points) };
}

export async function gridInSlices(
	scene: Scene,
	a: SweepControl,
	b: SweepControl,
	...progress: Progress
): Promise<SweepGridResult | null> {
	const defA = controlDef(scene.enclosure, a);
	const defB = controlDef(scene.enclosure, b);
	if (!defA || !defB) return null;
	const rows = allowedPositions(defA)
		.map((p) => p.offsetMm)
		.sort((p, q) => p - q);
	// Set by the first row (TypeScript does not see the closure assign it).
	let result = null as SweepGridResult | null;
	const cells: SweepGridCell[] = [];
	// A row of the grid a slice.
	const row = (i: number) => {
		const slice = sweepGrid(scene, a, b, { positionsA: [rows[i]] });
		result ??= slice;
		cells.push(...slice.cells);
	};
	if (!(await inSlices(rows.length, 1, row, progress))) return null;
	if (!result) return null;
	const positionsA = allowedPositions(defA).sort((p, q) => p.offsetMm - q.offsetMm);
	return { ...result, positionsA, cells };
}
