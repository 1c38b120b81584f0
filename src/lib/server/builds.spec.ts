/**
 * Saving, loading and conflicts of build variants against the real PostgreSQL, then the same
 * through the built app over HTTP (what the editor's autosave sends), and the access matrix rows
 * for the editor and the engine's endpoints.
 */
import { describe, expect, it } from 'vitest';
import { MAX_BOXES, type FitReport, type PartDef } from '$lib/geometry';
import { DEMO_SPINE_OFFSETS, demoParts } from '$lib/geometry/standard-library';
import { variantSettingsSchema, type VariantSettings } from '$lib/builds/settings';
import { SceneRejected } from './builds';
import { buildRows } from './testing/builds-access-rows';
import {
	demoBuildIn,
	loadedVariant,
	saveOver as save,
	storedVariant,
	type TestBuild
} from './testing/builds';
import { createPart } from './catalog/parts';
import { runAccessMatrix } from './testing/access-matrix';
import { studioWithMembers } from './testing/factories';
import { useApp } from './testing/suite';

const app = useApp();

async function fixture() {
	const f = await studioWithMembers();
	const build = await demoBuildIn(f.studio.id, f.owner.id);
	return { ...f, build };
}

/** A change of everything a variant holds: positions, a moved, turned, locked part, margin and budgets. */
function changed(s: VariantSettings): VariantSettings {
	return {
		dividerPositions: { ...s.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] },
		bracketOffsets: { bar: 30 },
		placements: s.placements.map((p) =>
			p.id === 'pump-res'
				? {
						...p,
						position: [88.5, 226, 109.25],
						rotation: { x: 0, y: 2, z: 0 },
						locked: true,
						hidden: true
					}
				: p
		),
		marginMm: 1.5,
		budgets: { wattsPer120mm: 90, psuHeadroomPct: 35 }
	};
}

async function rejection(p: Promise<unknown>): Promise<SceneRejected> {
	const e = await p.then(
		() => null,
		(err: unknown) => err
	);
	expect(e, 'the save was refused').toBeInstanceOf(SceneRejected);
	return e as SceneRejected;
}

describe('save and load', () => {
	it('load returns exactly what was saved, and the version counts up by one', async () => {
		const { build } = await fixture();
		const next = changed(build.settings);
		const saved = await save(build, build.version, next);
		expect(saved).toMatchObject({ ok: true, version: build.version + 1 });
		const loaded = await loadedVariant(build);
		expect(loaded?.settings).toEqual(next);
		expect(loaded?.variant.version).toBe(build.version + 1);
		// The stored row itself, not only what the loader makes of it.
		expect(variantSettingsSchema.parse((await storedVariant(build.variantId)).settings)).toEqual(
			next
		);
	});

	it('a save against a stale version is a conflict carrying the stored scene; nothing is overwritten', async () => {
		const { build } = await fixture();
		const theirs = changed(build.settings);
		expect((await save(build, build.version, theirs)).ok).toBe(true);
		const before = await storedVariant(build.variantId);
		const mine = { ...build.settings, marginMm: 7 };
		const result = await save(build, build.version, mine);
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.conflict.version).toBe(build.version + 1);
		expect(result.conflict.settings).toEqual(theirs);
		expect(result.conflict.updatedAt.getTime()).toBe(before.updatedAt.getTime());
		expect(await storedVariant(build.variantId)).toEqual(before);
	});

	it('two saves over the same version at once: one wins, the other gets the winner as its conflict', async () => {
		const { build } = await fixture();
		const a = { ...build.settings, marginMm: 3 };
		const b = { ...build.settings, marginMm: 4 };
		const results = await Promise.all([
			save(build, build.version, a),
			save(build, build.version, b)
		]);
		expect(results.filter((r) => r.ok)).toHaveLength(1);
		const lost = results.find((r) => !r.ok);
		const stored = variantSettingsSchema.parse((await storedVariant(build.variantId)).settings);
		expect(lost && !lost.ok && lost.conflict.settings).toEqual(stored);
		expect((await storedVariant(build.variantId)).version).toBe(build.version + 1);
	});
});

