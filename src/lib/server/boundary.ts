/**
 * Strings at the boundary, checked once for every route instead of route by route: a NUL byte or
 * another control character in a path parameter, a query parameter, a form field or a JSON string
 * is refused with 400 naming where it was, before any of it reaches PostgreSQL (which refuses a
 * NUL in text with an error, so it used to surface as a 500).
 */
import { error, type Handle } from '@sveltejs/kit';
import { CONTROL, CONTROL_IN_TEXT } from '$lib/schemas/common';

/**
 * Path and query parameters are ids, tokens, filters and search terms: no control character at
 * all. Runs in `handle`, after routing, so `event.params` is known.
 */
export const refuseControlCharsInAddress: Handle = ({ event, resolve }) => {
	for (const [name, value] of Object.entries(event.params)) {
		if (CONTROL.test(value)) error(400, `The address part "${name}" contains control characters.`);
	}
	for (const [name, value] of event.url.searchParams) {
		if (CONTROL.test(name) || CONTROL.test(value)) {
			error(400, `The query parameter "${printable(name)}" contains control characters.`);
		}
	}
	return resolve(event);
};

/** The first form field (by name) whose text holds a control character other than tab, LF or CR. */
export function controlCharField(
	entries: Iterable<[string, FormDataEntryValue | string]>
): string | null {
	for (const [name, value] of entries) {
		if (CONTROL_IN_TEXT.test(name)) return printable(name);
		if (
			typeof value === 'string' ? CONTROL_IN_TEXT.test(value) : CONTROL_IN_TEXT.test(value.name)
		) {
			return name;
		}
	}
	return null;
}

/**
 * The path (`placements.3.partId`) of the first string or key in a parsed JSON value that holds a
 * control character other than tab, LF or CR; null when there is none. Iterative, so a deeply
 * nested body cannot exhaust the stack.
 */
export function controlCharPath(value: unknown): string | null {
	const stack: { v: unknown; path: string }[] = [{ v: value, path: '' }];
	while (stack.length) {
		const { v, path } = stack.pop()!;
		if (typeof v === 'string') {
			if (CONTROL_IN_TEXT.test(v)) return path || '(body)';
		} else if (Array.isArray(v)) {
			for (let i = v.length - 1; i >= 0; i--) stack.push({ v: v[i], path: join(path, String(i)) });
		} else if (v && typeof v === 'object') {
			for (const [k, child] of Object.entries(v)) {
				if (CONTROL_IN_TEXT.test(k)) return join(path, printable(k));
				stack.push({ v: child, path: join(path, k) });
			}
		}
	}
	return null;
}

const join = (path: string, key: string) => (path ? `${path}.${key}` : key);

/** A name fit to quote back in a message: control characters shown as \uXXXX, at most 60 characters. */
function printable(s: string): string {
	const hex = (c: string) => `\\u${c.charCodeAt(0).toString(16).padStart(4, '0')}`;
	// eslint-disable-next-line no-control-regex
	return s.slice(0, 60).replace(/[\u0000-\u001f\u007f]/g, hex);
}
