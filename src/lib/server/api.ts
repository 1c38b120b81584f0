/**
 * The one helper for JSON endpoints (every /api route): bounded bodies (JSON, multipart, or raw for
 * a signature check), zod validation with paths, one refusal shape `{message, issues}`, and the
 * per-user API rate limit.
 */
import { error, json, type RequestEvent } from '@sveltejs/kit';
import { z } from 'zod';
import { formatZodIssues, type FieldIssue } from '$lib/geometry';
import { timingSafeEqual } from 'node:crypto';
import { controlCharPath } from './boundary';
import { config } from './config';
import { enforce } from './limits';
import { limits, type Limit } from './rate-limit';

/** Far more than any scene, variant, enclosure or part; larger bodies are refused before parsing. */
const MAX_JSON_BYTES = 4 * 1024 * 1024;

/** Any JSON object, for endpoints whose service validates the fields itself (the catalogue's). */
export const jsonObject = z.record(z.string(), z.unknown());

/** The refusal body of every JSON endpoint: `{message, issues}`, plus `detail` members if any. */
export function problem(
	status: number,
	message: string,
	issues: FieldIssue[] = [],
	detail: Record<string, unknown> = {}
) {
	return json({ ...detail, message, issues }, { status });
}

/**
 * A body as text, at most `maxBytes`: the declared length is checked before reading, the text
 * after. A larger one ends the request with 413 in the problem shape.
 */
async function boundedText(request: Request, maxBytes: number): Promise<string> {
	const tooLarge = () =>
		error(413, {
			message: `The body is larger than ${maxBytes / 1024 / 1024} MB.`,
			issues: []
		} as App.Error & { issues: FieldIssue[] });
	if (Number(request.headers.get('content-length') ?? 0) > maxBytes) tooLarge();
	const text = await request.text();
	if (text.length > maxBytes) tooLarge();
	return text;
}

/**
 * The body exactly as sent, bounded like every other, for an endpoint that must check it before
 * reading it: the payments webhook's signature is over the raw bytes, and parsing the JSON first
 * (readJson) and writing it out again would not give the same bytes back.
 */
export function readRawBody(request: Request, maxBytes: number): Promise<string> {
	return boundedText(request, maxBytes);
}

/** Reads and validates a JSON body; a bad one ends the request with 400 and the zod paths. */
export async function readJson<S extends z.ZodType>(
	request: Request,
	schema: S
): Promise<z.infer<S>> {
	const text = await boundedText(request, MAX_JSON_BYTES);
	let body: unknown;
	try {
		body = JSON.parse(text);
	} catch {
		badRequest('The body is not valid JSON.', []);
	}
	const bad = controlCharPath(body);
	if (bad) {
		badRequest('The request does not validate.', [
			{ path: bad, message: 'Contains control characters' }
		]);
	}
	return validated(schema, body);
}

/**
 * Reads a multipart body (a file upload to a JSON endpoint): the form, and its text fields
 * validated with the schema (the files are the caller's, read from `form`). A body that is not
 * a form, or fields that do not validate, end the request with 400 and the zod paths.
 */
export async function readMultipart<S extends z.ZodType>(
	request: Request,
	schema: S
): Promise<{ form: FormData; fields: z.infer<S> }> {
	let form: FormData;
	try {
		form = await request.formData();
	} catch {
		badRequest('Send the body as multipart form data.', []);
	}
	const text: Record<string, string> = {};
	for (const [name, value] of form) if (typeof value === 'string') text[name] = value;
	return { form, fields: validated(schema, text) };
}

function validated<S extends z.ZodType>(schema: S, body: unknown): z.infer<S> {
	const parsed = schema.safeParse(body);
	if (!parsed.success) badRequest('The request does not validate.', formatZodIssues(parsed.error));
	return parsed.data;
}

/**
 * Ends the request with 400 and the issues. An HttpError, not a thrown Response: SvelteKit answers
 * a thrown Response from an endpoint with 500. API callers get `{message, issues}` as JSON.
 */
export function badRequest(message: string, issues: FieldIssue[]): never {
	error(400, { message, issues } as App.Error & { issues: FieldIssue[] });
}

/** What `npm run bench:http` may send: far above any person, still counted like every call. */
const BENCH_LIMIT: Limit = { max: 100_000_000, windowSec: 60 };

/**
 * A load test is one user sending thousands of calls a minute. It is counted in its own bucket
 * with a high limit only when all three hold: development tools are on (INTERSTICE_DEV_TOOLS=1,
 * never in production mode, where a bench token even stops the server from starting), the server
 * was started with a bench token (scripts/bench-http.ts makes a random one per run), and the
 * request carries that token.
 */
function isBench(event: RequestEvent): boolean {
	const token = process.env.INTERSTICE_BENCH_TOKEN;
	if (!config.devTools || !token || token.length < 32) return false;
	const sent = event.request.headers.get('x-interstice-bench');
	if (!sent || sent.length !== token.length) return false;
	return timingSafeEqual(Buffer.from(sent), Buffer.from(token));
}

/** The per-user API bucket and limit for this request (the bench's own under a load test). */
export function apiBucket(event: RequestEvent): { bucket: string; limit: Limit } {
	return isBench(event)
		? { bucket: 'api-bench', limit: BENCH_LIMIT }
		: { bucket: 'api', limit: limits.api };
}

/** Per-user limit on API calls, counted in PostgreSQL like every other limit. */
export async function apiLimit(event: RequestEvent, userId: string) {
	const { bucket, limit } = apiBucket(event);
	await enforce(event, bucket, limit, userId);
}
