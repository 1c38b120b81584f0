import { describe, expect, it } from 'vitest';
import { checkScene, formatMm, sceneSchema, type Scene } from '$lib/geometry';
import { demoSceneInput } from '$lib/geometry/standard-library';
import { compareCsv, compareVariants, type CompareInput } from './compare';

function variant(id: string, scene: Scene): CompareInput {
	return { id, name: id, report: checkScene(scene), marginMm: scene.marginMm };
}

function withBar(offsetMm: number): Scene {
	return sceneSchema.parse({ ...demoSceneInput(), bracketOffsets: { bar: offsetMm } });
}

describe('compareVariants', () => {
	it('finds no difference between a scene and itself', () => {
		const s = withBar(0);
		const rows = compareVariants([variant('a', s), variant('b', s)]);
		expect(rows.length).toBeGreaterThan(20);
		expect(rows.filter((r) => r.differs)).toEqual([]);
		expect(rows.every((r) => r.cells.every((c) => !c.best))).toBe(true);
	});

	it('a bracket moved one step changes exactly the gaps that face it, by exactly that step', () => {
		// The demo's card support bar slides in 10 mm steps along Y. Without the card standing on it,
		// the only part above it is the pump-reservoir: its gap below must shrink by one step, 10 mm.
		const withoutCard = (bar: number) => {
			const input = demoSceneInput();
			return sceneSchema.parse({
				...input,
				placements: input.placements!.filter((p) => p.id !== 'card'),
				bracketOffsets: { bar }
			});
		};
		const rows = compareVariants([variant('a', withoutCard(0)), variant('b', withoutCard(10))]);
		const changed = rows.filter((r) => r.differs);
		expect(changed.map((r) => r.key)).toEqual(['part:pump-res:gap:-y']);
		expect(changed[0].cells[1].delta).toBeCloseTo(-10, 9);
		expect(changed[0].cells[0].best).toBe(true);
	});

	it('marks the better value: a bigger gap, less interference, a better status', () => {
		const fits = sceneSchema.parse({ ...demoSceneInput() });
		const clash = sceneSchema.parse({
			...demoSceneInput(),
			dividerPositions: { bulkhead: 64, spine: 106.32 }
		});
		const rows = compareVariants([variant('fits', fits), variant('clash', clash)]);
		const interference = rows.find((r) => r.key === 'total:interference')!;
		expect(interference.cells[0].best).toBe(true);
		expect(interference.cells[1].best).toBe(false);
		expect(interference.cells[1].delta).toBeGreaterThan(0);
		const cardStatus = rows.find((r) => r.key === 'part:card:status')!;
		// Tight in the first: 2 mm to the right panel, 1 mm once the card's ±1 mm is taken off.
		expect(cardStatus.cells.map((c) => c.text)).toEqual(['tight', 'collides']);
		expect(cardStatus.cells[0].best).toBe(true);
		expect(cardStatus.cells[1].best).toBe(false);
	});

	it('exports every row as CSV with one change column per later variant', () => {
		const s = withBar(0);
		const inputs = [variant('A, first', s), variant('B', withBar(10))];
		const rows = compareVariants(inputs);
		const csv = compareCsv(inputs, rows);
		const lines = csv.trim().split('\r\n');
		expect(lines[0]).toBe('group,item,"A, first",B,change in B');
		expect(lines).toHaveLength(rows.length + 1);
	});
});

