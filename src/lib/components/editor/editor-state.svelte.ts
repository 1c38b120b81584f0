/**
 * The build editor's state: one instance per page, passed down through context. Every change goes
 * through `apply`, which records undo history, re-runs the fit engine locally (instant), and
 * schedules the autosave and the server's confirming check.
 */
import { getContext, setContext } from 'svelte';
import {
	formatZodIssues,
	checkExcess,
	reportFor,
	resolveScene,
	sceneSchema,
	type Box,
	type BracketDef,
	type DividerDef,
	type EnclosureDef,
	type FieldIssue,
	type FitReport,
	type PartDef,
	type Placement,
	type PortRef,
	type ResolvedScene,
	type RunCache,
	type Scene,
	type TubeKindDef,
	type Vec3
} from '$lib/geometry';
import { composeScene, type VariantSettings } from '$lib/builds/settings';
import {
	landInRoom,
	landOnMount,
	nextPlacementId,
	snapToAllowed,
	stepAllowed,
	turnQuarter
} from '$lib/builds/placement';
import { reportDigest } from '$lib/builds/report-digest';
import {
	dragWaypoint as dragWaypointIn,
	newRunCache,
	type WaypointHandle
} from '$lib/loop/handles';
import { canonicalJson } from '$lib/builds/revisions';
import type { Problem, SaveOutcome } from '$lib/api/client';
import type { ViewName } from '$lib/scene/view';

export type EditorApi = {
	save(version: number, settings: VariantSettings): Promise<SaveOutcome>;
	check(settings: VariantSettings): Promise<FitReport | Problem>;
};

export type SaveStatus = 'saved' | 'pending' | 'saving' | 'conflict' | 'error';

type Computed =
	| { ok: true; scene: Scene; resolved: ResolvedScene; report: FitReport; issues: [] }
	| { ok: false; issues: FieldIssue[] };

const HISTORY_LIMIT = 200;

function sameSettings(a: VariantSettings, b: VariantSettings): boolean {
	return a === b || canonicalJson(a) === canonicalJson(b);
}

function compute(
	enclosure: EnclosureDef,
	parts: PartDef[],
	settings: VariantSettings,
	tubeKinds: TubeKindDef[] = [],
	runCache?: RunCache
): Computed {
	const parsed = sceneSchema.safeParse(composeScene(enclosure, parts, settings, tubeKinds));
	if (!parsed.success) return { ok: false, issues: formatZodIssues(parsed.error) };
	// Over the cost limits the browser would stall on it (and the server refuses to save it).
	const excess = checkExcess(parsed.data);
	if (excess) {
		return {
			ok: false,
			issues: [{ path: excess.path, message: `Too large to check: ${excess.message}` }]
		};
	}
	try {
		const resolved = resolveScene(parsed.data);
		return {
			ok: true,
			scene: parsed.data,
			resolved,
			report: reportFor(parsed.data, resolved, { runCache }),
			issues: []
		};
	} catch (e) {
		return { ok: false, issues: [{ path: '', message: (e as Error).message }] };
	}
}

export class EditorState {
	readonly enclosure: EnclosureDef;
	readonly buildId: string;
	readonly variantId: string;
	parts = $state.raw<PartDef[]>([]);
	settings = $state.raw<VariantSettings>() as VariantSettings;
	version = $state(1);

	selectedId = $state<string | null>(null);
	highlightIds = $state.raw<string[]>([]);
	hiddenIds = $state.raw<string[]>([]);
	view = $state<ViewName>('orbit');
	showPanels = $state(true);
	showKeepouts = $state(true);
	/** A free-space box picked in "what fits here", drawn as a ghost in 3D. */
	freeSpaceGhost = $state.raw<Box | null>(null);
	/** A suggested route's tube boxes, previewed as a ghost run in 3D before it is accepted. */
	routeGhost = $state.raw<Box[]>([]);
	dragTarget = $state.raw<
		| { kind: 'divider' | 'bracket'; id: string }
		| { kind: 'part'; id: string; axis: 'x' | 'y' | 'z' }
		| null
	>(null);

	saveStatus = $state<SaveStatus>('saved');
	saveMessage = $state('');
	conflict = $state.raw<{ version: number; settings: VariantSettings; updatedAt: string } | null>(
		null
	);
	serverAgrees = $state<boolean | null>(null);
	serverMessage = $state('');

