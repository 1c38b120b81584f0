/**
 * Access-matrix rows for the build editor and the engine's endpoints (see testing/access-matrix.ts).
 * Run by builds.spec.ts; access-matrix.spec.ts counts them as covered. Clients of the studio get
 * 403 on everything that edits a build, the owner of another studio 404 (the build's existence is
 * not revealed), anonymous visitors the sign-in page (pages) or 401 (API).
 */
import { demoSceneInput } from '$lib/geometry/standard-library';
import { SIGN_IN, type MatrixFixture, type MatrixRow } from './access-matrix';
import { studioOnly } from './matrix-rows';
import { variantsOf } from '../builds';
import { buildCount, demoBuildIn, demoEnclosureIn, storedVariant } from './builds';
import { demoLoopBackRun } from './engine-factories';
import { latestVersion } from '../versions';

async function withBuild(f: MatrixFixture) {
	const b = await demoBuildIn(f.studio.id, f.owner.id);
	f.vars.buildId = b.buildId;
	f.vars.variantId = b.variantId;
	f.vars.version = String(b.version);
	f.vars.settings = JSON.stringify(b.settings);
}

const editors = (ok: number) => studioOnly(ok, 404, 401);
const anyoneSignedIn = (ok: number): MatrixRow['expect'] => ({
	owner: ok,
	designer: ok,
	client: ok,
	outsider: ok,
	anonymous: 401
});

export const buildRows: MatrixRow[] = [
	{
		route: '/builds/[id]',
		method: 'GET',
		path: (f) => `/builds/${f.vars.buildId}`,
		setup: withBuild,
		expect: { owner: 200, designer: 200, client: 403, outsider: 404, anonymous: SIGN_IN }
	},
	{
		route: '/builds/[id]',
		method: 'POST',
		action: 'version',
		path: (f) => `/builds/${f.vars.buildId}?/version`,
		setup: withBuild,
		form: (f) => ({
			variantId: f.vars.variantId,
			revision: f.vars.version,
			note: 'Matrix version'
		}),
		expect: { owner: 200, designer: 200, client: 403, outsider: 404, anonymous: SIGN_IN },
		changes: {
			by: ['owner', 'designer'],
			check: async (f) => (await latestVersion(f.vars.variantId))?.note === 'Matrix version'
		}
	},
	{
		route: '/builds/[id]',
		method: 'POST',
		action: 'startFrom',
		path: (f) => `/builds/${f.vars.buildId}?/startFrom`,
		setup: withBuild,
		form: (f) => ({ variantId: f.vars.variantId }),
		expect: {
			owner: { status: 303, location: /\?variant=/ },
			designer: { status: 303, location: /\?variant=/ },
			client: 403,
			outsider: 404,
			anonymous: SIGN_IN
		},
		changes: {
			by: ['owner', 'designer'],
			check: async (f) => (await variantsOf(f.vars.buildId)).length === 2
		}
	},
	// Acts on the visitor's own active studio: the outsider sees theirs.
	{
		route: '/builds/new',
		method: 'GET',
		expect: { owner: 200, designer: 200, client: 403, outsider: 200, anonymous: SIGN_IN }
	},
	{
		route: '/builds/new',
		method: 'POST',
		action: 'default',
		setup: async (f) => {
			f.vars.enclosureId = (await demoEnclosureIn(f.studio.id, f.owner.id)).enclosureId;
		},
		form: (f) => ({ name: 'Matrix build', enclosureId: f.vars.enclosureId }),
		// The outsider's active studio has no such enclosure: the form comes back with a message.
		expect: {
			owner: { status: 303, location: /^\/builds\/[^/]+$/ },
			designer: { status: 303, location: /^\/builds\/[^/]+$/ },
			client: 403,
			outsider: 400,
			anonymous: SIGN_IN
		},
		changes: { by: ['owner', 'designer'], check: async (f) => (await buildCount(f.studio.id)) > 0 }
	},
	{
		route: '/api/builds/[id]/check',
		method: 'POST',
		path: (f) => `/api/builds/${f.vars.buildId}/check`,
		setup: withBuild,
		json: (f) => ({ settings: JSON.parse(f.vars.settings) }),
		expect: editors(200)
	},
	{
		route: '/api/builds/[id]/variants/[variantId]',
		method: 'GET',
		path: (f) => `/api/builds/${f.vars.buildId}/variants/${f.vars.variantId}`,
		setup: withBuild,
		expect: editors(200)
	},
	{
		route: '/api/builds/[id]/variants/[variantId]',
		method: 'PUT',
		path: (f) => `/api/builds/${f.vars.buildId}/variants/${f.vars.variantId}`,
		setup: withBuild,
		json: (f) => ({
			version: Number(f.vars.version),
			settings: { ...JSON.parse(f.vars.settings), marginMm: 4 }
		}),
		expect: editors(200),
		changes: {
			by: ['owner', 'designer'],
			check: async (f) => (await storedVariant(f.vars.variantId)).version > Number(f.vars.version)
		}
	},
	// The engine itself: a scene in, a report out, no studio data involved; any signed-in person.
	{
		route: '/api/check',
		method: 'POST',
		json: () => demoSceneInput(),
		expect: anyoneSignedIn(200)
	},
	{
		route: '/api/routes',
		method: 'POST',
		json: () => ({
			scene: demoSceneInput(),
			run: demoLoopBackRun()
		}),
		expect: anyoneSignedIn(200)
	},
	{
		route: '/api/sweep',
		method: 'POST',
		json: () => ({ scene: demoSceneInput(), control: { kind: 'divider', id: 'spine' } }),
		expect: anyoneSignedIn(200)
	},
	// A development tool served by the server hook (src/lib/server/dev-tools.ts), on in the test app.
	{ route: '/api/noop', method: 'POST', json: () => ({}), expect: anyoneSignedIn(200) }
];
