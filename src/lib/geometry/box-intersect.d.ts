/** Types for the box-intersect package, used only as an oracle in tests and the benchmark. */
declare module 'box-intersect' {
	/** Boxes as [minX, minY, minZ, maxX, maxY, maxZ]; closed, so touching boxes are reported. */
	type BoxArray = ArrayLike<number>;
	function boxIntersect(boxes: BoxArray[], visit: (i: number, j: number) => unknown): unknown;
	function boxIntersect(
		red: BoxArray[],
		blue: BoxArray[],
		visit: (i: number, j: number) => unknown
	): unknown;
	export default boxIntersect;
}
