import { z } from 'zod';

/** Any C0 control character or DEL: never in an id, a token, a search term or a one-line field. */
// eslint-disable-next-line no-control-regex
export const CONTROL = /[\u0000-\u001f\u007f]/;
/** Control characters no text field may hold, multi-line ones included (tab, LF and CR are allowed). */
// Also a lone UTF-16 surrogate: PostgreSQL refuses to store one, so it is bad input, not a 500.
export const CONTROL_IN_TEXT =
	// eslint-disable-next-line no-control-regex
	/[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]|[\ud800-\udbff](?![\udc00-\udfff])|(?<![\ud800-\udbff])[\udc00-\udfff]/;

/** The largest value a PostgreSQL `integer` column holds (2³¹ − 1). */
export const INT4_MAX = 2_147_483_647;

/**
 * An id or token from a form, a path or a JSON body: 1 to `max` characters, no control characters
 * (a NUL byte would otherwise reach PostgreSQL, which refuses it with an error, not a miss).
 */
export const idField = (label: string, max = 64) =>
	z
		.string({ error: `${label} is required.` })
		.min(1, `${label} is required.`)
		.max(max, `${label} can be at most ${max} characters.`)
		.refine((s) => !CONTROL.test(s), `${label} contains control characters.`);

/** A search term: trimmed, bounded, no control characters; empty means "no filter". */
export const searchTerm = (label: string, max = 200) =>
	z
		.string({ error: `${label} must be text.` })
		.trim()
		.max(max, `${label} can be at most ${max} characters.`)
		.refine((s) => !CONTROL.test(s), `${label} contains control characters.`);

/** A whole number that fits the PostgreSQL `integer` column it is stored in or compared with. */
export const int4 = (label: string, min = 0, max = INT4_MAX) =>
	z
		.number({ error: `${label} must be a number.` })
		.int(`${label} must be a whole number.`)
		.min(min, `${label} must be at least ${min}.`)
		.max(max, `${label} can be at most ${max}.`);

/** A single-line text field: trimmed, no control characters, bounded. */
export const line = (label: string, max = 120, min = 1) =>
	z
		.string({ error: `${label} is required.` })
		.trim()
		.min(min, min === 1 ? `${label} is required.` : `${label} needs at least ${min} characters.`)
		.max(max, `${label} can be at most ${max} characters.`)
		.refine((s) => !CONTROL.test(s), `${label} contains control characters.`);

/** Multi-line text (notes, comments): newlines and tabs allowed, other control characters not. */
export const paragraph = (label: string, max = 4000) =>
	z
		.string({ error: `${label} is required.` })
		.trim()
		.max(max, `${label} can be at most ${max} characters.`)
		.refine((s) => !CONTROL_IN_TEXT.test(s), `${label} contains control characters.`);

export const email = z
	.string({ error: 'E-mail is required.' })
	.trim()
	.toLowerCase()
	.min(1, 'E-mail is required.')
	.max(320, 'E-mail can be at most 320 characters.')
	.refine((s) => !CONTROL.test(s), 'E-mail contains control characters.')
	.pipe(z.email({ error: 'E-mail must look like name@example.com.' }));

export const passwordRules = [
	'at least 10 characters',
	'at most 200 characters',
	'not only letters or only digits'
];

export const password = z
	.string({ error: 'Password is required.' })
	.min(10, 'Password needs at least 10 characters.')
	.max(200, 'Password can be at most 200 characters.')
	.refine(
		(s) => !/^[\p{L}]+$/u.test(s) && !/^\d+$/.test(s),
		'Password must not be only letters or only digits.'
	);

export const roleSchema = z.enum(['owner', 'designer', 'client'], {
	error: 'Role must be owner, designer or client.'
});
