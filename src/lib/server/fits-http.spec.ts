/**
 * The clearance table and "what fits here" through the built app, with the real PostgreSQL: who
 * may ask, what a bad request gets (400 naming the field, nothing written), and answers that
 * agree with the engine run here.
 */
import { describe, expect, it } from 'vitest';
import { DEMO_SPINE_OFFSETS, demoSceneInput } from '$lib/geometry/standard-library';
import { fitsRows } from './testing/fits-access-rows';
import { runAccessMatrix } from './testing/access-matrix';
import { createMember, createStudio } from './testing/factories';
import { useApp } from './testing/suite';
import { createEnclosure } from './catalog/enclosures';
import { demoEnclosure } from '$lib/geometry/standard-library';

const app = useApp();

runAccessMatrix(fitsRows, app);

async function designer() {
	const studio = await createStudio();
	const user = await createMember(studio.id, 'designer');
	const client = app.client();
	await client.signIn(user.email, user.password);
	return { studio, user, client };
}

type Issue = { path: string; message: string };

describe('GET /api/enclosures/[id]/room', () => {
	it('answers the demo enclosure’s table: 48 rows, 53.08 mm over the board at 4 slots', async () => {
		const { studio, user, client } = await designer();
		const made = await createEnclosure(studio.id, user.id, { definition: demoEnclosure() });
		if (!made.ok) throw new Error('refused');
		const res = await client.get(`/api/enclosures/${made.value.id}/room`, {
			accept: 'application/json'
		});
		expect(res.status).toBe(200);
		const room = res.json<{
			room: {
				rows: {
					settings: { id: string; offsetMm: number }[];
					figures: { id: string; valueMm: number }[];
				}[];
			};
		}>().room;
		expect(room.rows).toHaveLength(48);
		const row = room.rows.find(
			(r) => r.settings.find((s) => s.id === 'spine')!.offsetMm === DEMO_SPINE_OFFSETS['4 slots']
		)!;
		expect(row.figures.find((f) => f.id === 'over-board:tray')!.valueMm).toBeCloseTo(53.08, 9);
	});

	it('404 for an enclosure that does not exist', async () => {
		const { client } = await designer();
		expect(
			(await client.get('/api/enclosures/nope/room', { accept: 'application/json' })).status
		).toBe(404);
	});
});

