import { onMount, untrack } from 'svelte';
import { superForm, type Infer, type SuperValidated } from 'sveltekit-superforms';
import { zod4Client, type ZodValidationSchema } from 'sveltekit-superforms/adapters';
import type { FieldIssue } from '$lib/geometry';

/** Another save won the race: what it saved, for the user to take or to overwrite. */
export type Conflict<F> = { revision: number; message: string; theirs: F; savedAt: string };

/** The props an enclosure's and a part's editor share. */
export type CatalogEditorProps<F extends Record<string, unknown>> = {
	data: SuperValidated<F>;
	submitLabel?: string;
	serverIssues?: FieldIssue[];
	conflict?: Conflict<F> | null;
};

/**
 * The editor's form. The editor is keyed by its page: one form per mount, so the first value is
 * the one wanted.
 */
export function catalogForm<S extends ZodValidationSchema>(
	data: () => SuperValidated<Infer<S, 'zod4'>>,
	schema: S
) {
	return superForm(untrack(data), {
		validators: zod4Client(schema),
		resetForm: false,
		taintedMessage: null
	});
}

/** True once the page runs in the browser: the parts that need script wait for it. */
export function hydratedFlag() {
	let hydrated = $state(false);
	onMount(() => (hydrated = true));
	return {
		get current() {
			return hydrated;
		}
	};
}

type Checked<D> = { ok: true; def: D } | { ok: false; issues: FieldIssue[] } | null;

/**
 * What the preview draws while the form is typed in: the last definition that checked, and the
 * live problems under `paths` (the server's from the last save while there are none).
 */
export function livePreview<D>(
	composed: () => Checked<D>,
	paths: RegExp,
	serverIssues: () => FieldIssue[]
) {
	const first = untrack(composed);
	let lastGood = $state.raw(first?.ok ? first.def : null);
	$effect(() => {
		const c = composed();
		if (c?.ok) lastGood = c.def;
	});
	const liveIssues = $derived.by(() => {
		const c = composed();
		return c && !c.ok ? c.issues.filter((i) => paths.test(i.path)) : [];
	});
	const issues = $derived(liveIssues.length ? liveIssues : serverIssues());
	return {
		get lastGood() {
			return lastGood;
		},
		get issues() {
			return issues;
		}
	};
}
