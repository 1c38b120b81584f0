/**
 * Validation for catalogue writes, shared by forms (client and server), the JSON API and CSV
 * import. Geometry is always checked with the fit engine's own schemas, so a stored enclosure or
 * part is one the engine can resolve.
 */
import { z } from 'zod';
import { isCurrencyCode } from '../quotes/money';
import { idField, int4 } from '$lib/schemas/common';
import {
	COORD_LIMIT_MM,
	PANELS,
	enclosureDefSchema,
	formatZodIssues,
	partCategorySchema,
	partDefSchema,
	type EnclosureDef,
	type PanelName,
	type FieldIssue,
	type PartDef
} from '$lib/geometry';

/** The enclosure's panels by name, for the wall fields. */
export { PANELS };

/** A panel's name as a label or a line begins: "Left panel thickness", "Top panel offset …". */
export const PANEL_WORDS: Record<PanelName, string> = {
	left: 'Left',
	right: 'Right',
	bottom: 'Bottom',
	top: 'Top',
	front: 'Front',
	back: 'Back'
};

const CURRENCY_RULE = 'Currency must be an ISO 4217 code such as EUR, GBP or USD';

/** A price typed in a form: blank, or an amount with up to two decimals. */
function priceText(label: string, example: string) {
	return z
		.string()
		.trim()
		.regex(/^(\d{1,7}([.,]\d{1,2})?)?$/, `${label} must be an amount such as ${example}`)
		.default('');
}

/** A currency typed in a form (any case). */
function currencyText() {
	return z.string().trim().toUpperCase().refine(isCurrencyCode, CURRENCY_RULE).default('EUR');
}

/** Money, notes and provenance: what a quote needs beyond the engine's PartDef. */
export const partExtrasSchema = z.object({
	priceMinor: z
		.number({ error: 'Price must be a number' })
		.int('Price must be whole cents')
		.min(0, 'Price must not be negative')
		.max(1_000_000_000, 'Price is too large')
		.nullable()
		.default(null),
	currency: z.string().refine(isCurrencyCode, CURRENCY_RULE).default('EUR'),
	supplierNote: z.string().max(1000, 'Supplier note can be at most 1000 characters').default('')
});
export type PartExtras = z.infer<typeof partExtrasSchema>;

export type PartInput = Omit<PartDef, 'id'> & PartExtras;

/** Every problem with a part, with paths as the engine names them (`bodies[0].box.max[2]`). */
export type PartCheck =
	{ ok: true; def: PartDef; extras: PartExtras } | { ok: false; issues: FieldIssue[] };

/**
 * Checks a part as the API and CSV import send it. `standard` provenance is kept for the
 * read-only library; a studio's own part is from a datasheet, measured, or an estimate.
 */
export function checkPart(raw: unknown, id: string, allowStandard = false): PartCheck {
	const input = (raw && typeof raw === 'object' ? raw : {}) as Record<string, unknown>;
	const def = partDefSchema.safeParse({ ...input, id });
	const extras = partExtrasSchema.safeParse({
		priceMinor: input.priceMinor ?? null,
		currency: input.currency ?? 'EUR',
		supplierNote: input.supplierNote ?? ''
	});
	const issues: FieldIssue[] = [];
	if (!def.success) {
		issues.push(...formatZodIssues(def.error));
	}
	if (!extras.success) {
		issues.push(...formatZodIssues(extras.error));
	}
	if (def.success && def.data.provenance === 'standard' && !allowStandard) {
		issues.push({
			path: 'provenance',
			message: 'Dimensions from must be datasheet, measured or estimate'
		});
	}
	if (!def.success || !extras.success || issues.length) {
		return { ok: false, issues };
	}
	return { ok: true, def: def.data, extras: extras.data };
}

export type EnclosureCheck = { ok: true; def: EnclosureDef } | { ok: false; issues: FieldIssue[] };

export function checkEnclosure(raw: unknown): EnclosureCheck {
	const parsed = enclosureDefSchema.safeParse(raw);
	return parsed.success
		? { ok: true, def: parsed.data }
		: { ok: false, issues: formatZodIssues(parsed.error) };
}

/* ---------- forms (flat fields, so the basic ones work without JavaScript) ---------- */

