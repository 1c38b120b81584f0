/**
 * The one way a form action reads a post: superforms' `superValidate` with the area's zod schema
 * (from `$lib/schemas/*` or `$lib/catalog/schemas`), answering a bad form in the one failure shape
 * `{values, errors}` the pages read (`formFail` in ./errors).
 */
import { superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { z } from 'zod';
import { controlCharField } from './boundary';
import { formFail } from './errors';

// superforms reads objects: a form schema is an object (or a record of fields) of text.
type FormSchema = z.ZodType<Record<string, unknown>, Record<string, unknown>>;

/** Every posted text field, passwords dropped: what the page shows again after a refusal. */
function echoValues(data: FormData): Record<string, string> {
	const values: Record<string, string> = {};
	for (const [k, v] of data) if (typeof v === 'string' && !/password/i.test(k)) values[k] = v;
	return values;
}

/** superforms' nested errors → one message per field (the first), `_` for the whole form. */
export function firstErrors(errors: SuperValidated<Record<string, unknown>>['errors']) {
	const out: Record<string, string> = {};
	const walk = (node: unknown, path: string) => {
		if (Array.isArray(node)) {
			if (node.length) out[path || '_'] ??= String(node[0]);
		} else if (node && typeof node === 'object') {
			for (const [k, v] of Object.entries(node)) {
				walk(v, k === '_errors' ? path : path ? `${path}.${k}` : k);
			}
		}
	};
	walk(errors, '');
	return out;
}

/**
 * Reads and validates a form post. Strict mode: a field that was not posted reaches the schema as
 * missing (its own "… is required." or default applies), never as a value superforms made up.
 * Control characters are refused before the schema, so no field of any form carries a NUL byte
 * through to the database. Pass the FormData when the action needs more of it (an uploaded file).
 */
export async function readForm<S extends FormSchema>(source: Request | FormData, schema: S) {
	const data = source instanceof FormData ? source : await source.formData();
	const values = echoValues(data);
	const bad = controlCharField(data);
	if (bad) {
		delete values[bad];
		return {
			ok: false as const,
			failure: formFail(400, values, { [bad]: `${bad} contains control characters.` })
		};
	}
	// Every field reaches the schema as posted text: the schema coerces (z.coerce), so "1.5" meets
	// `.int()` instead of being cut to 1 by superforms' own number parsing.
	const form = await superValidate(data, zod4(schema), {
		strict: true,
		preprocessed: [...new Set(data.keys())] as never
	});
	if (!form.valid) {
		return { ok: false as const, failure: formFail(400, values, firstErrors(form.errors)) };
	}
	return { ok: true as const, data: form.data as z.output<S>, values };
}
