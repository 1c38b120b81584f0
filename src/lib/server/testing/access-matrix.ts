/**
 * The access matrix: every route and action × every kind of visitor → the answer expected.
 *
 * A row names one route (and action or method), how to call it, and what each visitor gets. The
 * runner gives each row (each cell, for requests that change things) a fresh studio with an owner,
 * a designer and a client, plus an outsider who owns another studio, and checks three things:
 *   1. the status (and redirect target) is exactly the expected one;
 *   2. the outsider never sees the studio's name or its members' e-mails (routes without a studio
 *      in the address act on the visitor's own studio, so "200" for the outsider means "their own");
 *   3. when a row declares `changes`, the request changed the studio exactly for those visitors.
 * `routeInventory()` lists what exists under src/routes, so a route without a row fails the test.
 *
 * To add routes: export your rows (a MatrixRow[]) from `src/lib/server/testing/<area>-access-rows.ts`
 * and run them from your own spec with
 * `runAccessMatrix(rows, useApp())`. The coverage check in src/lib/server/access-matrix.spec.ts finds
 * such modules itself and counts their rows as covered.
 */
import { describe, it } from 'vitest';
import type { Client, Fields } from './client';
import { ownerInvite, studioWithMembers } from './factories';

export const VISITORS = ['owner', 'designer', 'client', 'outsider', 'anonymous'] as const;
export type Visitor = (typeof VISITORS)[number];

export type Expected = number | { status: number; location: string | RegExp };

/** The sign-in page, remembering where the visitor wanted to go. */
export const SIGN_IN: Expected = { status: 303, location: /^\/signin\?next=%2F/ };
/** A redirect to exactly this address. */
export const to = (location: string): Expected => ({ status: 303, location });

export type MatrixFixture = Awaited<ReturnType<typeof studioWithMembers>> & {
	/** An open invitation (designer) to the studio. */
	invite: { id: string; token: string; email: string };
	/** Anything a row's `setup` adds (ids of builds, parts, …). */
	vars: Record<string, string>;
};

export type MatrixRow = {
	/** SvelteKit route id, as in src/routes: '/invite/[token]'. */
	route: string;
	method: 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE';
	/** The form action for POSTs to a page ('default' for an unnamed one). */
	action?: string;
	/** The address to call; defaults to the route id (plus `?/action`). */
	path?: (f: MatrixFixture) => string;
	/** Form fields (pages) … */
	form?: (f: MatrixFixture) => Fields;
	/** … or a JSON body (API endpoints). */
	json?: (f: MatrixFixture) => unknown;
	setup?: (f: MatrixFixture) => Promise<void>;
	expect: Record<Visitor, Expected>;
	/** Which visitors' requests change the studio, and how to tell. */
	changes?: { by: Visitor[]; check: (f: MatrixFixture, who: Visitor) => Promise<boolean> };
	/** The page is meant to show the studio to anyone holding the link (invitations). */
	showsStudioToLinkHolders?: boolean;
	/**
	 * A fresh fixture for each visitor. The default for everything but GET rows without `changes`,
	 * whose five visitors share one (set this when such a GET changes something all the same).
	 */
	fresh?: boolean;
};

export async function matrixFixture(): Promise<MatrixFixture> {
	const f = await studioWithMembers();
	const invite = await ownerInvite(f, 'designer');
	return { ...f, invite, vars: {} };
}

export function rowPath(row: MatrixRow, f: MatrixFixture): string {
	if (row.path) return row.path(f);
	const base = row.route;
	return row.action && row.action !== 'default' ? `${base}?/${row.action}` : base;
}

export function rowLabel(row: MatrixRow): string {
	return `${row.method} ${row.route}${row.action && row.action !== 'default' ? `?/${row.action}` : ''}`;
}

function describeExpected(e: Expected) {
	if (typeof e === 'number') return String(e);
	return `${e.status} → ${typeof e.location === 'string' ? e.location : e.location.source.replace(/\\/g, '')}`;
}

async function call(row: MatrixRow, f: MatrixFixture, c: Client) {
	const path = rowPath(row, f);
	if (row.method === 'GET') return c.get(path);
	if (row.json) {
		return c.request(row.method, path, {
			body: JSON.stringify(row.json(f)),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: new URL(c.baseURL).origin
			}
		});
	}
	return c.postForm(path, row.form?.(f) ?? {});
}

