/** Between the flat part form and the part as the engine and the API see it. */
import type { PartDef, PartSpecs } from '$lib/geometry';
import { bodySizeMm, categoryTemplate, isOneBox, oneBody } from './part-shape';
import { parsePrice, type PartExtras, type PartForm, type PartInput } from './schemas';

type Geometry = Pick<PartDef, 'bodies' | 'keepouts' | 'ports'>;

export function parseGeometry(text: string): {
	geometry: Partial<Geometry> | null;
	error?: string;
} {
	try {
		const value = JSON.parse(text) as unknown;
		if (!value || typeof value !== 'object' || Array.isArray(value)) {
			return { geometry: null, error: 'Expected an object with bodies, keep-outs and ports' };
		}
		return { geometry: value as Partial<Geometry> };
	} catch {
		return { geometry: null, error: 'Bodies, keep-outs and ports are not valid JSON' };
	}
}

function specsOf(form: PartForm): PartSpecs {
	const specs: Record<string, unknown> = {
		heatW: form.heatW,
		powerDrawW: form.powerDrawW,
		radiatorClass: form.radiatorClass ? Number(form.radiatorClass) : undefined,
		radiatorThicknessMm: form.radiatorThicknessMm,
		fanSizeMm: form.fanSizeMm,
		fanThicknessMm: form.fanThicknessMm,
		psuFormFactor: form.psuFormFactor || undefined,
		psuRatingW: form.psuRatingW,
		boardFormFactor: form.boardFormFactor || undefined,
		cardLengthMm: form.cardLengthMm,
		cardSlots: form.cardSlots
	};
	return Object.fromEntries(Object.entries(specs).filter(([, v]) => v !== undefined)) as PartSpecs;
}

/**
 * The part a form describes, not yet validated. A one-box part takes its body from width ×
 * height × depth; the category template fills keep-outs and ports only when there are none.
 */
export function formToPart(form: PartForm): {
	input: PartInput | null;
	errors: Record<string, string>;
} {
	const errors: Record<string, string> = {};
	const { geometry, error } = parseGeometry(form.geometry);
	if (!geometry) {
		return { input: null, errors: { geometry: error ?? 'Invalid' } };
	}
	let bodies = (geometry.bodies ?? []) as PartDef['bodies'];
	if (form.shape === 'box') {
		for (const key of ['widthMm', 'heightMm', 'depthMm'] as const) {
			if (form[key] === undefined) {
				errors[key] =
					`${key === 'widthMm' ? 'Width' : key === 'heightMm' ? 'Height' : 'Depth'} must be a positive number in mm`;
			}
		}
		if (Object.keys(errors).length) {
			return { input: null, errors };
		}
		bodies = oneBody([form.widthMm!, form.heightMm!, form.depthMm!]);
	}
	let keepouts = (geometry.keepouts ?? []) as PartDef['keepouts'];
	let ports = (geometry.ports ?? []) as PartDef['ports'];
	if (form.applyTemplate && keepouts.length === 0 && ports.length === 0 && form.shape === 'box') {
		({ keepouts, ports } = categoryTemplate(form.category, [
			form.widthMm!,
			form.heightMm!,
			form.depthMm!
		]));
	}
	const extras: PartExtras = {
		priceMinor: parsePrice(form.price),
		currency: form.currency,
		supplierNote: form.supplierNote
	};
	return {
		input: {
			name: form.name,
			category: form.category,
			bodies,
			keepouts,
			ports,
			specs: specsOf(form),
			provenance: form.provenance,
			toleranceMm: form.toleranceMm,
			source: form.source || undefined,
			...extras
		},
		errors
	};
}

export function partToForm(def: PartDef, extras: PartExtras & { revision: number }): PartForm {
	const oneBox = isOneBox(def);
	const [w, h, d] = bodySizeMm(def);
	const s = def.specs;
	return {
		revision: extras.revision,
		name: def.name,
		category: def.category,
		shape: oneBox ? 'box' : 'boxes',
		widthMm: w,
		heightMm: h,
		depthMm: d,
		applyTemplate: false,
		geometry: JSON.stringify(
			{ bodies: oneBox ? [] : def.bodies, keepouts: def.keepouts, ports: def.ports },
			null,
			2
		),
		provenance: def.provenance === 'standard' ? 'datasheet' : def.provenance,
		toleranceMm: def.toleranceMm,
		source: def.source ?? '',
		price: extras.priceMinor === null ? '' : (extras.priceMinor / 100).toFixed(2),
		currency: extras.currency,
		supplierNote: extras.supplierNote,
		heatW: s.heatW,
		powerDrawW: s.powerDrawW,
		radiatorClass: s.radiatorClass ? (String(s.radiatorClass) as PartForm['radiatorClass']) : '',
		radiatorThicknessMm: s.radiatorThicknessMm,
		fanSizeMm: s.fanSizeMm,
		fanThicknessMm: s.fanThicknessMm,
		psuFormFactor: s.psuFormFactor ?? '',
		psuRatingW: s.psuRatingW,
		boardFormFactor: s.boardFormFactor ?? '',
		cardLengthMm: s.cardLengthMm,
		cardSlots: s.cardSlots
	};
}

/** Engine paths → form fields: `bodies[0].box.max[0]` → widthMm for a one-box part, else geometry. */
export function partFieldFor(path: string, shape: PartForm['shape']): string {
	if (shape === 'box') {
		const m = /^bodies\[0\]\.box\.max\[(\d)\]/.exec(path);
		if (m) {
			return ['widthMm', 'heightMm', 'depthMm'][Number(m[1])];
		}
	}
	if (/^(bodies|keepouts|ports)/.test(path)) {
		return 'geometry';
	}
	const spec = /^specs\.(\w+)/.exec(path);
	if (spec) {
		return spec[1];
	}
	if (path === 'priceMinor') {
		return 'price';
	}
	return path.split(/[.[]/)[0] || 'name';
}
