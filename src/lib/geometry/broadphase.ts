/**
 * Broadphase: which boxes share a positive volume. A uniform grid on typed arrays: each box is
 * filed under every cell it touches, pairs are tested only within a cell, and a pair is reported
 * only by the cell holding the low corner of its overlap, so each pair comes out once without a
 * hash set. Cells are sized from the mean box size, so a layout of similar boxes puts a handful of
 * boxes in each cell; boxes that would cover too many cells (walls, a long shelf) are tested
 * against everything directly instead.
 */

import { EPSILON_MM } from './box';
import type { Box } from './schema';

/** Six numbers per box: minX, minY, minZ, maxX, maxY, maxZ. */
export function flattenBoxes(boxes: readonly Box[]): Float64Array {
	const flat = new Float64Array(boxes.length * 6);
	for (let i = 0; i < boxes.length; i++) {
		const { min, max } = boxes[i];
		const o = i * 6;
		flat[o] = min[0];
		flat[o + 1] = min[1];
		flat[o + 2] = min[2];
		flat[o + 3] = max[0];
		flat[o + 4] = max[1];
		flat[o + 5] = max[2];
	}
	return flat;
}

/** Grows as pairs are found; `data[2k], data[2k + 1]` is the k-th pair. */
class PairBuffer {
	data = new Int32Array(256);
	count = 0;

	push(i: number, j: number): void {
		if (this.count * 2 + 2 > this.data.length) {
			const next = new Int32Array(this.data.length * 2);
			next.set(this.data);
			this.data = next;
		}
		if (i < j) {
			this.data[this.count * 2] = i;
			this.data[this.count * 2 + 1] = j;
		} else {
			this.data[this.count * 2] = j;
			this.data[this.count * 2 + 1] = i;
		}
		this.count++;
	}
}

/** Boxes i and j of a flat list (six numbers a box) share volume: more than EPSILON_MM on every axis. */
export function overlapsFlat(f: ArrayLike<number>, i: number, j: number): boolean {
	const a = i * 6;
	const b = j * 6;
	return (
		Math.min(f[a + 3], f[b + 3]) - Math.max(f[a], f[b]) > EPSILON_MM &&
		Math.min(f[a + 4], f[b + 4]) - Math.max(f[a + 1], f[b + 1]) > EPSILON_MM &&
		Math.min(f[a + 5], f[b + 5]) - Math.max(f[a + 2], f[b + 2]) > EPSILON_MM
	);
}

function bruteForce(f: Float64Array, n: number, out: PairBuffer): void {
	for (let i = 0; i < n; i++) {
		for (let j = i + 1; j < n; j++) {
			if (overlapsFlat(f, i, j)) {
				out.push(i, j);
			}
		}
	}
}

/** Below this many boxes the grid costs more than it saves. */
const BRUTE_FORCE_BELOW = 64;
/** A box covering more cells than this is tested against all boxes instead. */
const MAX_CELLS_PER_BOX = 64;

interface Grid {
	origin: [number, number, number];
	inv: [number, number, number];
	dims: [number, number, number];
}

function planGrid(f: Float64Array, n: number): Grid {
	const lo = [Infinity, Infinity, Infinity];
	const hi = [-Infinity, -Infinity, -Infinity];
	const mean = [0, 0, 0];
	for (let i = 0; i < n; i++) {
		const o = i * 6;
		for (let a = 0; a < 3; a++) {
			const min = f[o + a];
			const max = f[o + 3 + a];
			if (min < lo[a]) lo[a] = min;
			if (max > hi[a]) hi[a] = max;
			mean[a] += max - min;
		}
	}
	const dims: [number, number, number] = [1, 1, 1];
	const inv: [number, number, number] = [0, 0, 0];
	// Cells about the mean box size; never more cells than ~2n so memory stays linear.
	let scale = 1;
	for (;;) {
		for (let a = 0; a < 3; a++) {
			const extent = hi[a] - lo[a];
			const cell = Math.max((mean[a] / n) * scale, extent / 1024, 1e-9);
			dims[a] = Math.max(1, Math.min(1024, Math.ceil(extent / cell)));
		}
		if (dims[0] * dims[1] * dims[2] <= 2 * n + 8) {
			break;
		}
		scale *= 1.25;
	}
	for (let a = 0; a < 3; a++) {
		const extent = hi[a] - lo[a];
		inv[a] = extent > 0 ? dims[a] / extent : 0;
	}
	return { origin: [lo[0], lo[1], lo[2]], inv, dims };
}

function clampCell(c: number, max: number): number {
	return c < 0 ? 0 : c > max ? max : c;
}

/**
 * Pairs (i < j) of boxes in `flat` (six numbers a box) that share more than EPSILON_MM on every
 * axis, as `[i0, j0, i1, j1, …]` in `pairs` up to `count`. Order follows the grid, the same for the
 * same input.
 */
