/**
 * The editor's chips count exactly what its lists list, for every fixture: the demo at each of its
 * spine and support-bar positions, the tower enclosure's demo, a pile of identical parts with the
 * listing capped, and generated scenes.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { checkScene } from '$lib/geometry/check';
import { DEMO_SPINE_OFFSETS, demoScene } from '$lib/geometry/standard-library';
import { sceneArb } from '$lib/server/testing/engine-factories';
import { pileSceneInput } from '$lib/server/testing/engine-hostile';
import { sceneSchema } from '$lib/geometry/schema';
import type { FitReport, Scene } from '$lib/geometry';
import { REPORT_KINDS, reportChips, reportGroups, reportItems } from './report-items';
import { calloutSentence, gapWords } from '$lib/words/builds';

function agree(report: FitReport, marginMm: number) {
	const items = reportItems(report, marginMm);
	const chips = reportChips(items);
	const groups = reportGroups(items);
	// Chip = the count shown in the group's heading, for every kind (0 when no group).
	for (const k of REPORT_KINDS) {
		const g = groups.find((x) => x.status === k);
		expect(chips[k]).toBe(g?.count ?? 0);
		// The heading's count is what its rows stand for: one each, or the overlaps past the cap.
		if (g) expect(g.count).toBe(g.items.reduce((n, i) => n + i.count, 0));
	}
	// Every listed overlap is listed once, under its kind; the ones past the cap are counted too.
	for (const o of report.overlaps) {
		const hits = items.filter((i) => i.key === `o:${o.a.id}|${o.b.id}`);
		expect(hits).toHaveLength(1);
		expect(hits[0].status).toBe(o.kind === 'warning' ? 'note' : o.kind);
	}
	const overlapCount = items.filter((i) => i.key.startsWith('o:')).reduce((n, i) => n + i.count, 0);
	expect(overlapCount).toBe(report.overlaps.length + report.overlapsNotListed);
	// A part's own status (shown per part) is backed by an item of that status naming it.
	for (const p of report.parts) {
		// (or, past the listing cap, by the '…and N more overlaps' item that names the rest)
		const backed = items.some(
			(i) =>
				i.ids.includes(p.placementId) &&
				(i.status === p.status ||
					(i.key === 'o:more' && (p.status === 'collides' || p.status === 'blocked')))
		);
		expect(backed, `${p.placementId} (${p.status})`).toBe(true);
	}
	return chips;
}

const demo = demoScene();
const demoStates: [string, Scene][] = [];
for (const [slots, spine] of Object.entries(DEMO_SPINE_OFFSETS)) {
	for (const bar of [0, 50, 100, 150]) {
		demoStates.push([
			`spine at ${slots}, bar at ${bar} mm`,
			{ ...demo, dividerPositions: { ...demo.dividerPositions, spine }, bracketOffsets: { bar } }
		]);
	}
}

describe('fit report chips and lists', () => {
	it.each(demoStates)('agree for the demo with the %s', (_name, scene) => {
		agree(checkScene(scene), scene.marginMm);
	});

	it('the colliding demo: "2 collides" means two collide items listed, not two parts', () => {
		const scene = {
			...demo,
			dividerPositions: { ...demo.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] }
		};
		const report = checkScene(scene);
		const chips = agree(report, scene.marginMm);
		expect(chips.collides).toBeGreaterThan(0);
		expect(chips.collides).toBe(
			report.overlaps.filter((o) => o.kind === 'collides').length +
				report.parts.filter(
					(p) => p.status === 'collides' && p.mountProblems[0]?.status === 'collides'
				).length
		);
	});

	it('agree for a pile of identical parts with the listing capped', () => {
		const scene = sceneSchema.parse(pileSceneInput(12));
		const report = checkScene(scene, { maxListedOverlaps: 5 });
		expect(report.overlapsNotListed).toBeGreaterThan(0);
		const chips = agree(report, scene.marginMm);
		// 12 parts in one spot: every one of the 66 pairs collides, 5 listed and 61 counted.
		expect(chips.collides).toBe(66);
	});

	it('agree for generated scenes', () => {
		fc.assert(
			fc.property(sceneArb, (scene) => void agree(checkScene(scene), scene.marginMm)),
			{ numRuns: 150 }
		);
	});
});

describe('words that name things', () => {
	it('an overlap in the gap table reads as an overlap, naming what it overlaps', () => {
		const spine = {
			id: 'divider:spine',
			kind: 'divider' as const,
			label: 'Spine',
			ownerId: 'spine'
		};
		expect(gapWords({ gapMm: -0.96, worstCaseMm: -1.96, against: spine })).toBe(
			'overlaps the spine by 0.96\u2009mm'
		);
		expect(gapWords({ gapMm: 2, worstCaseMm: 2 })).toBe('2.0\u2009mm');
	});

	it('the colliding demo callout names the card, the spine and both fixes', () => {
		const report = checkScene({
			...demo,
			dividerPositions: { ...demo.dividerPositions, spine: DEMO_SPINE_OFFSETS['2 slots'] }
		});
		const hit = report.overlaps.find((o) => o.a.id === 'card/body')!;
		// 21.3 cm³ and 0.96 mm are the engine's (fixtures.spec.ts checks them); this checks the words.
		expect(calloutSentence(hit)).toBe(
			'Compact graphics card, two slots, 185 mm ↔ spine: 21.3\u2009cm³, 0.96\u2009mm deep — move the compact graphics card, two slots, 185 mm 0.96\u2009mm right, or the spine one slot left'
		);
	});
});
