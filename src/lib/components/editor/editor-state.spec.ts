/**
 * The editor's state on the demo scene (src/lib/geometry/standard-library.ts): undo and redo, snapping to
 * allowed positions, locks, autosave and the 409 conflict. The API is a small in-memory stand-in
 * with the server's version rule (save only over the version you loaded); the fit reports come
 * from the real engine. The integration tests in src/lib/server/builds.spec.ts cover the real API.
 */
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest';
import {
	checkScene,
	enclosureDefSchema,
	partDefSchema,
	sceneSchema,
	type FitReport,
	type PartDef
} from '$lib/geometry';
import { DEMO_SPINE_OFFSETS, demoSceneInput } from '$lib/geometry/standard-library';
import { composeScene, variantSettingsSchema, type VariantSettings } from '$lib/builds/settings';
import type { Problem, SaveOutcome } from '$lib/api/client';
import { EditorState, type EditorApi } from './editor-state.svelte';

const SAVE_DELAY_MS = 700;
const CHECK_DELAY_MS = 400;

function demo() {
	const s = demoSceneInput();
	const enclosure = enclosureDefSchema.parse(s.enclosure);
	const parts = (s.parts ?? []).map((p) => partDefSchema.parse(p));
	const settings = variantSettingsSchema.parse({
		dividerPositions: s.dividerPositions,
		bracketOffsets: s.bracketOffsets,
		placements: s.placements,
		marginMm: s.marginMm,
		budgets: s.budgets
	});
	return { enclosure, parts, settings };
}

/** What a server does with saves: a stored scene with a version; a save over an older one is refused. */
class FakeServer implements EditorApi {
	saves: { version: number; settings: VariantSettings }[] = [];
	checks = 0;
	/** Holds saves on the wire until released, to test overlapping saves. */
	hold = false;
	#held: (() => void)[] = [];
	reject: Problem | null = null;

	constructor(
		public version: number,
		public stored: VariantSettings,
		private parts: PartDef[]
	) {}

	/** Someone else saves (another tab, another designer). */
	saveElsewhere(settings: VariantSettings) {
		this.version += 1;
		this.stored = settings;
	}