	#undo = $state.raw<VariantSettings[]>([]);
	#redo = $state.raw<VariantSettings[]>([]);
	#coalesceKey: string | null = null;
	/** The save on the wire, if any: one at a time, or the second would conflict with the first. */
	#inFlight: Promise<SaveOutcome> | null = null;
	#saveTimer: ReturnType<typeof setTimeout> | undefined;
	#checkTimer: ReturnType<typeof setTimeout> | undefined;
	#api: EditorApi;
	#saveDelayMs: number;
	#checkDelayMs: number;

	/** The studio's tube kinds and fitting parts, for the loop panel. */
	readonly tubeKinds: TubeKindDef[];
	readonly fittings: PartDef[];

	/**
	 * Runs checked before, kept while nothing but the loops changes (a waypoint dragged re-checks
	 * only its run: the engine's run cache); anything else changing starts a fresh one.
	 */
	#runCache: { base: string; parts: PartDef[]; cache: RunCache } = {
		base: '',
		parts: [],
		cache: newRunCache()
	};

	#cacheFor(settings: VariantSettings, parts: PartDef[]): RunCache {
		const base = canonicalJson({ ...settings, loops: null });
		if (base !== this.#runCache.base || parts !== this.#runCache.parts) {
			this.#runCache = { base, parts, cache: newRunCache() };
		}
		return this.#runCache.cache;
	}

	computed = $derived.by(() =>
		compute(
			this.enclosure,
			this.parts,
			this.settings,
			this.tubeKinds,
			this.#cacheFor(this.settings, this.parts)
		)
	);

	/** A coolant port clicked in the 3D view, for the loop panel to start or finish a run with. */
	portPick = $state.raw<PortRef | null>(null);

	/**
	 * Waypoint `handle` dragged to `to` (see dragWaypoint): applied when the scene accepts it, one
	 * undo step per drag; a hard run that cannot follow keeps its last accepted place.
	 */
	dragWaypoint(handle: WaypointHandle, to: Vec3, done: boolean) {
		const run = this.settings.loops?.[handle.loop]?.runs[handle.run];
		const points = this.report?.loops?.[handle.loop]?.runs[handle.run]?.points;
		if (run && points && points.length >= 2) {
			const next = dragWaypointIn(
				this.settings,
				handle.loop,
				handle.run,
				handle.index,
				to,
				this.tubeKinds.find((t) => t.id === run.tube),
				{ start: points[0], end: points[points.length - 1] }
			);
			if (next) this.applyLoop(next, [], `waypoint:${handle.key}`);
		}
		if (done) this.endGesture();
	}
	report = $derived(this.computed.ok ? this.computed.report : null);
	resolved = $derived(this.computed.ok ? this.computed.resolved : null);
	canUndo = $derived(this.#undo.length > 0);
	canRedo = $derived(this.#redo.length > 0);
	// A fresh read-only lookup per change of `parts`; never mutated, so no reactive map is needed.
	// eslint-disable-next-line svelte/prefer-svelte-reactivity
	partsById = $derived(new Map(this.parts.map((p) => [p.id, p])));

	/** Set when the client approved this variant: nothing changes, nothing is saved. */
	readOnly: string | null = null;
	/** The settings the server holds (the last save): a change back to them writes nothing. */
	#saved: VariantSettings;

	constructor(init: {
		buildId: string;
		variantId: string;
		enclosure: EnclosureDef;
		parts: PartDef[];
		tubeKinds?: TubeKindDef[];
		fittings?: PartDef[];
		settings: VariantSettings;
		version: number;
		api: EditorApi;
		saveDelayMs?: number;
		checkDelayMs?: number;
		readOnly?: string | null;
		history?: VariantSettings[];
	}) {
		this.readOnly = init.readOnly ?? null;
		this.#saved = init.settings;
		// Earlier saved revisions, oldest first: undo steps back through them after a reload.
		if (!this.readOnly && init.history?.length) this.#undo = init.history.slice(-HISTORY_LIMIT);
		this.buildId = init.buildId;
		this.variantId = init.variantId;
		this.enclosure = init.enclosure;
		this.parts = init.parts;
		this.tubeKinds = init.tubeKinds ?? [];
		this.fittings = init.fittings ?? [];
		this.settings = init.settings;
		this.version = init.version;
		this.#api = init.api;
		this.#saveDelayMs = init.saveDelayMs ?? 700;
		this.#checkDelayMs = init.checkDelayMs ?? 400;
	}

	/**
	 * The one way to change the scene. Changes with the same `coalesce` key in a row (one slider
	 * drag, one held arrow key) make a single undo step.
	 */
	apply(next: VariantSettings, coalesce?: string) {
		if (this.readOnly) return;
		if (!(coalesce && coalesce === this.#coalesceKey)) {
			this.#undo = [...this.#undo, this.settings].slice(-HISTORY_LIMIT);
		}
		this.#coalesceKey = coalesce ?? null;
		this.#redo = [];
		this.settings = next;
		this.#changed();
	}

	/**
	 * Ends a gesture (a slider released, a 3D drag let go): the next change starts a new undo step
	 * even with the same coalesce key, so two drags of one control are two steps.
	 */
	endGesture() {
		this.#coalesceKey = null;
	}

	undo() {
		this.#step('undo');
	}

	redo() {
		this.#step('redo');
	}

	/** Undo or redo: the top of that stack becomes the scene, and the scene goes onto the other. */
	#step(way: 'undo' | 'redo') {
		const from = way === 'undo' ? this.#undo : this.#redo;
		const target = from.at(-1);
		if (!target || this.readOnly) return;
		const rest = from.slice(0, -1);
		if (way === 'undo') {
			this.#undo = rest;
			this.#redo = [...this.#redo, this.settings];
		} else {
			this.#redo = rest;
			this.#undo = [...this.#undo, this.settings];
		}
		this.#coalesceKey = null;
		this.settings = target;
		this.#changed();
	}

	/** The words a refused loop change was refused with (the server's own), until the next change. */
	loopRefusal = $state.raw<FieldIssue[]>([]);

	/**
	 * Applies a loop change unless the scene schema refuses its loops (a missing port, a port used
	 * twice, a waypoint outside, a bend too tight…): then nothing changes and `loopRefusal` holds
	 * the reasons. A fitting the change names joins the scene's parts first. True when applied.
	 */
	applyLoop(next: VariantSettings, fittingIds: (string | null)[] = [], coalesce?: string) {
		if (this.readOnly) return false;
		const missing = fittingIds.flatMap((id) => {
			const f = id && !this.partsById.has(id) ? this.fittings.find((p) => p.id === id) : null;
			return f ? [f] : [];
		});
		const parts = missing.length ? [...this.parts, ...missing] : this.parts;
		const trial = compute(this.enclosure, parts, next, this.tubeKinds);
		// Loop and cable edits are refused in their own words (the runs' and cables' forms show them).
		const refused = trial.ok
			? []
			: trial.issues.filter((i) => i.path.startsWith('loops') || i.path.startsWith('cables'));
		if (refused.length) {
			this.loopRefusal = refused;
			return false;
		}
		this.loopRefusal = [];
		if (missing.length) this.parts = parts;
		this.apply(next, coalesce);
		return true;
	}

	// — controls —

	control(kind: 'divider' | 'bracket', id: string): DividerDef | BracketDef | undefined {
		return kind === 'divider'
			? this.enclosure.dividers.find((d) => d.id === id)
			: this.enclosure.brackets.find((b) => b.id === id);
	}

	offsetOf(kind: 'divider' | 'bracket', id: string): number {
		const map = kind === 'divider' ? this.settings.dividerPositions : this.settings.bracketOffsets;
		return (
			map[id] ??
			this.resolved?.[kind === 'divider' ? 'dividerPositions' : 'bracketOffsets'][id] ??
			0
		);
	}

	/** Sets a divider or bracket to an allowed offset. A free value (from a drag) snaps to the nearest. */
	setControl(kind: 'divider' | 'bracket', id: string, offsetMm: number, coalesce?: string) {
		const def = this.control(kind, id);
		if (!def) return;
		const snapped = snapToAllowed(def, offsetMm).offsetMm;
		if (snapped === this.offsetOf(kind, id)) return;
		const key = kind === 'divider' ? 'dividerPositions' : 'bracketOffsets';
		this.apply(
			{ ...this.settings, [key]: { ...this.settings[key], [id]: snapped } },
			coalesce ?? `${kind}:${id}`
		);
	}

	stepControl(kind: 'divider' | 'bracket', id: string, delta: number) {
		const def = this.control(kind, id);
		if (!def) return;
		this.setControl(kind, id, stepAllowed(def, this.offsetOf(kind, id), delta));
	}

	setMargin(marginMm: number) {
		if (!Number.isFinite(marginMm) || marginMm < 0 || marginMm > 100) return;
		this.apply({ ...this.settings, marginMm }, 'margin');
	}

	setBudgets(budgets: Partial<VariantSettings['budgets']>) {
		this.apply({ ...this.settings, budgets: { ...this.settings.budgets, ...budgets } }, 'budgets');
	}

	// — placements —

	placement(id: string): Placement | undefined {
		return this.settings.placements.find((p) => p.id === id);
	}

	#updatePlacement(id: string, change: (p: Placement) => Placement, coalesce?: string) {
		const p = this.placement(id);
		if (!p || p.locked) return;
		this.apply(
			{
				...this.settings,
				placements: this.settings.placements.map((q) => (q.id === id ? change(q) : q))
			},
			coalesce
		);
	}

	setPosition(id: string, position: Vec3) {
		if (position.some((v) => !Number.isFinite(v))) return;
		this.#updatePlacement(id, (p) => ({ ...p, position }), `pos:${id}`);
	}

	/** A drag in 3D along one axis: the part's corner goes to `valueMm`, on a 0.5 mm grid. */
	dragPart(id: string, axis: 0 | 1 | 2, valueMm: number) {
		const p = this.placement(id);
		if (!p || !Number.isFinite(valueMm)) return;
		const position = [...p.position] as Vec3;
		position[axis] = Math.round(valueMm * 2) / 2;
		if (position[axis] === p.position[axis]) return;
		this.#updatePlacement(id, (q) => ({ ...q, position }), `drag:${id}:${axis}`);
	}

	/** Keyboard nudge: 1 mm, 10 mm with Shift (the caller decides). */
	nudge(id: string, axis: 0 | 1 | 2, deltaMm: number) {
		const p = this.placement(id);
		if (!p) return;
		const position = [...p.position] as Vec3;
		position[axis] = Math.round((position[axis] + deltaMm) * 1000) / 1000;
		this.#updatePlacement(id, (q) => ({ ...q, position }), `nudge:${id}`);
	}

	rotate(id: string, axis: 'x' | 'y' | 'z') {
		this.#updatePlacement(id, (p) => ({ ...p, rotation: turnQuarter(p.rotation, axis) }));
	}

	toggleLocked(id: string) {
		const p = this.placement(id);
		if (!p) return;
		this.apply({
			...this.settings,
			placements: this.settings.placements.map((q) =>
				q.id === id ? { ...q, locked: !q.locked } : q
			)
		});
	}

	toggleHidden(id: string) {
		this.hiddenIds = this.hiddenIds.includes(id)
			? this.hiddenIds.filter((h) => h !== id)
			: [...this.hiddenIds, id];
	}

	remove(id: string) {
		if (this.placement(id)?.locked) return;
		this.apply({
			...this.settings,
			placements: this.settings.placements.filter((p) => p.id !== id)
		});
		if (this.selectedId === id) this.selectedId = null;
	}

	/**
	 * Adds a catalogue part: onto a mount when one is named (snapped flat against its panel or on the
	 * stack there), else into free space in the chosen compartment.
	 */
	addPart(
		part: PartDef,
		where: { mountId?: string; compartmentId?: string } = {}
	): string | { reason: string } {
		return this.addPartTurned(part, where).result;
	}

	/** The same, with the quarter turn it used in words ("a quarter turn about Y"). */
	addPartTurned(
		part: PartDef,
		where: { mountId?: string; compartmentId?: string } = {}
	): { result: string | { reason: string }; turn?: string } {
		if (!this.partsById.has(part.id)) this.parts = [...this.parts, part];
		const resolved = this.resolved;
		if (this.readOnly) return { result: { reason: `Read-only: ${this.readOnly}` } };
		if (!resolved) return { result: { reason: 'Fix the scene’s errors first.' } };
		const mount = where.mountId
			? this.enclosure.mounts.find((m) => m.id === where.mountId)
			: undefined;
		let landing: ReturnType<typeof landInRoom>;
		if (mount) {
			landing = landOnMount(resolved, mount, part);
		} else {
			const compartment = resolved.compartments.find((c) => c.id === where.compartmentId);
			landing = landInRoom(resolved, compartment?.box ?? resolved.innerBox, part, {
				mounts: this.enclosure.mounts,
				roomLabel: compartment?.label ?? 'the enclosure'
			});
		}
		if ('reason' in landing) return { result: landing };
		const id = nextPlacementId(this.settings.placements);
		const placement: Placement = {
			id,
			partId: part.id,
			position: landing.position,
			rotation: landing.rotation,
			...(mount ? { mountId: mount.id } : {})
		};
		this.apply({ ...this.settings, placements: [...this.settings.placements, placement] });
		this.selectedId = id;
		return { result: id, turn: landing.turn };
	}

	// — saving —

	#changed() {
		this.saveStatus = this.conflict ? 'conflict' : 'pending';
		this.serverAgrees = null;
		clearTimeout(this.#saveTimer);
		clearTimeout(this.#checkTimer);
		// Back to what the server holds (an undo of an unsaved change): nothing to write.
		if (!this.conflict && !this.#inFlight && sameSettings(this.settings, this.#saved)) {
			this.saveStatus = 'saved';
			this.saveMessage = '';
		} else if (!this.conflict) {
			this.#saveTimer = setTimeout(() => void this.saveNow(), this.#saveDelayMs);
		}
		this.#checkTimer = setTimeout(() => void this.confirmWithServer(), this.#checkDelayMs);
	}

	async saveNow(): Promise<SaveOutcome | null> {
		clearTimeout(this.#saveTimer);
		// The save in flight ends by scheduling the next one when the scene changed meanwhile.
		if (this.#inFlight) return null;
		if (this.conflict || !this.computed.ok) {
			if (!this.computed.ok) {
				this.saveStatus = 'error';
				this.saveMessage = 'Not saved: the scene has errors.';
			}
			return null;
		}
		const settings = this.settings;
		this.saveStatus = 'saving';
		let outcome: SaveOutcome;
		try {
			this.#inFlight = this.#api.save(this.version, settings);
			outcome = await this.#inFlight;
		} catch (e) {
			this.saveStatus = 'error';
			this.saveMessage = `Not saved: ${(e as Error).message}`;
			return null;
		} finally {
			this.#inFlight = null;
		}
		if (outcome.kind === 'saved') {
			this.version = outcome.version;
			this.#saved = settings;
			// A change made while the save was in flight is saved next.
			if (this.settings === settings) {
				this.saveStatus = 'saved';
				this.saveMessage = '';
			} else {
				this.#changed();
			}
		} else if (outcome.kind === 'conflict') {
			this.conflict = {
				version: outcome.version,
				settings: outcome.settings,
				updatedAt: outcome.updatedAt
			};
			this.saveStatus = 'conflict';
			this.saveMessage =
				'Someone else saved this variant. Your changes are kept here; choose which to keep.';
		} else {
			this.saveStatus = 'error';
			this.saveMessage = outcome.problem.issues[0]
				? `${outcome.problem.message} ${outcome.problem.issues[0].path}: ${outcome.problem.issues[0].message}`
				: outcome.problem.message;
		}
		return outcome;
	}

	/** Keep my scene: save it over the newer one (which stays in undo history). */
	async keepMine() {
		const c = this.conflict;
		if (!c) return;
		this.#undo = [...this.#undo, c.settings].slice(-HISTORY_LIMIT);
		this.#coalesceKey = null;
		this.version = c.version;
		this.#saved = c.settings;
		this.conflict = null;
		await this.saveNow();
	}

	/** Take the newer scene; mine goes onto the undo stack, so nothing is lost. */
	takeTheirs() {
		const c = this.conflict;
		if (!c) return;
		this.#undo = [...this.#undo, this.settings].slice(-HISTORY_LIMIT);
		this.#redo = [];
		this.#coalesceKey = null;
		this.settings = c.settings;
		this.version = c.version;
		this.#saved = c.settings;
		this.conflict = null;
		this.saveStatus = 'saved';
		this.saveMessage = '';
		void this.confirmWithServer();
	}

	async confirmWithServer() {
		clearTimeout(this.#checkTimer);
		const local = this.report;
		const settings = this.settings;
		if (!local) return;
		let server: FitReport | Problem;
		try {
			server = await this.#api.check(settings);
		} catch (e) {
			server = { message: (e as Error).message, issues: [] };
		}
		if (settings !== this.settings) return;
		if ('message' in server) {
			this.serverAgrees = false;
			this.serverMessage = `The server could not check this scene: ${server.message}`;
			return;
		}
		this.serverAgrees = reportDigest(server) === reportDigest(local);
		this.serverMessage = this.serverAgrees
			? ''
			: 'The server’s check differs from this browser’s. The server’s report is the one that counts; reload to see it.';
	}

	dispose() {
		clearTimeout(this.#saveTimer);
		clearTimeout(this.#checkTimer);
	}
}

const KEY = Symbol('editor');
export const setEditor = (e: EditorState) => setContext(KEY, e);
export const getEditor = () => getContext<EditorState>(KEY);
