/**
 * Access-matrix rows for the catalogue's tube kinds page (run by tube-kinds.spec.ts, counted by
 * the coverage check in access-matrix.spec.ts): owner and designer as for parts, a client 403,
 * an outsider sees their own studio's page (200) and cannot touch this studio's kinds (404),
 * anonymous visitors go to sign-in.
 */
import { eq } from 'drizzle-orm';
import { db } from '../db';
import { studioLoopSettings, tubeKinds } from '../db/schema';
import type { Expected, MatrixFixture, MatrixRow } from './access-matrix';
import { EDITORS, countRows, isStamped, studioOnly } from './matrix-rows';
import { addTubeKind } from '../catalog/tube-kinds';

const catalogue = (member: Expected, outsider: Expected) => studioOnly(member, outsider);

/** A 14 mm hard tube kind as the form posts it. */
export const tubeFields = (extra: Record<string, string> = {}) => ({
	name: 'Hard tube 14 mm',
	kind: 'hard',
	innerMm: '10',
	outerMm: '14',
	minBendRadiusMm: '28',
	clearanceMm: '2',
	price: '6.50',
	currency: 'EUR',
	...extra
});

async function withTube(f: MatrixFixture) {
	f.vars.tube = await addTubeKind(f.studio.id, {
		id: '',
		stamp: '',
		name: 'Matrix tube',
		kind: 'soft',
		innerMm: '10',
		outerMm: 13,
		minBendRadiusMm: 40,
		clearanceMm: 2,
		price: '',
		currency: 'EUR'
	});
	const [row] = await db
		.select({ at: tubeKinds.updatedAt })
		.from(tubeKinds)
		.where(eq(tubeKinds.id, f.vars.tube));
	f.vars.stamp = String(row.at.getTime());
}

const tubeCount = (f: MatrixFixture) => countRows(tubeKinds, eq(tubeKinds.studioId, f.studio.id));
const tubeRetired = (f: MatrixFixture) =>
	isStamped(tubeKinds, tubeKinds.id, f.vars.tube, tubeKinds.archivedAt);
const tubeName = async (f: MatrixFixture) =>
	(await db.select({ n: tubeKinds.name }).from(tubeKinds).where(eq(tubeKinds.id, f.vars.tube)))[0]
		?.n;
const allowance = async (f: MatrixFixture) =>
	(
		await db
			.select({ pct: studioLoopSettings.cutAllowancePct })
			.from(studioLoopSettings)
			.where(eq(studioLoopSettings.studioId, f.studio.id))
	)[0]?.pct;

export const tubeKindRows: MatrixRow[] = [
	{ route: '/tube-kinds', method: 'GET', expect: catalogue(200, 200) },
	{
		route: '/tube-kinds',
		method: 'POST',
		action: 'add',
		form: () => tubeFields(),
		// The outsider adds to their own studio: this one is untouched.
		expect: catalogue(200, 200),
		changes: { by: EDITORS, check: async (f) => (await tubeCount(f)) === 1 }
	},
	{
		route: '/tube-kinds',
		method: 'POST',
		action: 'save',
		setup: withTube,
		form: (f) => tubeFields({ id: f.vars.tube, stamp: f.vars.stamp, name: 'Matrix tube, saved' }),
		expect: catalogue(200, 404),
		changes: { by: EDITORS, check: async (f) => (await tubeName(f)) === 'Matrix tube, saved' }
	},
	{
		route: '/tube-kinds',
		method: 'POST',
		action: 'retire',
		setup: withTube,
		form: (f) => ({ id: f.vars.tube }),
		expect: catalogue(200, 404),
		changes: { by: EDITORS, check: tubeRetired }
	},
	{
		route: '/tube-kinds',
		method: 'POST',
		action: 'restore',
		setup: async (f) => {
			await withTube(f);
			await db
				.update(tubeKinds)
				.set({ archivedAt: new Date() })
				.where(eq(tubeKinds.id, f.vars.tube));
		},
		form: (f) => ({ id: f.vars.tube }),
		expect: catalogue(200, 404),
		changes: { by: EDITORS, check: async (f) => !(await tubeRetired(f)) }
	},
	{
		route: '/tube-kinds',
		method: 'POST',
		action: 'allowance',
		form: () => ({ cutAllowancePct: '15' }),
		expect: catalogue(200, 200),
		changes: { by: EDITORS, check: async (f) => (await allowance(f)) === 15 }
	}
];