	async save(version: number, settings: VariantSettings): Promise<SaveOutcome> {
		this.saves.push({ version, settings });
		if (this.hold) await new Promise<void>((r) => this.#held.push(r));
		if (this.reject) return { kind: 'rejected', status: 400, problem: this.reject };
		if (version !== this.version) {
			return {
				kind: 'conflict',
				version: this.version,
				settings: this.stored,
				updatedAt: new Date(0).toISOString()
			};
		}
		this.version += 1;
		this.stored = structuredClone(settings);
		return { kind: 'saved', version: this.version, report: this.report(settings) };
	}

	async check(settings: VariantSettings): Promise<FitReport | Problem> {
		this.checks++;
		return this.report(settings);
	}

	release() {
		this.#held.splice(0).forEach((r) => r());
	}

	private report(settings: VariantSettings) {
		return checkScene(sceneSchema.parse(composeScene(demo().enclosure, this.parts, settings)));
	}
}

function setup(
	opts: {
		version?: number;
		serverParts?: PartDef[];
		history?: VariantSettings[];
		readOnly?: string;
	} = {}
) {
	const d = demo();
	const server = new FakeServer(opts.version ?? 1, d.settings, opts.serverParts ?? d.parts);
	const editor = new EditorState({
		buildId: 'demo-build',
		variantId: 'demo-variant-a',
		enclosure: d.enclosure,
		parts: d.parts,
		settings: d.settings,
		version: opts.version ?? 1,
		api: server,
		saveDelayMs: SAVE_DELAY_MS,
		checkDelayMs: CHECK_DELAY_MS,
		history: opts.history,
		readOnly: opts.readOnly
	});
	return { editor, server, initial: d.settings, parts: d.parts };
}

const spineAt = (e: EditorState) => e.settings.dividerPositions.spine;
const barAt = (e: EditorState) => e.settings.bracketOffsets.bar;
/** The bar's slider dragged through these offsets: one gesture, until it is let go. */
const slideBar = (e: EditorState, ...offsets: number[]) =>
	offsets.forEach((offset) => e.setControl('bracket', 'bar', offset, 'bracket:bar:slider'));
/** One undo, and where the bar is after it. */
function undoBar(e: EditorState) {
	e.undo();
	return barAt(e);
}
/** The card against the spine: the demo's known collision with the spine at "2 slots". */
const cardHitsSpine = (e: EditorState) =>
	!!e.report?.overlaps.some(
		(o) =>
			o.kind === 'collides' &&
			[o.a, o.b].some((r) => r.placementId === 'card') &&
			[o.a, o.b].some((r) => r.ownerId === 'spine')
	);

let editors: EditorState[] = [];
beforeEach(() => {
	vi.useFakeTimers();
	editors = [];
});
afterEach(() => {
	editors.forEach((e) => e.dispose());
	vi.useRealTimers();
});
function track<T extends { editor: EditorState }>(t: T): T {
	editors.push(t.editor);
	return t;
}

describe('undo and redo', () => {
	it('a slider drag across several positions is one undo step', () => {
		const { editor } = track(setup());
		slideBar(editor, 10, 20, 30, 40);
		expect(barAt(editor)).toBe(40);
		expect(undoBar(editor)).toBe(0);
		expect(editor.canUndo).toBe(false);
		editor.redo();
		expect(barAt(editor)).toBe(40);
		expect(editor.canRedo).toBe(false);
	});

	it('two drags of the same slider, each let go, are two steps', () => {
		const { editor } = track(setup());
		slideBar(editor, 10, 20);
		editor.endGesture();
		slideBar(editor, 30, 50);
		expect(undoBar(editor)).toBe(20);
		expect(undoBar(editor)).toBe(0);
	});

	it('changes to different controls are separate steps, undone in reverse order', () => {
		const { editor } = track(setup());
		editor.setControl('bracket', 'bar', 30);
		editor.setControl('divider', 'spine', DEMO_SPINE_OFFSETS['4 slots']);
		editor.setMargin(3);
		editor.undo();
		expect(editor.settings.marginMm).toBe(2);
		editor.undo();
		expect(spineAt(editor)).toBe(DEMO_SPINE_OFFSETS['3 slots']);
		expect(barAt(editor)).toBe(30);
		expect(undoBar(editor)).toBe(0);
	});

	it('a new change after an undo drops the redo history', () => {
		const { editor } = track(setup());
		editor.setControl('bracket', 'bar', 30);
		editor.undo();
		expect(editor.canRedo).toBe(true);
		editor.setControl('divider', 'spine', DEMO_SPINE_OFFSETS['2 slots']);
		expect(editor.canRedo).toBe(false);
		editor.redo();
		expect(barAt(editor)).toBe(0);
	});

	it('undo and redo with nothing to undo or redo change nothing', () => {
		const { editor, initial } = track(setup());
		editor.undo();
		editor.redo();
		expect(editor.settings).toBe(initial);
	});

	it('an undo that follows a drag does not fold the next drag into it', () => {
		const { editor } = track(setup());
		slideBar(editor, 30);
		editor.undo();
		slideBar(editor, 60, 70);
		expect(undoBar(editor)).toBe(0);
		expect(editor.canUndo).toBe(false);
	});
});

describe('snapping to allowed positions', () => {
	it.each([
		// Midpoints: 75.84 mm between "4 slots" and "3 slots", 96.16 mm between "3 slots" and "2 slots".
		[100, DEMO_SPINE_OFFSETS['2 slots']],
		[96.2, DEMO_SPINE_OFFSETS['2 slots']],
		[96.1, DEMO_SPINE_OFFSETS['3 slots']],
		[75.8, DEMO_SPINE_OFFSETS['4 slots']],
		[-40, DEMO_SPINE_OFFSETS['4 slots']],
		[400, DEMO_SPINE_OFFSETS['2 slots']]
	])('a spine dragged freely to %s mm lands on %s mm', (free, expected) => {
		const { editor } = track(setup());
		editor.setControl('divider', 'spine', free, 'divider:spine:drag');
		expect(spineAt(editor)).toBe(expected);
	});

	it.each([
		[33, 30],
		[36, 40],
		[-12, 0],
		[149, 150],
		[1000, 150]
	])(
		'the card support bar dragged to %s mm lands on %s mm (0–150 mm in 10 mm steps)',
		(free, expected) => {
			const { editor } = track(setup());
			editor.setControl('bracket', 'bar', free);
			expect(barAt(editor)).toBe(expected);
		}
	);

	it('the fit report follows at once: at "2 slots" the card collides with the spine, back at "3 slots" it fits', () => {
		const { editor } = track(setup());
		expect(cardHitsSpine(editor)).toBe(false);
		expect(editor.report?.totals.counts.collides).toBe(0);
		editor.setControl('divider', 'spine', 104, 'divider:spine:drag');
		expect(cardHitsSpine(editor)).toBe(true);
		editor.setControl('divider', 'spine', 88, 'divider:spine:drag');
		expect(cardHitsSpine(editor)).toBe(false);
		expect(editor.report?.totals.counts.collides).toBe(0);
	});

	it('a free value that snaps to where the control already is makes no change and no undo step', () => {
		const { editor, initial } = track(setup());
		editor.setControl('divider', 'spine', DEMO_SPINE_OFFSETS['3 slots'] + 3);
		expect(editor.settings).toBe(initial);
		expect(editor.canUndo).toBe(false);
	});

	it('an unknown control is ignored', () => {
		const { editor, initial } = track(setup());
		editor.setControl('divider', 'no-such-divider', 10);
		editor.stepControl('bracket', 'no-such-bracket', 1);
		expect(editor.settings).toBe(initial);
	});
});

describe('stepping', () => {
	it('+1 and −1 walk the allowed positions in offset order and hold at the ends', () => {
		const { editor } = track(setup());
		editor.stepControl('divider', 'spine', 1);
		expect(spineAt(editor)).toBe(DEMO_SPINE_OFFSETS['2 slots']);
		const atEnd = editor.settings;
		editor.stepControl('divider', 'spine', 1);
		expect(editor.settings, 'held at the last position, nothing changed').toBe(atEnd);
		for (let i = 0; i < 4; i++) editor.stepControl('divider', 'spine', -1);
		expect(spineAt(editor)).toBe(DEMO_SPINE_OFFSETS['4 slots']);
	});

	it('the bar steps 10 mm and holds at 0 and 150 mm', () => {
		const { editor } = track(setup());
		editor.stepControl('bracket', 'bar', -1);
		expect(barAt(editor)).toBe(0);
		for (let i = 0; i < 20; i++) editor.stepControl('bracket', 'bar', 1);
		expect(barAt(editor)).toBe(150);
	});
});

describe('parts', () => {
	it('a nudge moves 1 mm (10 mm with Shift) along one axis; a held key is one undo step', () => {
		const { editor } = track(setup());
		const before = editor.placement('pump-res')!.position;
		editor.nudge('pump-res', 0, -1);
		editor.nudge('pump-res', 0, -1);
		editor.nudge('pump-res', 2, -10);
		expect(editor.placement('pump-res')!.position).toEqual([
			before[0] - 2,
			before[1],
			before[2] - 10
		]);
		editor.undo();
		expect(editor.placement('pump-res')!.position).toEqual(before);
	});

	it('a locked part does not move, turn or go away; unlocking lets it move again', () => {
		const { editor } = track(setup());
		editor.toggleLocked('card');
		const locked = editor.settings;
		const card = editor.placement('card')!;
		expect(card.locked).toBe(true);
		editor.nudge('card', 0, 10);
		editor.setPosition('card', [0, 0, 0]);
		editor.rotate('card', 'y');
		editor.remove('card');
		expect(editor.settings).toBe(locked);
		expect(editor.placement('card')).toEqual(card);
		editor.toggleLocked('card');
		editor.nudge('card', 1, 1);
		expect(editor.placement('card')!.position[1]).toBe(card.position[1] + 1);
	});

	it('a position that is not a finite number is ignored', () => {
		const { editor, initial } = track(setup());
		editor.setPosition('pump-res', [Number.NaN, 0, 0]);
		editor.setMargin(-1);
		editor.setMargin(Number.POSITIVE_INFINITY);
		expect(editor.settings).toBe(initial);
	});
});

describe('autosave', () => {
	it('an undo back to the saved state writes nothing (no revision for a nudge taken back)', async () => {
		const { editor, server, initial } = track(setup());
		editor.nudge('pump-res', 0, 1);
		expect(editor.saveStatus).toBe('pending');
		editor.undo();
		expect(editor.settings).toBe(initial);
		expect(editor.saveStatus).toBe('saved');
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS * 3);
		expect(server.saves).toEqual([]);
		expect(editor.version).toBe(1);
	});

	it('an undo after the nudge was saved is a change from the saved state, so it is saved', async () => {
		const { editor, server } = track(setup());
		editor.nudge('pump-res', 0, 1);
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		editor.undo();
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		expect(server.saves.map((s) => s.version)).toEqual([1, 2]);
	});

	it('undo reaches back into the saved revisions it was opened with (across a reload), and saves the state it goes back to', async () => {
		const earlier = { ...demo().settings, marginMm: 3 };
		const { editor, server } = track(setup({ version: 2, history: [earlier] }));
		expect(editor.canUndo).toBe(true);
		editor.undo();
		expect(editor.settings.marginMm).toBe(3);
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		expect(server.saves.map((s) => [s.version, s.settings.marginMm])).toEqual([[2, 3]]);
	});

	it('a read-only editor (approved by the client) changes nothing and saves nothing', async () => {
		const { editor, server, initial, parts } = track(
			setup({ readOnly: 'Version 1 was approved.' })
		);
		editor.nudge('pump-res', 0, 1);
		editor.setControl('divider', 'spine', 106.32);
		expect(editor.settings).toBe(initial);
		expect(editor.addPart(parts[0])).toEqual({ reason: 'Read-only: Version 1 was approved.' });
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS * 2);
		expect(server.saves).toEqual([]);
	});

