/** The pruning rule for autosaved revisions, checked on a worked timeline. */
import { describe, expect, it } from 'vitest';
import { revisionsToPrune } from './revisions';

const NOW = new Date('2026-12-01T12:00:00Z');
const at = (iso: string, id: string) => ({ id, createdAt: new Date(iso) });

describe('revisionsToPrune', () => {
	it('keeps every revision of the last day', () => {
		const list = [
			at('2026-12-01T11:59:00Z', 'a'),
			at('2026-12-01T11:58:00Z', 'b'),
			at('2026-11-30T12:00:01Z', 'c')
		];
		expect(revisionsToPrune(list, NOW)).toEqual([]);
	});

	it('keeps the newest in each hour for a week, then the newest in each day', () => {
		const list = [
			at('2026-12-01T11:00:00Z', 'today'),
			// Two days ago, same clock hour 09:00–10:00: 09:50 stays, 09:10 goes; 10:05 is another hour.
			at('2026-11-29T09:10:00Z', 'h-old'),
			at('2026-11-29T09:50:00Z', 'h-new'),
			at('2026-11-29T10:05:00Z', 'h-next'),
			// Ten days ago, one UTC day: only 23:00 stays.
			at('2026-11-21T01:00:00Z', 'd-early'),
			at('2026-11-21T23:00:00Z', 'd-late'),
			// Twenty days ago, alone in its day: stays.
			at('2026-11-11T08:00:00Z', 'alone')
		];
		expect(revisionsToPrune(list, NOW).sort()).toEqual(['d-early', 'h-old']);
	});

	it('never prunes the newest revision, however old', () => {
		expect(revisionsToPrune([at('2025-01-01T00:00:00Z', 'only')], NOW)).toEqual([]);
	});

	it('a day boundary: 24 h + 1 s old is thinned, 24 h − 1 s is not', () => {
		const list = [
			at('2026-12-01T11:00:00Z', 'head'),
			at('2026-11-30T12:00:01Z', 'young-a'),
			at('2026-11-30T12:00:02Z', 'young-b'),
			at('2026-11-30T11:59:58Z', 'old-a'),
			at('2026-11-30T11:59:59Z', 'old-b')
		];
		// old-a and old-b share the 11:00 hour; the newer (old-b) stays.
		expect(revisionsToPrune(list, NOW)).toEqual(['old-a']);
	});
});
