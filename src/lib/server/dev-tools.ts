/**
 * Development tools, served from the server hook rather than from src/routes, so they are in no
 * build's route list and answer 404 unless config.devTools is on (never in production mode).
 *
 * POST /api/noop: the same session and request cost as a real endpoint and no work, the reference
 * that `npm run bench:http` compares the check endpoint against.
 */
import { json, type RequestEvent } from '@sveltejs/kit';

export const DEV_TOOL_PATHS = ['/api/noop'] as const;

export async function devToolsHandle(event: RequestEvent): Promise<Response | null> {
	if (event.url.pathname !== '/api/noop') return null;
	if (event.request.method !== 'POST') {
		return json({ message: 'Use POST.' }, { status: 405, headers: { allow: 'POST' } });
	}
	if (!event.locals.user) return json({ message: 'Sign in first.' }, { status: 401 });
	await event.request.text();
	return json({ ok: true });
}
