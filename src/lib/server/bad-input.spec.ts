/**
 * Bad input to every form: wrong types, empty, overlong, control characters, values outside the
 * allowed set. Each answers 400 with a message for the field at fault and writes nothing.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { db } from './db';
import { passwordResets } from './db/schema';
import { hashToken, newToken } from './tokens';
import {
	accountRowCounts,
	ownerInvite,
	createUser,
	studioWithMembers,
	uniqueEmail
} from './testing/factories';
import { useApp } from './testing/suite';

const app = useApp();

type Kind = 'email' | 'password' | 'currentPassword' | 'name' | 'role' | 'id';
type Form = {
	name: string;
	path: () => string;
	/** Who posts it: a session id, or none for the public forms. */
	session: () => string | undefined;
	fields: Record<string, Kind>;
	valid: () => Record<string, string>;
	/** What the valid post answers, to prove the baseline itself is accepted. */
	accepted: { status: number; location?: string };
};

let f: Awaited<ReturnType<typeof studioWithMembers>>;
let signInUser: Awaited<ReturnType<typeof createUser>>;
let resetToken: string;
let inviteId: string;

beforeAll(async () => {
	f = await studioWithMembers();
	signInUser = await createUser();
	resetToken = newToken();
	await db.insert(passwordResets).values({
		tokenHash: hashToken(resetToken),
		userId: signInUser.id,
		expiresAt: new Date(Date.now() + 3600_000)
	});
	inviteId = (await ownerInvite(f, 'client')).id;
});

/**
 * A form: where it posts, who posts it (nobody: a public form), its fields' kinds, a valid post,
 * and what that answers: the page itself (200) or a redirect to the address given.
 */
function form(
	name: string,
	path: () => string,
	by: 'owner' | 'designer' | null,
	fields: Record<string, Kind>,
	valid: () => Record<string, string>,
	accepted: 200 | string
): Form {
	return {
		name,
		path,
		session: () => (by ? f[by].session : undefined),
		fields,
		valid,
		accepted: accepted === 200 ? { status: 200 } : { status: 303, location: accepted }
	};
}
/** A form action of the members page, posted by the owner; it answers with the page. */
const membersForm = (
	name: string,
	action: string,
	fields: Record<string, Kind>,
	valid: () => Record<string, string>
) => form(name, () => `/studio/members?/${action}`, 'owner', fields, valid, 200);

const forms: Form[] = [
	form(
		'sign up',
		() => '/signup',
		null,
		{ name: 'name', email: 'email', password: 'password' },
		() => ({ name: 'Ines Fitter', email: uniqueEmail('valid'), password: 'long-enough-1' }),
		'/check-mail'
	),
	form(
		'sign in',
		() => '/signin',
		null,
		{ email: 'email', password: 'currentPassword' },
		() => ({ email: signInUser.email, password: signInUser.password }),
		'/builds'
	),
	form(
		'reset request',
		() => '/reset',
		null,
		{ email: 'email' },
		() => ({ email: uniqueEmail('nobody') }),
		200
	),
	form(
		'new password',
		() => `/reset/${resetToken}`,
		null,
		{ password: 'password' },
		() => ({ password: 'fresh-password-2' }),
		'/signin?reset=1'
	),
	form(
		'new studio',
		() => '/studios/new',
		'designer',
		{ name: 'name' },
		() => ({ name: 'Quay Street Bench' }),
		'/builds'
	),
	membersForm('invite', 'invite', { email: 'email', role: 'role' }, () => ({
		email: uniqueEmail('invitee'),
		role: 'designer'
	})),
	membersForm('change role', 'role', { userId: 'id', role: 'role' }, () => ({
		userId: f.client.id,
		role: 'designer'
	})),
	membersForm('remove member', 'remove', { userId: 'id' }, () => ({ userId: f.client.id })),
	membersForm('withdraw invitation', 'revoke', { inviteId: 'id' }, () => ({ inviteId })),
	form(
		'switch studio',
		() => '/studios?/switch',
		'designer',
		{ studioId: 'id' },
		() => ({ studioId: f.studio.id }),
		'/builds'
	)
];