export function overlappingPairsFlat(
	flat: Float64Array,
	n: number
): { pairs: Int32Array; count: number } {
	const out = new PairBuffer();
	if (n < BRUTE_FORCE_BELOW) {
		bruteForce(flat, n, out);
		return { pairs: out.data, count: out.count };
	}
	const grid = planGrid(flat, n);
	const [dx, dy, dz] = grid.dims;
	const cellCount = dx * dy * dz;
	// Cell range of every box, and which boxes are too big for the grid.
	const range = new Int32Array(n * 6);
	const big: number[] = [];
	const isBig = new Uint8Array(n);
	const counts = new Int32Array(cellCount + 1);
	const [ox, oy, oz] = grid.origin;
	const [ix, iy, iz] = grid.inv;
	const mx = dx - 1;
	const my = dy - 1;
	const mz = dz - 1;
	for (let i = 0; i < n; i++) {
		const o = i * 6;
		const x0 = clampCell(Math.floor((flat[o] - ox) * ix), mx);
		const y0 = clampCell(Math.floor((flat[o + 1] - oy) * iy), my);
		const z0 = clampCell(Math.floor((flat[o + 2] - oz) * iz), mz);
		const x1 = clampCell(Math.floor((flat[o + 3] - ox) * ix), mx);
		const y1 = clampCell(Math.floor((flat[o + 4] - oy) * iy), my);
		const z1 = clampCell(Math.floor((flat[o + 5] - oz) * iz), mz);
		range[o] = x0;
		range[o + 1] = y0;
		range[o + 2] = z0;
		range[o + 3] = x1;
		range[o + 4] = y1;
		range[o + 5] = z1;
		if ((x1 - x0 + 1) * (y1 - y0 + 1) * (z1 - z0 + 1) > MAX_CELLS_PER_BOX) {
			isBig[i] = 1;
			big.push(i);
			continue;
		}
		for (let z = z0; z <= z1; z++) {
			for (let y = y0; y <= y1; y++) {
				const row = (z * dy + y) * dx;
				for (let x = x0; x <= x1; x++) {
					counts[row + x + 1]++;
				}
			}
		}
	}
	for (let c = 0; c < cellCount; c++) {
		counts[c + 1] += counts[c];
	}
	const fill = counts.slice(0, cellCount);
	const members = new Int32Array(counts[cellCount]);
	for (let i = 0; i < n; i++) {
		if (isBig[i]) {
			continue;
		}
		const o = i * 6;
		for (let z = range[o + 2]; z <= range[o + 5]; z++) {
			for (let y = range[o + 1]; y <= range[o + 4]; y++) {
				const row = (z * dy + y) * dx;
				for (let x = range[o]; x <= range[o + 3]; x++) {
					members[fill[row + x]++] = i;
				}
			}
		}
	}
	for (let z = 0; z < dz; z++) {
		for (let y = 0; y < dy; y++) {
			for (let x = 0; x < dx; x++) {
				const cell = (z * dy + y) * dx + x;
				const start = counts[cell];
				const end = counts[cell + 1];
				for (let p = start; p < end; p++) {
					const i = members[p];
					// boxAt: where box i's six numbers (min xyz, max xyz) start in flat.
					const boxAt = i * 6;
					const ax0 = flat[boxAt];
					const ay0 = flat[boxAt + 1];
					const az0 = flat[boxAt + 2];
					const ax1 = flat[boxAt + 3];
					const ay1 = flat[boxAt + 4];
					const az1 = flat[boxAt + 5];
					const rx = range[boxAt];
					const ry = range[boxAt + 1];
					const rz = range[boxAt + 2];
					for (let q = p + 1; q < end; q++) {
						const j = members[q];
						const oj = j * 6;
						if (
							Math.min(ax1, flat[oj + 3]) - Math.max(ax0, flat[oj]) > EPSILON_MM &&
							Math.min(ay1, flat[oj + 4]) - Math.max(ay0, flat[oj + 1]) > EPSILON_MM &&
							Math.min(az1, flat[oj + 5]) - Math.max(az0, flat[oj + 2]) > EPSILON_MM &&
							// The cell holding the overlap's low corner reports the pair; others skip it.
							(rx > range[oj] ? rx : range[oj]) === x &&
							(ry > range[oj + 1] ? ry : range[oj + 1]) === y &&
							(rz > range[oj + 2] ? rz : range[oj + 2]) === z
						) {
							out.push(i, j);
						}
					}
				}
			}
		}
	}
	for (let b = 0; b < big.length; b++) {
		const i = big[b];
		for (let j = 0; j < n; j++) {
			if (j !== i && (!isBig[j] || j > i) && overlapsFlat(flat, i, j)) {
				out.push(i, j);
			}
		}
	}
	return { pairs: out.data, count: out.count };
}

/** Index pairs (i < j) of boxes that share a positive volume; touching faces are not a pair. */
export function overlappingPairs(boxes: readonly Box[]): [number, number][] {
	const { pairs, count } = overlappingPairsFlat(flattenBoxes(boxes), boxes.length);
	const out: [number, number][] = new Array(count);
	for (let k = 0; k < count; k++) {
		out[k] = [pairs[2 * k], pairs[2 * k + 1]];
	}
	return out;
}

/**
 * Overlapping pairs with their overlap volumes (mm³), straight from typed arrays: what the
 * interference markers and the benchmark need without building a Box per pair.
 */
export function overlapVolumes(boxes: readonly Box[]): {
	pairs: Int32Array;
	volumesMm3: Float64Array;
	count: number;
} {
	const flat = flattenBoxes(boxes);
	const { pairs, count } = overlappingPairsFlat(flat, boxes.length);
	const volumesMm3 = new Float64Array(count);
	for (let k = 0; k < count; k++) {
		const a = pairs[2 * k] * 6;
		const b = pairs[2 * k + 1] * 6;
		volumesMm3[k] =
			(Math.min(flat[a + 3], flat[b + 3]) - Math.max(flat[a], flat[b])) *
			(Math.min(flat[a + 4], flat[b + 4]) - Math.max(flat[a + 1], flat[b + 1])) *
			(Math.min(flat[a + 5], flat[b + 5]) - Math.max(flat[a + 2], flat[b + 2]));
	}
	return { pairs: pairs.subarray(0, 2 * count), volumesMm3, count };
}
