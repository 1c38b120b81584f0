/**
 * The pool as Vitest and `vite dev` run it: the worker loads the TypeScript source through tsx,
 * and its answers are the engine's own (compared with checkScene on this thread).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { checkScene, sceneSchema } from '$lib/geometry';
import { demoScene } from '$lib/geometry/standard-library';
import { largestAllowedPile, pileSceneInput } from '$lib/server/testing/engine-hostile';
import { checkInPool, closeEnginePool, sweepInPool } from './pool';

afterAll(closeEnginePool);

describe('the engine pool in development', () => {
	it('a heavy check goes to a worker and answers what the engine answers here', async () => {
		const scene = sceneSchema.parse(pileSceneInput(largestAllowedPile()));
		expect(await checkInPool(scene)).toEqual(checkScene(scene));
	});

	it('a cheap check (the demo) answers the same', async () => {
		expect(await checkInPool(demoScene())).toEqual(checkScene(demoScene()));
	});

	it('an engine error in the worker comes back as an invalid-input refusal naming the field (400)', async () => {
		const scene = sceneSchema.parse(pileSceneInput(300));
		const refused = sweepInPool(
			{ kind: 'sweep', scene, control: { kind: 'divider', id: 'nope' } },
			0
		);
		// A service refusal of kind 'invalid': errors.ts answers it with 400 and these issues.
		await expect(refused).rejects.toMatchObject({
			kind: 'invalid',
			issues: [{ path: 'control.id' }]
		});
	});

	it('over the limits: an over-limit refusal (422) before any work', async () => {
		await expect(
			checkInPool(sceneSchema.parse(pileSceneInput(4_900)), 'scene')
		).rejects.toMatchObject({ kind: 'over-limit', issues: [{ path: 'scene.placements' }] });
	});
});
