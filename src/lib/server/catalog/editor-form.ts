/**
 * What the part and enclosure editors' form actions share: reading a posted form (control
 * characters refused), putting the engine's issues on the fields they are about, and the revision
 * a save names.
 */
import { fail } from '@sveltejs/kit';
import { setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import type { ValidationAdapter } from 'sveltekit-superforms/adapters';
import type { FieldIssue } from '$lib/geometry';
import { INT4_MAX } from '$lib/schemas/common';
import { controlCharField } from '../boundary';

// superforms types a field path per form; these helpers take the editors' field names as text.
type AnyForm = SuperValidated<Record<string, unknown>>;

/**
 * Reads and validates a posted editor form. `ok` is false when a field holds control characters
 * (the error is on that field, or on the form) or the flat fields do not validate.
 */
export async function readEditorForm<
	T extends Record<string, unknown>,
	In extends Record<string, unknown>
>(request: Request, adapter: ValidationAdapter<T, In>) {
	const data = await request.formData();
	const overwrite = Number(data.get('overwriteRevision'));
	const form = await superValidate(data, adapter);
	const bad = controlCharField(data);
	if (bad) {
		if (bad in form.data) setError(form as AnyForm, bad, 'Contains control characters.');
		else setError(form as AnyForm, '', `${bad} contains control characters.`);
	}
	return { form, overwrite, ok: !bad && form.valid };
}

/**
 * Puts each issue on the field `fieldOf` names; an issue it names no field for belongs to the
 * list field (dividers and mounts, bodies and ports), which gets one count of them. Returns those.
 */
export function placeOnFields(
	form: SuperValidated<Record<string, unknown>>,
	issues: FieldIssue[],
	list: { field: string; what: string; fieldOf: (path: string) => string | null }
): FieldIssue[] {
	const onList: FieldIssue[] = [];
	for (const issue of issues) {
		const field = list.fieldOf(issue.path);
		if (field === null) onList.push(issue);
		else setError(form, field, issue.message);
	}
	if (onList.length) {
		const n = onList.length;
		setError(form, list.field, `${n} problem${n === 1 ? '' : 's'} with ${list.what}`);
	}
	return onList;
}

/**
 * The editor's `refuse`: every failure has one shape, so the page reads its issues list (named
 * `issuesKey`) and `form.conflict` alike.
 */
export function refusal<F, C, K extends string>(issuesKey: K) {
	return (status: number, form: F, issues: FieldIssue[] = [], conflict: C | null = null) =>
		fail(status, { form, conflict, ...({ [issuesKey]: issues } as Record<K, FieldIssue[]>) });
}

/** "Save mine over theirs" after a conflict names the newer revision the user has now seen. */
export function revisionToSave(overwrite: number, formRevision: number) {
	return Number.isInteger(overwrite) && overwrite > 0 && overwrite <= INT4_MAX
		? overwrite
		: formRevision;
}
