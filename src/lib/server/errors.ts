/**
 * The one error style of the services: a service refuses by throwing a ServiceError (a kind, a
 * message for people, optionally the field or the issues it is about), and routes turn it into
 * HTTP here, in one place: `problem(...)` for JSON endpoints, `fail(...)` with `{values, errors}`
 * for form actions, `error(...)` for loads and actions that show the error page.
 */
import { error, fail, type ActionFailure } from '@sveltejs/kit';
import type { FieldIssue } from '$lib/geometry';
import { problem } from './api';

/** What went wrong, in HTTP's terms; the status each kind answers with is in STATUS below. */
export type ServiceErrorKind =
	| 'invalid'
	| 'forbidden'
	| 'not-found'
	| 'conflict'
	| 'locked'
	| 'gone'
	| 'too-large'
	| 'unsupported-type'
	| 'over-limit'
	| 'rate-limited'
	| 'busy';

const STATUS: Record<ServiceErrorKind, number> = {
	invalid: 400,
	forbidden: 403,
	'not-found': 404,
	conflict: 409,
	// A paid quote: the same 409 as any other stale or refused write, a word of its own for logs.
	locked: 409,
	gone: 410,
	'too-large': 413,
	'unsupported-type': 415,
	// The engine's cost limits (boxes, candidate pairs, sweep points): the request is well formed but
	// more than the server computes for one call.
	'over-limit': 422,
	'rate-limited': 429,
	busy: 503
};

export type ServiceErrorOptions = {
	/** The form field or JSON path the error is about (a form shows the message beside it). */
	field?: string;
	/** Several field problems at once (a scene that does not validate). */
	issues?: FieldIssue[];
	/** Extra members for a JSON refusal body (a cost limit's name and maximum). */
	detail?: Record<string, unknown>;
};

export class ServiceError extends Error {
	readonly kind: ServiceErrorKind;
	readonly field: string | undefined;
	readonly issues: FieldIssue[];
	readonly detail: Record<string, unknown>;
	constructor(kind: ServiceErrorKind, message: string, options: ServiceErrorOptions = {}) {
		super(message);
		this.name = new.target.name;
		this.kind = kind;
		this.field = options.field;
		this.issues = options.issues ?? [];
		this.detail = options.detail ?? {};
	}
	get status(): number {
		return STATUS[this.kind];
	}
}

/** The shape every form failure has, so pages read `form.values` and `form.errors` alike. */
export type FormProblem = { values: Record<string, string>; errors: Record<string, string> };

/** `fail(status, {values, errors})`: the one way an action answers a form that cannot be done. */
export function formFail(
	status: number,
	values: Record<string, string>,
	errors: Record<string, string>
): ActionFailure<FormProblem> {
	return fail(status, { values, errors });
}

type Target = { as: 'json'; headline?: string } | ({ as: 'form' } & FormTarget) | { as: 'page' };

type FormTarget = {
	values?: Record<string, string>;
	field?: string;
	/** A page whose forms answer some kind with another status (members: a rule refused is 400). */
	statusFor?: Partial<Record<ServiceErrorKind, number>>;
	/** One status for every refusal (a wrong choice in the form, whatever the service called it). */
	status?: number;
};

/**
 * The one mapping from a ServiceError to HTTP. JSON: `{message, issues}` (with `headline` as the
 * message when the error carries issues, e.g. "The scene was not saved."). Form: the message on the
 * error's own field, else the route's `field`, else `_` (the whole form). Page: the error page.
 */
export function toHttp(e: ServiceError, target: { as: 'json'; headline?: string }): Response;
export function toHttp(
	e: ServiceError,
	target: { as: 'form' } & FormTarget
): ActionFailure<FormProblem>;
export function toHttp(e: ServiceError, target: { as: 'page' }): never;
export function toHttp(e: ServiceError, target: Target): Response | ActionFailure<FormProblem> {
	if (target.as === 'json') {
		const issues = e.issues.length
			? e.issues
			: e.field
				? [{ path: e.field, message: e.message }]
				: [];
		const message = e.issues.length && target.headline ? target.headline : e.message;
		return problem(e.status, message, issues, e.detail);
	}
	if (target.as === 'form') {
		const field = e.field ?? target.field ?? '_';
		const status = target.status ?? target.statusFor?.[e.kind] ?? e.status;
		return formFail(status, target.values ?? {}, { [field]: e.issues[0]?.message ?? e.message });
	}
	const issues = e.issues.length ? { issues: e.issues } : {};
	error(e.status, { message: e.message, ...issues, ...e.detail } as App.Error);
}

/** Runs a JSON endpoint's service call; a ServiceError becomes the refusal response. */
export async function forJson<T>(fn: () => Promise<T>, headline?: string): Promise<T | Response> {
	try {
		return await fn();
	} catch (e) {
		if (e instanceof ServiceError) return toHttp(e, { as: 'json', headline });
		throw e;
	}
}

/**
 * Runs a form action's service call; a ServiceError becomes `fail(status, {values, errors})` with
 * the message on `field` (unless the error names its own) and the user's input in `values`.
 */
export async function forForm<T>(
	fn: () => Promise<T>,
	options: FormTarget = {}
): Promise<T | ActionFailure<FormProblem>> {
	try {
		return await fn();
	} catch (e) {
		if (e instanceof ServiceError) return toHttp(e, { as: 'form', ...options });
		throw e;
	}
}

/** Runs a load's (or an error-page action's) service call; a ServiceError ends it with error(). */
export async function forPage<T>(fn: () => Promise<T>): Promise<T> {
	try {
		return await fn();
	} catch (e) {
		if (e instanceof ServiceError) toHttp(e, { as: 'page' });
		throw e;
	}
}

/**
 * Wraps a JSON endpoint (`export const POST: RequestHandler = jsonRoute(async (event) => …)`):
 * a ServiceError from any service it calls answers as `problem(...)`.
 */
export function jsonRoute<E>(handler: (event: E) => Promise<Response>) {
	return async (event: E): Promise<Response> => {
		try {
			return await handler(event);
		} catch (e) {
			if (e instanceof ServiceError) return toHttp(e, { as: 'json' });
			throw e;
		}
	};
}

/**
 * Wraps a load, a page-like endpoint (PDF, CSV) or an action that shows the error page: a
 * ServiceError from any service it calls ends it with `error(status, message)`.
 */
export function pageRoute<E, T>(handler: (event: E) => Promise<T>) {
	return (event: E): Promise<T> => forPage(() => handler(event));
}
