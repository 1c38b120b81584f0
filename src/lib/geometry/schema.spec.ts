/** The scene schema: error paths a client can act on, limits, and the documented example. */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';
import { checkScene } from './check';
import { SceneError } from './errors';
import { blockPart, plainEnclosure } from '../server/testing/engine-factories';
import { demoEnclosure, demoSceneInput, standardParts } from './standard-library';
import { resolveScene } from './resolve';
import {
	enclosureDefSchema,
	formatPath,
	formatZodIssues,
	partDefSchema,
	sceneSchema,
	type SceneInput
} from './schema';

const here = dirname(fileURLToPath(import.meta.url));

function issuesOf(input: unknown) {
	const result = sceneSchema.safeParse(input);
	if (result.success) return [];
	return formatZodIssues(result.error);
}

type Edit = (s: SceneInput & Record<string, unknown>) => void;
const withEdit = (edit: Edit) => {
	const input = demoSceneInput() as SceneInput & Record<string, unknown>;
	edit(input);
	return input;
};

describe('sceneSchema', () => {
	it('accepts the demo scene and fills defaults', () => {
		expect(issuesOf(demoSceneInput())).toEqual([]);
		const scene = sceneSchema.parse({
			format: 'interstice.scene',
			version: 1,
			enclosure: plainEnclosure([100, 100, 100])
		});
		expect(scene).toMatchObject({
			parts: [],
			placements: [],
			marginMm: 2,
			budgets: { wattsPer120mm: 100, psuHeadroomPct: 30 }
		});
	});

	it.each<[string, Edit, string]>([
		[
			'rotation out of range',
			(s) => (s.placements![3].rotation = { x: 0, y: 5, z: 0 }),
			'placements[3].rotation.y'
		],
		[
			'rotation not whole',
			(s) => (s.placements![0].rotation = { x: 0.5, y: 0, z: 0 }),
			'placements[0].rotation.x'
		],
		[
			'position not finite',
			(s) => (s.placements![1].position = [0, 0, Infinity]),
			'placements[1].position[2]'
		],
		['position NaN', (s) => (s.placements![1].position = [NaN, 0, 0]), 'placements[1].position[0]'],
		[
			'coordinate beyond 10 m',
			(s) => (s.placements![2].position = [0, 10_001, 0]),
			'placements[2].position[1]'
		],
		[
			'body with min ≥ max',
			(s) => (s.parts![3].bodies[0].box = { min: [0, 5, 0], max: [10, 5, 10] }),
			'parts[3].bodies[0].box.max[1]'
		],
		['size not positive', (s) => (s.enclosure.outerMm = [154, 0, 244]), 'enclosure.outerMm[1]'],
		[
			'walls thicker than the enclosure',
			(s) => (s.enclosure.walls.left.thicknessMm = 200),
			'enclosure.outerMm[0]'
		],
		[
			'duplicate placement id',
			(s) => (s.placements![1].id = s.placements![0].id),
			'placements[1].id'
		],
		['duplicate part id', (s) => (s.parts![1].id = s.parts![0].id), 'parts[1].id'],
		[
			'duplicate body id in a part',
			(s) => s.parts![0].bodies.push({ ...s.parts![0].bodies[0] }),
			'parts[0].bodies[1].id'
		],
		[
			'duplicate control id',
			(s) => (s.enclosure.brackets![0].id = 'spine'),
			'enclosure.brackets[0].id'
		],
		['unknown part', (s) => (s.placements![4].partId = 'nope'), 'placements[4].partId'],
		['unknown mount', (s) => (s.placements![0].mountId = 'nope'), 'placements[0].mountId'],
		[
			'unknown divider',
			(s) => (s.dividerPositions = { ...s.dividerPositions, nope: 3 }),
			'dividerPositions.nope'
		],
		[
			'divider position not allowed',
			(s) => (s.dividerPositions = { ...s.dividerPositions, spine: 87 }),
			'dividerPositions.spine'
		],
		['bracket offset between steps', (s) => (s.bracketOffsets = { bar: 15 }), 'bracketOffsets.bar'],
		[
			'bracket offset past its travel',
			(s) => (s.bracketOffsets = { bar: 160 }),
			'bracketOffsets.bar'
		],
		['id with a slash', (s) => (s.placements![0].id = 'a/b'), 'placements[0].id'],
		['wrong format', (s) => ((s as Record<string, unknown>).format = 'other'), 'format'],
		['wrong version', (s) => ((s as Record<string, unknown>).version = 2), 'version']
	])('%s → %s', (_name, edit, path) => {
		expect(issuesOf(withEdit(edit)).map((i) => i.path)).toContain(path);
	});

	it('limits the scene to 5,000 boxes', () => {
		const input = withEdit((s) => {
			s.parts!.push(
				blockPart('many', [1, 1, 1], {
					bodies: Array.from({ length: 2000 }, (_, i) => ({
						id: `b${i}`,
						label: 'b',
						box: { min: [i, 0, 0], max: [i + 1, 1, 1] }
					}))
				})
			);
			s.placements!.push(
				...[0, 1, 2].map((k) => ({
					id: `m${k}`,
					partId: 'many',
					position: [0, 0, 0] as [number, number, number]
				}))
			);
		});
		expect(issuesOf(input)).toContainEqual({
			path: 'placements',
			message: expect.stringMatching(/at most 5000/)
		});
	});

	it('writes paths as an API client reads them', () => {
		expect(formatPath(['placements', 3, 'rotation', 'y'])).toBe('placements[3].rotation.y');
		expect(formatPath(['dividerPositions', 'main'])).toBe('dividerPositions.main');
		expect(formatPath(['dividerPositions', 'odd key'])).toBe('dividerPositions["odd key"]');
		expect(formatPath([])).toBe('');
	});

	it('the catalogue schemas work alone', () => {
		for (const part of standardParts()) {
			expect(partDefSchema.parse(part)).toMatchObject({ id: part.id, source: part.source });
		}
		expect(enclosureDefSchema.parse(demoEnclosure()).name).toBe('Demo sandwich enclosure');
		expect(
			partDefSchema.safeParse({ id: 'x', name: 'x', category: 'gpu', bodies: [] }).success
		).toBe(false);
	});
});

