/**
 * Access-matrix rows for variants, the comparison and moving a build on (see testing/access-matrix.ts).
 * Run by variants-http.spec.ts. Only the studio's owners and designers manage variants and compare
 * them; the studio's clients get 403, another studio 404, anonymous visitors the sign-in page.
 */
import { eq } from 'drizzle-orm';
import { forkVariant, variantsOf } from '../builds';
import { demoBuildIn } from './builds';
import { db } from '../db';
import { builds, variants } from '../db/schema';
import type { Fields } from './client';
import { SIGN_IN, type Expected, type MatrixFixture, type MatrixRow } from './access-matrix';
import { EDITORS, about, countRows, studioOnly } from './matrix-rows';

async function withTwoVariants(f: MatrixFixture) {
	const b = await demoBuildIn(f.studio.id, f.owner.id);
	f.vars.buildId = b.buildId;
	f.vars.variantId = b.variantId;
	f.vars.otherId = await forkVariant(b.buildId, b.variantId, 'Second');
}

const count = async (f: MatrixFixture) => (await variantsOf(f.vars.buildId)).length;
const second = async (f: MatrixFixture) =>
	(await db.select().from(variants).where(eq(variants.id, f.vars.otherId)))[0];
const renamed = async (f: MatrixFixture) => (await second(f)).name === 'Renamed in the matrix';
const movedFirst = async (f: MatrixFixture) =>
	(await variantsOf(f.vars.buildId))[0].id === f.vars.otherId;
const proposed = async (f: MatrixFixture) => (await second(f)).isProposal;
const buildGone = async (f: MatrixFixture) =>
	(await countRows(builds, eq(builds.id, f.vars.buildId))) === 0;
const forked = async (f: MatrixFixture) => (await count(f)) === 3;
const deleted = async (f: MatrixFixture) => (await count(f)) === 1;
const editors = (ok: Expected) => studioOnly(ok);
const ofBuild = about(withTwoVariants, { id: 'buildId' });
const page = (f: MatrixFixture, rest = '') => `/builds/${f.vars.buildId}${rest}`;

type Check = (f: MatrixFixture) => Promise<boolean>;

/** The variants page's form actions: what an editor posts, what they get, how to tell it worked. */
const VARIANT_ACTIONS: [string, (f: MatrixFixture) => Fields, Expected, Check][] = [
	[
		'fork',
		(f) => ({ variantId: f.vars.variantId }),
		{ status: 303, location: /\?variant=/ },
		forked
	],
	['rename', (f) => ({ variantId: f.vars.otherId, name: 'Renamed in the matrix' }), 200, renamed],
	['move', (f) => ({ variantId: f.vars.otherId, by: '-1' }), 200, movedFirst],
	['delete', (f) => ({ variantId: f.vars.otherId, confirm: 'yes' }), 200, deleted],
	['propose', (f) => ({ variantId: f.vars.otherId }), 200, proposed],
	['deleteBuild', () => ({ confirm: 'yes' }), { status: 303, location: '/builds' }, buildGone]
];

export const variantRows: MatrixRow[] = [
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'GET',
		expect: editors(200)
	}),
	...VARIANT_ACTIONS.map(([action, form, ok, check]) =>
		ofBuild({
			route: '/builds/[id]/variants',
			method: 'POST',
			action,
			form,
			expect: editors(ok),
			changes: { by: EDITORS, check }
		})
	),
	{
		route: '/builds/[id]/compare',
		method: 'GET',
		path: (f) => page(f, `/compare?variants=${f.vars.variantId},${f.vars.otherId}`),
		setup: withTwoVariants,
		expect: editors(200)
	},
	{
		route: '/builds/[id]/compare.csv',
		method: 'GET',
		path: (f) => page(f, `/compare.csv?variants=${f.vars.variantId},${f.vars.otherId}`),
		setup: withTwoVariants,
		expect: { owner: 200, designer: 200, client: 403, outsider: 404, anonymous: SIGN_IN }
	},
	ofBuild({
		route: '/builds/[id]/enclosure',
		method: 'GET',
		expect: editors(200)
	}),
	ofBuild({
		route: '/builds/[id]/enclosure',
		method: 'POST',
		action: 'default',
		form: () => ({ toVersionId: 'no-such-version' }),
		// Already on the current version: the form comes back with a message, nothing moves.
		expect: editors(409)
	})
];
