/**
 * Zod schemas for enclosures, parts and scenes (format `interstice.scene`, version 1). Millimetres,
 * right-handed, Y up, origin at the enclosure's inner front-bottom-left corner. The API, the forms
 * and the catalogue all validate with these, so a scene that parses is one the engine can resolve.
 */

import { z } from 'zod';
import { FACES, PANELS, type PanelName } from './box';
import { loopIssues } from './loop-path';
import { MAX_POSITIONS, allowedIndex, rangeCount } from './positions';

/** Coordinates and offsets stay within ±10,000 mm (10 m): far beyond any enclosure, small enough to keep doubles exact to ~2e-12 mm. */
export const COORD_LIMIT_MM = 10_000;
/** World boxes one scene may hold (walls, dividers, brackets, placed bodies and keep-outs). */
export const MAX_BOXES = 5_000;

const idSchema = z
	.string()
	.min(1, 'Required')
	.max(120, 'At most 120 characters')
	.regex(/^[^/\s]+$/, 'No spaces or slashes');
const labelSchema = z.string().max(200, 'At most 200 characters');
const coordMm = z
	.number({ error: 'Must be a finite number' })
	.min(-COORD_LIMIT_MM, `At least −${COORD_LIMIT_MM} mm`)
	.max(COORD_LIMIT_MM, `At most ${COORD_LIMIT_MM} mm`);
const sizeMm = z
	.number({ error: 'Must be a finite number' })
	.gt(0, 'Must be greater than 0')
	.max(COORD_LIMIT_MM, `At most ${COORD_LIMIT_MM} mm`);
const thicknessMm = z
	.number({ error: 'Must be a finite number' })
	.min(0, 'Must not be negative')
	.max(COORD_LIMIT_MM, `At most ${COORD_LIMIT_MM} mm`);
const wattsSchema = z.number({ error: 'Must be a finite number' }).min(0).max(100_000);

export const vec3Schema = z.tuple([coordMm, coordMm, coordMm]);
export type Vec3 = [number, number, number];

export const boxSchema = z.object({ min: vec3Schema, max: vec3Schema }).superRefine((box, ctx) => {
	for (let i = 0; i < 3; i++) {
		if (!(box.max[i] > box.min[i])) {
			ctx.addIssue({ code: 'custom', path: ['max', i], message: 'Must be greater than min' });
		}
	}
});
export type Box = { min: Vec3; max: Vec3 };

export const axisSchema = z.enum(['x', 'y', 'z']);
/** A box face (`Face` in box.ts): a port's direction, a gap's side. */
export const faceSchema = z.enum(FACES);
/** An enclosure panel by name (`PanelName` in box.ts): a wall, the panel a mount sits on. */
export const panelSchema = z.enum(PANELS);

export const wallSpecSchema = z.object({
	thicknessMm,
	kind: z.enum(['solid', 'mesh']).default('solid'),
	/** Room a panel adds beyond its nominal place (a bulged side panel); may be negative. */
	offsetMm: coordMm.default(0)
});
export type WallSpec = z.infer<typeof wallSpecSchema>;

const rangeSchema = z
	.object({ minMm: coordMm, maxMm: coordMm, stepMm: sizeMm })
	.superRefine((r, ctx) => {
		if (r.maxMm < r.minMm) {
			ctx.addIssue({ code: 'custom', path: ['maxMm'], message: 'Must not be below minMm' });
		} else if (rangeCount(r) > MAX_POSITIONS) {
			ctx.addIssue({
				code: 'custom',
				path: ['stepMm'],
				message: `At most ${MAX_POSITIONS} positions`
			});
		}
	});

const intervalSchema = z
	.object({ minMm: coordMm, maxMm: coordMm })
	.refine((i) => i.maxMm > i.minMm, { path: ['maxMm'], message: 'Must be greater than minMm' });

export const dividerPositionsSchema = z.discriminatedUnion('kind', [
	z.object({
		kind: z.literal('list'),
		options: z
			.array(z.object({ label: labelSchema, offsetMm: coordMm }))
			.min(1, 'At least one position')
			.max(MAX_POSITIONS)
	}),
	rangeSchema.safeExtend({ kind: z.literal('range') })
]);

/**
 * A cut-out in a divider for tubes and cables, in the divider's plane: `at` and `size` are on the
 * divider's other two axes in x, y, z order (an 'x' divider: y then z; 'y': x then z; 'z': x then
 * y), millimetres from the low corner of the divider's span. It goes through the thickness.
 */
