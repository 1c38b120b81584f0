/** Searches over numbers sorted ascending, shared by the sweep's slide index and the route grid. */

/** First index in the ascending `sorted` whose value is at or above `v`; `sorted.length` if none. */
export function lowerBound(sorted: Float64Array, v: number): number {
	let lo = 0;
	let hi = sorted.length;
	while (lo < hi) {
		const mid = (lo + hi) >> 1;
		if (sorted[mid] < v) lo = mid + 1;
		else hi = mid;
	}
	return lo;
}
