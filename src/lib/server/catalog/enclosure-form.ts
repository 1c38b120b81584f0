/**
 * The enclosure editor's form actions: superforms validates the flat fields, the engine's schema
 * validates the whole definition, and its issues land on the field they are about.
 */
import { fail } from '@sveltejs/kit';
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
import { INT4_MAX } from '$lib/schemas/common';
import type { StudioAccess } from '../access';
import { controlCharField } from '../boundary';
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

/** Every failure has one shape, so the page reads `form.featureIssues` and `form.conflict` alike. */
function refuse(
	status: number,
	form: Form,
	featureIssues: FieldIssue[] = [],
	conflict: EnclosureConflict | null = null
) {
	return fail(status, { form, featureIssues, conflict });
}

function placeIssues(form: Form, issues: FieldIssue[]) {
	const features: FieldIssue[] = [];
	for (const issue of issues) {
		const field = formFieldFor(issue.path) as keyof EnclosureForm;
		if (field === 'features') features.push(issue);
		else setError(form, field, issue.message);
	}
	if (features.length) {
		setError(
			form,
			'features',
			`${features.length} problem${features.length === 1 ? '' : 's'} with dividers, brackets or mounts`
		);
	}
	return refuse(400, form, features);
}

/** Creates (no id) or saves (id) from a posted form: `{saved}` names the editor to go to, else a failure. */
export async function saveEnclosureForm(request: Request, access: StudioAccess, id?: string) {
	const data = await request.formData();
	const overwrite = Number(data.get('overwriteRevision'));
	const form = await superValidate(data, enclosureAdapter);
	const bad = controlCharField(data);
	if (bad) {
		if (bad in form.data) {
			setError(form, bad as keyof EnclosureForm, 'Contains control characters.');
		} else setError(form, '', `${bad} contains control characters.`);
		return refuse(400, form);
	}
	if (!form.valid) return refuse(400, form);
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
	// "Save mine over theirs" after a conflict names the newer revision the user has now seen.
	const revision =
		Number.isInteger(overwrite) && overwrite > 0 && overwrite <= INT4_MAX
			? overwrite
			: form.data.revision;
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