export const dividerOpeningSchema = z.object({
	id: idSchema,
	label: labelSchema.optional(),
	at: z.tuple([coordMm, coordMm]),
	size: z.tuple([sizeMm, sizeMm])
});
export type DividerOpening = z.infer<typeof dividerOpeningSchema>;

/** The divider's two plane axes (indexes into x, y, z) in the order openings use. */
export function openingAxes(axis: 'x' | 'y' | 'z'): [0 | 1 | 2, 0 | 1 | 2] {
	return axis === 'x' ? [1, 2] : axis === 'y' ? [0, 2] : [0, 1];
}

export const dividerDefSchema = z.object({
	id: idSchema,
	label: labelSchema,
	/** The axis the slab is thin along: 'x' is a vertical divider splitting left from right. */
	axis: axisSchema,
	thicknessMm: sizeMm,
	positions: dividerPositionsSchema,
	/** Extent on the other two axes, in inner coordinates; a missing axis spans the whole inside. */
	span: z
		.object({
			x: intervalSchema.optional(),
			y: intervalSchema.optional(),
			z: intervalSchema.optional()
		})
		.optional(),
	/** Names of the compartments on its low and high side ('CPU side', 'card side'). */
	sides: z.object({ low: labelSchema, high: labelSchema }).optional(),
	/** Cut-outs through the slab; they let tubes pass and leave the compartments as they are. */
	openings: z.array(dividerOpeningSchema).max(20).optional()
});
export type DividerDef = z.infer<typeof dividerDefSchema>;

export const bracketDefSchema = z.object({
	id: idSchema,
	label: labelSchema,
	kind: z.enum(['card-support', 'radiator-plate', 'pump', 'other']).default('other'),
	/** The bracket's box in inner coordinates at offset 0. */
	box: boxSchema,
	axis: axisSchema,
	travel: rangeSchema
});
export type BracketDef = z.infer<typeof bracketDefSchema>;

/** PCI Express CEM spec: expansion slots sit 0.8 in = 20.32 mm apart. */
export const SLOT_PITCH_MM = 20.32;

export const mountDefSchema = z.object({
	id: idSchema,
	label: labelSchema,
	kind: z.enum(['radiator', 'fan', 'board-tray', 'psu-bay', 'slots']),
	/** The panel the mount sits on; its normal points from that panel into the inside. */
	face: panelSchema,
	/** Where mounted parts must lie on the face's two axes (all three for a power-supply bay). */
	region: boxSchema,
	/** Classes taken: radiator/fan sizes ('240', '280'), supply form factors ('SFX'), boards ('Mini-ITX'). */
	accepts: z.array(z.string().min(1).max(40)).max(50).default([]),
	/** Room along the face normal for the whole stack (plate + standoffs + radiator + fans). */
	budgetMm: thicknessMm.optional(),
	/** Adapter-plate thickness, counted in the stack when a mounted class needs the plate. */
	plateMm: thicknessMm.optional(),
	/** Classes that need the adapter plate; missing means every class does. */
	plateFor: z.array(z.string().min(1).max(40)).max(50).optional(),
	standoffMm: thicknessMm.default(0),
	slotPitchMm: sizeMm.default(SLOT_PITCH_MM),
	slotCount: z.number().int().min(0).max(32).optional()
});
export type MountDef = z.infer<typeof mountDefSchema>;

export const enclosureDefSchema = z
	.object({
		name: z.string().min(1, 'Required').max(200),
		outerMm: z.tuple([sizeMm, sizeMm, sizeMm]),
		walls: z.object({
			left: wallSpecSchema,
			right: wallSpecSchema,
			bottom: wallSpecSchema,
			top: wallSpecSchema,
			front: wallSpecSchema,
			back: wallSpecSchema
		}),
		dividers: z.array(dividerDefSchema).max(100).default([]),
		brackets: z.array(bracketDefSchema).max(100).default([]),
		mounts: z.array(mountDefSchema).max(100).default([])
	})
	.superRefine((enc, ctx) => {
		const pairs = [
			['left', 'right'],
			['bottom', 'top'],
			['front', 'back']
		] as const;
		pairs.forEach(([lo, hi], i) => {
			const w = enc.walls;
			const inner =
				enc.outerMm[i] - w[lo].thicknessMm - w[hi].thicknessMm + w[lo].offsetMm + w[hi].offsetMm;
			if (!(inner > 0)) {
				ctx.addIssue({
					code: 'custom',
					path: ['outerMm', i],
					message: 'Walls leave no inside on this axis'
				});
			}
		});
		enc.dividers.forEach((d, i) => checkOpenings(enc, d, ['dividers', i, 'openings'], ctx));
		const seen = new Set<string>();
		(['dividers', 'brackets', 'mounts'] as const).forEach((list) => {
			enc[list].forEach((item, i) => {
				if (seen.has(item.id)) {
					ctx.addIssue({ code: 'custom', path: [list, i, 'id'], message: 'Duplicate id' });
				}
				seen.add(item.id);
			});
		});
	});
