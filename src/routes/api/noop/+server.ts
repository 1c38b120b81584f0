import { json } from '@sveltejs/kit';
import { requireUser } from '$lib/server/access';
import type { RequestHandler } from './$types';

/** The same session and routing cost as a real endpoint, no work: the reference for bench:http. */
export const POST: RequestHandler = async ({ locals, request }) => {
	requireUser(locals);
	await request.text();
	return json({ ok: true });
};
