/**
 * The part editor's form actions: superforms validates the flat fields, the engine's PartDef
 * schema validates the whole part, and its issues land on the field they are about.
 */
import { fail } from '@sveltejs/kit';
import { setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { FieldIssue } from '$lib/geometry';
import { formToPart, partFieldFor, partToForm } from '$lib/catalog/part-form';
import { partFormSchema, type PartForm } from '$lib/catalog/schemas';
import { INT4_MAX } from '$lib/schemas/common';
import type { StudioAccess } from '../access';
import { controlCharField } from '../boundary';
import { createPart, updatePart, type PartRecord } from './parts';

export const partAdapter = zod4(partFormSchema);

export type PartConflict = { revision: number; message: string; theirs: PartForm; savedAt: string };
type Form = SuperValidated<PartForm>;

export function partFormFor(p: PartRecord) {
	return superValidate(partToForm(p.def, { ...p, revision: p.revision }), partAdapter);
}

function refuse(
	status: number,
	form: Form,
	geometryIssues: FieldIssue[] = [],
	conflict: PartConflict | null = null
) {
	return fail(status, { form, geometryIssues, conflict });
}

function placeIssues(form: Form, issues: FieldIssue[]) {
	const geometry: FieldIssue[] = [];
	const fields = Object.keys(form.data);
	for (const issue of issues) {
		const field = partFieldFor(issue.path, form.data.shape);
		if (field === 'geometry' || !fields.includes(field)) geometry.push(issue);
		else setError(form, field as keyof PartForm, issue.message);
	}
	if (geometry.length) {
		setError(
			form,
			'geometry',
			`${geometry.length} problem${geometry.length === 1 ? '' : 's'} with bodies, keep-outs or ports`
		);
	}
	return refuse(400, form, geometry);
}

/** Creates (no id) or saves (id) from a posted form: `{saved}` names the page to go to, else a failure. */
export async function savePartForm(request: Request, access: StudioAccess, id?: string) {
	const data = await request.formData();
	const overwrite = Number(data.get('overwriteRevision'));
	const form = await superValidate(data, partAdapter);
	const bad = controlCharField(data);
	if (bad) {
		if (bad in form.data) setError(form, bad as keyof PartForm, 'Contains control characters.');
		else setError(form, '', `${bad} contains control characters.`);
		return refuse(400, form);
	}
	if (!form.valid) return refuse(400, form);
	const { input, errors } = formToPart(form.data);
	if (!input) {
		for (const [field, message] of Object.entries(errors)) {
			setError(form, field as keyof PartForm, message);
		}
		return refuse(400, form);
	}
	if (!id) {
		const made = await createPart(access.studioId, input);
		if (!made.ok) {
			return made.status === 400 ? placeIssues(form, made.issues) : refuse(made.status, form);
		}
		return { saved: `/parts/${made.value.id}?saved=1` };
	}
	const revision =
		Number.isInteger(overwrite) && overwrite > 0 && overwrite <= INT4_MAX
			? overwrite
			: form.data.revision;
	const saved = await updatePart(access.studioId, id, revision, input);
	if (saved.ok) return { saved: `/parts/${id}?saved=1` };
	if (saved.status === 400) return placeIssues(form, saved.issues);
	if (saved.status === 404) return refuse(404, form);
	const theirs = saved.current;
	return refuse(409, form, [], {
		revision: theirs.revision,
		message: saved.message,
		theirs: partToForm(theirs.def, { ...theirs, revision: theirs.revision }),
		savedAt: theirs.updatedAt.toISOString()
	});
}
