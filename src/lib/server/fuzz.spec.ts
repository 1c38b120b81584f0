/**
 * Fuzzing the built app with fast-check: the JSON endpoints' bodies and query strings and the form
 * actions' fields, each case a valid request with one part made hostile (a NUL byte, a lone
 * surrogate, 5,000 characters, 2³¹, 1e300, the wrong type, a missing key, not JSON at all) or
 * something random altogether. Every case must hold three things:
 *
 * - never a 5xx;
 * - a 4xx writes nothing: a digest of every row the fuzzing accounts and their studio can reach
 *   (builds, variants, parts, enclosures, links, quotes, photos, ticks, members, invitations,
 *   sessions, reset and confirmation links, queued mail) is the same before and after;
 * - an answer within a generous time budget (TIME_BUDGET_MS; a slow, shared machine still meets it).
 *
 * FUZZ_CASES (default 2000) and FUZZ_SEED pick the run; the case count and the status histogram are
 * printed at the end.
 */
import fc from 'fast-check';
import { sql } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { demoEnclosure, demoParts, demoSceneInput } from '$lib/geometry/standard-library';
import { demoBuildIn, type TestBuild } from './testing/builds';
import { demoLoopBackRun } from './testing/engine-factories';
import { db } from './db';
import { createShareLink } from './sharing/links';
import {
	clearRateLimits,
	ownerInvite,
	studioWithMembers,
	unique,
	type TestMember
} from './testing/factories';
import { randomLoopback, type Client } from './testing/client';
import { useApp } from './testing/suite';

const app = useApp();

const CASES = Number(process.env.FUZZ_CASES ?? 2000);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : Date.now() % 2 ** 31;
/** Far above any real answer here (tens of milliseconds): a hang or a runaway computation, not a slow disk. */
const TIME_BUDGET_MS = 10_000;
/** Every fuzzed address that could make an account ends here, so its rows are in the digest. */
const DOMAIN = `${unique('fuzz')}.test`;

let f: Awaited<ReturnType<typeof studioWithMembers>>;
let build: TestBuild;
let linkId: string;
let inviteId: string;
let partId: string;

beforeAll(async () => {
	f = await studioWithMembers();
	build = await demoBuildIn(f.studio.id, f.designer.id);
	partId = Object.values(build.partIds).find((id) => !id.startsWith('std-'))!;
	linkId = (
		await createShareLink({
			studioId: f.studio.id,
			buildId: build.buildId,
			variantId: build.variantId,
			createdBy: f.designer.id,
			recipientEmail: '',
			recipientName: '',
			expiresAt: null
		})
	).link.id;
	inviteId = (await ownerInvite(f, 'client', `invitee@${DOMAIN}`)).id;
});

/* ---------- what the rows look like ---------- */

/**
 * Per table: the row count and one md5 over every row version the fuzzing can reach. Each row is
 * named by its system columns `xmin` (the transaction that wrote this version) and `ctid` (where
 * it lies), so any insert, update or delete changes the digest without reading the rows' large
 * JSON. Scoped to the fixture's studio and accounts (other test files write to the same database
 * at the same time). Rate-limit counters are left out: they count refusals too.
 */
