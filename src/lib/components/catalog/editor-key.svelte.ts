import { untrack } from 'svelte';

/**
 * The key an enclosure's or part's editor is rebuilt under: a new editor after a save (the
 * revision moved on), not after a conflict, which must keep what the user typed.
 */
export function editorKey(revision: () => number, conflicted: () => boolean) {
	let key = $state(untrack(revision));
	$effect(() => {
		if (!conflicted()) key = revision();
	});
	return {
		get current() {
			return key;
		}
	};
}
