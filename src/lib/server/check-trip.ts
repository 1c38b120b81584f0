/**
 * What POST /api/builds/:id/check needs from the database, in one statement (one round trip, one
 * prepared statement per connection): the session and its user, the build with the caller's role
 * in its studio and the pinned enclosure, the per-user API counter (incremented), and the placed
 * parts the build's studio may use. The check runs after every pause in editing, so the database
 * round trips were most of its cost; this keeps it close to a request that only reads the session.
 *
 * The route skips the session hook (hooks.server.ts: OWN_SESSION_ROUTES) and reads the session
 * here. Anything unusual (no session, an expired one, one Lucia would extend now) falls back to
 * readSession, which handles it as on every other route.
 */
import type { EnclosureDef, PartDef } from '$lib/geometry';
import type { SessionUser } from './auth';
import { getConnection } from './db';
import type { Role } from './db/schema';
import { rateResult, type Limit, type RateResult } from './rate-limit';

export const CHECK_ROUTE = '/api/builds/[id]/check';

export type CheckTrip = {
	user: SessionUser;
	sessionExpiresAt: Date;
	/** Null: no such build. */
	build: { studioId: string; role: Role | null; definition: EnclosureDef } | null;
	rate: RateResult;
	parts: PartDef[];
	forbidden: string[];
};

type Row = {
	user_id: string | null;
	email: string;
	name: string;
	active_studio_id: string | null;
	expires_at: Date;
	studio_id: string | null;
	role: Role | null;
	definition: EnclosureDef | null;
	count: number | null;
	window_started_at: Date | null;
	parts: { id: string; name: string; definition: PartDef }[] | null;
};

/**
 * Null when the session is not valid (missing or expired): the caller falls back to readSession.
 * `limitPrefix` is the counter key without the account (limits.ts limitKey), the account is added
 * here once the session is known, so the key is the one apiLimit would use.
 */
export async function checkTrip(input: {
	sessionId: string;
	buildId: string;
	partIds: string[];
	limitPrefix: string;
	limit: Limit;
}): Promise<CheckTrip | null> {
	const { client } = getConnection();
	const ids = [...new Set(input.partIds)];
	const rows = await client<Row[]>`
		with s as (
			select s.user_id, s.expires_at, u.email, u.name, u.active_studio_id
			from session s join "user" u on u.id = s.user_id
			where s.id = ${input.sessionId} and s.expires_at > now()
		), b as (
			select b.studio_id, m.role, ev.definition
			from build b
			join enclosure_version ev on ev.id = b.enclosure_version_id
			left join membership m on m.studio_id = b.studio_id and m.user_id = (select user_id from s)
			where b.id = ${input.buildId}
		), r as (
			insert into rate_limit (key, count, window_started_at)
			select ${input.limitPrefix} || ':' || s.user_id, 1, now() from s
			on conflict (key) do update set
				count = case when rate_limit.window_started_at < now() - make_interval(secs => ${input.limit.windowSec})
					then 1 else rate_limit.count + 1 end,
				window_started_at = case when rate_limit.window_started_at < now() - make_interval(secs => ${input.limit.windowSec})
					then now() else rate_limit.window_started_at end
			returning count, window_started_at
		), p as (
			select p.id, p.name, p.definition from part p
			where p.id = any(${ids}::text[])
				and (p.studio_id is null or p.studio_id = (select studio_id from b))
		)
		select s.*, b.studio_id, b.role, b.definition, r.count, r.window_started_at,
			(select json_agg(json_build_object('id', p.id, 'name', p.name, 'definition', p.definition)) from p) as parts
		from s left join b on true left join r on true`;
	const row = rows[0];
	if (!row?.user_id || row.count === null || !row.window_started_at) return null;
	const found = row.parts ?? [];
	const have = new Set(found.map((p) => p.id));
	return {
		user: {
			id: row.user_id,
			email: row.email,
			name: row.name,
			activeStudioId: row.active_studio_id
		},
		sessionExpiresAt: new Date(row.expires_at),
		build:
			row.studio_id && row.definition
				? { studioId: row.studio_id, role: row.role, definition: row.definition }
				: null,
		rate: rateResult({ count: row.count, window_started_at: row.window_started_at }, input.limit),
		// Stored definitions were validated when saved (their schemas, before every write).
		parts: found.map((p) => ({ ...p.definition, id: p.id, name: p.name })),
		forbidden: ids.filter((id) => !have.has(id))
	};
}