describe('resolveScene refuses what the schema would', () => {
	it.each([
		[
			'a divider position that is not allowed',
			{ dividerPositions: { bulkhead: 64, spine: 86.5 } },
			'dividerPositions.spine'
		],
		['a bracket offset between steps', { bracketOffsets: { bar: 5 } }, 'bracketOffsets.bar']
	])('%s: throws SceneError, never snaps', (_name, patch, path) => {
		const scene = { ...sceneSchema.parse(demoSceneInput()), ...patch };
		expect(() => resolveScene(scene)).toThrow(SceneError);
		try {
			resolveScene(scene);
		} catch (e) {
			expect((e as SceneError).path).toBe(path);
		}
	});
});

describe('docs/scene-format.md', () => {
	it('its example parses with sceneSchema and checks', () => {
		const text = readFileSync(join(here, '../../../docs/scene-format.md'), 'utf8');
		const json = /```json\n([\s\S]*?)```/.exec(text)![1];
		const scene = sceneSchema.parse(JSON.parse(json));
		const report = checkScene(scene);
		expect(report.overlaps).toEqual([]);
		const block = report.parts.find((p) => p.placementId === 'block-1')!;
		expect(block.gaps['+y']).toMatchObject({
			gapMm: expect.closeTo(30.32, 9),
			against: { id: 'divider:shelf' }
		});
		expect(report.parts.find((p) => p.placementId === 'fan-1')!.status).toBe('clear');
		expect(report.mounts[0]).toMatchObject({ usedMm: 25, spareMm: 5, status: 'clear' });
	});
});
