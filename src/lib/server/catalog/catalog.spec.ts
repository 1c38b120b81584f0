/**
 * The catalogue services against the real PostgreSQL (DATABASE_URL must name a test database,
 * migrated and seeded): parts, versioned enclosures, conflicts, archive, and the editor's look-ups.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { and, count, eq, sql } from 'drizzle-orm';
import { Box3, Vector3 } from 'three';
import { SLOT_PITCH_MM, type EnclosureDef } from '$lib/geometry';
import { demoEnclosure } from '$lib/geometry/standard-library';
import { closeDb, db } from '../db';
import { builds, enclosureVersions, parts, variants } from '../db/schema';
import { createStudio } from '../testing/factories';
import { testDatabaseUrl } from '../testing/env';
import { newId } from '../tokens';
import {
	archivePart,
	createPart,
	deletePart,
	duplicatePart,
	getPartsByIds,
	listParts,
	listPartsForStudio,
	restorePart,
	updatePart
} from './parts';
import {
	createEnclosure,
	getEnclosure,
	getEnclosureVersion,
	updateEnclosure,
	archiveEnclosure,
	listEnclosures
} from './enclosures';

let studioId = '';
let otherStudioId = '';

beforeAll(async () => {
	testDatabaseUrl();
	studioId = (await createStudio()).id;
	otherStudioId = (await createStudio()).id;
});
afterAll(closeDb);

const partCount = async (id = studioId) =>
	(await db.select({ n: count() }).from(parts).where(eq(parts.studioId, id)))[0].n;

function pump(overrides: Record<string, unknown> = {}) {
	return {
		name: 'Compact pump, test',
		category: 'pump',
		bodies: [{ id: 'body', label: 'Body', box: { min: [0, 0, 0], max: [62, 50, 62] } }],
		keepouts: [
			{
				id: 'fittings',
				label: 'Fittings',
				kind: 'fitting',
				severity: 'error',
				box: { min: [0, 50, 0], max: [62, 75, 62] }
			}
		],
		ports: [{ id: 'in', position: [20, 50, 31], direction: '+y' }],
		specs: { powerDrawW: 18 },
		provenance: 'measured',
		toleranceMm: 0.5,
		priceMinor: 9400,
		currency: 'EUR',
		supplierNote: 'two weeks',
		...overrides
	};
}

describe('parts', () => {
	it('stores a part with its bounding size, defaults the port thread to G 1/4, and lists it', async () => {
		const made = await createPart(studioId, pump());
		expect(made.ok).toBe(true);
		if (!made.ok) return;
		const p = made.value;
		// Oracle: three.js Box3 over the body boxes (keep-outs excluded).
		const b3 = new Box3(new Vector3(0, 0, 0), new Vector3(62, 50, 62));
		const size = b3.getSize(new Vector3());
		expect([p.widthMm, p.heightMm, p.depthMm]).toEqual([size.x, size.y, size.z]);
		// ISO 228-1 G 1/4 is the default thread for fittings (common practice).
		expect(p.def.ports[0].thread).toBe('G 1/4');
		expect(p.revision).toBe(1);
		const found = await listPartsForStudio(studioId, { q: 'compact pump' });
		expect(found.map((f) => f.id)).toContain(p.id);
	});

	it.each([
		[
			'a negative depth',
			{ bodies: [{ id: 'b', label: '', box: { min: [0, 0, 0], max: [10, 10, -5] } }] },
			'bodies[0].box.max[2]'
		],
		[
			'a zero-size body',
			{ bodies: [{ id: 'b', label: '', box: { min: [0, 0, 0], max: [0, 10, 10] } }] },
			'bodies[0].box.max[0]'
		],
		[
			'NaN',
			{ bodies: [{ id: 'b', label: '', box: { min: [0, 0, 0], max: [Number.NaN, 10, 10] } }] },
			'bodies[0].box.max[0]'
		],
		[
			'more than 10 m',
			{ bodies: [{ id: 'b', label: '', box: { min: [0, 0, 0], max: [10_001, 10, 10] } }] },
			'bodies[0].box.max[0]'
		],
		[
			'a keep-out with no size',
			{
				keepouts: [
					{
						id: 'k',
						label: '',
						kind: 'airflow',
						severity: 'warning',
						box: { min: [0, 0, 0], max: [0, 0, 0] }
					}
				]
			},
			'keepouts[0].box.max[0]'
		],
		[
			'a keep-out with no box',
			{ keepouts: [{ id: 'k', label: '', kind: 'airflow', severity: 'warning' }] },
			'keepouts[0].box'
		],
		['an unknown category', { category: 'toaster' }, 'category'],
		['no body', { bodies: [] }, 'bodies'],
		['a negative price', { priceMinor: -1 }, 'priceMinor'],
		['standard provenance in a studio', { provenance: 'standard' }, 'provenance']
	])('refuses %s with a field error and writes nothing', async (_what, change, path) => {
		const before = await partCount();
		const made = await createPart(studioId, pump(change));
		expect(made.ok).toBe(false);
		if (made.ok || made.status !== 400) throw new Error('expected 400');
		expect(made.issues.map((i) => i.path)).toContain(path);
		expect(await partCount()).toBe(before);
	});

	it('saves with the loaded revision, and answers a stale one with a conflict that changes nothing', async () => {
		const made = await createPart(studioId, pump({ name: 'Conflict pump' }));
		if (!made.ok) throw new Error('create failed');
		const id = made.value.id;
		const first = await updatePart(studioId, id, 1, pump({ name: 'Conflict pump, first save' }));
		expect(first.ok && first.value.revision).toBe(2);
		const second = await updatePart(studioId, id, 1, pump({ name: 'Conflict pump, second save' }));
		expect(second.ok).toBe(false);
		if (second.ok || second.status !== 409) throw new Error('expected 409');
		expect(second.current.name).toBe('Conflict pump, first save');
		const [row] = await db.select().from(parts).where(eq(parts.id, id));
		expect(row.name).toBe('Conflict pump, first save');
		expect(row.revision).toBe(2);
	});

	it('archives: gone from search and the table, still loadable by id for builds', async () => {
		const made = await createPart(
			studioId,
			pump({ name: 'Archived reservoir zq', category: 'reservoir' })
		);
		if (!made.ok) throw new Error('create failed');
		await archivePart(studioId, made.value.id);
		expect((await listPartsForStudio(studioId, { q: 'zq' })).length).toBe(0);
		expect((await listParts(studioId, { q: 'zq' })).total).toBe(0);
		expect((await listParts(studioId, { q: 'zq', archived: true })).total).toBe(1);
		const [byId] = await getPartsByIds(studioId, [made.value.id]);
		expect(byId.archived).toBe(true);
		await restorePart(studioId, made.value.id);
		expect((await listPartsForStudio(studioId, { q: 'zq' })).length).toBe(1);
	});

	it('keeps the standard library read-only, and copies an entry into the studio', async () => {
		const [sfx] = await getPartsByIds(studioId, ['std-sfx']);
		// SFX12V Power Supply Design Guide: 125 W × 63.5 H × 100 D mm.
		expect([sfx.widthMm, sfx.heightMm, sfx.depthMm]).toEqual([125, 63.5, 100]);
		expect(sfx.isStandard).toBe(true);
		expect(sfx.source).toMatch(/SFX12V/);
		const write = await updatePart(studioId, 'std-sfx', sfx.revision, {
			...sfx.def,
			provenance: 'datasheet',
			name: 'mine now'
		});
		expect(write.ok || write.status).toBe(404);
		const copy = await duplicatePart(studioId, 'std-sfx');
		if (!copy.ok) throw new Error('copy failed');
		expect(copy.value.studioId).toBe(studioId);
		expect(copy.value.copiedFromId).toBe('std-sfx');
		expect(copy.value.provenance).toBe('datasheet');
		expect(copy.value.def.bodies).toEqual(sfx.def.bodies);
	});

	it('never lets another studio read or find a part', async () => {
		const made = await createPart(studioId, pump({ name: 'Private pump xk' }));
		if (!made.ok) throw new Error('create failed');
		expect(await getPartsByIds(otherStudioId, [made.value.id])).toEqual([]);
		expect(await listPartsForStudio(otherStudioId, { q: 'xk' })).toEqual([]);
		expect(await archivePart(otherStudioId, made.value.id)).toBeNull();
	});

	it('sorts and pages in the database, filtering by category', async () => {
		const sorted = await listParts(studioId, {
			scope: 'standard',
			category: 'fan',
			sort: 'depthMm',
			dir: 'asc',
			pageSize: 2,
			page: 1
		});
		expect(sorted.total).toBe(4);
		// Common practice: slim fans are about 15 mm thick, standard ones 25 mm.
		expect(sorted.rows.map((r) => r.depthMm)).toEqual([15, 15]);
		const page2 = await listParts(studioId, {
			scope: 'standard',
			category: 'fan',
			sort: 'depthMm',
			dir: 'asc',
			pageSize: 2,
			page: 2
		});
		expect(page2.rows.map((r) => r.depthMm)).toEqual([25, 25]);
	});

	it('deletes an unused part, but only archives one a build places', async () => {
		const unused = await createPart(studioId, pump({ name: 'Unused pump' }));
		const used = await createPart(studioId, pump({ name: 'Used pump' }));
		if (!unused.ok || !used.ok) throw new Error('create failed');
		const enc = await createEnclosure(studioId, null, { definition: demoEnclosure() });
		if (!enc.ok) throw new Error('enclosure failed');
		const buildId = newId();
		await db.insert(builds).values({
			id: buildId,
			studioId,
			name: 'Test build',
			enclosureVersionId: enc.value.current.id
		});
		await db.insert(variants).values({
			id: newId(),
			buildId,
			name: 'A',
			settings: { placements: [{ id: 'p1', partId: used.value.id, position: [0, 0, 0] }] }
		});
		expect(await deletePart(studioId, unused.value.id)).toEqual({ ok: true });
		const refused = await deletePart(studioId, used.value.id);
		expect(refused.ok).toBe(false);
		expect(!refused.ok && refused.status).toBe(409);
		expect((await getPartsByIds(studioId, [used.value.id])).length).toBe(1);
	});
});

function box(outer: [number, number, number], wallMm: number): EnclosureDef {
	const w = { thicknessMm: wallMm, kind: 'solid' as const, offsetMm: 0 };
	return {
		name: 'Test box',
		outerMm: outer,
		walls: { left: w, right: w, bottom: w, top: w, front: w, back: w },
		dividers: [
			{
				id: 'spine',
				label: 'Spine',
				axis: 'x',
				thicknessMm: 2,
				positions: {
					kind: 'list',
					options: [2, 3].map((n) => ({
						label: `${n} slots`,
						offsetMm: outer[0] - 2 * wallMm - 2 - n * SLOT_PITCH_MM
					}))
				}
			}
		],
		brackets: [],
		mounts: []
	};
}

describe('enclosures', () => {
	it('stores litres of the inside: a worked example, 200 × 300 × 250 outside with 2 mm walls', async () => {
		const made = await createEnclosure(studioId, null, { definition: box([200, 300, 250], 2) });
		if (!made.ok) throw new Error('create failed');
		// Worked example: (200 − 4) × (300 − 4) × (250 − 4) mm³ = 196 × 296 × 246 = 14,271,936 mm³; 1 L = 10⁶ mm³ (SI).
		expect(made.value.volumeLitres).toBeCloseTo(14.271936, 9);
		expect(made.value.current.version).toBe(1);
	});

	it('updates in place while no build uses the version, then makes version 2 and leaves the build pinned', async () => {
		const made = await createEnclosure(studioId, null, { definition: box([200, 300, 250], 2) });
		if (!made.ok) throw new Error('create failed');
		const id = made.value.id;
		const v1 = made.value.current.id;
		const inPlace = await updateEnclosure(studioId, id, 1, null, {
			definition: box([210, 300, 250], 2)
		});
		if (!inPlace.ok) throw new Error('update failed');
		expect(inPlace.value.current.id).toBe(v1);
		expect(inPlace.value.current.def.outerMm[0]).toBe(210);
		expect(inPlace.value.revision).toBe(2);

		const buildId = newId();
		await db
			.insert(builds)
			.values({ id: buildId, studioId, name: 'Pinned', enclosureVersionId: v1 });
		const versioned = await updateEnclosure(studioId, id, 2, null, {
			definition: box([220, 300, 250], 2),
			note: 'wider'
		});
		if (!versioned.ok) throw new Error('update failed');
		expect(versioned.created).toBe(true);
		expect(versioned.value.currentVersion).toBe(2);
		expect(versioned.value.current.def.outerMm[0]).toBe(220);
		const [pinned] = await db.select().from(builds).where(eq(builds.id, buildId));
		expect(pinned.enclosureVersionId).toBe(v1);
		const old = await getEnclosureVersion(studioId, v1);
		expect(old?.def.outerMm[0]).toBe(210);
		expect(versioned.value.versions.map((v) => [v.version, v.buildCount])).toEqual([
			[2, 0],
			[1, 1]
		]);
	});

	it('answers a stale revision with a conflict and writes nothing', async () => {
		const made = await createEnclosure(studioId, null, { definition: box([200, 300, 250], 2) });
		if (!made.ok) throw new Error('create failed');
		const id = made.value.id;
		await updateEnclosure(studioId, id, 1, null, { definition: box([205, 300, 250], 2) });
		const stale = await updateEnclosure(studioId, id, 1, null, {
			definition: box([999, 300, 250], 2)
		});
		expect(stale.ok).toBe(false);
		if (stale.ok || stale.status !== 409) throw new Error('expected 409');
		expect(stale.current.current.def.outerMm[0]).toBe(205);
		const after = await getEnclosure(studioId, id);
		expect(after?.current.def.outerMm[0]).toBe(205);
		expect(after?.revision).toBe(2);
	});

	it('orders two saves at once: exactly one wins, the other is a conflict', async () => {
		const made = await createEnclosure(studioId, null, { definition: box([200, 300, 250], 2) });
		if (!made.ok) throw new Error('create failed');
		const results = await Promise.all([
			updateEnclosure(studioId, made.value.id, 1, null, { definition: box([201, 300, 250], 2) }),
			updateEnclosure(studioId, made.value.id, 1, null, { definition: box([202, 300, 250], 2) })
		]);
		expect(results.filter((r) => r.ok).length).toBe(1);
		expect(results.filter((r) => !r.ok && r.status === 409).length).toBe(1);
	});

	it.each([
		['walls that leave no inside', { ...box([10, 300, 250], 5) }, 'outerMm[0]'],
		[
			'a negative outer size',
			{ ...box([200, 300, 250], 2), outerMm: [-200, 300, 250] },
			'outerMm[0]'
		],
		[
			'a divider with no positions',
			{
				...box([200, 300, 250], 2),
				dividers: [
					{
						id: 'd',
						label: 'd',
						axis: 'x',
						thicknessMm: 2,
						positions: { kind: 'list', options: [] }
					}
				]
			},
			'dividers[0].positions.options'
		]
	])('refuses %s and writes nothing', async (_what, definition, path) => {
		const before = (await db.select({ n: count() }).from(enclosureVersions))[0].n;
		const made = await createEnclosure(studioId, null, { definition });
		expect(made.ok).toBe(false);
		if (made.ok || made.status !== 400) throw new Error('expected 400');
		expect(made.issues.map((i) => i.path)).toContain(path);
		expect((await db.select({ n: count() }).from(enclosureVersions))[0].n).toBe(before);
	});

	it('keeps versions of one studio away from another, and archives without deleting', async () => {
		const made = await createEnclosure(studioId, null, { definition: box([200, 300, 250], 2) });
		if (!made.ok) throw new Error('create failed');
		expect(await getEnclosureVersion(otherStudioId, made.value.current.id)).toBeNull();
		expect(await getEnclosure(otherStudioId, made.value.id)).toBeNull();
		await archiveEnclosure(studioId, made.value.id);
		expect((await listEnclosures(studioId)).map((e) => e.id)).not.toContain(made.value.id);
		expect(await getEnclosureVersion(studioId, made.value.current.id)).not.toBeNull();
		const [{ n }] = await db
			.select({ n: sql<number>`count(*)::int` })
			.from(enclosureVersions)
			.where(and(eq(enclosureVersions.enclosureId, made.value.id)));
		expect(n).toBe(1);
	});
});