export type EnclosureDef = z.infer<typeof enclosureDefSchema>;

/** Each opening lies inside the divider's span on its plane axes and overlaps no other one. */
function checkOpenings(
	enc: { outerMm: number[]; walls: Record<PanelName, WallSpec> },
	d: DividerDef,
	path: (string | number)[],
	ctx: z.RefinementCtx
) {
	const openings = d.openings ?? [];
	if (openings.length === 0) return;
	const w = enc.walls;
	const faces: [PanelName, PanelName][] = [
		['left', 'right'],
		['bottom', 'top'],
		['front', 'back']
	];
	const plane = openingAxes(d.axis).map((a) => {
		const [lo, hi] = faces[a];
		const inner =
			enc.outerMm[a] - w[lo].thicknessMm - w[hi].thicknessMm + w[lo].offsetMm + w[hi].offsetMm;
		const span = d.span?.[(['x', 'y', 'z'] as const)[a]];
		return span ? span.maxMm - span.minMm : inner;
	});
	const seen = new Set<string>();
	openings.forEach((o, k) => {
		for (let j = 0; j < 2; j++) {
			if (o.at[j] < 0) {
				ctx.addIssue({
					code: 'custom',
					path: [...path, k, 'at', j],
					message: 'Must not be negative'
				});
			} else if (o.at[j] + o.size[j] > plane[j] + 1e-6) {
				ctx.addIssue({
					code: 'custom',
					path: [...path, k, 'size', j],
					message: `Reaches past the divider (${plane[j]} mm on this axis)`
				});
			}
		}
		if (seen.has(o.id)) {
			ctx.addIssue({ code: 'custom', path: [...path, k, 'id'], message: 'Duplicate id' });
		}
		seen.add(o.id);
		for (let m = 0; m < k; m++) {
			const p = openings[m];
			const overlaps = [0, 1].every(
				(j) => o.at[j] < p.at[j] + p.size[j] && p.at[j] < o.at[j] + o.size[j]
			);
			if (overlaps) {
				ctx.addIssue({
					code: 'custom',
					path: [...path, k, 'at'],
					message: `Overlaps opening ${p.id}`
				});
			}
		}
	});
}
/** An enclosure as a client may send it: defaults not yet filled in. */
export type EnclosureInput = z.input<typeof enclosureDefSchema>;

export const partCategorySchema = z.enum([
	'board',
	'cpu-block',
	'gpu',
	'pump',
	'reservoir',
	'pump-reservoir',
	'radiator',
	'fan',
	'psu',
	'fitting',
	'drive',
	'other'
]);
export type PartCategory = z.infer<typeof partCategorySchema>;

export const keepoutDefSchema = z.object({
	id: idSchema,
	label: labelSchema,
	kind: z.enum(['fitting', 'airflow', 'cable', 'service']),
	severity: z.enum(['error', 'warning']).default('error'),
	box: boxSchema
});
export type KeepoutDef = z.infer<typeof keepoutDefSchema>;

export const portDefSchema = z.object({
	id: idSchema,
	position: vec3Schema,
	direction: faceSchema,
	/** ISO 228-1 parallel pipe thread; G 1/4 for fittings is common practice. Coolant ports only. */
	thread: z.string().min(1).max(40).default('G 1/4'),
	/** A coolant port takes a fitting; a power port a cable's plug. Missing means coolant. */
	kind: z.enum(['coolant', 'power']).optional(),
	/** Power ports: the plug's reach out of the face and the straight room its cable needs before the first bend. */
	plugReachMm: thicknessMm.optional()
});
export type PortDef = z.infer<typeof portDefSchema>;