const sizeMm = (label: string) =>
	z
		.number({ error: `${label} must be a number in mm` })
		.gt(0, `${label} must be greater than 0 mm`)
		.max(COORD_LIMIT_MM, `${label} must be at most ${COORD_LIMIT_MM} mm (10 m)`);
const thicknessMm = (label: string) =>
	z
		.number({ error: `${label} must be a number in mm` })
		.min(0, `${label} must not be negative`)
		.max(COORD_LIMIT_MM, `${label} must be at most ${COORD_LIMIT_MM} mm (10 m)`);
const offsetMm = (label: string) =>
	z
		.number({ error: `${label} must be a number in mm` })
		.min(-COORD_LIMIT_MM, `${label} must be at least −${COORD_LIMIT_MM} mm`)
		.max(COORD_LIMIT_MM, `${label} must be at most ${COORD_LIMIT_MM} mm`);
const wallKind = z.enum(['solid', 'mesh']);

type WallFields<F extends string> = Record<`${F}Mm`, ReturnType<typeof thicknessMm>> &
	Record<`${F}Kind`, z.ZodDefault<typeof wallKind>> &
	Record<`${F}OffsetMm`, z.ZodDefault<ReturnType<typeof offsetMm>>>;

/** One wall's three fields (thickness, solid or mesh, inward offset), named after its face. */
const wallFields = <F extends string>(face: F, label: string) =>
	({
		[`${face}Mm`]: thicknessMm(`${label} panel`),
		[`${face}Kind`]: wallKind.default('solid'),
		[`${face}OffsetMm`]: offsetMm(`${label} offset`).default(0)
	}) as WallFields<F>;

export const enclosureFormSchema = z.object({
	/** The revision the form was loaded at; 0 for a new enclosure. */
	revision: int4('Change number').default(0),
	name: z.string().trim().min(1, 'Name is required').max(200, 'Name can be at most 200 characters'),
	description: z
		.string()
		.trim()
		.max(2000, 'Description can be at most 2000 characters')
		.default(''),
	note: z.string().trim().max(500, 'Note can be at most 500 characters').default(''),
	outerX: sizeMm('Outer width'),
	outerY: sizeMm('Outer height'),
	outerZ: sizeMm('Outer depth'),
	...wallFields('left', 'Left'),
	...wallFields('right', 'Right'),
	...wallFields('bottom', 'Bottom'),
	...wallFields('top', 'Top'),
	...wallFields('front', 'Front'),
	...wallFields('back', 'Back'),
	/** Dividers, brackets and mounts as JSON: edited by the structured editor, or by hand without JavaScript. */
	features: z
		.string()
		.max(400_000, 'Too much to save at once')
		.default('{"dividers":[],"brackets":[],"mounts":[]}')
});
export type EnclosureForm = z.infer<typeof enclosureFormSchema>;

type WallKey = `${PanelName}Mm` | `${PanelName}Kind` | `${PanelName}OffsetMm`;

export function enclosureToForm(
	def: EnclosureDef,
	extra: { revision: number; description: string }
): EnclosureForm {
	const walls = Object.fromEntries(
		PANELS.flatMap((f) => [
			[`${f}Mm`, def.walls[f].thicknessMm],
			[`${f}Kind`, def.walls[f].kind],
			[`${f}OffsetMm`, def.walls[f].offsetMm]
		])
	) as Record<WallKey, never>;
	return {
		revision: extra.revision,
		name: def.name,
		description: extra.description,
		note: '',
		outerX: def.outerMm[0],
		outerY: def.outerMm[1],
		outerZ: def.outerMm[2],
		...walls,
		features: JSON.stringify(
			{ dividers: def.dividers, brackets: def.brackets, mounts: def.mounts },
			null,
			2
		)
	};
}

/** Where an engine path lands in the flat form: `outerMm[1]` → outerY, `walls.top.thicknessMm` → topMm. */
export function formFieldFor(path: string): string {
	const outer = /^outerMm\[(\d)\]/.exec(path);
	if (outer) {
		return ['outerX', 'outerY', 'outerZ'][Number(outer[1])];
	}
	const wall = /^walls\.(\w+)\.(thicknessMm|kind|offsetMm)/.exec(path);
	if (wall) {
		const suffix = wall[2] === 'thicknessMm' ? 'Mm' : wall[2] === 'kind' ? 'Kind' : 'OffsetMm';
		return `${wall[1]}${suffix}`;
	}
	if (/^(dividers|brackets|mounts)/.test(path)) {
		return 'features';
	}
	return path === 'name' ? 'name' : 'features';
}

