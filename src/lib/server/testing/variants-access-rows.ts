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
import { SIGN_IN, type Expected, type MatrixFixture, type MatrixRow } from './access-matrix';
import { EDITORS, about, studioOnly } from './matrix-rows';

async function withTwoVariants(f: MatrixFixture) {
	const b = await demoBuildIn(f.studio.id, f.owner.id);
	f.vars.buildId = b.buildId;
	f.vars.variantId = b.variantId;
	f.vars.otherId = await forkVariant(b.buildId, b.variantId, 'Second');
}

const count = async (f: MatrixFixture) => (await variantsOf(f.vars.buildId)).length;
const editors = (ok: Expected) => studioOnly(ok);
const ofBuild = about(withTwoVariants, { id: 'buildId' });
const page = (f: MatrixFixture, rest = '') => `/builds/${f.vars.buildId}${rest}`;

export const variantRows: MatrixRow[] = [
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'GET',
		expect: editors(200)
	}),
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'fork',
		form: (f) => ({ variantId: f.vars.variantId }),
		expect: editors({ status: 303, location: /\?variant=/ }),
		changes: { by: EDITORS, check: async (f) => (await count(f)) === 3 }
	}),
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'rename',
		form: (f) => ({ variantId: f.vars.otherId, name: 'Renamed in the matrix' }),
		expect: editors(200),
		changes: {
			by: EDITORS,
			check: async (f) =>
				(await db.select().from(variants).where(eq(variants.id, f.vars.otherId)))[0].name ===
				'Renamed in the matrix'
		}
	}),
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'move',
		form: (f) => ({ variantId: f.vars.otherId, by: '-1' }),
		expect: editors(200),
		changes: {
			by: EDITORS,
			check: async (f) => (await variantsOf(f.vars.buildId))[0].id === f.vars.otherId
		}
	}),
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'delete',
		form: (f) => ({ variantId: f.vars.otherId, confirm: 'yes' }),
		expect: editors(200),
		changes: { by: EDITORS, check: async (f) => (await count(f)) === 1 }
	}),
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'propose',
		form: (f) => ({ variantId: f.vars.otherId }),
		expect: editors(200),
		changes: {
			by: EDITORS,
			check: async (f) =>
				(await db.select().from(variants).where(eq(variants.id, f.vars.otherId)))[0].isProposal
		}
	}),
	ofBuild({
		route: '/builds/[id]/variants',
		method: 'POST',
		action: 'deleteBuild',
		form: () => ({ confirm: 'yes' }),
		expect: editors({ status: 303, location: '/builds' }),
		changes: {
			by: EDITORS,
			check: async (f) =>
				(await db.select().from(builds).where(eq(builds.id, f.vars.buildId))).length === 0
		}
	}),
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