async function digest(): Promise<Record<string, string>> {
	const studio = f.studio.id;
	const people = [f.owner, f.designer, f.client, f.outsider].map((m) => m.id);
	const like = `%@${DOMAIN}`;
	const accounts = sql`(select id from acc)`;
	const builds = sql`(select id from b)`;
	const tables: Record<string, ReturnType<typeof sql>> = {
		studio: sql`select xmin::text as x, ctid::text as c from studio where id = ${studio} or id in (select studio_id from membership where user_id in ${accounts})`,
		user: sql`select xmin::text as x, ctid::text as c from "user" where id in ${accounts}`,
		session: sql`select xmin::text as x, ctid::text as c from session where user_id in ${accounts}`,
		membership: sql`select xmin::text as x, ctid::text as c from membership where studio_id = ${studio} or user_id in ${accounts}`,
		invite: sql`select xmin::text as x, ctid::text as c from invite where studio_id = ${studio}`,
		password_reset: sql`select xmin::text as x, ctid::text as c from password_reset where user_id in ${accounts}`,
		email_verification: sql`select xmin::text as x, ctid::text as c from email_verification where user_id in ${accounts}`,
		mail_outbox: sql`select xmin::text as x, ctid::text as c from mail_outbox where recipient in (select email from acc) or recipient like ${like}`,
		build: sql`select xmin::text as x, ctid::text as c from build where studio_id = ${studio}`,
		variant: sql`select xmin::text as x, ctid::text as c from variant where build_id in ${builds}`,
		part: sql`select xmin::text as x, ctid::text as c from part where studio_id = ${studio}`,
		enclosure: sql`select xmin::text as x, ctid::text as c from enclosure where studio_id = ${studio}`,
		enclosure_version: sql`select xmin::text as x, ctid::text as c from enclosure_version where enclosure_id in (select id from enclosure where studio_id = ${studio})`,
		share_link: sql`select xmin::text as x, ctid::text as c from share_link where build_id in ${builds}`,
		build_comment: sql`select xmin::text as x, ctid::text as c from build_comment where build_id in ${builds}`,
		variant_approval: sql`select xmin::text as x, ctid::text as c from variant_approval where build_id in ${builds}`,
		quote: sql`select xmin::text as x, ctid::text as c from quote where build_id in ${builds}`,
		payment: sql`select xmin::text as x, ctid::text as c from payment where build_id in ${builds}`,
		photo: sql`select xmin::text as x, ctid::text as c from photo where build_id in ${builds}`,
		checklist_tick: sql`select xmin::text as x, ctid::text as c from checklist_tick where build_id in ${builds}`
	};
	const parts = Object.entries(tables).map(
		([name, q]) =>
			sql`select ${name} as t, count(*)::int as n, coalesce(md5(string_agg(r.x || '@' || r.c, '|' order by r.c)), '') as h from (${q}) r`
	);
	// The fuzzing accounts and the studio's builds once, then every table against them.
	const rows = await db.execute<{ t: string; n: number; h: string }>(sql`
		with acc as materialized (select id, email from "user" where id in (${sql.join(
			people.map((p) => sql`${p}`),
			sql`, `
		)}) or email like ${like}),
			b as materialized (select id from build where studio_id = ${studio})
		${sql.join(parts, sql` union all `)}`);
	return Object.fromEntries([...rows].map((r) => [r.t, `${r.n}:${r.h}`]));
}

/** Mail queued by an accepted request is sent in the background; wait until it is, so it is not
 * counted against the next case. */
async function outboxSettled() {
	for (let i = 0; i < 100; i++) {
		const [r] = await db.execute<{ n: number }>(
			sql`select count(*)::int as n from mail_outbox where done_at is null and (recipient like ${`%@${DOMAIN}`} or recipient in (${f.owner.email}, ${f.designer.email}, ${f.client.email}))`
		);
		if (r.n === 0) return;
		await new Promise((r) => setTimeout(r, 50));
	}
}

/* ---------- hostile values ---------- */

const nastyStrings = fc.constantFrom(
	'\u0000',
	'a\u0000b',
	'%00',
	'\t',
	'\r\n',
	'\u0007',
	'\u007f',
	'\ud800',
	'😀',
	'',
	' ',
	'x'.repeat(5000),
	'../../etc/passwd',
	"'; drop table build; --",
	'=HYPERLINK("https://evil.example","x")',
	'<script>alert(1)</script>',
	'//evil.example',
	'/\\evil.example',
	'-1',
	'1e309',
	'NaN',
	'null',
	'{}',
	'[]'
);
const str = fc.oneof(
	nastyStrings,
	fc.string({ unit: 'binary', maxLength: 40 }),
	fc.string({ maxLength: 12 })
);
const num = fc.oneof(
	fc.constantFrom(
		2 ** 31,
		2 ** 31 - 1,
		-(2 ** 31) - 1,
		2 ** 53,
		1e300,
		-1e300,
		-1,
		0,
		-0,
		0.5,
		1e-300
	),
	fc.integer(),
	fc.double({ noNaN: true, noDefaultInfinity: true })
);
const anyJson: fc.Arbitrary<unknown> = fc.oneof(
	str,
	num,
	fc.boolean(),
	fc.constant(null),
	fc.array(fc.oneof(str, num), { maxLength: 4 }),
	fc.dictionary(str, fc.oneof(str, num), { maxKeys: 3 })
);

