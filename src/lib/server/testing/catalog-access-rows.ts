/**
 * Access-matrix rows for the catalogue's pages, actions and endpoints (run by catalog-http.spec.ts,
 * counted by the coverage check in access-matrix.spec.ts). Catalogue = owner and designer; a
 * client gets 403; an outsider (owner of another studio) works in their own studio, so lists answer
 * 200 and this studio's items 404; anonymous visitors go to sign-in (pages) or get 401 (API).
 */
import { eq } from 'drizzle-orm';
import { demoEnclosure } from '$lib/geometry/standard-library';
import { db } from '../db';
import { enclosures, parts } from '../db/schema';
import type { Fields } from './client';
import type { Expected, MatrixFixture, MatrixRow } from './access-matrix';
import { EDITORS, about, countRows, isStamped, studioOnly } from './matrix-rows';
import { createEnclosure } from '../catalog/enclosures';
import { createPart } from '../catalog/parts';

const catalogue = studioOnly;
const api = (member: Expected, outsider: Expected) => studioOnly(member, outsider, 401);
const redirectTo = (location: RegExp): Expected => ({ status: 303, location });

export const testPart = (name = 'Matrix pump') => ({
	name,
	category: 'pump',
	bodies: [{ id: 'body', label: 'Body', box: { min: [0, 0, 0], max: [62, 50, 62] } }],
	provenance: 'measured'
});

async function withEnclosure(f: MatrixFixture) {
	const made = await createEnclosure(f.studio.id, f.owner.id, { definition: demoEnclosure() });
	if (!made.ok) throw new Error('fixture enclosure refused');
	f.vars.enclosure = made.value.id;
	f.vars.version = made.value.current.id;
}
async function withPart(f: MatrixFixture) {
	const made = await createPart(f.studio.id, testPart());
	if (!made.ok) throw new Error('fixture part refused');
	f.vars.part = made.value.id;
}

const ofEnclosure = about(withEnclosure, { id: 'enclosure', versionId: 'version' });
const ofPart = about(withPart, { id: 'part' });

const enclosureCount = (f: MatrixFixture) =>
	countRows(enclosures, eq(enclosures.studioId, f.studio.id));
const partCount = (f: MatrixFixture) => countRows(parts, eq(parts.studioId, f.studio.id));
const partArchived = (f: MatrixFixture) =>
	isStamped(parts, parts.id, f.vars.part, parts.archivedAt);
const enclosureRevision = async (f: MatrixFixture) =>
	(
		await db
			.select({ r: enclosures.revision })
			.from(enclosures)
			.where(eq(enclosures.id, f.vars.enclosure))
	)[0]?.r ?? 0;
const partRevision = async (f: MatrixFixture) =>
	(await db.select({ r: parts.revision }).from(parts).where(eq(parts.id, f.vars.part)))[0]?.r ?? 0;

/** The flat enclosure form as a browser without JavaScript posts it. */
export function enclosureFields(revision = 0, name = 'Matrix box') {
	const walls: Record<string, string> = {};
	for (const face of ['left', 'right', 'bottom', 'top', 'front', 'back']) {
		walls[`${face}Mm`] = '2';
		walls[`${face}Kind`] = 'solid';
		walls[`${face}OffsetMm`] = '0';
	}
	return {
		revision: String(revision),
		name,
		description: '',
		note: '',
		outerX: '200',
		outerY: '300',
		outerZ: '250',
		...walls,
		features: '{"dividers":[],"brackets":[],"mounts":[]}'
	};
}
export const partFields = (revision = 0, name = 'Matrix fan') => ({
	revision: String(revision),
	name,
	category: 'fan',
	shape: 'box',
	widthMm: '120',
	heightMm: '120',
	depthMm: '25',
	geometry: '{"bodies":[],"keepouts":[],"ports":[]}',
	provenance: 'datasheet',
	toleranceMm: '0',
	currency: 'EUR'
});

const CSV = 'name,category,width_mm,height_mm,depth_mm\nMatrix hub,other,60,15,40\n';

type Catalogue = {
	kind: 'enclosures' | 'parts';
	/** Rows about one item of this kind (its setup makes it). */
	of: (row: Omit<MatrixRow, 'setup'>) => MatrixRow;
	count: (f: MatrixFixture) => Promise<number>;
	revision: (f: MatrixFixture) => Promise<number>;
	/** The form as posted: new (revision 0) or over revision 1 under the saved name. */
	fields: (revision?: number, name?: string) => Fields;
	savedName: string;
	/** The JSON bodies the API takes: a new item, and the item saved over revision 1. */
	created: () => unknown;
	saved: () => unknown;
	/** Whether the API's PATCH { archived: true } did its work. */
	archived: (f: MatrixFixture) => Promise<boolean>;
};

const ENCLOSURES: Catalogue = {
	kind: 'enclosures',
	of: ofEnclosure,
	count: enclosureCount,
	revision: enclosureRevision,
	fields: enclosureFields,
	savedName: 'Matrix box, saved',
	created: () => ({ definition: demoEnclosure() }),
	saved: () => ({ revision: 1, definition: { ...demoEnclosure(), name: 'Renamed' } }),
	archived: async (f) => (await enclosureRevision(f)) === 2
};

const PARTS: Catalogue = {
	kind: 'parts',
	of: ofPart,
	count: partCount,
	revision: partRevision,
	fields: partFields,
	savedName: 'Matrix fan, saved',
	created: () => testPart(),
	saved: () => ({ revision: 1, ...testPart('Matrix pump, saved') }),
	archived: partArchived
};

