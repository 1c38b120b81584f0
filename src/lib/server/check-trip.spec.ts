/**
 * The fit check's one statement (check-trip.ts) against the real PostgreSQL: what it reads and
 * counts, that the stored definitions it trusts are what their schemas make of them, and that the
 * trusted scene is the scene the full validation makes. Then over HTTP, the sessions it does not
 * handle itself (none, expired, due for extension) answered as on every other route.
 */
import { eq } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { enclosureDefSchema, partDefSchema, type EnclosureDef } from '$lib/geometry';
import { SESSION_LIFE_MS } from './auth';
import { trustedScene, validateScene } from './builds';
import { demoBuildIn, loadedVariant } from './testing/builds';
import { checkTrip } from './check-trip';
import { db } from './db';
import { enclosureVersions, parts, rateLimits, sessions } from './db/schema';
import { createMember, createSession, studioWithMembers, unique } from './testing/factories';
import { useApp } from './testing/suite';
import { hashToken } from './tokens';

const app = useApp();
const limit = { max: 3, windowSec: 60 };

/** A studio with a demo build, and its variant as the check loads it. */
async function demoVariant() {
	const f = await studioWithMembers();
	const build = await demoBuildIn(f.studio.id, f.owner.id);
	const loaded = await loadedVariant(build);
	return { f, build, loaded };
}

describe('the check’s one statement', () => {
	it('reads session, role, pinned enclosure and allowed parts, and counts the call', async () => {
		const { f, build, loaded } = await demoVariant();
		const ids = loaded.settings.placements.map((p) => p.partId);
		const prefix = `api-test:${unique('addr')}`;
		const input = {
			sessionId: hashToken(f.designer.session),
			buildId: build.buildId,
			partIds: [...ids, 'no-such-part'],
			limitPrefix: prefix,
			limit
		};
		const trip = (await checkTrip(input))!;
		expect(trip.user.id).toBe(f.designer.id);
		expect(trip.build?.role).toBe('designer');
		expect(trip.build?.studioId).toBe(f.studio.id);
		expect(trip.forbidden).toEqual(['no-such-part']);
		expect(trip.parts.map((p) => p.id).sort()).toEqual([...new Set(ids)].sort());
		expect(trip.rate).toMatchObject({ allowed: true, count: 1 });

		// The scene it composes without re-validating the stored definitions is the fully checked one.
		const def = trip.build!.definition as EnclosureDef;
		expect(trustedScene(def, trip.parts, loaded.settings)).toEqual(
			validateScene(def, trip.parts, loaded.settings)
		);

		// The counter is the one apiLimit keeps for this account; the fourth call is over the limit.
		await checkTrip(input);
		await checkTrip(input);
		const fourth = (await checkTrip(input))!;
		expect(fourth.rate).toMatchObject({ allowed: false, count: 4 });
		const [row] = await db
			.select()
			.from(rateLimits)
			.where(eq(rateLimits.key, `${prefix}:${f.designer.id}`));
		expect(row.count).toBe(4);

		// Another studio's member: the build is found, the role is not; nothing of it is allowed.
		const other = (await checkTrip({ ...input, sessionId: hashToken(f.outsider.session) }))!;
		expect(other.build?.role).toBeNull();
		// No session, no count and no answer: the route falls back to readSession.
		expect(await checkTrip({ ...input, sessionId: hashToken('not-a-session') })).toBeNull();
		expect(
			(await checkTrip({ ...input, buildId: 'no-such-build' }))?.build,
			'a missing build'
		).toBeNull();
	});

	it('trusts stored definitions only because every stored one is what its schema makes of it', async () => {
		// Validated when saved: parsing again changes nothing (defaults filled, nothing dropped).
		const storedParts = await db.select({ id: parts.id, d: parts.definition }).from(parts);
		expect(storedParts.length).toBeGreaterThan(0);
		for (const p of storedParts) {
			const parsed = partDefSchema.safeParse({ ...(p.d as object), id: p.id });
			expect(parsed.success, p.id).toBe(true);
			expect({ ...parsed.data, id: p.id }, p.id).toEqual({ ...(p.d as object), id: p.id });
		}
		const versions = await db
			.select({ id: enclosureVersions.id, d: enclosureVersions.definition })
			.from(enclosureVersions);
		for (const v of versions) expect(enclosureDefSchema.parse(v.d), v.id).toEqual(v.d);
	});
});

describe('POST /api/builds/:id/check and sessions', () => {
	async function setup() {
		const { f, build, loaded } = await demoVariant();
		return { f, build, body: JSON.stringify({ settings: loaded.settings }) };
	}
	const post = (c: ReturnType<typeof app.client>, buildId: string, body: string) =>
		c.request('POST', `/api/builds/${buildId}/check`, {
			headers: { 'content-type': 'application/json', accept: 'application/json' },
			body
		});

	it('answers a member, 401 without a session, 401 and a cleared cookie for an expired one', async () => {
		const { f, build, body } = await setup();
		const ok = await post(app.client({ session: f.designer.session }), build.buildId, body);
		expect(ok.status, ok.text).toBe(200);
		expect(JSON.parse(ok.text)).toHaveProperty('totals');

		expect((await post(app.client(), build.buildId, body)).status).toBe(401);

		const expired = await createMember(f.studio.id, 'designer');
		await db
			.update(sessions)
			.set({ expiresAt: new Date(Date.now() - 1000) })
			.where(eq(sessions.userId, expired.id));
		const c = app.client({ session: expired.session });
		const gone = await post(c, build.buildId, body);
		expect(gone.status).toBe(401);
		expect(c.sessionId).toBeUndefined();
	});

	it('extends a session in its second half and sends the new cookie, as every route does', async () => {
		const { f, build, body } = await setup();
		const token = await createSession(f.designer.id);
		const soon = new Date(Date.now() + SESSION_LIFE_MS / 4);
		await db
			.update(sessions)
			.set({ expiresAt: soon })
			.where(eq(sessions.id, hashToken(token)));
		const c = app.client({ session: token });
		const res = await post(c, build.buildId, body);
		expect(res.status, res.text).toBe(200);
		expect(c.cookieAttributes('interstice_session')).toMatch(/max-age=[1-9]/i);
		const [row] = await db
			.select()
			.from(sessions)
			.where(eq(sessions.id, hashToken(token)));
		expect(row.expiresAt.getTime()).toBeGreaterThan(Date.now() + SESSION_LIFE_MS * 0.9);
	});
});