	it('saves once after a pause, with the last position of the drag, and counts the version up', async () => {
		const { editor, server } = track(setup());
		for (const offset of [10, 20, 30]) {
			editor.setControl('bracket', 'bar', offset, 'bracket:bar:slider');
			await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS - 100);
		}
		expect(server.saves).toEqual([]);
		expect(editor.saveStatus).toBe('pending');
		await vi.advanceTimersByTimeAsync(100);
		expect(server.saves.map((s) => [s.version, s.settings.bracketOffsets.bar])).toEqual([[1, 30]]);
		expect(editor.saveStatus).toBe('saved');
		expect(editor.version).toBe(2);
		expect(server.stored.bracketOffsets.bar).toBe(30);
	});

	it('sends one save at a time: a change made while a save is on the wire is saved after it, over the new version', async () => {
		const { editor, server } = track(setup());
		server.hold = true;
		editor.setControl('bracket', 'bar', 10);
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		expect(server.saves).toHaveLength(1);
		expect(editor.saveStatus).toBe('saving');
		editor.setControl('divider', 'spine', DEMO_SPINE_OFFSETS['4 slots']);
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS * 3);
		expect(server.saves, 'no second save while the first is on the wire').toHaveLength(1);
		server.hold = false;
		server.release();
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		expect(server.saves.map((s) => s.version)).toEqual([1, 2]);
		expect(editor.conflict).toBeNull();
		expect(editor.saveStatus).toBe('saved');
		expect(editor.version).toBe(3);
		expect(server.stored.dividerPositions.spine).toBe(DEMO_SPINE_OFFSETS['4 slots']);
		expect(server.stored.bracketOffsets.bar).toBe(10);
	});

	it('a refused save says why, with the path of the first problem', async () => {
		const { editor, server } = track(setup());
		server.reject = {
			message: 'The scene was not saved.',
			issues: [{ path: 'settings.dividerPositions.spine', message: 'Not an allowed position' }]
		};
		editor.setControl('bracket', 'bar', 10);
		await editor.saveNow();
		expect(editor.saveStatus).toBe('error');
		expect(editor.saveMessage).toContain('settings.dividerPositions.spine');
		expect(editor.version).toBe(1);
	});

	it('a save that never reaches the server is an error, not a save stuck "saving"', async () => {
		const { editor, server } = track(setup());
		server.save = () => Promise.reject(new TypeError('Failed to fetch'));
		editor.setControl('bracket', 'bar', 10);
		await editor.saveNow();
		expect(editor.saveStatus).toBe('error');
		expect(editor.saveMessage).toContain('Failed to fetch');
	});
});

