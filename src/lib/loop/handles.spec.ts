/** Dragging a waypoint: a soft run takes the point, a hard run keeps its segments square. */
import { describe, expect, it } from 'vitest';
import { sceneSchema, type Vec3 } from '$lib/geometry';
import { resolveScene } from '$lib/geometry/resolve';
import { defaultTubeKinds } from '$lib/geometry/loop-library';
import { demoSceneInput } from '$lib/geometry/standard-library';
import type { VariantSettings } from '$lib/builds/settings';
import { runDef } from '$lib/server/testing/engine-factories';
import { dragWaypoint, portMarkers, waypointHandles } from './handles';

const hard = defaultTubeKinds().find((t) => t.id === 'hard-12')!;
const soft = defaultTubeKinds().find((t) => t.id === 'soft-10-13')!;

// Run 1 of the demo loop: pump outlet tip (129, 320.5, 126) … block inlet (38.6, 225, 153).
const ends = { start: [129, 320.5, 126] as Vec3, end: [38.6, 225, 153] as Vec3 };
const waypoints: Vec3[] = [
	[129, 320.5, 82],
	[129, 150, 82],
	[75, 150, 82],
	[75, 225, 82],
	[75, 225, 153]
];
function settings(tube: string): VariantSettings {
	return {
		dividerPositions: {},
		bracketOffsets: {},
		placements: [],
		marginMm: 2,
		loops: [
			{
				id: 'main',
				runs: [
					runDef('r1', ['pump-res', 'out'], ['cpu-block', 'in'], tube, [null, null], waypoints)
				],
				plugs: [{ placementId: 'pump-res', portId: 'fill', fitting: null }]
			}
		]
	} as unknown as VariantSettings;
}
const wps = (s: VariantSettings | null) => s?.loops?.[0].runs[0].waypoints;

describe('dragWaypoint', () => {
	it('hard: the second waypoint moved 16 mm back (z) takes the first, third and fourth along; the fifth, joined along z, stays', () => {
		const out = dragWaypoint(settings('hard-12'), 0, 0, 1, [129, 150, 98.2], hard, ends);
		expect(wps(out)).toEqual([
			[129, 320.5, 98],
			[129, 150, 98],
			[75, 150, 98],
			[75, 225, 98],
			[75, 225, 153]
		]);
	});

	it('hard: the axis is the one the pointer moved most on, snapped to 0.5 mm; a change a port would have to follow is refused', () => {
		// Down along y: the first segment (along y) and the fourth (along y) take it up.
		expect(wps(dragWaypoint(settings('hard-12'), 0, 0, 1, [130, 140.26, 82], hard, ends))).toEqual([
			[129, 320.5, 82],
			[129, 140.5, 82],
			[75, 140.5, 82],
			[75, 225, 82],
			[75, 225, 153]
		]);
		// Along x the first waypoint would have to follow, and then the pump's end point: refused.
		expect(dragWaypoint(settings('hard-12'), 0, 0, 0, [140, 320.5, 82], hard, ends)).toBeNull();
	});

	it('soft: the point goes where it is dragged, on the 0.5 mm grid; nothing else moves', () => {
		const out = wps(
			dragWaypoint(settings('soft-10-13'), 0, 0, 2, [80.26, 160.74, 90.1], soft, ends)
		);
		expect(out![2]).toEqual([80.5, 160.5, 90]);
		expect(out!.filter((_, i) => i !== 2)).toEqual(waypoints.filter((_, i) => i !== 2));
	});
});

describe('markers and handles', () => {
	it('a marker per coolant port of the demo build, used when joined or plugged; a handle per waypoint', () => {
		const loops = settings('hard-12').loops!;
		const resolved = resolveScene(sceneSchema.parse(demoSceneInput()));
		const markers = portMarkers(resolved, loops);
		expect(markers.map((m) => [m.key, m.used])).toEqual([
			['cpu-block/in', true],
			['cpu-block/out', false],
			['pump-res/in', false],
			['pump-res/out', true],
			['pump-res/fill', true],
			['radiator/in', false],
			['radiator/out', false]
		]);
		expect(markers.find((m) => m.key === 'pump-res/out')!.position).toEqual([129, 320.5, 150]);
		expect(waypointHandles(loops).map((h) => h.label)).toEqual(
			waypoints.map((_, k) => `Run 1, waypoint ${k + 1}`)
		);
	});
});
