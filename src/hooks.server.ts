import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { readSession } from '$lib/server/auth';
import { refuseControlCharsInAddress } from '$lib/server/boundary';
import { config, productionProblems } from '$lib/server/config';
import { CHECK_ROUTE } from '$lib/server/check-trip';
import { closeDb } from '$lib/server/db';
import { devToolsHandle } from '$lib/server/dev-tools';
import { scheduleDrain } from '$lib/server/outbox';

/**
 * Runs once before the server takes requests (adapter-node awaits it at start). In production
 * mode a missing or built-in setting stops the process, one line per setting.
 */
export const init: ServerInit = () => {
	const problems = productionProblems();
	if (problems.length) {
		console.error(
			`Interstice will not start in production mode (NODE_ENV=production):\n${problems.map((p) => `  - ${p}`).join('\n')}`
		);
		process.exit(1);
	}
	// Send account mail a previous process queued but did not get to, and keep sweeping.
	scheduleDrain();
};

// adapter-node stops accepting requests on SIGTERM/SIGINT, then waits for the event loop to empty;
// the open database pool would keep the process alive until killed.
process.on('sveltekit:shutdown', () => void closeDb());

const session: Handle = async ({ event, resolve }) => {
	// The fit check reads the session in the same statement as everything else it needs.
	if (event.route.id === CHECK_ROUTE && event.request.method === 'POST') return resolve(event);
	const { user, session } = await readSession(event.cookies);
	event.locals.user = user;
	event.locals.session = session ? { id: session.id, expiresAt: session.expiresAt } : null;
	return resolve(event);
};

/** Pages under these prefixes are meant to be embedded by the client's own site. */
const embeddable = ['/embed/'];

const securityHeaders: Handle = async ({ event, resolve }) => {
	const response = await resolve(event);
	const h = response.headers;
	h.set('x-content-type-options', 'nosniff');
	h.set('referrer-policy', 'strict-origin-when-cross-origin');
	h.set('cross-origin-opener-policy', 'same-origin');
	h.set('permissions-policy', 'camera=(), microphone=(), geolocation=(), payment=()');
	if (!embeddable.some((p) => event.url.pathname.startsWith(p))) h.set('x-frame-options', 'DENY');
	if (['/s/', '/reset/', '/invite/', '/verify/'].some((p) => event.url.pathname.startsWith(p))) {
		// Token-bearing URLs: never leak them to another site in a Referer header. Not `no-referrer`:
		// with it browsers send `Origin: null` on the page's own form posts, which SvelteKit's CSRF
		// check refuses (403), so accepting an invitation or saving a new password failed.
		h.set('referrer-policy', 'same-origin');
	}
	if (event.locals.user) h.set('cache-control', 'private, no-store');
	return response;
};

/** Development tools answer only when they are on; otherwise the request goes on to a 404. */
const devTools: Handle = async ({ event, resolve }) =>
	(config.devTools && (await devToolsHandle(event))) || resolve(event);

export const handle = sequence(securityHeaders, refuseControlCharsInAddress, session, devTools);

export const handleError: HandleServerError = ({ error, status }) => {
	if (status >= 500) console.error(error);
	return {
		message:
			status === 404 ? 'There is nothing at this address.' : 'Something went wrong on our side.'
	};
};
