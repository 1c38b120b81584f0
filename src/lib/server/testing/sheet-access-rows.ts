/**
 * Access-matrix rows for the build sheet (see testing/access-matrix.ts): run by sheet-http.spec.ts,
 * counted as covered by access-matrix.spec.ts. Owners and designers see and tick; a client sees the
 * sheet of a variant shared with them and may not tick (403); the owner of another studio gets 404
 * (the build's existence is not revealed); anonymous visitors the sign-in page, or 401 for what is
 * not a page.
 */
import { and, count, eq } from 'drizzle-orm';
import sharp from 'sharp';
import { db } from '../db';
import { checklistTicks } from '../db/schema';
import { shareWithClient } from './sharing';
import { addPhoto } from '../sharing/photos';
import { createSheetBuild } from './sheet-build';
import { SIGN_IN, type MatrixFixture, type MatrixRow } from './access-matrix';

/** The demo build in the fixture's studio, its variant shared with the fixture's client. */
async function withSheet(f: MatrixFixture) {
	const b = await createSheetBuild({ studioId: f.studio.id, userId: f.designer.id });
	await shareWithClient(f, b);
	f.vars.buildId = b.buildId;
	f.vars.variantId = b.variantId;
}

async function withPhoto(f: MatrixFixture) {
	await withSheet(f);
	const bytes = await sharp({
		create: { width: 48, height: 32, channels: 3, background: '#c1964a' }
	})
		.png()
		.toBuffer();
	f.vars.photoId = (
		await addPhoto({ buildId: f.vars.buildId, uploadedBy: f.designer.id, bytes, caption: 'Bench' })
	).id;
}

async function tickCount(f: MatrixFixture) {
	const [r] = await db
		.select({ n: count() })
		.from(checklistTicks)
		.where(
			and(
				eq(checklistTicks.buildId, f.vars.buildId),
				eq(checklistTicks.itemKey, 'caution:leak-test')
			)
		);
	return r.n;
}

export const sheetRows: MatrixRow[] = [
	{
		route: '/builds/[id]/sheet',
		method: 'GET',
		path: (f) => `/builds/${f.vars.buildId}/sheet`,
		setup: withSheet,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: SIGN_IN }
	},
	{
		route: '/builds/[id]/sheet',
		method: 'POST',
		action: 'tick',
		path: (f) => `/builds/${f.vars.buildId}/sheet?/tick`,
		setup: withSheet,
		form: (f) => ({ variantId: f.vars.variantId, key: 'caution:leak-test', ticked: '1' }),
		expect: { owner: 200, designer: 200, client: 403, outsider: 404, anonymous: 401 },
		changes: { by: ['owner', 'designer'], check: async (f) => (await tickCount(f)) === 1 }
	},
	{
		route: '/builds/[id]/sheet.pdf',
		method: 'GET',
		path: (f) => `/builds/${f.vars.buildId}/sheet.pdf?variant=${f.vars.variantId}`,
		setup: withSheet,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: SIGN_IN }
	},
	{
		route: '/builds/[id]/sheet/photos/[photoId]',
		method: 'GET',
		path: (f) => `/builds/${f.vars.buildId}/sheet/photos/${f.vars.photoId}`,
		setup: withPhoto,
		expect: { owner: 200, designer: 200, client: 200, outsider: 404, anonymous: 401 }
	}
];
