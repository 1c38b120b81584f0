import { redirect } from '@sveltejs/kit';
import { confirmReturn } from '$lib/server/payments';
import { RETURN_COOKIE } from '$lib/server/sharing/client-actions';
import { notifyDepositPaid } from '$lib/server/sharing/notify';
import { safeNext } from '$lib/server/redirects';
import type { RequestHandler } from './$types';

/** Only our own client pages, so the cookie can never send anyone elsewhere. */
const PAGE = /^\/s\/([A-Za-z0-9_-]{43}|v\/[A-Za-z0-9_-]{1,64})$/;

/**
 * Back from the hosted checkout. Asks the payment service about the session (the webhook may not
 * have arrived yet), then returns to the page the client paid from.
 */
export const GET: RequestHandler = async ({ url, cookies }) => {
	const back = cookies.get(RETURN_COOKIE);
	const safe = safeNext(back, url.origin);
	const page = safe && PAGE.test(safe) ? safe : null;
	const sessionId = url.searchParams.get('session_id');
	let outcome = url.searchParams.has('cancelled') ? 'cancelled' : 'pending';
	if (sessionId) {
		const { payment, newlyPaid } = await confirmReturn(sessionId);
		if (newlyPaid) await notifyDepositPaid(newlyPaid);
		if (payment?.status === 'paid') outcome = 'paid';
	}
	if (!page) redirect(303, `/s/thanks?deposit=${outcome}`);
	cookies.delete(RETURN_COOKIE, { path: '/s' });
	redirect(303, `${page}?deposit=${outcome}#deposit`);
};