/** Every path to a value in `v` (objects and arrays, at most 6 deep and 400 paths). */
function pathsOf(
	v: unknown,
	prefix: (string | number)[] = [],
	out: (string | number)[][] = []
): (string | number)[][] {
	if (out.length >= 400 || prefix.length > 6) return out;
	if (prefix.length) out.push(prefix);
	if (Array.isArray(v)) v.forEach((x, i) => pathsOf(x, [...prefix, i], out));
	else if (v && typeof v === 'object') {
		for (const [k, x] of Object.entries(v)) pathsOf(x, [...prefix, k], out);
	}
	return out;
}

function setAt(root: unknown, path: (string | number)[], value: unknown, remove: boolean): unknown {
	const copy = structuredClone(root) as Record<string | number, unknown>;
	let at = copy as Record<string | number, unknown>;
	for (const k of path.slice(0, -1)) at = at[k] as Record<string | number, unknown>;
	const last = path[path.length - 1];
	if (remove) {
		if (Array.isArray(at)) at.splice(Number(last), 1);
		else delete at[last];
	} else at[last] = value;
	return copy;
}

/** A valid body with one value replaced or removed; now and then something else altogether. */
function mutated(valid: () => unknown): fc.Arbitrary<string> {
	const paths = pathsOf(valid());
	return fc.oneof(
		{
			weight: 8,
			arbitrary: fc
				.tuple(fc.nat({ max: paths.length - 1 }), anyJson, fc.boolean())
				.map(([i, v, remove]) => JSON.stringify(setAt(valid(), paths[i], v, remove && i % 3 === 0)))
		},
		{ weight: 1, arbitrary: fc.constant(JSON.stringify(valid())) },
		{
			weight: 1,
			arbitrary: fc.oneof(
				fc.jsonValue({ maxDepth: 3 }).map((v) => JSON.stringify(v)),
				str,
				fc.constantFrom('', '{', '{"a":', '[1,2', '\u0000', 'null')
			)
		}
	);
}

/** Field values for forms: mostly the valid one, else hostile. */
const field = (valid: () => string) =>
	fc.oneof(
		{ weight: 2, arbitrary: fc.constant(null).map(valid) },
		{ weight: 3, arbitrary: str },
		{ weight: 1, arbitrary: num.map(String) }
	);
const email = fc.oneof(
	str,
	fc.stringMatching(/^[a-z0-9.]{1,12}$/).map((s) => `${s}@${DOMAIN}`),
	fc.constant(null).map(() => f.designer.email)
);
const QUERY_KEYS = [
	'q',
	'category',
	'page',
	'size',
	'limit',
	'ids',
	'search',
	'sort',
	'dir',
	'scope',
	'archived',
	'studio',
	'variants',
	'variant',
	'next'
];
/** Query strings: known keys (and odd ones) with hostile values, or real ids now and then. */
const query = () =>
	fc.dictionary(
		fc.oneof(fc.constantFrom(...QUERY_KEYS), str),
		fc.oneof(
			str,
			num.map(String),
			fc.constantFrom(
				'1',
				'studio',
				'desc',
				'name',
				build.variantId,
				`${build.variantId},${build.variantId}`,
				f.studio.id
			)
		),
		{ maxKeys: 4 }
	);

/* ---------- the requests ---------- */

type Who = 'designer' | 'owner' | 'outsider' | 'anonymous';
type Req = {
	name: string;
	who: Who;
	method: string;
	path: string;
	json?: string;
	form?: Record<string, string>;
};

/** Percent-encoding that also takes a lone surrogate (sent as the raw, invalid UTF-8 bytes). */
const pathPart = (s: string) => {
	try {
		return encodeURIComponent(s);
	} catch {
		return '%ED%A0%80';
	}
};

const qs = (params: Record<string, string>) => {
	const s = new URLSearchParams(params).toString();
	return s ? `?${s}` : '';
};

const validPart = () => {
	const p = demoParts().find((x) => !x.id.startsWith('std-'))!;
	return { ...p, provenance: 'measured' };
};

