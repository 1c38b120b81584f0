/** The drag helpers against worked examples with a camera looking straight down −Z (three.js). */
import { PerspectiveCamera } from 'three';
import { describe, expect, it } from 'vitest';
import { dragPoint, screenOf } from './point-drag';

// A 90° vertical field of view, square, at (0, 0, 1000) in view space looking at the origin:
// the plane z = 0 in view space is engine z = 0; NDC (0.5, 0) is 500 mm right of centre there
// (tan 45° × 1000 mm × 0.5).
function camera() {
	const c = new PerspectiveCamera(90, 1, 1, 10_000);
	c.position.set(0, 0, 1000);
	c.lookAt(0, 0, 0);
	c.updateMatrixWorld();
	return c;
}

describe('dragPoint', () => {
	it('on the plane facing the camera: NDC (0.5, 0) is 500 mm to the right, depth unchanged', () => {
		const p = dragPoint(camera(), [0.5, 0], [0, 0, 0], null)!;
		expect(p[0]).toBeCloseTo(500, 6);
		expect(p[1]).toBeCloseTo(0, 6);
		expect(p[2]).toBeCloseTo(0, 6);
	});

	it('along one axis: only that coordinate moves, to the point of the line nearest the ray', () => {
		// A ray through NDC (0.5, 20 / 1030) meets the line y = 20, engine z = 30 (view z −30, 1030 mm
		// from the camera) at x = 0.5 × 1030 = 515 mm.
		const p = dragPoint(camera(), [0.5, 20 / 1030], [10, 20, 30], 0)!;
		expect(p[1]).toBeCloseTo(20, 9);
		expect(p[2]).toBeCloseTo(30, 9);
		expect(p[0]).toBeCloseTo(515, 3);
	});

	it('round trip: the screen point of an engine point drags back onto it', () => {
		const c = camera();
		const s = screenOf(c, [120, -40, 200], 800, 800)!;
		const ndc: [number, number] = [(s.x / 800) * 2 - 1, 1 - (s.y / 800) * 2];
		const p = dragPoint(c, ndc, [0, 0, 200], null)!;
		expect(p[0]).toBeCloseTo(120, 6);
		expect(p[1]).toBeCloseTo(-40, 6);
		expect(p[2]).toBeCloseTo(200, 6);
	});
});