export const partSpecsSchema = z.object({
	heatW: wattsSchema.optional(),
	powerDrawW: wattsSchema.optional(),
	radiatorClass: z.literal([120, 140, 240, 280, 360, 420]).optional(),
	radiatorThicknessMm: sizeMm.optional(),
	fanSizeMm: sizeMm.optional(),
	fanThicknessMm: sizeMm.optional(),
	psuFormFactor: z.enum(['SFX', 'SFX-L', 'ATX', 'TFX']).optional(),
	psuRatingW: wattsSchema.optional(),
	boardFormFactor: z.enum(['Mini-ITX', 'microATX', 'ATX']).optional(),
	cardLengthMm: sizeMm.optional(),
	cardSlots: z.number().int().min(1).max(8).optional(),
	/** For a part of category fitting: what it is (a coolant-loop fitting or a stop plug). */
	fittingKind: z
		.enum(['straight', '45', '90', 'rotary', 'extension', 'quick-disconnect', 'plug'])
		.optional(),
	/** For a fitting: how deep the tube goes in past its tip, counted in the tube's cut length. */
	insertionDepthMm: thicknessMm.optional()
});
export type PartSpecs = z.infer<typeof partSpecsSchema>;

export const bodyDefSchema = z.object({ id: idSchema, label: labelSchema, box: boxSchema });
export type BodyDef = z.infer<typeof bodyDefSchema>;

export const partDefSchema = z
	.object({
		id: idSchema,
		name: z.string().min(1, 'Required').max(200),
		category: partCategorySchema,
		/** Boxes in the part's own frame. */
		bodies: z.array(bodyDefSchema).min(1, 'At least one body').max(MAX_BOXES),
		keepouts: z.array(keepoutDefSchema).max(MAX_BOXES).default([]),
		ports: z.array(portDefSchema).max(200).default([]),
		specs: partSpecsSchema.default({}),
		provenance: z.enum(['datasheet', 'measured', 'estimate', 'standard']).default('estimate'),
		/** ± mm the dimensions may be off by. */
		toleranceMm: thicknessMm.default(0),
		/** Where the dimensions come from (a published standard, a datasheet, a measurement). */
		source: z.string().max(500).optional()
	})
	.superRefine((part, ctx) => {
		const seen = new Set<string>();
		(['bodies', 'keepouts'] as const).forEach((list) => {
			part[list].forEach((item, i) => {
				if (seen.has(item.id)) {
					ctx.addIssue({ code: 'custom', path: [list, i, 'id'], message: 'Duplicate id' });
				}
				seen.add(item.id);
			});
		});
		const ports = new Set<string>();
		part.ports.forEach((p, i) => {
			if (ports.has(p.id)) {
				ctx.addIssue({ code: 'custom', path: ['ports', i, 'id'], message: 'Duplicate id' });
			}
			ports.add(p.id);
		});
	});
export type PartDef = z.infer<typeof partDefSchema>;
export type PartInput = z.input<typeof partDefSchema>;

const quarterTurns = z
	.number({ error: 'Must be 0, 1, 2 or 3' })
	.int('Must be 0, 1, 2 or 3')
	.min(0, 'Must be 0, 1, 2 or 3')
	.max(3, 'Must be 0, 1, 2 or 3');

export const placementSchema = z.object({
	id: idSchema,
	partId: idSchema,
	/** Where the min corner of the rotated part's body bounding box lands, inner coordinates. */
	position: vec3Schema,
	/** Quarter turns (90°, right-handed) about X, then Y, then Z. */
	rotation: z
		.object({ x: quarterTurns.default(0), y: quarterTurns.default(0), z: quarterTurns.default(0) })
		.default({ x: 0, y: 0, z: 0 }),
	mountId: idSchema.optional(),
	/** View-only: hidden parts are still checked. */
	hidden: z.boolean().optional(),
	/** Editor hint: a locked part is not the one a clearing move proposes to move. */
	locked: z.boolean().optional()
});
export type Placement = z.infer<typeof placementSchema>;
export type Rotation = Placement['rotation'];

export const budgetsSchema = z.object({
	/** Common practice, from memory: about 100 W of heat per 120 mm of radiator at quiet fan speed. */
	wattsPer120mm: z.number().gt(0).max(10_000).default(100),
	/** Common practice, from memory: 30 % above sustained draw for transient spikes. */
	psuHeadroomPct: z.number().min(0).max(1_000).default(30)
});
export type Budgets = z.infer<typeof budgetsSchema>;