export function runAccessMatrix(
	rows: MatrixRow[],
	app: { client(opts?: { session?: string }): Client }
) {
	const cells = rows.flatMap((row) => VISITORS.map((who) => ({ row, who })));
	const shared = new Map<MatrixRow, Promise<MatrixFixture>>();
	const fixtureFor = (row: MatrixRow) => {
		const make = async () => {
			const f = await matrixFixture();
			await row.setup?.(f);
			return f;
		};
		if (row.fresh ?? (row.method !== 'GET' || !!row.changes)) return make();
		if (!shared.has(row)) shared.set(row, make());
		return shared.get(row) as Promise<MatrixFixture>;
	};
	// Cells are independent (own fixtures, or shared ones nobody changes), so they run side by side.
	describe.concurrent('access matrix', () => {
		it.for(
			cells.map(
				(c) =>
					[`${rowLabel(c.row)} as ${c.who} → ${describeExpected(c.row.expect[c.who])}`, c] as const
			)
		)('%s', async ([, { row, who }], { expect }) => {
			const f = await fixtureFor(row);
			const session = who === 'anonymous' ? undefined : f[who].session;
			const res = await call(row, f, app.client(session ? { session } : {}));
			const expected = row.expect[who];
			const status = typeof expected === 'number' ? expected : expected.status;
			expect(res.status, `${res.status} ${res.location ?? ''} ${res.text.slice(0, 200)}`).toBe(
				status
			);
			if (typeof expected !== 'number') {
				if (typeof expected.location === 'string') expect(res.location).toBe(expected.location);
				else expect(res.location).toMatch(expected.location);
			}
			if (who === 'outsider' && !row.showsStudioToLinkHolders) {
				for (const secret of [
					f.studio.name,
					f.owner.email,
					f.designer.email,
					f.client.email,
					f.invite.email
				]) {
					expect(res.text, 'the outsider sees nothing of the studio').not.toContain(secret);
				}
			}
			if (row.changes) {
				expect(await row.changes.check(f, who), 'whether the studio changed').toBe(
					row.changes.by.includes(who)
				);
			}
		});
	});
}

export type RouteEntry = { route: string; method: MatrixRow['method']; action?: string };

/** Route id of a file under src/routes: '/src/routes/invite/[token]/+page.svelte' → '/invite/[token]'. */
function routeId(file: string) {
	return file.replace(/^\/src\/routes/, '').replace(/\/\+[^/]+$/, '') || '/';
}

/**
 * Names of the properties of the object literal that follows `export const actions` in a module's
 * source (`invite: async …`, `async leave(…)`, `default: …`); null when the object is not written
 * out there. Reading the source, not importing every module, keeps the inventory fast.
 */
export function actionNames(source: string): string[] | null {
	const start = source.search(/export\s+const\s+actions\b/);
	if (start < 0) return [];
	const assigned = /^=\s*(\{)?/.exec(source.slice(source.indexOf('=', start)));
	// Built by a function call, not written out: only importing the module tells.
	if (!assigned?.[1]) return null;
	const open = source.indexOf('{', source.indexOf('=', start));
	const names: string[] = [];
	let depth = 0;
	let expectKey = false;
	for (let i = open; i < source.length; i++) {
		const ch = source[i];
		const rest = source.slice(i, i + 2);
		if (rest === '//') i = source.indexOf('\n', i);
		else if (rest === '/*') i = source.indexOf('*/', i) + 1;
		else if (ch === "'" || ch === '"' || ch === '`') {
			for (i++; i < source.length && source[i] !== ch; i++) if (source[i] === '\\') i++;
		} else if ('{(['.includes(ch)) {
			depth++;
			expectKey = depth === 1;
		} else if ('})]'.includes(ch)) {
			depth--;
			if (depth === 0) break;
		} else if (ch === ',' && depth === 1) expectKey = true;
		else if (expectKey && /[A-Za-z_$]/.test(ch)) {
			const word = /^(?:async\s+)?([A-Za-z_$][\w$]*)/.exec(source.slice(i));
			if (word) {
				names.push(word[1]);
				i += word[0].length - 1;
			}
			expectKey = false;
		}
		if (i < 0) break;
	}
	return names;
}

const METHOD = /export\s+(?:const|let|async\s+function|function)\s+(GET|POST|PUT|PATCH|DELETE)\b/g;

/**
 * Everything that answers HTTP under src/routes: a GET for each page, a POST for each form action,
 * each exported method of each endpoint.
 */
export async function routeInventory(): Promise<RouteEntry[]> {
	const pages = Object.keys(import.meta.glob('/src/routes/**/+page.svelte'));
	const pageServers = import.meta.glob<string>('/src/routes/**/+page.server.ts', {
		query: '?raw',
		import: 'default',
		eager: true
	});
	const pageModules = import.meta.glob<{ actions?: Record<string, unknown> }>(
		'/src/routes/**/+page.server.ts'
	);
	const endpoints = import.meta.glob<string>('/src/routes/**/+server.ts', {
		query: '?raw',
		import: 'default',
		eager: true
	});
	const out: RouteEntry[] = pages.map((p) => ({ route: routeId(p), method: 'GET' as const }));
	for (const [file, source] of Object.entries(pageServers)) {
		const route = routeId(file);
		if (!pages.some((p) => routeId(p) === route)) out.push({ route, method: 'GET' });
		const names = actionNames(source) ?? Object.keys((await pageModules[file]()).actions ?? {});
		for (const action of names) out.push({ route, method: 'POST', action });
	}
	for (const [file, source] of Object.entries(endpoints)) {
		for (const [, method] of source.matchAll(METHOD)) {
			out.push({ route: routeId(file), method: method as MatrixRow['method'] });
		}
	}
	return out;
}

export function entryKey(e: RouteEntry) {
	return `${e.method} ${e.route}${e.action ? ` ?/${e.action}` : ''}`;
}

/**
 * The inventory entries a row can stand for: a POST row without `action` may be an endpoint's POST
 * or a page's default action (both take form posts).
 */
export function rowKeys(row: MatrixRow): string[] {
	const base = { route: row.route, method: row.method };
	if (row.method !== 'POST') return [entryKey(base)];
	if (row.action) return [entryKey({ ...base, action: row.action })];
	return row.json ? [entryKey(base)] : [entryKey(base), entryKey({ ...base, action: 'default' })];
}
