/**
 * A form's "busy" flag for `use:enhance`: set while the post is on its way (the page disables its
 * button), cleared once SvelteKit has applied the answer; `after` runs then too.
 */
export function busyForm(after?: () => void) {
	let busy = $state(false);
	return {
		get busy() {
			return busy;
		},
		submit: () => {
			busy = true;
			return async ({ update }: { update: () => Promise<void> }) => {
				await update();
				busy = false;
				after?.();
			};
		}
	};
}