/** The raw definition a form describes; the engine's schema decides whether it is valid. */
export function formToEnclosure(form: EnclosureForm): { raw: unknown; featuresError?: string } {
	let features: unknown;
	try {
		features = JSON.parse(form.features);
	} catch {
		return { raw: null, featuresError: 'Dividers, brackets and mounts are not valid JSON' };
	}
	if (!features || typeof features !== 'object' || Array.isArray(features)) {
		return { raw: null, featuresError: 'Expected an object with dividers, brackets and mounts' };
	}
	const f = features as Record<string, unknown>;
	const walls = Object.fromEntries(
		PANELS.map((face) => [
			face,
			{
				thicknessMm: form[`${face}Mm`],
				kind: form[`${face}Kind`],
				offsetMm: form[`${face}OffsetMm`]
			}
		])
	);
	return {
		raw: {
			name: form.name,
			outerMm: [form.outerX, form.outerY, form.outerZ],
			walls,
			dividers: f.dividers ?? [],
			brackets: f.brackets ?? [],
			mounts: f.mounts ?? []
		}
	};
}

const optionalNumber = (label: string, max = 100_000) =>
	z
		.number({ error: `${label} must be a number` })
		.min(0, `${label} must not be negative`)
		.max(max, `${label} is too large`)
		.optional();

export const partFormSchema = z.object({
	revision: int4('Change number').default(0),
	name: z.string().trim().min(1, 'Name is required').max(200, 'Name can be at most 200 characters'),
	category: z.enum(partCategorySchema.options, { error: 'Choose a category from the list' }),
	/** 'box': one body typed as width × height × depth; 'boxes': bodies from the geometry JSON. */
	shape: z.enum(['box', 'boxes']).default('box'),
	widthMm: sizeMm('Width').optional(),
	heightMm: sizeMm('Height').optional(),
	depthMm: sizeMm('Depth').optional(),
	/** Add the category's usual keep-outs and ports when the part has none yet. */
	applyTemplate: z.boolean().default(false),
	/** Bodies, keep-outs and ports as JSON. */
	geometry: z
		.string()
		.max(400_000, 'Too much to save at once')
		.default('{"bodies":[],"keepouts":[],"ports":[]}'),
	provenance: z
		.enum(['datasheet', 'measured', 'estimate'], {
			error: 'Choose datasheet, measured or estimate'
		})
		.default('estimate'),
	toleranceMm: thicknessMm('Tolerance').default(0),
	source: z.string().trim().max(500, 'Source can be at most 500 characters').default(''),
	price: priceText('Price', '24.90'),
	currency: currencyText(),
	supplierNote: z
		.string()
		.trim()
		.max(1000, 'Supplier note can be at most 1000 characters')
		.default(''),
	heatW: optionalNumber('Heat'),
	powerDrawW: optionalNumber('Power draw'),
	radiatorClass: z.enum(['', '120', '140', '240', '280', '360', '420']).default(''),
	radiatorThicknessMm: sizeMm('Radiator thickness').optional(),
	fanSizeMm: sizeMm('Fan size').optional(),
	fanThicknessMm: sizeMm('Fan thickness').optional(),
	psuFormFactor: z.enum(['', 'SFX', 'SFX-L', 'ATX', 'TFX']).default(''),
	psuRatingW: optionalNumber('Rating'),
	boardFormFactor: z.enum(['', 'Mini-ITX', 'microATX', 'ATX']).default(''),
	cardLengthMm: sizeMm('Card length').optional(),
	cardSlots: z
		.number()
		.int('Slots must be a whole number')
		.min(1, 'At least 1 slot')
		.max(8, 'At most 8 slots')
		.optional()
});
export type PartForm = z.infer<typeof partFormSchema>;

export function parsePrice(text: string): number | null {
	if (!text) {
		return null;
	}
	return Math.round(Number(text.replace(',', '.')) * 100);
}

