/**
 * Where a redirect may send someone after sign-in, sign-up or a payment: a path on this app's own
 * origin, nothing else. The one helper every redirect target taken from a request goes through.
 *
 * Browsers are lenient with a `Location`: they drop tabs and newlines inside it and read `\` as
 * `/`, so `/\t/evil.example` or `/\evil.example` lands on another site even though it starts with
 * one slash. So a target is refused outright when it (or its percent-decoded form) holds a control
 * character or a backslash, and otherwise resolved with `URL` against the origin and kept only when
 * the origin did not change. What is returned is the normalised path, query and fragment.
 */

// eslint-disable-next-line no-control-regex
const UNSAFE = /[\u0000-\u001f\u007f-\u009f\\]/;
/** Longer targets are not links anyone follows; refusing them keeps the check cheap. */
const MAX_TARGET_CHARS = 2000;

export function safeNext(next: string | null | undefined, origin: string): string | null {
	if (!next || next.length > MAX_TARGET_CHARS || !next.startsWith('/')) return null;
	let decoded: string;
	try {
		decoded = decodeURIComponent(next);
	} catch {
		return null; // a stray `%` that is not an escape
	}
	if (UNSAFE.test(next) || UNSAFE.test(decoded)) return null;
	// `//host` is a network-path reference: another origin with this page's scheme.
	if (next.startsWith('//') || decoded.startsWith('//')) return null;
	let base: URL;
	let target: URL;
	try {
		base = new URL(origin);
		target = new URL(next, base);
	} catch {
		return null;
	}
	if (target.origin !== base.origin) return null;
	return target.pathname + target.search + target.hash;
}