describe('a stale version: 409', () => {
	async function conflicted() {
		const t = track(setup());
		const theirs: VariantSettings = {
			...t.initial,
			dividerPositions: { ...t.initial.dividerPositions, spine: DEMO_SPINE_OFFSETS['4 slots'] },
			marginMm: 1
		};
		t.server.saveElsewhere(theirs);
		t.editor.setControl('bracket', 'bar', 20, 'bracket:bar:slider');
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		const mine = t.editor.settings;
		return { ...t, theirs, mine };
	}

	it('puts the editor in the conflict state with the newer scene beside mine; nothing is overwritten', async () => {
		const { editor, server, theirs, mine } = await conflicted();
		expect(editor.saveStatus).toBe('conflict');
		expect(editor.conflict).toMatchObject({ version: 2, settings: theirs });
		expect(editor.settings).toBe(mine);
		expect(server.stored).toEqual(theirs);
		// Further changes wait for the builder's choice instead of saving over the newer scene.
		editor.setControl('bracket', 'bar', 40, 'bracket:bar:other');
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS * 2);
		expect(server.saves).toHaveLength(1);
		expect(editor.saveStatus).toBe('conflict');
		expect(server.stored).toEqual(theirs);
	});

	it('"use the saved version" takes theirs and keeps mine one undo away', async () => {
		const { editor, server, theirs, mine } = await conflicted();
		editor.takeTheirs();
		expect(editor.conflict).toBeNull();
		expect(editor.settings).toEqual(theirs);
		expect(editor.version).toBe(2);
		expect(editor.saveStatus).toBe('saved');
		// Their scene is worked on like any other: a drag after it is its own step, above theirs.
		editor.setControl('bracket', 'bar', 60, 'bracket:bar:slider');
		editor.undo();
		expect(editor.settings).toEqual(theirs);
		editor.undo();
		expect(editor.settings).toBe(mine);
		// Undoing to mine saves mine, now over the version it was shown.
		await vi.advanceTimersByTimeAsync(SAVE_DELAY_MS);
		expect(server.saves.at(-1)?.version).toBe(2);
		expect(server.stored).toEqual(mine);
		expect(editor.version).toBe(3);
	});

	it('"keep mine" saves mine over the newer version, whose scene stays one undo away', async () => {
		const { editor, server, theirs, mine } = await conflicted();
		await editor.keepMine();
		expect(server.saves.at(-1)).toEqual({ version: 2, settings: mine });
		expect(server.stored).toEqual(mine);
		expect(editor.version).toBe(3);
		expect(editor.saveStatus).toBe('saved');
		expect(editor.conflict).toBeNull();
		editor.undo();
		expect(editor.settings).toEqual(theirs);
	});
});