/**
 * A studio's tube kind: soft tube by inner/outer diameter (10/13, 10/16 mm), hard tube by outer
 * diameter (12, 14, 16 mm). `minBendRadiusMm` is to the tube's centre line; `clearanceMm` the room
 * kept free around it (closer than that is tight).
 */
export const tubeKindSchema = z
	.object({
		id: idSchema,
		name: z.string().min(1, 'Required').max(200),
		kind: z.enum(['soft', 'hard']),
		innerMm: sizeMm.optional(),
		outerMm: sizeMm,
		minBendRadiusMm: thicknessMm,
		clearanceMm: thicknessMm.default(2),
		source: z.string().max(500).optional()
	})
	.refine((t) => t.innerMm === undefined || t.innerMm < t.outerMm, {
		path: ['innerMm'],
		message: 'Must be smaller than the outer diameter'
	});
export type TubeKindDef = z.infer<typeof tubeKindSchema>;

export const portRefSchema = z.object({ placementId: idSchema, portId: idSchema });
export type PortRef = z.infer<typeof portRefSchema>;

/**
 * One connection of a loop, flowing from `from` to `to`. `waypoints` are the intermediate points
 * of the tube's centre line only: the whole line is [start, ...waypoints, end], start and end
 * being the ports pushed out along their direction by the fittings' reach.
 */
export const runSchema = z.object({
	id: idSchema,
	from: portRefSchema,
	to: portRefSchema,
	/** A tube kind id of the scene's `tubeKinds`. */
	tube: idSchema,
	/** Fitting part ids (category fitting) at each end; null: the tube goes onto the port bare. */
	fittings: z
		.object({ from: idSchema.nullable().default(null), to: idSchema.nullable().default(null) })
		.default({ from: null, to: null }),
	waypoints: z.array(vec3Schema).max(200, 'At most 200 waypoints').default([])
});
export type RunDef = z.infer<typeof runSchema>;

export const loopSchema = z.object({
	id: idSchema,
	label: labelSchema.optional(),
	/** In flow order: pump out → block in, block out → radiator in, …, reservoir out → pump in. */
	runs: z.array(runSchema).min(1, 'At least one run').max(100, 'At most 100 runs'),
	/** Ports closed with a stop plug (a fitting part of kind plug, or null for a generic one). */
	plugs: z
		.array(portRefSchema.extend({ fitting: idSchema.nullable().default(null) }))
		.max(200)
		.default([]),
	/** The plugged port the loop is filled through, and the one it is drained through. */
	fill: portRefSchema.optional(),
	drain: portRefSchema.optional(),
	/** Route suggestions: one bend costs as much as this many mm of tube (missing: 100). */
	bendPenaltyMm: z
		.number({ error: 'Must be a finite number' })
		.min(0, 'Must not be negative')
		.max(10_000, 'At most 10,000 mm')
		.optional()
});
export type LoopDef = z.infer<typeof loopSchema>;

/**
 * A power cable bundle from a supply connector to a board's or card's power input (ports of kind
 * power): a flat section, a minimum bend radius, and the intermediate points of its centre line
 * (the ends are the ports pushed out by their `plugReachMm`). Checked like a coolant run.
 */
export const cableSchema = z.object({
	id: idSchema,
	/** What the builder orders it as: "24-pin", "8-pin processor", "card power". */
	label: z.string().min(1, 'Required').max(200, 'At most 200 characters'),
	from: portRefSchema,
	to: portRefSchema,
	widthMm: sizeMm,
	thicknessMm: sizeMm,
	minBendRadiusMm: thicknessMm,
	clearanceMm: thicknessMm.default(2),
	/** Where it runs, for the sheet ("behind the board tray"); optional. */
	where: z.string().max(200, 'At most 200 characters').optional(),
	waypoints: z.array(vec3Schema).max(200, 'At most 200 waypoints').default([])
});
export type CableDef = z.infer<typeof cableSchema>;

export const SCENE_FORMAT = 'interstice.scene';
export const SCENE_VERSION = 1;

