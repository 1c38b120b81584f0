/** readForm: superforms with the area's zod schema, answering in the pages' `{values, errors}`. */
import { describe, expect, it } from 'vitest';
import { saveVersionForm, deleteBuildForm } from '$lib/schemas/builds';
import { signInSchema } from '$lib/schemas/account';
import { shareForm } from '$lib/schemas/sharing';
import { quoteFields, quoteForm } from '$lib/schemas/quotes';
import { MAX_CSV_BYTES, csvUploadForm } from '$lib/catalog/schemas';
import { readForm } from './forms';

function post(fields: Record<string, string>) {
	const body = new FormData();
	for (const [k, v] of Object.entries(fields)) body.append(k, v);
	return new Request('http://localhost/x', { method: 'POST', body });
}

describe('readForm', () => {
	it('gives the schema’s output (trimmed, lower-cased, defaults) and echoes the input', async () => {
		const r = await readForm(
			post({ email: ' Ana@Example.COM ', password: 'x', next: '/a' }),
			signInSchema
		);
		expect(r.ok && r.data).toEqual({ email: 'ana@example.com', password: 'x' });
		// Fields outside the schema stay readable (the sign-in's `next`); passwords are never echoed.
		expect(r.ok && r.values).toEqual({ email: ' Ana@Example.COM ', next: '/a' });
		const share = await readForm(post({ variantId: 'v1' }), shareForm);
		expect(share.ok && share.data).toMatchObject({ expires: '30', send: '', recipientEmail: '' });
	});

	it('refuses with 400, one message per field named by the schema, nothing made up', async () => {
		const r = await readForm(post({ password: 'secret-typed' }), signInSchema);
		expect(r.ok).toBe(false);
		if (r.ok) return;
		expect(r.failure.status).toBe(400);
		expect(r.failure.data).toEqual({ values: {}, errors: { email: 'E-mail is required.' } });
		// A literal is not filled in for a box left unticked.
		const box = await readForm(post({}), deleteBuildForm);
		expect(!box.ok && box.failure.data.errors).toEqual({ confirm: 'Tick the box to confirm.' });
	});

	it('lets the schema coerce numbers: "1.5" and "12abc" are not a revision', async () => {
		for (const revision of ['1.5', '12abc', 'abc']) {
			const r = await readForm(post({ variantId: 'v', revision }), saveVersionForm);
			expect(r.ok, revision).toBe(false);
			expect(!r.ok && Object.keys(r.failure.data.errors)).toEqual(['revision']);
		}
		const ok = await readForm(post({ variantId: 'v', revision: '12' }), saveVersionForm);
		expect(ok.ok && ok.data).toEqual({ variantId: 'v', revision: 12, note: '' });
	});

	it('refuses a control character in any field before the schema, naming the field', async () => {
		const r = await readForm(
			post({ email: 'a@b.co', password: 'x', next: '/a\u0000' }),
			signInSchema
		);
		expect(!r.ok && r.failure.data).toEqual({
			values: { email: 'a@b.co' },
			errors: { next: 'next contains control characters.' }
		});
	});

	it('reads the quote form into minor units and basis points (worked example)', async () => {
		// 2 × 12.50 EUR = 25.00 → 1250 minor units each; 20 % → 2000 bp; a 30 % deposit → 3000 bp.
		const fields = {
			currency: 'eur',
			tax: '20',
			depositKind: 'percent',
			depositValue: '30',
			'line-a-description': 'Pump and reservoir',
			'line-a-quantity': '2',
			'line-a-price': '12.50',
			'line-x-description': 'not a line of this quote'
		};
		const r = await readForm(post(fields), quoteForm(['a', 'b']));
		expect(r.ok).toBe(true);
		if (!r.ok) return;
		expect(quoteFields(r.data, ['a', 'b']).fields).toEqual({
			currency: 'EUR',
			labourMinor: 0,
			labourNote: '',
			taxRateBp: 2000,
			depositKind: 'percent',
			depositValue: 3000,
			notes: '',
			lines: [
				{
					id: 'a',
					remove: false,
					description: 'Pump and reservoir',
					quantity: 2,
					unitPriceMinor: 1250
				}
			],
			added: []
		});
		const bad = await readForm(
			post({
				currency: 'XX',
				tax: '101',
				'new-price': '1.234',
				'line-a-description': 'x',
				'line-a-quantity': '0'
			}),
			quoteForm(['a'])
		);
		expect(!bad.ok && bad.failure.data.errors).toEqual({
			currency: 'Use an ISO 4217 currency code such as EUR, GBP or USD.',
			'line-a-quantity': 'A whole number from 1 to 10,000.',
			'new-description': 'Description is required.',
			'new-price': 'The price must be an amount like 120.50.',
			tax: 'A percentage from 0 to 100, at most two decimals.'
		});
	});

	it('takes an uploaded file as a File: the CSV import’s schema checks it is there, not empty, not too big', async () => {
		const upload = (bytes: number) => {
			const body = new FormData();
			body.append(
				'file',
				new Blob([new Uint8Array(bytes).fill(65)], { type: 'text/csv' }),
				'p.csv'
			);
			return new Request('http://localhost/x', { method: 'POST', body });
		};
		const ok = await readForm(upload(3), csvUploadForm);
		expect(ok.ok && ok.data.file instanceof File && ok.data.file.size).toBe(3);
		expect(ok.ok && (await ok.data.file.text())).toBe('AAA');
		const none = await readForm(post({}), csvUploadForm);
		expect(!none.ok && none.failure.data.errors).toEqual({ file: 'Choose a CSV file to import.' });
		const empty = await readForm(upload(0), csvUploadForm);
		expect(!empty.ok && empty.failure.data.errors).toEqual({
			file: 'Choose a CSV file to import.'
		});
		// 2 MiB + 1 byte: one byte over the limit (2 × 1024 × 1024 = 2,097,152 bytes).
		const big = await readForm(upload(MAX_CSV_BYTES + 1), csvUploadForm);
		expect(!big.ok && big.failure.status).toBe(400);
		expect(!big.ok && big.failure.data.errors.file).toBe(
			'The file is 2.0 MB; at most 2 MB can be imported at once.'
		);
	});
});
