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
import { SIGN_IN, type MatrixFixture, type MatrixRow } from './access-matrix';

async function withTwoVariants(f: MatrixFixture) {
	const b = await demoBuildIn(f.studio.id, f.owner.id);
	f.vars.buildId = b.buildId;
	f.vars.variantId = b.variantId;
	f.vars.otherId = await forkVariant(b.buildId, b.variantId, 'Second');
}

const count = async (f: MatrixFixture) => (await variantsOf(f.vars.buildId)).length;
const editors = (ok: MatrixRow['expect']['owner']): MatrixRow['expect'] => ({
	owner: ok,
	designer: ok,
	client: 403,
	outsider: 404,
	anonymous: SIGN_IN
});
const page = (f: MatrixFixture, rest = '') => `/builds/${f.vars.buildId}${rest}`;

export const variantRows: MatrixRow[] = [
	{
		route: '/builds/[id]/variants',
		method: 'GET',
		path: (f) => page(f, '/variants'),
		setup: withTwoVariants,
		expect: editors(200)
	},
	{
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'fork',
		path: (f) => page(f, '/variants?/fork'),
		setup: withTwoVariants,
		form: (f) => ({ variantId: f.vars.variantId }),
		expect: editors({ status: 303, location: /\?variant=/ }),
		changes: { by: ['owner', 'designer'], check: async (f) => (await count(f)) === 3 }
	},
	{
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'rename',
		path: (f) => page(f, '/variants?/rename'),
		setup: withTwoVariants,
		form: (f) => ({ variantId: f.vars.otherId, name: 'Renamed in the matrix' }),
		expect: editors(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) =>
				(await db.select().from(variants).where(eq(variants.id, f.vars.otherId)))[0].name ===
				'Renamed in the matrix'
		}
	},
	{
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'move',
		path: (f) => page(f, '/variants?/move'),
		setup: withTwoVariants,
		form: (f) => ({ variantId: f.vars.otherId, by: '-1' }),
		expect: editors(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) => (await variantsOf(f.vars.buildId))[0].id === f.vars.otherId
		}
	},
	{
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'delete',
		path: (f) => page(f, '/variants?/delete'),
		setup: withTwoVariants,
		form: (f) => ({ variantId: f.vars.otherId, confirm: 'yes' }),
		expect: editors(200),
		changes: { by: ['owner', 'designer'], check: async (f) => (await count(f)) === 1 }
	},
	{
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'propose',
		path: (f) => page(f, '/variants?/propose'),
		setup: withTwoVariants,
		form: (f) => ({ variantId: f.vars.otherId }),
		expect: editors(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) =>
				(await db.select().from(variants).where(eq(variants.id, f.vars.otherId)))[0].isProposal
		}
	},
	{
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'deleteBuild',
		path: (f) => page(f, '/variants?/deleteBuild'),
		setup: withTwoVariants,
		form: () => ({ confirm: 'yes' }),
		expect: editors({ status: 303, location: '/builds' }),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) =>
				(await db.select().from(builds).where(eq(builds.id, f.vars.buildId))).length === 0
		}
	},
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
	{
		route: '/builds/[id]/enclosure',
		method: 'GET',
		path: (f) => page(f, '/enclosure'),
		setup: withTwoVariants,
		expect: editors(200)
	},
	{
		route: '/builds/[id]/enclosure',
		method: 'POST',
		action: 'default',
		path: (f) => page(f, '/enclosure'),
		setup: withTwoVariants,
		form: () => ({ toVersionId: 'no-such-version' }),
		// Already on the current version: the form comes back with a message, nothing moves.
		expect: editors(409)
	}
];