describe('bad input: refused with the path of the problem, nothing saved', () => {
	async function refused(build: TestBuild, settings: unknown) {
		const before = await storedVariant(build.variantId);
		const e = await rejection(save(build, build.version, settings));
		expect(await storedVariant(build.variantId), 'the row is untouched').toEqual(before);
		return e;
	}

	it('a divider position that is not allowed → 400 at settings.dividerPositions.spine', async () => {
		const { build } = await fixture();
		const e = await refused(build, {
			...build.settings,
			dividerPositions: { ...build.settings.dividerPositions, spine: 100 }
		});
		expect(e.status).toBe(400);
		expect(e.issues).toContainEqual({
			path: 'settings.dividerPositions.spine',
			message: expect.stringMatching(/not an allowed position/)
		});
	});

	it.each([
		[
			'a bracket between its 10 mm steps → 400 at settings.bracketOffsets.bar',
			(s: VariantSettings) => ({ ...s, bracketOffsets: { bar: 35 } }),
			'settings.bracketOffsets.bar'
		],
		[
			'a divider the enclosure does not have → 400',
			(s: VariantSettings) => ({ ...s, dividerPositions: { ...s.dividerPositions, shelf: 10 } }),
			'settings.dividerPositions.shelf'
		]
	])('%s', async (_title, edit, path) => {
		const { build } = await fixture();
		const e = await refused(build, edit(build.settings));
		expect(e.status).toBe(400);
		expect(e.issues.map((i) => i.path)).toEqual([path]);
	});

	it(`more than ${MAX_BOXES} placed parts → 400 at settings.placements`, async () => {
		const { build } = await fixture();
		const p = build.settings.placements[0];
		const many = Array.from({ length: MAX_BOXES + 1 }, (_, i) => ({ ...p, id: `p${i}` }));
		const e = await refused(build, { ...build.settings, placements: many });
		expect(e.status).toBe(400);
		expect(e.issues.map((i) => i.path)).toContain('settings.placements');
	});

	it(`a scene that resolves to more than ${MAX_BOXES} boxes → 400 at settings.placements`, async () => {
		const { build, studio } = await fixture();
		// A part of 100 bodies placed 60 times: 6,000 boxes with only 60 placements.
		const bodies = Array.from({ length: 100 }, (_, i) => ({
			id: `b${i}`,
			label: `slice ${i}`,
			box: { min: [0, i * 0.1, 0], max: [5, i * 0.1 + 0.1, 5] }
		}));
		const created = await createPart(studio.id, {
			name: 'Many-slice test block',
			category: 'other',
			bodies,
			keepouts: [],
			ports: [],
			specs: {},
			provenance: 'estimate',
			toleranceMm: 0
		});
		if (!created.ok) throw new Error(JSON.stringify(created));
		const placements = Array.from({ length: 60 }, (_, i) => ({
			id: `s${i}`,
			partId: created.value.id,
			position: [10 + (i % 10) * 6, 10 + Math.floor(i / 10) * 12, 80]
		}));
		const e = await refused(build, { ...build.settings, placements });
		expect(e.status).toBe(400);
		expect(e.issues).toContainEqual({
			path: 'settings.placements',
			message: expect.stringMatching(/6\d{3} boxes; at most 5000/)
		});
	});

	it('a part from another studio → 403 at its placement, even when it exists', async () => {
		const { build, otherStudio } = await fixture();
		const theirs = await createPart(otherStudio.id, {
			...(demoParts().find((p) => p.id === 'demo-card') as PartDef),
			name: 'Another studio’s card'
		});
		if (!theirs.ok) throw new Error(JSON.stringify(theirs));
		const placements = build.settings.placements.map((p) =>
			p.id === 'card' ? { ...p, partId: theirs.value.id } : p
		);
		const e = await refused(build, { ...build.settings, placements });
		expect(e.status).toBe(403);
		expect(e.issues.map((i) => i.path)).toEqual([
			`settings.placements[${placements.findIndex((p) => p.id === 'card')}].partId`
		]);
	});

	it('settings that are not settings at all → 400 with paths', async () => {
		const { build } = await fixture();
		const e = await refused(build, { ...build.settings, marginMm: -1, placements: 'none' });
		expect(e.status).toBe(400);
		expect(e.issues.map((i) => i.path).sort()).toEqual([
			'settings.marginMm',
			'settings.placements'
		]);
	});
});