const sceneObjectSchema = z.object({
	format: z.literal(SCENE_FORMAT),
	version: z.literal(SCENE_VERSION),
	enclosure: enclosureDefSchema,
	parts: z.array(partDefSchema).max(MAX_BOXES).default([]),
	/** Divider id → offset of its low face; a divider left out takes its first allowed position. */
	dividerPositions: z.record(z.string(), coordMm).default({}),
	/** Bracket id → offset along its axis; a bracket left out takes its first allowed offset. */
	bracketOffsets: z.record(z.string(), coordMm).default({}),
	placements: z.array(placementSchema).max(MAX_BOXES).default([]),
	/** Gaps under this many millimetres count as tight; a couple of mm is common practice. */
	marginMm: thicknessMm.default(2),
	budgets: budgetsSchema.default({ wattsPer120mm: 100, psuHeadroomPct: 30 }),
	/** Tube kinds the loops use (optional; version 1 scenes without loops mean the same). */
	tubeKinds: z.array(tubeKindSchema).max(100).optional(),
	/** Coolant loops: ordered cycles of ports joined by runs (see docs/scene-format.md). */
	loops: z.array(loopSchema).max(8, 'At most 8 loops').optional(),
	/** Power cable bundles (optional; version 1 scenes without them mean the same). */
	cables: z.array(cableSchema).max(50, 'At most 50 cables').optional()
});

type SceneShape = z.infer<typeof sceneObjectSchema>;
type RefineCtx = z.RefinementCtx<SceneShape>;

function checkUniqueIds(scene: SceneShape, ctx: RefineCtx): Map<string, PartDef> {
	const parts = new Map<string, PartDef>();
	scene.parts.forEach((p, i) => {
		if (parts.has(p.id)) {
			ctx.addIssue({ code: 'custom', path: ['parts', i, 'id'], message: 'Duplicate id' });
		}
		parts.set(p.id, p);
	});
	const placements = new Set<string>();
	scene.placements.forEach((p, i) => {
		if (placements.has(p.id)) {
			ctx.addIssue({ code: 'custom', path: ['placements', i, 'id'], message: 'Duplicate id' });
		}
		placements.add(p.id);
	});
	return parts;
}

function checkControlPositions(scene: SceneShape, ctx: RefineCtx): void {
	const checks = [
		['dividerPositions', scene.enclosure.dividers, 'divider'],
		['bracketOffsets', scene.enclosure.brackets, 'bracket']
	] as const;
	for (const [key, defs, noun] of checks) {
		const byId = new Map<string, DividerDef | BracketDef>(defs.map((d) => [d.id, d]));
		for (const [id, offset] of Object.entries(scene[key])) {
			const def = byId.get(id);
			if (!def) {
				ctx.addIssue({ code: 'custom', path: [key, id], message: `No ${noun} with this id` });
			} else if (allowedIndex(def, offset) < 0) {
				ctx.addIssue({
					code: 'custom',
					path: [key, id],
					message: `${offset} mm is not an allowed position of this ${noun}`
				});
			}
		}
	}
}

function checkPlacements(scene: SceneShape, parts: Map<string, PartDef>, ctx: RefineCtx): void {
	const mounts = new Set(scene.enclosure.mounts.map((m) => m.id));
	let boxes = 6 + scene.enclosure.dividers.length + scene.enclosure.brackets.length;
	scene.placements.forEach((p, i) => {
		const part = parts.get(p.partId);
		if (!part) {
			ctx.addIssue({
				code: 'custom',
				path: ['placements', i, 'partId'],
				message: 'No part with this id'
			});
		} else {
			boxes += part.bodies.length + part.keepouts.length;
		}
		if (p.mountId !== undefined && !mounts.has(p.mountId)) {
			ctx.addIssue({
				code: 'custom',
				path: ['placements', i, 'mountId'],
				message: 'No mount with this id'
			});
		}
	});
	if (boxes > MAX_BOXES) {
		ctx.addIssue({
			code: 'custom',
			path: ['placements'],
			message: `The scene resolves to ${boxes} boxes; at most ${MAX_BOXES}`
		});
	}
	const defined = scene.parts.reduce((n, p) => n + p.bodies.length + p.keepouts.length, 0);
	if (defined > MAX_BOXES) {
		ctx.addIssue({
			code: 'custom',
			path: ['parts'],
			message: `The parts define ${defined} boxes; at most ${MAX_BOXES}`
		});
	}
}

