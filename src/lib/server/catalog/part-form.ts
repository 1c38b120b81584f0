/**
 * The part editor's form actions: superforms validates the flat fields, the engine's PartDef
 * schema validates the whole part, and its issues land on the field they are about.
 */
import { setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { FieldIssue } from '$lib/geometry';
import { formToPart, partFieldFor, partToForm } from '$lib/catalog/part-form';
import { partFormSchema, type PartForm } from '$lib/catalog/schemas';
import type { StudioAccess } from '../access';
import { placeOnFields, readEditorForm, refusal, revisionToSave } from './editor-form';
import { createPart, updatePart, type PartRecord } from './parts';

export const partAdapter = zod4(partFormSchema);

export type PartConflict = { revision: number; message: string; theirs: PartForm; savedAt: string };
type Form = SuperValidated<PartForm>;

export function partFormFor(p: PartRecord) {
	return superValidate(partToForm(p.def, { ...p, revision: p.revision }), partAdapter);
}

const refuse = refusal<Form, PartConflict, 'geometryIssues'>('geometryIssues');

function placeIssues(form: Form, issues: FieldIssue[]) {
	const fields = Object.keys(form.data);
	const geometry = placeOnFields(form, issues, {
		field: 'geometry',
		what: 'bodies, keep-outs or ports',
		fieldOf: (path) => {
			const field = partFieldFor(path, form.data.shape);
			return field === 'geometry' || !fields.includes(field) ? null : field;
		}
	});
	return refuse(400, form, geometry);
}

/** Creates (no id) or saves (id) from a posted form: `{saved}` names the page to go to, else a failure. */
export async function savePartForm(request: Request, access: StudioAccess, id?: string) {
	const { form, overwrite, ok } = await readEditorForm(request, partAdapter);
	if (!ok) return refuse(400, form);
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
	const revision = revisionToSave(overwrite, form.data.revision);
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
