import type { PageLoad } from './$types';

/** The editor's skip links: straight to the 3D view or the fit report, past the add-part search. */
export const load: PageLoad = ({ data }) => ({
	...data,
	skipLinks: [
		{ href: '#scene-view', label: 'Skip to the 3D view' },
		{ href: '#fit-report', label: 'Skip to the fit report' }
	]
});