function targets(): fc.Arbitrary<Req>[] {
	const B = build.buildId;
	const V = build.variantId;
	const api = (name: string, method: string, path: string, body: fc.Arbitrary<string>) =>
		body.map((json): Req => ({ name, who: 'designer', method, path, json }));
	const get = (name: string, path: string, who: Who = 'designer') =>
		query().map((q): Req => ({ name, who, method: 'GET', path: path + qs(q) }));
	const form = (
		name: string,
		path: string,
		fields: Record<string, fc.Arbitrary<string>>,
		who: Who = 'designer'
	) => fc.record(fields).map((values): Req => ({ name, who, method: 'POST', path, form: values }));
	return [
		api(
			'POST /api/check',
			'POST',
			'/api/check',
			mutated(() => demoSceneInput())
		),
		api(
			'POST /api/routes',
			'POST',
			'/api/routes',
			mutated(() => ({
				scene: demoSceneInput(),
				run: demoLoopBackRun()
			}))
		),
		api(
			'POST /api/sweep',
			'POST',
			'/api/sweep',
			mutated(() => ({
				scene: demoSceneInput(),
				control: { kind: 'bracket', id: 'bar' },
				positions: [0, 10, 20]
			}))
		),
		api(
			'POST /api/builds/[id]/check',
			'POST',
			`/api/builds/${B}/check`,
			mutated(() => ({ settings: build.settings }))
		),
		api(
			'PUT /api/builds/[id]/variants/[v]',
			'PUT',
			`/api/builds/${B}/variants/${V}`,
			mutated(() => ({ version: build.version, settings: build.settings }))
		),
		api('POST /api/parts', 'POST', '/api/parts', mutated(validPart)),
		api(
			'PUT /api/parts/[id]',
			'PUT',
			`/api/parts/${partId}`,
			mutated(() => ({ ...validPart(), revision: 1 }))
		),
		api(
			'PATCH /api/parts/[id]',
			'PATCH',
			`/api/parts/${partId}`,
			mutated(() => ({ archived: true, revision: 1 }))
		),
		api(
			'POST /api/enclosures',
			'POST',
			'/api/enclosures',
			mutated(() => ({ definition: demoEnclosure(), note: 'fuzz' }))
		),
		api(
			'PUT /api/enclosures/[id]',
			'PUT',
			`/api/enclosures/${build.enclosureId}`,
			mutated(() => ({ definition: demoEnclosure(), note: 'fuzz', revision: 1 }))
		),
		get('GET /api/parts', '/api/parts'),
		get('GET /api/enclosures', '/api/enclosures'),
		get('GET /api/parts/export', '/api/parts/export'),
		get('GET /builds/[id]/compare.csv', `/builds/${B}/compare.csv`),
		get('GET /parts', '/parts'),
		get('GET /builds/[id]', `/builds/${B}`),
		get('GET /signin', '/signin', 'anonymous'),
		str.map((s): Req => ({
			name: 'GET /builds/[id] (id)',
			who: 'designer',
			method: 'GET',
			path: `/builds/${pathPart(s)}`
		})),
		str.map((s): Req => ({
			name: 'GET /api/parts/[id] (id)',
			who: 'designer',
			method: 'GET',
			path: `/api/parts/${pathPart(s)}`
		})),
		form(
			'POST /signin',
			'/signin',
			{ email, password: field(() => 'not-the-password-9'), next: field(() => '/builds') },
			'anonymous'
		),
		form(
			'POST /signup',
			'/signup',
			{
				name: field(() => 'Fuzz Person'),
				email,
				password: field(() => 'long-enough-1'),
				next: field(() => '/account')
			},
			'anonymous'
		),
		form('POST /reset', '/reset', { email }, 'anonymous'),
		// The outsider: a new studio becomes its maker's active one, and the designer must stay in theirs.
		form('POST /studios/new', '/studios/new', { name: field(() => 'Fuzz Bench') }, 'outsider'),
		form('POST /builds/new', '/builds/new', {
			name: field(() => 'Fuzz build'),
			clientName: field(() => ''),
			notes: field(() => ''),
			enclosureId: field(() => build.enclosureId)
		}),
		form('POST /builds/[id]/share?/revoke', `/builds/${B}/share?/revoke`, {
			linkId: field(() => linkId)
		}),
		form('POST /builds/[id]/share?/comment', `/builds/${B}/share?/comment`, {
			body: field(() => 'A note'),
			variantId: field(() => V),
			part: field(() => '')
		}),
		form('POST /builds/[id]/photos?/delete', `/builds/${B}/photos?/delete`, {
			photoId: field(() => 'no-such-photo')
		}),
		form('POST /builds/[id]/photos?/caption', `/builds/${B}/photos?/caption`, {
			photoId: field(() => 'no-such-photo'),
			caption: field(() => 'Front')
		}),
		form('POST /builds/[id]/sheet?/tick', `/builds/${B}/sheet?/tick`, {
			variantId: field(() => V),
			key: field(() => 'no-such-item'),
			ticked: field(() => '1')
		}),
		form('POST /builds/[id]/variants?/rename', `/builds/${B}/variants?/rename`, {
			variantId: field(() => V),
			name: field(() => 'Variant A')
		}),
		form('POST /builds/[id]/variants?/move', `/builds/${B}/variants?/move`, {
			variantId: field(() => V),
			by: field(() => '1')
		}),
		form('POST /parts?/archive', '/parts?/archive', { id: field(() => 'no-such-part') }),
		form('POST /parts?/duplicate', '/parts?/duplicate', { id: field(() => 'no-such-part') }),
		form(
			'POST /studio/members?/revoke',
			'/studio/members?/revoke',
			{ inviteId: field(() => `${inviteId}-not`) },
			'owner'
		),
		form(
			'POST /studio/members?/role',
			'/studio/members?/role',
			{ userId: field(() => f.client.id), role: field(() => 'client') },
			'owner'
		)
	];
}