describe('POST /api/fits', () => {
	const post = async (client: Awaited<ReturnType<typeof designer>>['client'], body: unknown) =>
		client.request('POST', '/api/fits', {
			body: JSON.stringify(body),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app.baseURL
			}
		});

	it('ranks the standard library for the emptied front radiator mount, with combinations', async () => {
		const { client } = await designer();
		const scene = {
			...demoSceneInput(),
			placements: demoSceneInput().placements!.filter((p) => p.mountId !== 'radiator')
		};
		const res = await post(client, {
			scene,
			target: { kind: 'mount', mountId: 'radiator' },
			combinations: true
		});
		expect(res.status).toBe(200);
		const data = res.json<{
			fits: { partId: string; status: string }[];
			combinations: { key: string; spareMm: number; availableMm: number; stackMm: number }[];
		}>();
		// The standard fans lie flat on the panel: all four fit the empty mount.
		expect(
			data.fits
				.map((f) => f.partId)
				.filter((id) => id.startsWith('std-fan'))
				.sort()
		).toEqual(['std-fan-120-15', 'std-fan-120-25', 'std-fan-140-15', 'std-fan-140-25']);
		// The standard library's radiators with its fans: each spare is the room less the stack, best first.
		expect(data.combinations.length).toBeGreaterThan(0);
		for (const c of data.combinations) expect(c.spareMm).toBeCloseTo(c.availableMm - c.stackMm, 9);
		expect(data.combinations.map((c) => c.spareMm)).toEqual(
			[...data.combinations.map((c) => c.spareMm)].sort((a, b) => b - a)
		);
	});

	it.each([
		[{ kind: 'mount', mountId: 'nope' }, 'target.mountId'],
		[{ kind: 'compartment', compartmentId: 'nope' }, 'target.compartmentId'],
		[{ kind: 'replace', placementId: 'nope' }, 'target.placementId'],
		[{ kind: 'space', box: { min: [0, 0, 0], max: [151, 10, 10] } }, 'target.box'],
		[{ kind: 'elsewhere' }, 'target.kind']
	])('400 naming the field for target %o', async (target, path) => {
		const { client } = await designer();
		const res = await post(client, { scene: demoSceneInput(), target });
		expect(res.status).toBe(400);
		expect(
			res
				.json<{ issues: Issue[] }>()
				.issues.map((i) => i.path)
				.some((p) => p === path || (path === 'target.kind' && p.startsWith('target'))),
			res.text
		).toBe(true);
	});

	it('400 naming the part id that does not exist, and the control of a parts × positions table', async () => {
		const { client } = await designer();
		const target = { kind: 'replace', placementId: 'card' };
		const bad = await post(client, {
			scene: demoSceneInput(),
			target,
			filters: { partIds: ['std-fan-120-25', 'nope'] }
		});
		expect(bad.status).toBe(400);
		expect(bad.json<{ issues: Issue[] }>().issues[0].path).toBe('filters.partIds[1]');
		const noControl = await post(client, {
			scene: demoSceneInput(),
			target,
			positions: { kind: 'divider', id: 'nope' }
		});
		expect(noControl.json<{ issues: Issue[] }>().issues[0].path).toBe('positions.id');
	});

	it('parts × positions for two standard fans in place of the card', async () => {
		const { client } = await designer();
		const res = await post(client, {
			scene: demoSceneInput(),
			target: { kind: 'replace', placementId: 'card' },
			filters: { partIds: ['std-fan-120-25', 'std-fan-140-25'] },
			positions: { kind: 'divider', id: 'spine' }
		});
		expect(res.status).toBe(200);
		const table = res.json<{
			partsByPositions: {
				positions: { label: string }[];
				rows: { partId: string; cells: { status: string }[] }[];
			};
		}>().partsByPositions;
		expect(table.positions.map((p) => p.label)).toEqual(['4 slots', '3 slots', '2 slots']);
		expect(table.rows.map((r) => r.partId)).toEqual(['std-fan-120-25', 'std-fan-140-25']);
	});

	it('streams NDJSON a chunk at a time: the lines add up to the one-shot answer; a bad target is still a 400', async () => {
		const { client } = await designer();
		const body = { scene: demoSceneInput(), target: { kind: 'replace', placementId: 'card' } };
		const whole = await post(client, { ...body, limit: 200 });
		const once = whole.json<{
			counts: { fits: number; left: number };
			fits: { partId: string }[];
		}>();
		const res = await post(client, { ...body, stream: true });
		expect(res.status).toBe(200);
		expect(res.headers['content-type']).toContain('application/x-ndjson');
		const lines = res.text
			.split('\n')
			.filter(Boolean)
			.map(
				(l) =>
					JSON.parse(l) as {
						fits: { partId: string }[];
						left: { partId: string }[];
						done: number;
						total: number;
					}
			);
		expect(lines.length).toBeGreaterThan(0);
		// Each line says how far it has got; the last has checked every candidate.
		expect(lines.map((l) => l.done)).toEqual([...lines.map((l) => l.done)].sort((a, b) => a - b));
		expect(lines.at(-1)!.done).toBe(lines.at(-1)!.total);
		const fits = lines.flatMap((l) => l.fits.map((r) => r.partId)).sort();
		expect(fits).toEqual(once.fits.map((r) => r.partId).sort());
		expect(lines.flatMap((l) => l.left).length).toBe(once.counts.left);
		const bad = await post(client, {
			scene: demoSceneInput(),
			target: { kind: 'mount', mountId: 'nope' },
			stream: true
		});
		expect(bad.status).toBe(400);
		expect(bad.json<{ issues: Issue[] }>().issues[0].path).toBe('target.mountId');
	});
});