/** The pages every kind has: its list, the new form and its save, an item's page and its save. */
function editorPages(c: Catalogue): MatrixRow[] {
	const saved = redirectTo(new RegExp(`^\\/${c.kind}\\/\\w+\\?saved=1$`));
	return [
		{ route: `/${c.kind}`, method: 'GET', expect: catalogue(200, 200) },
		{ route: `/${c.kind}/new`, method: 'GET', expect: catalogue(200, 200) },
		{
			route: `/${c.kind}/new`,
			method: 'POST',
			action: 'save',
			form: () => c.fields(),
			expect: catalogue(saved, redirectTo(new RegExp(`^\\/${c.kind}\\/`))),
			changes: { by: EDITORS, check: async (f) => (await c.count(f)) === 1 }
		},
		c.of({ route: `/${c.kind}/[id]`, method: 'GET', expect: catalogue(200, 404) }),
		c.of({
			route: `/${c.kind}/[id]`,
			method: 'POST',
			action: 'save',
			form: () => c.fields(1, c.savedName),
			expect: catalogue(saved, 404),
			changes: { by: EDITORS, check: async (f) => (await c.revision(f)) === 2 }
		})
	];
}

/** The JSON endpoints every kind has: list, create, read, save over a revision, archive. */
function apiRows(c: Catalogue): MatrixRow[] {
	const item = `/api/${c.kind}/[id]`;
	return [
		{ route: `/api/${c.kind}`, method: 'GET', expect: api(200, 200) },
		{
			route: `/api/${c.kind}`,
			method: 'POST',
			json: c.created,
			expect: api(201, 201),
			changes: { by: EDITORS, check: async (f) => (await c.count(f)) === 1 }
		},
		c.of({ route: item, method: 'GET', expect: api(200, 404) }),
		c.of({
			route: item,
			method: 'PUT',
			json: c.saved,
			expect: api(200, 404),
			changes: { by: EDITORS, check: async (f) => (await c.revision(f)) === 2 }
		}),
		c.of({
			route: item,
			method: 'PATCH',
			json: () => ({ archived: true }),
			expect: api(200, 404),
			changes: { by: EDITORS, check: c.archived }
		})
	];
}

export const catalogRows: MatrixRow[] = [
	// Pages.
	...editorPages(ENCLOSURES),
	...(['archive', 'restore', 'duplicate'] as const).map((action) =>
		ofEnclosure({
			route: '/enclosures/[id]',
			method: 'POST',
			action,
			expect: catalogue(redirectTo(/^\/enclosures\/\w+$/), 404),
			changes: {
				by: EDITORS,
				check: async (f) =>
					action === 'duplicate'
						? (await enclosureCount(f)) === 2
						: (await enclosureRevision(f)) === 2
			}
		})
	),
	...editorPages(PARTS),
	...(
		[
			[
				'duplicate',
				redirectTo(/^\/parts\/\w+\?copied=1$/),
				async (f) => (await partCount(f)) === 2
			],
			['archive', 200, partArchived],
			['restore', 200, async (f) => (await partRevision(f)) === 2]
		] satisfies [string, Expected, (f: MatrixFixture) => Promise<boolean>][]
	).map(([action, ok, check]): MatrixRow => ({
		route: '/parts',
		method: 'POST',
		action,
		setup: withPart,
		form: (f) => ({ id: f.vars.part }),
		expect: catalogue(ok, 404),
		changes: { by: EDITORS, check }
	})),
	...(['duplicate', 'archive', 'restore', 'delete'] as const).map((action) =>
		ofPart({
			route: '/parts/[id]',
			method: 'POST',
			action,
			expect: catalogue(
				redirectTo(
					action === 'delete'
						? /^\/parts$/
						: action === 'duplicate'
							? /^\/parts\/\w+\?copied=1$/
							: /^\/parts\/\w+$/
				),
				404
			),
			changes: {
				by: EDITORS,
				check: async (f) =>
					action === 'duplicate'
						? (await partCount(f)) === 2
						: action === 'delete'
							? (await partCount(f)) === 0
							: (await partRevision(f)) === 2
			}
		})
	),
	{ route: '/parts/import', method: 'GET', expect: catalogue(200, 200) },
	// No file: the members get the form back with a message; nothing is written.
	{ route: '/parts/import', method: 'POST', action: 'preview', expect: catalogue(400, 400) },
	{
		route: '/parts/import',
		method: 'POST',
		action: 'commit',
		form: () => ({ csv: CSV }),
		expect: catalogue(200, 200),
		changes: { by: EDITORS, check: async (f) => (await partCount(f)) === 1 }
	},
	{ route: '/parts/export', method: 'GET', expect: catalogue(200, 200) },

	// JSON endpoints.
	...apiRows(ENCLOSURES),
	ofEnclosure({
		route: '/api/enclosures/[id]/versions/[versionId]',
		method: 'GET',
		expect: api(200, 404)
	}),
	...apiRows(PARTS),
	ofPart({
		route: '/api/parts/[id]',
		method: 'DELETE',
		json: () => ({}),
		expect: api(204, 404),
		changes: { by: EDITORS, check: async (f) => (await partCount(f)) === 0 }
	}),
	{ route: '/api/parts/export', method: 'GET', expect: api(200, 200) },
	// The matrix sends JSON; the endpoint takes text/csv, so members who pass the check get 415.
	{ route: '/api/parts/import', method: 'POST', json: () => ({}), expect: api(415, 415) }
];
