import { describe, expect, it } from 'vitest';
import { variantSettingsSchema } from '$lib/builds/settings';
import { addRun, removeRun, setWaypoint, snapHalf, splitSegment, togglePlug } from './edit';

const base = variantSettingsSchema.parse({});
const run = {
	from: { placementId: 'a', portId: 'out' },
	to: { placementId: 'b', portId: 'in' },
	tube: 't',
	fittings: { from: null, to: null },
	waypoints: []
};

describe('loop edits', () => {
	it('starts a loop with the first run and numbers ids it does not yet use', () => {
		const one = addRun(base, 0, run);
		const two = addRun(one, 0, { ...run, from: run.to, to: run.from });
		expect(two.loops![0].id).toBe('loop-1');
		expect(two.loops![0].runs.map((r) => r.id)).toEqual(['run-1', 'run-2']);
		expect(removeRun(removeRun(two, 0, 1), 0, 0).loops).toBeUndefined();
	});

	it('snaps typed waypoints to 0.5 mm and splits a segment at its middle', () => {
		expect(snapHalf(12.26)).toBe(12.5);
		expect(snapHalf(12.24)).toBe(12);
		const one = addRun(base, 0, run);
		const split = splitSegment(
			one,
			0,
			0,
			[
				[0, 0, 0],
				[10, 0, 0]
			],
			0
		);
		expect(split.loops![0].runs[0].waypoints).toEqual([[5, 0, 0]]);
		expect(setWaypoint(split, 0, 0, 0, 1, 3.3).loops![0].runs[0].waypoints).toEqual([[5, 3.5, 0]]);
	});

	it('plugs a port and opens it again, dropping it as the fill port', () => {
		const one = addRun(base, 0, run);
		const plugged = togglePlug(one, 0, { placementId: 'a', portId: 'fill' });
		expect(plugged.loops![0].plugs).toEqual([{ placementId: 'a', portId: 'fill', fitting: null }]);
		const filled = {
			...plugged,
			loops: [{ ...plugged.loops![0], fill: { placementId: 'a', portId: 'fill' } }]
		};
		const open = togglePlug(filled, 0, { placementId: 'a', portId: 'fill' });
		expect(open.loops![0].plugs).toEqual([]);
		expect(open.loops![0].fill).toBeUndefined();
	});
});