describe('comparison CSV and formulas', () => {
	it('a variant named like a formula goes out as text, in the header and the change column', () => {
		// A probe named a variant =HYPERLINK(...) and the comparison CSV carried it unescaped.
		const evil = '=HYPERLINK("https://evil.example","open")';
		const inputs = [variant(evil, withBar(0)), variant('@B', withBar(10))];
		const csv = compareCsv(inputs, compareVariants(inputs));
		const header = csv.split('\r\n')[0];
		expect(header).toBe(`group,item,"'${evil.replace(/"/g, '""')}",'@B,change in @B`);
		expect(csv).not.toMatch(/(^|,)"?[=+@]/m);
	});
});

describe('overlaps in the difference table', () => {
	// The demo with the spine one slot too far left: the card's body runs into the spine.
	const fits = sceneSchema.parse({ ...demoSceneInput() });
	const clash = sceneSchema.parse({
		...demoSceneInput(),
		dividerPositions: { bulkhead: 64, spine: 106.32 }
	});
	const inputs = [variant('fits', fits), variant('clash', clash)];
	const rows = compareVariants(inputs);
	const gapRows = rows.filter((r) => r.key.includes(':gap:'));

	it('no gap cell, change or CSV field is a negative number', () => {
		expect(gapRows.length).toBeGreaterThan(0);
		for (const r of gapRows) {
			for (const c of r.cells) {
				expect(c.text, r.label).not.toMatch(/[−-]\s?\d/);
				if (c.value !== null && c.value < 0) expect(c.delta).toBeNull();
			}
		}
		// Columns: group, item, one per variant, then one change column per later variant. A gap's
		// own columns never hold a negative number; a change may be negative (the gap shrank), but
		// never to or from an overlap.
		const csv = compareCsv(inputs, rows);
		const fields = (line: string) =>
			[...line.matchAll(/("(?:[^"]|"")*"|[^,]*)(?:,|$)/g)].map((m) => m[1]).slice(0, 5);
		for (const line of csv.split('\r\n').filter((l) => l.includes(' gap '))) {
			const [, , ...rest] = fields(line);
			const values = rest.slice(0, inputs.length);
			const change = rest[inputs.length];
			for (const v of values) expect(v, line).not.toMatch(/^-\d/);
			if (values.some((v) => v.startsWith('overlaps'))) expect(change, line).toBe('');
		}
	});

	it('an overlap reads as one, naming the other thing and the depth that clears it', () => {
		const report = inputs[1].report;
		const cardSpine = report.overlaps.find((o) =>
			[o.a.placementId, o.b.placementId].includes('card')
		)!;
		expect(cardSpine).toBeDefined();
		// The depth that clears an overlap is its thinnest extent (an oracle straight from the
		// overlap box: the smallest of its three sizes).
		const depth = Math.min(...cardSpine.depthMm);
		const overlapCells = gapRows
			.filter((r) => r.key.startsWith('part:card:'))
			.map((r) => r.cells[1].text)
			.filter((t) => t.startsWith('overlaps'));
		expect(overlapCells.length).toBeGreaterThan(0);
		for (const t of overlapCells) {
			expect(t).toMatch(/^overlaps the [a-z ]+ by \d+\.\d\d?\u2009mm$/);
		}
		expect(overlapCells).toContain(`overlaps the spine by ${formatMm(depth)}`);
		// The demo's collision, worked: the card reaches 0.96 mm into the spine.
		expect(depth).toBeCloseTo(0.96, 6);
	});
});

describe('settings rows', () => {
	it('say a named position and its offset, and an unnamed one once', () => {
		// As the server names them: a divider's list label, a bracket's offset in millimetres.
		const withControls = (id: string, bar: number): CompareInput => ({
			...variant(id, withBar(bar)),
			controls: [
				{ key: 'divider:spine', label: 'Spine', offsetMm: 86, position: '3 slots' },
				{ key: 'bracket:bar', label: 'Card support bar', offsetMm: bar, position: formatMm(bar) }
			]
		});
		const rows = compareVariants([withControls('a', 0), withControls('b', 10)]);
		const spine = rows.find((r) => r.key === 'setting:divider:spine')!;
		expect(spine.cells[0].text).toBe('3 slots · 86.0\u2009mm');
		const bar = rows.find((r) => r.key === 'setting:bracket:bar')!;
		expect(bar.cells.map((c) => c.text)).toEqual(['0.0\u2009mm', '10.0\u2009mm']);
	});
});