/** The part a catalogue list row's button acts on (duplicate, archive, restore). */
export const partIdForm = z.object({ id: idField('Part') });

/** A length in mm typed into a form: required, a number, greater than 0 (or at least 0). */
const mmText = (label: string, atLeastZero = false) =>
	z
		.string({ error: `${label} is required.` })
		.trim()
		.min(1, `${label} is required.`)
		.pipe(
			atLeastZero
				? z.coerce
						.number<string>({ error: `${label} must be a number in mm.` })
						.pipe(thicknessMm(label))
				: z.coerce.number<string>({ error: `${label} must be a number in mm.` }).pipe(sizeMm(label))
		);

/**
 * A tube kind as the catalogue's form posts it: soft tube by inner/outer diameter, hard tube by
 * outer diameter (its inner one optional), the bend radius to the centre line, the room kept free
 * around it and a price per metre. The engine's own schema checks the result again on the server.
 */
export const tubeKindForm = z
	.object({
		/** Empty when adding; the kind's id when editing. */
		id: z.string().trim().max(120, 'Tube kind can be at most 120 characters.').default(''),
		/** When editing: the time (ms) of the change the form was filled from, for stale edits. */
		stamp: z.string().trim().max(20).default(''),
		name: z
			.string({ error: 'Name is required.' })
			.trim()
			.min(1, 'Name is required.')
			.max(200, 'Name can be at most 200 characters.'),
		kind: z.enum(['soft', 'hard'], { error: 'Kind must be soft or hard.' }),
		innerMm: z
			.string()
			.trim()
			.default('')
			.refine(
				(s) => s === '' || (Number.isFinite(Number(s)) && Number(s) > 0),
				'Inner diameter must be a number in mm greater than 0.'
			),
		outerMm: mmText('Outer diameter'),
		minBendRadiusMm: mmText('Minimum bend radius', true),
		clearanceMm: mmText('Clearance', true),
		price: priceText('Price per metre', '4.50'),
		currency: currencyText()
	})
	.superRefine((t, ctx) => {
		if (t.kind === 'soft' && t.innerMm === '') {
			ctx.addIssue({
				code: 'custom',
				path: ['innerMm'],
				message: 'Inner diameter is required for soft tube.'
			});
		}
		if (t.innerMm !== '' && Number(t.innerMm) >= t.outerMm) {
			ctx.addIssue({
				code: 'custom',
				path: ['innerMm'],
				message: 'Inner diameter must be smaller than the outer diameter.'
			});
		}
	});
export type TubeKindForm = z.infer<typeof tubeKindForm>;

/** The tube kind a row's button acts on (retire, restore). */
export const tubeKindIdForm = z.object({ id: idField('Tube kind', 120) });

/** The studio's cut allowance: percent added to the cut lengths when buying tube. */
export const cutAllowanceForm = z.object({
	cutAllowancePct: z
		.string({ error: 'Cut allowance is required.' })
		.trim()
		.min(1, 'Cut allowance is required.')
		.pipe(
			z.coerce
				.number<string>({ error: 'Cut allowance must be a number in %.' })
				.min(0, 'Cut allowance must not be negative.')
				.max(100, 'Cut allowance can be at most 100 %.')
		)
});

/** The largest CSV file the parts import reads at once: 2 MiB. */
export const MAX_CSV_BYTES = 2 * 1024 * 1024;

/** The parts import's first step: one CSV file, not empty, at most MAX_CSV_BYTES. */
export const csvUploadForm = z.object({
	file: z.instanceof(File, { message: 'Choose a CSV file to import.' }).superRefine((file, ctx) => {
		if (file.size === 0) ctx.addIssue({ code: 'custom', message: 'Choose a CSV file to import.' });
		else if (file.size > MAX_CSV_BYTES) {
			ctx.addIssue({
				code: 'custom',
				message: `The file is ${(file.size / 1024 / 1024).toFixed(1)} MB; at most ${MAX_CSV_BYTES / 1024 / 1024} MB can be imported at once.`
			});
		}
	})
});

/** The second step: the previewed text, sent back so the server keeps nothing in between. */
export const csvCommitForm = z.object({ csv: z.string().default('') });
