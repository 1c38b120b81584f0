/**
 * Broadphase: which boxes share a positive volume. A uniform grid on typed arrays: each box is
 * filed under every cell it touches, pairs are tested only within a cell, and a pair is reported
 * only by the cell holding the low corner of its overlap, so each pair comes out once without a
 * hash set. Cells are sized from the mean box size, so a layout of similar boxes puts a handful of
 * boxes in each cell; boxes that would cover too many cells (walls, a long shelf) are tested
 * against everything directly instead.
 */

import { EPSILON_MM } from './box';
import { BOX_STRIDE, MAX, packBoxes, type PackedBoxes } from './packed';
import type { Box } from './schema';

/** The boxes packed six numbers each (see packed.ts). */
export const flattenBoxes: (boxes: readonly Box[]) => PackedBoxes = packBoxes;

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

/** Packed boxes i and j share volume: more than EPSILON_MM on every axis. */
export function overlapsFlat(coords: ArrayLike<number>, i: number, j: number): boolean {
	const a = i * BOX_STRIDE;
	const b = j * BOX_STRIDE;
	return (
		Math.min(coords[a + MAX], coords[b + MAX]) - Math.max(coords[a], coords[b]) > EPSILON_MM &&
		Math.min(coords[a + MAX + 1], coords[b + MAX + 1]) - Math.max(coords[a + 1], coords[b + 1]) >
			EPSILON_MM &&
		Math.min(coords[a + MAX + 2], coords[b + MAX + 2]) - Math.max(coords[a + 2], coords[b + 2]) >
			EPSILON_MM
	);
}

function bruteForce(coords: PackedBoxes, n: number, out: PairBuffer): void {
	for (let i = 0; i < n; i++) {
		for (let j = i + 1; j < n; j++) {
			if (overlapsFlat(coords, i, j)) {
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
	/** Low corner of the boxes' bounds (mm). */
	origin: [number, number, number];
	/** Cells per millimetre along each axis. */
	inv: [number, number, number];
	/** Cells along each axis. */
	dims: [number, number, number];
}

function planGrid(coords: PackedBoxes, n: number): Grid {
	const lo = [Infinity, Infinity, Infinity];
	const hi = [-Infinity, -Infinity, -Infinity];
	const mean = [0, 0, 0];
	for (let i = 0; i < n; i++) {
		const at = i * BOX_STRIDE;
		for (let a = 0; a < 3; a++) {
			const min = coords[at + a];
			const max = coords[at + MAX + a];
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
 * Pairs (i < j) of the first n boxes in `flat` (packed, see packed.ts) that share more than
 * EPSILON_MM on every axis, as `[i0, j0, i1, j1, …]` in `pairs` up to `count`. Order follows the
 * grid, the same for the same input.
 */
export function overlappingPairsFlat(
	flat: PackedBoxes,
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
	// Cell range of every box (low cell x, y, z, then high, at the box's packed offsets), and which
	// boxes are too big for the grid.
	const range = new Int32Array(n * BOX_STRIDE);
	const big: number[] = [];
	const isBig = new Uint8Array(n);
	const counts = new Int32Array(cellCount + 1);
	const [ox, oy, oz] = grid.origin;
	const [ix, iy, iz] = grid.inv;
	const mx = dx - 1;
	const my = dy - 1;
	const mz = dz - 1;
	for (let i = 0; i < n; i++) {
		const at = i * BOX_STRIDE;
		const x0 = clampCell(Math.floor((flat[at] - ox) * ix), mx);
		const y0 = clampCell(Math.floor((flat[at + 1] - oy) * iy), my);
		const z0 = clampCell(Math.floor((flat[at + 2] - oz) * iz), mz);
		const x1 = clampCell(Math.floor((flat[at + MAX] - ox) * ix), mx);
		const y1 = clampCell(Math.floor((flat[at + MAX + 1] - oy) * iy), my);
		const z1 = clampCell(Math.floor((flat[at + MAX + 2] - oz) * iz), mz);
		range[at] = x0;
		range[at + 1] = y0;
		range[at + 2] = z0;
		range[at + MAX] = x1;
		range[at + MAX + 1] = y1;
		range[at + MAX + 2] = z1;
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
		const at = i * BOX_STRIDE;
		for (let z = range[at + 2]; z <= range[at + MAX + 2]; z++) {
			for (let y = range[at + 1]; y <= range[at + MAX + 1]; y++) {
				const row = (z * dy + y) * dx;
				for (let x = range[at]; x <= range[at + MAX]; x++) {
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
					// Box i's corners and low cell, read once for every partner in the cell.
					const iAt = i * BOX_STRIDE;
					const iMinX = flat[iAt];
					const iMinY = flat[iAt + 1];
					const iMinZ = flat[iAt + 2];
					const iMaxX = flat[iAt + MAX];
					const iMaxY = flat[iAt + MAX + 1];
					const iMaxZ = flat[iAt + MAX + 2];
					const iCellX = range[iAt];
					const iCellY = range[iAt + 1];
					const iCellZ = range[iAt + 2];
					for (let q = p + 1; q < end; q++) {
						const j = members[q];
						const jAt = j * BOX_STRIDE;
						if (
							Math.min(iMaxX, flat[jAt + MAX]) - Math.max(iMinX, flat[jAt]) > EPSILON_MM &&
							Math.min(iMaxY, flat[jAt + MAX + 1]) - Math.max(iMinY, flat[jAt + 1]) > EPSILON_MM &&
							Math.min(iMaxZ, flat[jAt + MAX + 2]) - Math.max(iMinZ, flat[jAt + 2]) > EPSILON_MM &&
							// The cell holding the overlap's low corner reports the pair; others skip it.
							(iCellX > range[jAt] ? iCellX : range[jAt]) === x &&
							(iCellY > range[jAt + 1] ? iCellY : range[jAt + 1]) === y &&
							(iCellZ > range[jAt + 2] ? iCellZ : range[jAt + 2]) === z
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
		const a = pairs[2 * k] * BOX_STRIDE;
		const b = pairs[2 * k + 1] * BOX_STRIDE;
		volumesMm3[k] =
			(Math.min(flat[a + MAX], flat[b + MAX]) - Math.max(flat[a], flat[b])) *
			(Math.min(flat[a + MAX + 1], flat[b + MAX + 1]) - Math.max(flat[a + 1], flat[b + 1])) *
			(Math.min(flat[a + MAX + 2], flat[b + MAX + 2]) - Math.max(flat[a + 2], flat[b + 2]));
	}
	return { pairs: pairs.subarray(0, 2 * count), volumesMm3, count };
}