function clientFor(who: Who, address: string): Client {
	const member: TestMember | null = who === 'anonymous' ? null : f[who];
	return app.client({ address, session: member?.session });
}

async function send(req: Req, address: string) {
	const c = clientFor(req.who, address);
	const request = req.form
		? c.postForm(req.path, req.form)
		: c.request(req.method, req.path, {
				body: req.json,
				headers: {
					accept: 'application/json',
					origin: app.baseURL,
					...(req.json !== undefined ? { 'content-type': 'application/json' } : {})
				}
			});
	let timer: ReturnType<typeof setTimeout> | undefined;
	const late = new Promise<never>(
		(_, fail) =>
			(timer = setTimeout(
				() => fail(new Error(`no answer within ${TIME_BUDGET_MS} ms`)),
				TIME_BUDGET_MS
			))
	);
	try {
		return await Promise.race([request, late]);
	} finally {
		clearTimeout(timer);
	}
}

describe('fuzzing the API bodies, query strings and form fields', () => {
	it(
		`${CASES} cases: never a 5xx, never a write on a 4xx, always an answer in time`,
		{ timeout: 600_000 },
		async () => {
			const histogram = new Map<number, number>();
			const byTarget = new Map<string, Map<number, number>>();
			let cases = 0;
			let slowestMs = 0;
			// Own addresses, so sign-in and reset limits never reach other tests; cleared now and then
			// so the fuzzing keeps reaching the code behind them.
			const addresses = Array.from({ length: 4 }, () => randomLoopback());
			let before = await digest();
			const started = Date.now();
			await fc.assert(
				fc.asyncProperty(
					fc.oneof(...targets()),
					fc.nat({ max: addresses.length - 1 }),
					async (req, a) => {
						cases++;
						if (cases % 200 === 0) await Promise.all(addresses.map(clearRateLimits));
						const t0 = Date.now();
						const res = await send(req, addresses[a]);
						slowestMs = Math.max(slowestMs, Date.now() - t0);
						histogram.set(res.status, (histogram.get(res.status) ?? 0) + 1);
						const mine = byTarget.get(req.name) ?? new Map<number, number>();
						mine.set(res.status, (mine.get(res.status) ?? 0) + 1);
						byTarget.set(req.name, mine);
						const shown = `${req.method} ${req.path.slice(0, 200)} ${JSON.stringify(req.form ?? req.json ?? '').slice(0, 300)} → ${res.status} ${res.text.slice(0, 300)}`;
						expect(res.status, shown).toBeLessThan(500);
						if (res.status >= 400) {
							const after = await digest();
							expect(after, `a ${res.status} wrote: ${shown}`).toEqual(before);
						} else {
							await outboxSettled();
							before = await digest();
						}
					}
				),
				{ numRuns: CASES, seed: SEED, endOnFailure: true }
			);
			const seconds = (Date.now() - started) / 1000;
			const h = [...histogram]
				.sort(([x], [y]) => x - y)
				.map(([s, n]) => `${s}: ${n}`)
				.join(', ');
			console.log(
				`fuzz: ${cases} cases in ${seconds.toFixed(1)} s (seed ${SEED}), slowest answer ${slowestMs} ms; statuses ${h}; 5xx: 0`
			);
			for (const [name, m] of [...byTarget].sort()) {
				console.log(
					`  ${name}: ${[...m]
						.sort(([x], [y]) => x - y)
						.map(([s, n]) => `${s}×${n}`)
						.join(' ')}`
				);
			}
			expect(cases).toBeGreaterThanOrEqual(CASES);
		}
	);
});
