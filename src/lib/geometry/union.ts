/**
 * Exact volume (mm³) of a union of axis-aligned boxes: the interference total counts a point once
 * however many collision regions cover it. Boxes that overlap no other add their own volume; each
 * group of mutually overlapping boxes is measured by coordinate compression (the cells between
 * consecutive distinct faces on each axis are either wholly inside a box or wholly outside all).
 * A few dozen boxes per group at most in a real scene, so the O(k⁴) cell walk is small.
 */

import { overlapsFlat as overlaps } from './broadphase';

function volumeOf(f: ArrayLike<number>, i: number): number {
	const o = i * 6;
	return (f[o + 3] - f[o]) * (f[o + 4] - f[o + 1]) * (f[o + 5] - f[o + 2]);
}

function sortedFaces(f: ArrayLike<number>, group: readonly number[], axis: number): number[] {
	const values = new Set<number>();
	for (const i of group) {
		values.add(f[i * 6 + axis]);
		values.add(f[i * 6 + 3 + axis]);
	}
	return [...values].sort((x, y) => x - y);
}

/** Coordinate compression over one group: every cell whose centre lies in some box counts. */
function compressedVolume(f: ArrayLike<number>, group: readonly number[]): number {
	const xs = sortedFaces(f, group, 0);
	const ys = sortedFaces(f, group, 1);
	const zs = sortedFaces(f, group, 2);
	let total = 0;
	for (let ix = 0; ix + 1 < xs.length; ix++) {
		const cx = (xs[ix] + xs[ix + 1]) / 2;
		const inX = group.filter((i) => f[i * 6] < cx && cx < f[i * 6 + 3]);
		if (inX.length === 0) continue;
		for (let iy = 0; iy + 1 < ys.length; iy++) {
			const cy = (ys[iy] + ys[iy + 1]) / 2;
			const inXY = inX.filter((i) => f[i * 6 + 1] < cy && cy < f[i * 6 + 4]);
			if (inXY.length === 0) continue;
			let length = 0;
			for (let iz = 0; iz + 1 < zs.length; iz++) {
				const cz = (zs[iz] + zs[iz + 1]) / 2;
				if (inXY.some((i) => f[i * 6 + 2] < cz && cz < f[i * 6 + 5])) length += zs[iz + 1] - zs[iz];
			}
			total += (xs[ix + 1] - xs[ix]) * (ys[iy + 1] - ys[iy]) * length;
		}
	}
	return total;
}

/**
 * The boxes of `flat` with exact repeats left out: a repeat adds nothing to a union, and a pile of
 * identical parts repeats one overlap box once per pair (n² of them), which would make the
 * pairwise linking below quadratic in the pairs.
 */
function distinctBoxes(flat: ArrayLike<number>): ArrayLike<number> {
	const n = Math.floor(flat.length / 6);
	if (n < 2) return flat;
	const seen = new Set<string>();
	const out: number[] = [];
	for (let i = 0; i < n; i++) {
		const o = i * 6;
		const key = `${flat[o]},${flat[o + 1]},${flat[o + 2]},${flat[o + 3]},${flat[o + 4]},${flat[o + 5]}`;
		if (seen.has(key)) continue;
		seen.add(key);
		for (let k = 0; k < 6; k++) out.push(flat[o + k]);
	}
	return out.length === flat.length ? flat : out;
}

/** Volume of the union of the boxes in `all` (six numbers a box: min x, y, z, max x, y, z). */
export function unionVolume(all: ArrayLike<number>): number {
	const flat = distinctBoxes(all);
	const n = Math.floor(flat.length / 6);
	if (n === 0) return 0;
	if (n === 1) return volumeOf(flat, 0);
	// Groups of boxes linked by overlaps (union-find).
	const parent = Int32Array.from({ length: n }, (_, i) => i);
	const find = (i: number): number => {
		while (parent[i] !== i) {
			parent[i] = parent[parent[i]];
			i = parent[i];
		}
		return i;
	};
	let linked = false;
	for (let i = 0; i < n; i++) {
		for (let j = i + 1; j < n; j++) {
			if (overlaps(flat, i, j)) {
				parent[find(i)] = find(j);
				linked = true;
			}
		}
	}
	let total = 0;
	if (!linked) {
		for (let i = 0; i < n; i++) total += volumeOf(flat, i);
		return total;
	}
	const groups = new Map<number, number[]>();
	for (let i = 0; i < n; i++) {
		const root = find(i);
		const group = groups.get(root);
		if (group) group.push(i);
		else groups.set(root, [i]);
	}
	for (const group of groups.values()) {
		total += group.length === 1 ? volumeOf(flat, group[0]) : compressedVolume(flat, group);
	}
	return total;
}
