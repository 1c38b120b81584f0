import type { PageServerLoad } from './$types';

export const load: PageServerLoad = ({ locals }) => ({ signedIn: !!locals.user });
