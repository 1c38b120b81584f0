import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { sequence } from '@sveltejs/kit/hooks';
import { readSession } from '$lib/server/auth';
import { refuseControlCharsInAddress } from '$lib/server/boundary';
import { closeDb } from '$lib/server/db';
import { scheduleDrain } from '$lib/server/outbox';

// adapter-node stops accepting requests on SIGTERM/SIGINT, then waits for the event loop to empty;
// the open database pool would keep the process alive until killed.
process.on('sveltekit:shutdown', () => void closeDb());

/** At start: send account mail a previous process queued but did not get to, and keep sweeping. */
export const init: ServerInit = () => {
	scheduleDrain();
};

const session: Handle = async ({ event, resolve }) => {
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

export const handle = sequence(securityHeaders, refuseControlCharsInAddress, session);

export const handleError: HandleServerError = ({ error, status }) => {
	if (status >= 500) console.error(error);
	return { message: status === 404 ? 'There is nothing at this address.' : 'Something went wrong on our side.' };
};
