import { json } from '@sveltejs/kit';
import { problem } from '$lib/server/api';
import { jsonRoute } from '$lib/server/errors';
import { handleWebhook } from '$lib/server/payments';
import { notifyDepositPaid } from '$lib/server/sharing/notify';
import type { RequestHandler } from './$types';

const MAX_BODY_BYTES = 512 * 1024;

/**
 * The payment service's webhook. The raw body is verified with the SDK against the signing secret;
 * anything unsigned or altered answers 400 and changes nothing. Each event id is handled once.
 */
export const POST: RequestHandler = jsonRoute(async ({ request }) => {
	if (Number(request.headers.get('content-length') ?? 0) > MAX_BODY_BYTES) {
		return problem(413, 'Too large.');
	}
	const body = await request.text();
	if (body.length > MAX_BODY_BYTES) return problem(413, 'Too large.');
	const outcome = await handleWebhook(body, request.headers.get('stripe-signature'));
	if (outcome.paid) await notifyDepositPaid(outcome.paid);
	return json({ received: true, duplicate: outcome.duplicate });
});