/** One bad value per kind of field, and the words the message must contain. */
const badValues: Record<Kind, [label: string, value: string, message: RegExp][]> = {
	email: [
		['empty', '', /required/],
		['only spaces', '   ', /required/],
		// RFC 5321 §4.5.3.1: a path is at most 256 octets; the app allows 320 (64 local + @ + 255 domain).
		['321 characters', `${'a'.repeat(309)}@example.com`, /at most 320/],
		['a NUL byte', 'nul\u0000@example.com', /control characters/],
		['an escape sequence', 'esc\u001b[31m@example.com', /control characters/],
		['no @', 'not-an-address', /look like/]
	],
	password: [
		['empty', '', /at least 10|required/],
		['9 characters', 'abcde1234', /at least 10/],
		['201 characters', 'a1'.repeat(100) + 'b', /at most 200/],
		['only letters', 'onlyletterspassword', /only letters or only digits/],
		['only digits', '12345678901', /only letters or only digits/]
	],
	/** Sign-in takes any stored password; only its presence and length are checked. */
	currentPassword: [
		['empty', '', /required/],
		['201 characters', 'p'.repeat(201), /at most 200/]
	],
	name: [
		['empty', '', /required/],
		['only spaces', '    ', /required/],
		['81 characters', 'n'.repeat(81), /at most 80/],
		['a NUL byte', 'Bench\u0000Works', /control characters/],
		['a line break', 'Bench\nWorks', /control characters/],
		['DEL', 'Bench\u007fWorks', /control characters/]
	],
	role: [
		['empty', '', /owner, designer or client/],
		['not a role', 'admin', /owner, designer or client/],
		['a role in capitals', 'OWNER', /owner, designer or client/]
	],
	id: [
		['empty', '', /required/],
		['65 characters', 'i'.repeat(65), /at most 64/],
		['a NUL byte', 'abc\u0000def', /control characters/]
	]
};

const cases = forms.flatMap((form) =>
	Object.entries(form.fields).flatMap(([field, kind]) =>
		badValues[kind].map(([label, value, message]) => ({ form, field, label, value, message }))
	)
);

function client(form: Form) {
	const session = form.session();
	return app.client(session ? { session } : {});
}

describe('each field refuses bad values', () => {
	it.each(cases.map((c) => [`${c.form.name}: ${c.field} with ${c.label}`, c] as const))(
		'%s',
		async (_name, c) => {
			const before = await accountRowCounts();
			const r = await client(c.form).action(c.form.path(), {
				...c.form.valid(),
				[c.field]: c.value
			});
			expect(r.type).toBe('failure');
			expect(r.status).toBe(400);
			expect(r.data.errors[c.field]).toMatch(c.message);
			// Only the field at fault is blamed.
			expect(Object.keys(r.data.errors)).toEqual([c.field]);
			expect(r.data.values?.password).toBeUndefined();
			expect(await accountRowCounts()).toEqual(before);
		}
	);
});

describe('whole forms', () => {
	it.each(forms.map((form) => [form.name, form] as const))(
		'%s: missing fields get a message each, on the page too',
		async (_name, form) => {
			const before = await accountRowCounts();
			const c = client(form);
			const r = await c.action(form.path(), {});
			expect(r).toMatchObject({ type: 'failure', status: 400 });
			for (const field of Object.keys(form.fields)) {
				expect(r.data.errors[field], field).toBeTruthy();
			}

			const page = await c.postForm(form.path(), {});
			expect(page.status).toBe(400);
			expect(page.header('content-type')).toContain('text/html');
			expect(await accountRowCounts()).toEqual(before);
		}
	);

	it.each(forms.map((form) => [form.name, form] as const))(
		'%s: a file where text belongs counts as missing',
		async (_name, form) => {
			const before = await accountRowCounts();
			const body = new FormData();
			const valid = form.valid();
			for (const [k, v] of Object.entries(valid)) {
				body.append(k, k in form.fields ? new Blob([v], { type: 'text/plain' }) : v);
			}
			const r = await client(form).action(form.path(), body);
			expect(r).toMatchObject({ type: 'failure', status: 400 });
			for (const field of Object.keys(form.fields)) {
				expect(r.data.errors[field], field).toBeTruthy();
			}
			expect(await accountRowCounts()).toEqual(before);
		}
	);

	it('a JSON body to a form is refused without writing', async () => {
		const before = await accountRowCounts();
		const c = app.client();
		const res = await c.request('POST', '/signup', {
			body: JSON.stringify({
				name: 'Json Person',
				email: uniqueEmail('json'),
				password: 'long-enough-1'
			}),
			headers: {
				'content-type': 'application/json',
				accept: 'application/json',
				origin: app.baseURL
			}
		});
		expect(res.status).toBeGreaterThanOrEqual(400);
		expect(res.status).toBeLessThan(500);
		expect(await accountRowCounts()).toEqual(before);
	});

	it('shows the input again, without the password, beside the messages', async () => {
		const email = uniqueEmail('again');
		const page = await app
			.client()
			.postForm('/signup', { name: 'N'.repeat(81), email, password: 'short' });
		expect(page.status).toBe(400);
		expect(page.text).toContain(`value="${email}"`);
		expect(page.text).toContain('Name can be at most 80 characters.');
		expect(page.text).toContain('Password needs at least 10 characters.');
		expect(page.text).toContain('aria-invalid="true"');
		expect(page.text).not.toContain('value="short"');
	});
});

// Last: these write. They prove every baseline above is itself accepted, so each refusal came from
// the one bad field.
describe('the valid baselines are accepted', () => {
	it.each(forms.map((form) => [form.name, form] as const))('%s', async (_name, form) => {
		const res = await client(form).postForm(form.path(), form.valid());
		expect(res.status).toBe(form.accepted.status);
		if (form.accepted.location) expect(res.location).toBe(form.accepted.location);
	});
});
