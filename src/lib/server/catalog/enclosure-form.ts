/**
 * The enclosure editor's form actions: superforms validates the flat fields, the engine's schema
 * validates the whole definition, and its issues land on the field they are about.
 */
import { setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { FieldIssue } from '$lib/geometry';
import {
	enclosureFormSchema,
	enclosureToForm,
	formFieldFor,
	formToEnclosure,
	type EnclosureForm
} from '$lib/catalog/schemas';
import type { StudioAccess } from '../access';
import { placeOnFields, readEditorForm, refusal, revisionToSave } from './editor-form';
import { createEnclosure, updateEnclosure, type EnclosureDetail } from './enclosures';

export const enclosureAdapter = zod4(enclosureFormSchema);

export type EnclosureConflict = {
	revision: number;
	message: string;
	theirs: EnclosureForm;
	savedAt: string;
};

export function formFor(detail: EnclosureDetail) {
	return superValidate(
		enclosureToForm(detail.current.def, {
			revision: detail.revision,
			description: detail.description
		}),
		enclosureAdapter
	);
}

type Form = SuperValidated<EnclosureForm>;

const refuse = refusal<Form, EnclosureConflict, 'featureIssues'>('featureIssues');

function placeIssues(form: Form, issues: FieldIssue[]) {
	const features = placeOnFields(form, issues, {
		field: 'features',
		what: 'dividers, brackets or mounts',
		fieldOf: (path) => {
			const field = formFieldFor(path);
			return field === 'features' ? null : field;
		}
	});
	return refuse(400, form, features);
}

/** Creates (no id) or saves (id) from a posted form: `{saved}` names the editor to go to, else a failure. */
export async function saveEnclosureForm(request: Request, access: StudioAccess, id?: string) {
	const { form, overwrite, ok } = await readEditorForm(request, enclosureAdapter);
	if (!ok) return refuse(400, form);
	const { raw, featuresError } = formToEnclosure(form.data);
	if (featuresError) {
		setError(form, 'features', featuresError);
		return refuse(400, form);
	}
	const input = { definition: raw, description: form.data.description, note: form.data.note };
	if (!id) {
		const made = await createEnclosure(access.studioId, access.user.id, input);
		if (!made.ok) {
			return made.status === 400 ? placeIssues(form, made.issues) : refuse(made.status, form);
		}
		return { saved: `/enclosures/${made.value.id}?saved=1` };
	}
	const revision = revisionToSave(overwrite, form.data.revision);
	const saved = await updateEnclosure(access.studioId, id, revision, access.user.id, input);
	if (saved.ok) return { saved: `/enclosures/${id}?saved=${saved.created ? 'version' : '1'}` };
	if (saved.status === 400) return placeIssues(form, saved.issues);
	if (saved.status === 404) return refuse(404, form);
	const theirs = saved.current;
	const conflict: EnclosureConflict = {
		revision: theirs.revision,
		message: saved.message,
		theirs: enclosureToForm(theirs.current.def, {
			revision: theirs.revision,
			description: theirs.description
		}),
		savedAt: theirs.updatedAt.toISOString()
	};
	return refuse(409, form, [], conflict);
}
