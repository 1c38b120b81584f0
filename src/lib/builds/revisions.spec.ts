/** The pruning rule for autosaved revisions, checked on worked timelines. */
import { describe, expect, it } from 'vitest';
import { revisionsToPrune } from './revisions';

const NOW = new Date('2026-12-01T12:00:00Z');

describe('revisionsToPrune', () => {
	// Each timeline: revision id → when it was saved (UTC); `pruned`: the ids that go.
	const cases: { rule: string; timeline: Record<string, string>; pruned: string[] }[] = [
		{
			rule: 'keeps every revision of the last day',
			timeline: { a: '2026-12-01T11:59:00Z', b: '2026-12-01T11:58:00Z', c: '2026-11-30T12:00:01Z' },
			pruned: []
		},
		{
			rule: 'keeps the newest in each hour for a week, then the newest in each day',
			timeline: {
				today: '2026-12-01T11:00:00Z',
				// Two days ago, same clock hour 09:00–10:00: 09:50 stays, 09:10 goes; 10:05 is another hour.
				'h-old': '2026-11-29T09:10:00Z',
				'h-new': '2026-11-29T09:50:00Z',
				'h-next': '2026-11-29T10:05:00Z',
				// Ten days ago, one UTC day: only 23:00 stays.
				'd-early': '2026-11-21T01:00:00Z',
				'd-late': '2026-11-21T23:00:00Z',
				// Twenty days ago, alone in its day: stays.
				alone: '2026-11-11T08:00:00Z'
			},
			pruned: ['d-early', 'h-old']
		},
		{
			rule: 'never prunes the newest revision, however old',
			timeline: { only: '2025-01-01T00:00:00Z' },
			pruned: []
		},
		{
			rule: 'a day boundary: 24 h + 1 s old is thinned, 24 h − 1 s is not',
			timeline: {
				head: '2026-12-01T11:00:00Z',
				'young-a': '2026-11-30T12:00:01Z',
				'young-b': '2026-11-30T12:00:02Z',
				// old-a and old-b share the 11:00 hour; the newer (old-b) stays.
				'old-a': '2026-11-30T11:59:58Z',
				'old-b': '2026-11-30T11:59:59Z'
			},
			pruned: ['old-a']
		}
	];
	for (const { rule, timeline, pruned } of cases) {
		it(rule, () => {
			const list = Object.entries(timeline).map(([id, iso]) => ({ id, createdAt: new Date(iso) }));
			expect(revisionsToPrune(list, NOW).sort()).toEqual(pruned);
		});
	}
});