describe('over HTTP, through the built app', () => {
	const base = (b: TestBuild) => `/api/builds/${b.buildId}/variants/${b.variantId}`;
	const json = (c: ReturnType<typeof app.client>, method: string, path: string, body: unknown) =>
		c.request(method, path, {
			body: JSON.stringify(body),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app.baseURL
			}
		});

	it('the designer saves (200 with the server’s report), reads it back, and a stale save gets 409 with the stored scene', async () => {
		const { build, designer } = await fixture();
		const c = app.client({ session: designer.session });
		const next = changed(build.settings);
		const ok = await json(c, 'PUT', base(build), { version: build.version, settings: next });
		expect(ok.status, ok.text).toBe(200);
		const body = ok.json<{ version: number; report: FitReport }>();
		expect(body.version).toBe(build.version + 1);
		// At "2 slots" the demo card collides with the spine (the fixture's known answer).
		expect(
			body.report.overlaps.some(
				(o) => o.kind === 'collides' && [o.a.ownerId, o.b.ownerId].includes('spine')
			)
		).toBe(true);
		const got = await c.get(base(build), { accept: 'application/json' });
		expect(got.json()).toMatchObject({ version: build.version + 1, settings: next });

		const stale = await json(c, 'PUT', base(build), {
			version: build.version,
			settings: build.settings
		});
		expect(stale.status).toBe(409);
		expect(stale.json()).toMatchObject({
			conflict: { version: build.version + 1, settings: next }
		});
		expect((await storedVariant(build.variantId)).version).toBe(build.version + 1);
	});

	it('a position not allowed → 400 with the path; a part of another studio → 403; nothing saved', async () => {
		const { build, designer, otherStudio } = await fixture();
		const c = app.client({ session: designer.session });
		const before = await storedVariant(build.variantId);
		const bad = await json(c, 'PUT', base(build), {
			version: build.version,
			settings: { ...build.settings, dividerPositions: { bulkhead: 64, spine: 90 } }
		});
		expect(bad.status).toBe(400);
		expect(bad.json<{ issues: { path: string }[] }>().issues.map((i) => i.path)).toEqual([
			'settings.dividerPositions.spine'
		]);

		const foreign = await createPart(otherStudio.id, {
			...(demoParts().find((p) => p.id === 'demo-pump-res') as PartDef)
		});
		if (!foreign.ok) throw new Error(JSON.stringify(foreign));
		const placements = build.settings.placements.map((p) =>
			p.id === 'pump-res' ? { ...p, partId: foreign.value.id } : p
		);
		const forbidden = await json(c, 'PUT', base(build), {
			version: build.version,
			settings: { ...build.settings, placements }
		});
		expect(forbidden.status).toBe(403);
		expect(forbidden.text).not.toContain('Another');
		const check = await json(c, 'POST', `/api/builds/${build.buildId}/check`, {
			settings: { ...build.settings, placements }
		});
		expect(check.status).toBe(403);
		expect(await storedVariant(build.variantId)).toEqual(before);
	});

	it('a client of the studio gets 403 on the editor page and on the save, and nothing is saved', async () => {
		const { build, client } = await fixture();
		const c = app.client({ session: client.session });
		const before = await storedVariant(build.variantId);
		expect((await c.get(`/builds/${build.buildId}`)).status).toBe(403);
		const put = await json(c, 'PUT', base(build), {
			version: build.version,
			settings: changed(build.settings)
		});
		expect(put.status).toBe(403);
		expect(await storedVariant(build.variantId)).toEqual(before);
	});

	it('a body that is not JSON → 400, one over 4 MB → 413', async () => {
		const { build, designer } = await fixture();
		const c = app.client({ session: designer.session });
		const notJson = await c.request('PUT', base(build), {
			body: '{"version": 1,',
			headers: { 'content-type': 'application/json', origin: app.baseURL }
		});
		expect(notJson.status).toBe(400);
		const huge = await c.request('PUT', base(build), {
			body: JSON.stringify({ version: 1, settings: { pad: 'x'.repeat(4 * 1024 * 1024 + 10) } }),
			headers: { 'content-type': 'application/json', origin: app.baseURL }
		});
		expect(huge.status).toBe(413);
	});

	it('the checks answer 400 with paths, not 500, for a body that does not validate', async () => {
		const { build, designer } = await fixture();
		const c = app.client({ session: designer.session });
		const settings = await json(c, 'POST', `/api/builds/${build.buildId}/check`, {
			settings: { ...build.settings, marginMm: 'wide' }
		});
		expect(settings.status).toBe(400);
		expect(settings.json<{ issues: { path: string }[] }>().issues.map((i) => i.path)).toEqual([
			'settings.marginMm'
		]);
		const position = await json(c, 'POST', `/api/builds/${build.buildId}/check`, {
			settings: { ...build.settings, bracketOffsets: { bar: 5 } }
		});
		expect(position.status).toBe(400);
		expect(position.json<{ issues: { path: string }[] }>().issues.map((i) => i.path)).toEqual([
			'settings.bracketOffsets.bar'
		]);
		const scene = await json(c, 'POST', '/api/check', {
			format: 'interstice.scene',
			version: 1,
			enclosure: { name: 'no size' }
		});
		expect(scene.status).toBe(400);
		expect(scene.json<{ issues: { path: string }[] }>().issues.map((i) => i.path)).toContain(
			'enclosure.outerMm'
		);
	});
});

runAccessMatrix(buildRows, app);
