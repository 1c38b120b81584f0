import type { SubmitFunction } from '@sveltejs/kit';

/**
 * `use:enhance={keepFields}`: apply the answer as SvelteKit does, but leave what is typed in the
 * form's fields (an editor saved in place keeps its inputs instead of clearing them).
 */
export const keepFields: SubmitFunction = () => {
	return async ({ update }) => update({ reset: false });
};
