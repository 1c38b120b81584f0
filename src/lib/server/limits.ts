import { error, type RequestEvent } from '@sveltejs/kit';
import { hit, type Limit, type RateResult } from './rate-limit';

/**
 * The client address as the adapter reports it. Behind a proxy, set adapter-node's
 * ADDRESS_HEADER / XFF_DEPTH so this is the real client, never a raw X-Forwarded-For.
 */
export function clientAddress(event: Pick<RequestEvent, 'getClientAddress'>) {
	try {
		return event.getClientAddress();
	} catch {
		return 'unknown';
	}
}

/** Counts the attempt; over the limit → HTTP 429 with a plain message and Retry-After. */
export async function enforce(
	event: Pick<RequestEvent, 'getClientAddress' | 'setHeaders'>,
	bucket: string,
	limit: Limit,
	extraKey = ''
) {
	refuseOver(event, await hit(limitKey(event, bucket, extraKey), limit));
}

/** The counter's key: bucket, client address and (for per-account limits) the account. */
export function limitKey(
	event: Pick<RequestEvent, 'getClientAddress'>,
	bucket: string,
	extraKey = ''
) {
	return `${bucket}:${clientAddress(event)}${extraKey ? ':' + extraKey : ''}`;
}

/** Over the limit: ends the request with 429 and Retry-After. */
export function refuseOver(event: Pick<RequestEvent, 'setHeaders'>, r: RateResult) {
	if (!r.allowed) {
		event.setHeaders({ 'retry-after': String(r.retryAfterSec) });
		const minutes = Math.ceil(r.retryAfterSec / 60);
		error(429, `Too many attempts. Try again in ${minutes} minute${minutes === 1 ? '' : 's'}.`);
	}
}
