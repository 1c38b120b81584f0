/** three.js Box3 as the engine specs' independent box oracle: engine boxes to and from it. */

import { Box3, Vector3 } from 'three';
import type { Box } from '../../geometry/schema';

export const toBox3 = (box: Box) => new Box3(new Vector3(...box.min), new Vector3(...box.max));

export const fromBox3 = (b: Box3): Box => ({
	min: [b.min.x, b.min.y, b.min.z],
	max: [b.max.x, b.max.y, b.max.z]
});
