import { json } from '@sveltejs/kit';
import { readRawBody } from '$lib/server/api';
import { jsonRoute } from '$lib/server/errors';
import { handleWebhook } from '$lib/server/payments';
import { notifyDepositPaid } from '$lib/server/sharing/notify';
import type { RequestHandler } from './$types';

/** Far above any event the service sends (a few kB). */
const MAX_BODY_BYTES = 512 * 1024;

/**
 * The payment service's webhook. The raw body is verified with the SDK against the signing secret;
 * anything unsigned or altered answers 400 and changes nothing. Each event id is handled once.
 */
export const POST: RequestHandler = jsonRoute(async ({ request }) => {
	const body = await readRawBody(request, MAX_BODY_BYTES);
	const outcome = await handleWebhook(body, request.headers.get('stripe-signature'));
	if (outcome.paid) await notifyDepositPaid(outcome.paid);
	return json({ received: true, duplicate: outcome.duplicate });
});
