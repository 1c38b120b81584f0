/**
 * Camera placement for the preset views. The engine's Z runs front → back; three.js looks down
 * −Z, so the scene is drawn mirrored in Z (scale z = −1) and a camera in front of the enclosure
 * sees X to the right, as a builder standing in front of it does.
 */
import type { Box } from '$lib/geometry';

export type ViewName = 'orbit' | 'front' | 'top' | 'side';

export type CameraPose = {
	position: [number, number, number];
	target: [number, number, number];
	up: [number, number, number];
};

export function viewPose(inner: Box, view: ViewName): CameraPose {
	const c: [number, number, number] = [
		(inner.min[0] + inner.max[0]) / 2,
		(inner.min[1] + inner.max[1]) / 2,
		-(inner.min[2] + inner.max[2]) / 2
	];
	const size = Math.max(
		inner.max[0] - inner.min[0],
		inner.max[1] - inner.min[1],
		inner.max[2] - inner.min[2]
	);
	const d = size * 2.4;
	switch (view) {
		case 'front':
			return { position: [c[0], c[1], c[2] + d], target: c, up: [0, 1, 0] };
		case 'top':
			return { position: [c[0], c[1] + d, c[2] + 0.001], target: c, up: [0, 0, -1] };
		case 'side':
			return { position: [c[0] + d, c[1], c[2]], target: c, up: [0, 1, 0] };
		default:
			return {
				position: [c[0] + d * 0.55, c[1] + d * 0.45, c[2] + d * 0.75],
				target: c,
				up: [0, 1, 0]
			};
	}
}

/** Zoom for an orthographic camera whose frustum is the canvas in pixels. */
export function orthoZoom(inner: Box, view: ViewName, width: number, height: number): number {
	const w = inner.max[0] - inner.min[0];
	const h = inner.max[1] - inner.min[1];
	const dep = inner.max[2] - inner.min[2];
	const [sx, sy] = view === 'top' ? [w, dep] : view === 'side' ? [dep, h] : [w, h];
	return 0.8 * Math.min(width / sx, height / sy);
}
