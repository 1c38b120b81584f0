/**
 * How long autosaved revisions are kept. Every change is a revision; old ones thin out by age:
 * all from the last day, then the newest in each clock hour for a week, then the newest in each
 * UTC day. Pure, so the rule is tested without a database.
 */

const HOUR_MS = 3_600_000;
const DAY_MS = 24 * HOUR_MS;

export type RevisionStamp = { id: string; createdAt: Date };

/** The ids to delete from a variant's revisions at `now` (any order in; the newest always stays). */
export function revisionsToPrune(revisions: readonly RevisionStamp[], now: Date): string[] {
	const newestFirst = [...revisions].sort(
		(a, b) => b.createdAt.getTime() - a.createdAt.getTime() || (a.id < b.id ? 1 : -1)
	);
	const seen = new Set<string>();
	const prune: string[] = [];
	newestFirst.forEach((r, i) => {
		const age = now.getTime() - r.createdAt.getTime();
		if (i === 0 || age < DAY_MS) return;
		const bucket =
			age < 7 * DAY_MS
				? `h${Math.floor(r.createdAt.getTime() / HOUR_MS)}`
				: `d${Math.floor(r.createdAt.getTime() / DAY_MS)}`;
		// Newest first, so the first seen in a bucket is the one kept.
		if (seen.has(bucket)) prune.push(r.id);
		else seen.add(bucket);
	});
	return prune;
}

/** JSON with object keys sorted, so two settings compare equal however jsonb ordered their keys. */
export function canonicalJson(value: unknown): string {
	return JSON.stringify(value, (_k, v) =>
		v && typeof v === 'object' && !Array.isArray(v)
			? Object.fromEntries(Object.entries(v).sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0)))
			: v
	);
}
