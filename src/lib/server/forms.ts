import { fail } from '@sveltejs/kit';
import type { z } from 'zod';
import { fieldErrors } from '$lib/schemas/common';
import { controlCharField } from './boundary';

/**
 * Parses a form post with a zod schema. On failure returns `fail(400)` with the user's input
 * (passwords dropped) and one message per field, so the form can be shown again.
 */
export async function parseForm<S extends z.ZodType>(request: Request, schema: S) {
	const form = await request.formData();
	const raw: Record<string, string> = {};
	for (const [k, v] of form) if (typeof v === 'string') raw[k] = v;
	const values = Object.fromEntries(Object.entries(raw).filter(([k]) => !/password/i.test(k)));
	// Before the schema, so no field of any form can carry a NUL byte through to the database.
	const bad = controlCharField(form);
	if (bad) {
		delete values[bad];
		return {
			ok: false as const,
			failure: formFail(400, values, { [bad]: `${bad} contains control characters.` })
		};
	}
	const result = schema.safeParse(raw);
	if (result.success) return { ok: true as const, data: result.data as z.infer<S>, raw };
	return { ok: false as const, failure: formFail(400, values, fieldErrors(result.error)) };
}

export type FormProblem = { values: Record<string, string>; errors: Record<string, string> };

/** The one shape every form failure has, so pages can read `form.values` and `form.errors`. */
export function formFail(
	status: number,
	values: Record<string, string>,
	errors: Record<string, string>
) {
	const data: FormProblem = { values, errors };
	return fail(status, data);
}