/** The checks that tie a scene's parts together, the same for sent and for stored definitions. */
function refineScene(scene: SceneShape, ctx: RefineCtx) {
	const parts = checkUniqueIds(scene, ctx);
	checkControlPositions(scene, ctx);
	checkPlacements(scene, parts, ctx);
	for (const issue of loopIssues(scene)) {
		ctx.addIssue({ code: 'custom', path: issue.path, message: issue.message });
	}
	checkCablePorts(scene, parts, ctx);
}

/**
 * Every cable joins two different power ports of placed parts, and a socket takes one plug: a port
 * is the end of one cable only. Ids are unique.
 */
function checkCablePorts(scene: SceneShape, parts: Map<string, PartDef>, ctx: RefineCtx) {
	const placements = new Map(scene.placements.map((p) => [p.id, p]));
	const ids = new Set<string>();
	const used = new Map<string, number>();
	(scene.cables ?? []).forEach((c, i) => {
		if (ids.has(c.id)) {
			ctx.addIssue({ code: 'custom', path: ['cables', i, 'id'], message: 'Duplicate id' });
		}
		ids.add(c.id);
		if (c.from.placementId === c.to.placementId && c.from.portId === c.to.portId) {
			ctx.addIssue({
				code: 'custom',
				path: ['cables', i, 'to', 'portId'],
				message: 'A cable joins two different ports; this is the port it starts at'
			});
		}
		for (const key of ['from', 'to'] as const) {
			const k = `${c[key].placementId}/${c[key].portId}`;
			const other = used.get(k);
			if (other !== undefined && other !== i) {
				ctx.addIssue({
					code: 'custom',
					path: ['cables', i, key, 'portId'],
					message: `This port already takes cable ${other + 1}`
				});
			}
			used.set(k, i);
		}
	});
	(scene.cables ?? []).forEach((c, i) => {
		for (const key of ['from', 'to'] as const) {
			const ref = c[key];
			const placement = placements.get(ref.placementId);
			const port = placement && parts.get(placement.partId)?.ports.find((p) => p.id === ref.portId);
			if (!placement) {
				ctx.addIssue({
					code: 'custom',
					path: ['cables', i, key, 'placementId'],
					message: 'No placement with this id'
				});
			} else if (!port) {
				ctx.addIssue({
					code: 'custom',
					path: ['cables', i, key, 'portId'],
					message: 'No port with this id on that part'
				});
			} else if (port.kind !== 'power') {
				ctx.addIssue({
					code: 'custom',
					path: ['cables', i, key, 'portId'],
					message: 'A cable joins power ports; this one is a coolant port'
				});
			}
		}
	});
}
export const sceneSchema = sceneObjectSchema.superRefine(refineScene);
export type Scene = z.infer<typeof sceneSchema>;

/**
 * The same scene schema for a server that composes the scene from definitions it stored itself:
 * the enclosure and parts were parsed with their schemas when they were saved, so they are taken
 * as they are; everything else (settings, ids, positions, box counts) is checked as in sceneSchema.
 */
export const trustedSceneSchema = sceneObjectSchema
	.extend({
		enclosure: z.custom<EnclosureDef>(),
		parts: z.array(z.custom<PartDef>()).max(MAX_BOXES).default([])
	})
	.superRefine(refineScene);
/** What a client may send: defaults not yet filled in. */
export type SceneInput = z.input<typeof sceneSchema>;

export interface FieldIssue {
	/** `placements[3].rotation.y`, `dividerPositions.main`; empty for the scene as a whole. */
	path: string;
	message: string;
}

export function formatPath(path: readonly PropertyKey[]): string {
	let out = '';
	for (const key of path) {
		if (typeof key === 'number') {
			out += `[${key}]`;
		} else {
			const name = String(key);
			out += /^[A-Za-z_$][\w$-]*$/.test(name)
				? `${out ? '.' : ''}${name}`
				: `[${JSON.stringify(name)}]`;
		}
	}
	return out;
}

/** The first issue's message at `path` or inside it (`mounts[2]` takes `mounts[2].region`). */
export function issueAt(issues: readonly FieldIssue[], path: string): string | undefined {
	return issues.find(
		(i) => i.path === path || i.path.startsWith(path + '.') || i.path.startsWith(path + '[')
	)?.message;
}

/** Flat list of a zod error's issues with dotted paths, for 400 answers and form fields. */
export function formatZodIssues(error: z.ZodError): FieldIssue[] {
	return error.issues.map((issue) => ({ path: formatPath(issue.path), message: issue.message }));
}
