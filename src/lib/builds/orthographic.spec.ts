/**
 * The three views against three.js as an independent oracle: an OrthographicCamera posed exactly
 * as the 3D view's preset cameras (components/scene/view.ts, scene mirrored in Z) must see every
 * box where the drawing puts it, up to one scale and offset per view and with no mirroring.
 */
import { OrthographicCamera, Vector3 } from 'three';
import { describe, expect, it } from 'vitest';
import { checkScene, resolveScene, sceneSchema, type Box } from '$lib/geometry';
import { DEMO_SPINE_OFFSETS, demoSceneInput } from '$lib/geometry/standard-library';
import { viewPose } from '$lib/scene/view';
import { SCALES, layoutFits, orthographicViews, viewsAt, type OrthoView } from './orthographic';

const room = { widthMm: 186, heightMm: 251, gutterMm: 8 };

function drawingOf(spine: number = DEMO_SPINE_OFFSETS['3 slots']) {
	const input = demoSceneInput();
	input.dividerPositions = { ...input.dividerPositions, spine };
	const scene = sceneSchema.parse(input);
	const resolved = resolveScene(scene);
	const report = checkScene(scene);
	return { scene, resolved, report, drawing: orthographicViews(scene, resolved, report, room) };
}

/** Where three.js draws an engine point in a preset view, in normalised device coordinates. */
function cameraFor(inner: Box, view: 'front' | 'top' | 'side') {
	const pose = viewPose(inner, view);
	const camera = new OrthographicCamera(-1000, 1000, 1000, -1000, 1, 20000);
	camera.position.set(...pose.position);
	camera.up.set(...pose.up);
	camera.lookAt(...pose.target);
	camera.updateMatrixWorld();
	camera.updateProjectionMatrix();
	// The scene is drawn with scale z = −1 (engine Z runs front → back).
	return (p: [number, number, number]) => new Vector3(p[0], p[1], -p[2]).project(camera);
}

describe('views agree with the 3D view’s cameras', () => {
	const { resolved, drawing } = drawingOf();

	it.each(['front', 'top', 'side'] as const)(
		'%s: every body lands where three.js sees it',
		(id) => {
			const view = drawing.views.find((v) => v.id === id) as OrthoView;
			const project = cameraFor(resolved.innerBox, id);
			// Fit drawing = k · ndc + c from the inner box's corners, then check every body against it
			// (to a micrometre: the top camera sits 0.001 mm off the vertical, as in the 3D view).
			const a = project(resolved.innerBox.min);
			const b = project(resolved.innerBox.max);
			const h = view.h === 'x' ? 0 : view.h === 'y' ? 1 : 2;
			const v = view.v === 'x' ? 0 : view.v === 'y' ? 1 : 2;
			const kx = (resolved.innerBox.max[h] - resolved.innerBox.min[h]) / (b.x - a.x);
			const ky = (-resolved.innerBox.max[v] + resolved.innerBox.min[v]) / (b.y - a.y);
			// Same handedness: right on screen is right on paper, up on screen is up on paper (y down).
			expect(kx).toBeGreaterThan(0);
			expect(ky).toBeLessThan(0);
			for (const rp of resolved.placements) {
				for (const body of rp.bodies) {
					const rect = view.rects.find((r) => r.id === body.id)!;
					const p = project(body.box.min);
					const q = project(body.box.max);
					const left = Math.min(p.x, q.x);
					const top = Math.max(p.y, q.y);
					expect(rect.x).toBeCloseTo(resolved.innerBox.min[h] + (left - a.x) * kx, 3);
					expect(rect.y).toBeCloseTo(-resolved.innerBox.min[v] + (top - a.y) * ky, 3);
					expect(rect.w).toBeCloseTo(Math.abs(q.x - p.x) * kx, 3);
					expect(rect.h).toBeCloseTo(Math.abs(q.y - p.y) * -ky, 3);
				}
			}
		}
	);

	it('leaves out what faces the viewer: no front or back panel in the front view, no spine in the side view', () => {
		const front = drawing.views.find((v) => v.id === 'front')!;
		const side = drawing.views.find((v) => v.id === 'side')!;
		expect(front.rects.some((r) => r.id === 'wall:front' || r.id === 'wall:back')).toBe(false);
		expect(front.rects.some((r) => r.id === 'divider:spine')).toBe(true);
		expect(side.rects.some((r) => r.id === 'divider:spine')).toBe(false);
		expect(side.rects.some((r) => r.id === 'divider:bulkhead')).toBe(true);
	});

	it('paints bodies far to near, so nearer parts cover farther ones', () => {
		const front = drawing.views.find((v) => v.id === 'front')!;
		const bodies = front.rects
			.filter((r) => r.kind === 'body')
			.map((r) => resolved.placements.flatMap((p) => p.bodies).find((b) => b.id === r.id)!);
		const near = bodies.map((b) => b.box.min[2]);
		expect(near).toEqual([...near].sort((x, y) => y - x));
	});
});

describe('dimensions', () => {
	it('labels the divider position and measures gaps face to face', () => {
		const { drawing } = drawingOf();
		const front = drawing.views.find((v) => v.id === 'front')!;
		expect(front.dims.find((d) => d.id === 'position:divider:spine')?.label).toBe(
			'Spine x = 86.0\u2009mm'
		);
		// CPU block top at 38.6 mm (11 + 1.6 board + 26 block), spine at 86.0 mm.
		const gap = front.dims.find((d) => d.id.startsWith('gap:cpu-block:+x'))!;
		expect(gap.label).toBe('47.4\u2009mm');
		expect(Math.min(gap.a[0], gap.b[0])).toBeCloseTo(38.6, 9);
		expect(Math.max(gap.a[0], gap.b[0])).toBeCloseTo(86, 9);
	});

	it('draws interference as its own boxes in the two-slot variant', () => {
		const { drawing } = drawingOf(DEMO_SPINE_OFFSETS['2 slots']);
		const front = drawing.views.find((v) => v.id === 'front')!;
		const hit = front.rects.filter((r) => r.kind === 'interference');
		// The spine (106.32–108.32 mm) cuts the card from 107.36 mm (0.96 mm) and passes right
		// through the pump-reservoir (x 90–148 mm: the spine's full 2 mm).
		expect(
			hit
				.map((r) => [
					r.id.includes('card/') ? 'card' : r.id.includes('pump-res/') ? 'pump-res' : r.id,
					Math.round(r.w * 1000) / 1000
				])
				.sort()
		).toEqual([
			['card', 0.96],
			['pump-res', 2]
		]);
		expect(front.rects.find((r) => r.id === 'card/body')?.status).toBe('collides');
	});
});

describe('scale', () => {
	it('picks the largest listed scale at which the layout fits the room', () => {
		const { scene, resolved, report, drawing } = drawingOf();
		expect(layoutFits(drawing.views, drawing.scale, room)).toBe(true);
		const larger = SCALES.filter((s) => s > drawing.scale);
		expect(larger.length).toBeGreaterThan(0);
		for (const s of larger) {
			expect(layoutFits(viewsAt(scene, resolved, report, s).views, s, room)).toBe(false);
		}
		expect(drawing.scaleText).toBe(`1:${Math.round(10 / drawing.scale) / 10}`);
	});
});