describe('the server confirms', () => {
	it('agrees when it computes the same report', async () => {
		const { editor, server } = track(setup());
		editor.setControl('divider', 'spine', DEMO_SPINE_OFFSETS['2 slots']);
		expect(editor.serverAgrees).toBeNull();
		await vi.advanceTimersByTimeAsync(CHECK_DELAY_MS);
		expect(server.checks).toBe(1);
		expect(editor.serverAgrees).toBe(true);
	});

	it('says so when the server computes a different report (its catalogue has a longer card)', async () => {
		const d = demo();
		const longer = d.parts.map((p) =>
			p.id === 'demo-card'
				? {
						...p,
						bodies: p.bodies.map((b) => ({
							...b,
							box: {
								min: b.box.min,
								max: [b.box.max[0] + 40, b.box.max[1], b.box.max[2]] as typeof b.box.max
							}
						}))
					}
				: p
		);
		const { editor } = track(setup({ serverParts: longer }));
		await editor.confirmWithServer();
		expect(editor.serverAgrees).toBe(false);
		expect(editor.serverMessage).toMatch(/differs/);
	});

	it('a server that cannot be reached is reported, not thrown', async () => {
		const { editor, server } = track(setup());
		server.check = () => Promise.reject(new TypeError('Failed to fetch'));
		await editor.confirmWithServer();
		expect(editor.serverAgrees).toBe(false);
		expect(editor.serverMessage).toContain('Failed to fetch');
	});
});
