/**
 * Where a dragged point goes under the pointer: on the plane through its start that faces the
 * camera, or on the line through it along one axis (the point of that line nearest the pointer's
 * ray). Engine coordinates in and out; the view mirrors Z (the scene group's scale [1, 1, −1]).
 */
import { Plane, Raycaster, Vector2, Vector3, type Camera } from 'three';
import type { Vec3 } from '$lib/geometry';

const toView = (p: Vec3) => new Vector3(p[0], p[1], -p[2]);
const fromView = (v: Vector3): Vec3 => [v.x, v.y, -v.z];
/** Half the line searched along an axis, mm: far beyond any enclosure. */
const REACH_MM = 10_000;

/** `ndc`: the pointer in normalised device coordinates (−1 … 1, y up). Null when the ray misses. */
export function dragPoint(
	camera: Camera,
	ndc: [number, number],
	start: Vec3,
	axis: 0 | 1 | 2 | null
): Vec3 | null {
	const ray = new Raycaster();
	ray.setFromCamera(new Vector2(ndc[0], ndc[1]), camera);
	const origin = toView(start);
	if (axis === null) {
		const normal = camera.getWorldDirection(new Vector3());
		const plane = new Plane().setFromNormalAndCoplanarPoint(normal, origin);
		const hit = ray.ray.intersectPlane(plane, new Vector3());
		return hit ? fromView(hit) : null;
	}
	const dir = new Vector3(axis === 0 ? 1 : 0, axis === 1 ? 1 : 0, axis === 2 ? -1 : 0);
	const a = origin.clone().addScaledVector(dir, -REACH_MM);
	const b = origin.clone().addScaledVector(dir, REACH_MM);
	const onLine = new Vector3();
	ray.ray.distanceSqToSegment(a, b, undefined, onLine);
	return fromView(onLine);
}

/** The screen point (pixels from the canvas's top left) of an engine point, or null behind the camera. */
export function screenOf(camera: Camera, p: Vec3, width: number, height: number) {
	const v = toView(p).project(camera);
	if (!Number.isFinite(v.x) || !Number.isFinite(v.y) || v.z >= 1) return null;
	return { x: ((v.x + 1) / 2) * width, y: ((1 - v.y) / 2) * height };
}
