/**
 * Runs the engine's sweeps in slices, yielding between them, so a long sweep shows progress and
 * never freezes the page. The numbers are the engine's own; only the scheduling is here.
 */
import {
	allowedPositions,
	feasibleIntervals,
	sweep,
	sweepGrid,
	type BracketDef,
	type DividerDef,
	type Scene,
	type SweepControl,
	type SweepGridCell,
	type SweepGridResult,
	type SweepPoint,
	type SweepResult
} from '$lib/geometry';

const SLICE = 24;
const pause = () => new Promise<void>((resolve) => setTimeout(resolve, 0));

function defOf(scene: Scene, c: SweepControl): DividerDef | BracketDef | undefined {
	return c.kind === 'divider'
		? scene.enclosure.dividers.find((d) => d.id === c.id)
		: scene.enclosure.brackets.find((b) => b.id === c.id);
}

export async function sweepInSlices(
	scene: Scene,
	control: SweepControl,
	onProgress: (done: number, total: number) => void,
	signal?: AbortSignal
): Promise<SweepResult | null> {
	const def = defOf(scene, control);
	if (!def) return null;
	const offsets = allowedPositions(def).map((p) => p.offsetMm);
	const points: SweepPoint[] = [];
	for (let i = 0; i < offsets.length; i += SLICE) {
		if (signal?.aborted) return null;
		points.push(...sweep(scene, { control, positions: offsets.slice(i, i + SLICE) }).points);
		onProgress(Math.min(offsets.length, i + SLICE), offsets.length);
		await pause();
	}
	points.sort((a, b) => a.offsetMm - b.offsetMm);
	return { control, points, feasibleIntervals: feasibleIntervals(points) };
}

export async function gridInSlices(
	scene: Scene,
	a: SweepControl,
	b: SweepControl,
	onProgress: (done: number, total: number) => void,
	signal?: AbortSignal
): Promise<SweepGridResult | null> {
	const defA = defOf(scene, a);
	const defB = defOf(scene, b);
	if (!defA || !defB) return null;
	const rows = allowedPositions(defA)
		.map((p) => p.offsetMm)
		.sort((p, q) => p - q);
	let result: SweepGridResult | null = null;
	const cells: SweepGridCell[] = [];
	for (let i = 0; i < rows.length; i++) {
		if (signal?.aborted) return null;
		const slice = sweepGrid(scene, a, b, { positionsA: [rows[i]] });
		result ??= slice;
		cells.push(...slice.cells);
		onProgress(i + 1, rows.length);
		await pause();
	}
	if (!result) return null;
	const positionsA = allowedPositions(defA).sort((p, q) => p.offsetMm - q.offsetMm);
	return { ...result, positionsA, cells };
}
