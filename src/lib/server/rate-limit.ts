import { sql } from 'drizzle-orm';
import { db } from './db';

export type Limit = { max: number; windowSec: number };

export const limits = {
	/** Per address and account: guessing one account's password. */
	signIn: { max: 10, windowSec: 15 * 60 },
	/** Per address over all accounts: spraying many accounts from one place. */
	signInAddress: { max: 300, windowSec: 15 * 60 },
	reset: { max: 5, windowSec: 60 * 60 },
	signUp: { max: 20, windowSec: 60 * 60 },
	api: { max: 600, windowSec: 60 },
	comment: { max: 30, windowSec: 10 * 60 },
	shareToken: { max: 60, windowSec: 10 * 60 }
} satisfies Record<string, Limit>;

export type RateResult = { allowed: boolean; count: number; retryAfterSec: number };

/**
 * Counts one attempt under `key` in a fixed window. One atomic upsert in PostgreSQL, so every
 * process behind a load balancer shares the counter and it survives restarts.
 */
export async function hit(key: string, limit: Limit): Promise<RateResult> {
	const rows = await db.execute<{ count: number; window_started_at: Date }>(sql`
		insert into rate_limit (key, count, window_started_at) values (${key}, 1, now())
		on conflict (key) do update set
			count = case when rate_limit.window_started_at < now() - make_interval(secs => ${limit.windowSec})
				then 1 else rate_limit.count + 1 end,
			window_started_at = case when rate_limit.window_started_at < now() - make_interval(secs => ${limit.windowSec})
				then now() else rate_limit.window_started_at end
		returning count, window_started_at`);
	return rateResult(rows[0], limit);
}

/** The verdict on a counter row just written (here, or by a query that counts as it reads). */
export function rateResult(
	row: { count: number; window_started_at: Date | string },
	limit: Limit
): RateResult {
	const started = new Date(row.window_started_at).getTime();
	const retryAfterSec = Math.max(
		1,
		Math.ceil((started + limit.windowSec * 1000 - Date.now()) / 1000)
	);
	return { allowed: row.count <= limit.max, count: row.count, retryAfterSec };
}

export async function clear(key: string) {
	await db.execute(sql`delete from rate_limit where key = ${key}`);
}
