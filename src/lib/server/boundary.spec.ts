/**
 * Strings and numbers at the boundary, against the built app: each request below answered 500 in
 * a probe (a NUL byte reached PostgreSQL, or a number overflowed an integer column), and the
 * redirect payloads sent people off-site. Now each is a 400 naming the field, writing nothing.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { demoParts } from '$lib/geometry/standard-library';
import { controlCharField, controlCharPath } from './boundary';
import { demoBuildIn, storedVariant, type TestBuild } from './testing/builds';
import { studioWithMembers, type TestMember } from './testing/factories';
import { useApp } from './testing/suite';

const app = useApp();
let designer: TestMember;
let build: TestBuild;

beforeAll(async () => {
	const f = await studioWithMembers();
	designer = f.designer;
	build = await demoBuildIn(f.studio.id, f.designer.id);
});

const NUL = '\u0000';
const as = () => app.client({ session: designer.session });

describe('a NUL byte on each route a probe found', () => {
	it('in a search term: GET /api/parts?q=%00', async () => {
		const res = await as().request('GET', '/api/parts?search=1&q=%00', {
			headers: { accept: 'application/json' }
		});
		expect(res.status).toBe(400);
		expect(res.json<{ message: string }>().message).toMatch(/"q" contains control characters/);
	});

	it('in a path: GET /builds/%00 (and other control characters)', async () => {
		for (const bad of ['%00', '%0A', 'abc%09def']) {
			const res = await as().get(`/builds/${bad}`);
			expect(res.status, bad).toBe(400);
			expect(res.text).toMatch(/"id" contains control characters/);
		}
	});

	it('in a form id: photo delete, link revoke, checklist tick', async () => {
		const posts: [string, Record<string, string>, string][] = [
			[`/builds/${build.buildId}/photos?/delete`, { photoId: NUL }, 'photoId'],
			[`/builds/${build.buildId}/share?/revoke`, { linkId: `x${NUL}` }, 'linkId'],
			[
				`/builds/${build.buildId}/sheet?/tick`,
				{ variantId: build.variantId, key: `fit${NUL}`, ticked: '1' },
				'key'
			],
			[
				`/builds/${build.buildId}/sheet?/tick`,
				{ variantId: NUL, key: 'x', ticked: '1' },
				'variantId'
			]
		];
		for (const [path, fields, field] of posts) {
			const r = await as().action(path, fields);
			expect(r.status, path).toBe(400);
			expect(r.data.errors[field], path).toMatch(/control characters/);
		}
	});

	it('in a part id inside a check', async () => {
		const settings = {
			...build.settings,
			placements: build.settings.placements.map((p, i) =>
				i === 0 ? { ...p, partId: `${p.partId}${NUL}` } : p
			)
		};
		const res = await as().request('POST', `/api/builds/${build.buildId}/check`, {
			body: JSON.stringify({ settings }),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app.baseURL
			}
		});
		expect(res.status).toBe(400);
		expect(res.json<{ issues: { path: string }[] }>().issues[0].path).toBe(
			'settings.placements.0.partId'
		);
	});

	it('in a session cookie: no session, not an error', async () => {
		const res = await app.client({ session: `abc${NUL}` }).get('/account');
		expect(res.status).toBe(303);
	});
});

describe('integers against their column', () => {
	it('a variant version of 2³¹ or more is a 400 naming version, and nothing is saved', async () => {
		const before = await storedVariant(build.variantId);
		for (const version of [2 ** 31, 2 ** 53, 1e300]) {
			const res = await as().request(
				'PUT',
				`/api/builds/${build.buildId}/variants/${build.variantId}`,
				{
					body: JSON.stringify({ version, settings: build.settings }),
					headers: {
						'content-type': 'application/json',
						accept: 'application/json',
						origin: app.baseURL
					}
				}
			);
			expect(res.status, String(version)).toBe(400);
			expect(res.json<{ issues: { path: string }[] }>().issues[0].path).toBe('version');
		}
		expect(await storedVariant(build.variantId)).toEqual(before);
	});

	it('a catalogue page number far past the end is answered, not an overflow', async () => {
		for (const page of ['1e300', '9007199254740993', '-5']) {
			const res = await as().request('GET', `/api/parts?page=${page}&size=100`, {
				headers: { accept: 'application/json' }
			});
			expect(res.status, page).toBe(200);
		}
		for (const limit of ['1e300', '-1']) {
			const res = await as().request('GET', `/api/parts?search=1&limit=${limit}`, {
				headers: { accept: 'application/json' }
			});
			expect(res.status, limit).toBe(200);
		}
	});
});

describe('numbers against float4 columns', () => {
	it('a part with a tolerance of 1e-300 mm is saved, not a PostgreSQL underflow', async () => {
		// Found by the fuzz test (fuzz.spec.ts): the sizes and tolerance columns are `real`.
		const p = demoParts().find((x) => !x.id.startsWith('std-'))!;
		const res = await as().request('POST', '/api/parts', {
			body: JSON.stringify({ ...p, provenance: 'measured', toleranceMm: 1e-300 }),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app.baseURL
			}
		});
		expect(res.status).toBe(201);
		expect(res.json<{ part: { def: { toleranceMm: number } } }>().part.def.toleranceMm).toBe(
			1e-300
		);
	});
});

describe('redirect payloads over HTTP', () => {
	it('a signed-in visit to /signin never leaves the site', async () => {
		for (const next of [
			'/%09/evil.example',
			'/%0Aevil',
			'//evil.example',
			'/%5Cevil.example',
			'https://evil.example',
			'/\\evil.example'
		]) {
			const res = await as().get(`/signin?next=${next}`);
			expect(res.status, next).toBeLessThan(500);
			if (res.status === 303) expect(res.location, next).toBe('/builds');
		}
		expect((await as().get('/signin?next=/parts')).location).toBe('/parts');
	});

	it('a sign-in post with a tab or backslash target lands on the builds', async () => {
		for (const next of ['/\t/evil.example', '/\\evil.example', '//evil.example']) {
			const res = await app
				.client()
				.postForm('/signin', { email: designer.email, password: designer.password, next });
			expect(res.status, next).toBe(303);
			expect(res.location, next).toBe('/builds');
		}
	});
});

describe('the guards themselves', () => {
	it('name the first form field with a control character; tabs and line breaks are text', () => {
		expect(
			controlCharField([
				['a', 'fine'],
				['b', 'x\u0000'],
				['c', '\u0001']
			])
		).toBe('b');
		expect(controlCharField([['notes', 'line one\r\n\tline two']])).toBeNull();
	});

	it('give the JSON path, and survive a body nested far deeper than any stack', () => {
		expect(controlCharPath({ a: [{ b: 'ok' }, { c: 'bad\u0007' }] })).toBe('a.1.c');
		expect(controlCharPath({ 'k\u0000': 1 })).toBe('k\\u0000');
		let deep: unknown = 'x\u0000';
		for (let i = 0; i < 200_000; i++) deep = [deep];
		expect(controlCharPath(deep)).toMatch(/^0(\.0)+$/);
	});
});
