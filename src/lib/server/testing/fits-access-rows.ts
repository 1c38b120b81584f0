/**
 * Access-matrix rows for the clearance table and "what fits here" (see testing/access-matrix.ts).
 * Run by fits-http.spec.ts. Both read the studio's catalogue: owners and designers get answers,
 * the studio's clients 403, another studio's owner 404 for this studio's enclosure (and their own
 * catalogue's answer for a scene), anonymous callers 401.
 */
import { demoEnclosure, demoSceneInput } from '$lib/geometry/standard-library';
import { createEnclosure } from '../catalog/enclosures';
import type { MatrixFixture, MatrixRow } from './access-matrix';

export async function withEnclosure(f: MatrixFixture) {
	const made = await createEnclosure(f.studio.id, f.owner.id, { definition: demoEnclosure() });
	if (!made.ok) throw new Error('fixture enclosure refused');
	f.vars.enclosure = made.value.id;
}

export const fitsRows: MatrixRow[] = [
	{
		route: '/api/enclosures/[id]/room',
		method: 'GET',
		setup: withEnclosure,
		path: (f) => `/api/enclosures/${f.vars.enclosure}/room`,
		expect: { owner: 200, designer: 200, client: 403, outsider: 404, anonymous: 401 }
	},
	{
		route: '/api/fits',
		method: 'POST',
		json: () => ({ scene: demoSceneInput(), target: { kind: 'mount', mountId: 'radiator' } }),
		expect: { owner: 200, designer: 200, client: 403, outsider: 200, anonymous: 401 }
	}
];
