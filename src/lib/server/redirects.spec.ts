import { describe, expect, it } from 'vitest';
import { safeNext } from './redirects';

const ORIGIN = 'http://127.0.0.1:3000';

describe('safeNext', () => {
	it('keeps paths on this origin, normalised', () => {
		expect(safeNext('/builds', ORIGIN)).toBe('/builds');
		expect(safeNext('/builds/abc?variant=x#top', ORIGIN)).toBe('/builds/abc?variant=x#top');
		expect(safeNext('/parts?q=a%2Fb', ORIGIN)).toBe('/parts?q=a%2Fb');
		expect(safeNext('/a/../builds', ORIGIN)).toBe('/builds');
	});

	// The first two are what a probe sent: `next=/%09/evil.example` arrived decoded as `/\t/evil.example`
	// and went out as `Location: /\t/evil.example`, which browsers follow to evil.example.
	const refused = [
		'/\t/evil.example',
		'/\n/evil.example',
		'/\r\n/evil.example',
		'/%09/evil.example',
		'/%0A/evil.example',
		'/%0D%0ASet-Cookie:x=1',
		'/\u0000/x',
		'//evil.example',
		'//evil.example/builds',
		'/%2F/evil.example',
		'/\\evil.example',
		'/%5Cevil.example',
		'\\\\evil.example',
		'https://evil.example',
		'http://127.0.0.1:3000.evil.example/',
		'javascript:alert(1)',
		'evil.example',
		'/%zz',
		'',
		'/' + 'a'.repeat(2001)
	];
	it.each(refused.map((t) => [JSON.stringify(t), t]))('refuses %s', (_label, target) => {
		expect(safeNext(target, ORIGIN)).toBeNull();
	});

	it('refuses null and undefined', () => {
		expect(safeNext(null, ORIGIN)).toBeNull();
		expect(safeNext(undefined, ORIGIN)).toBeNull();
	});

	it('whatever it keeps resolves to this origin (the browser-side view, with URL as oracle)', () => {
		for (const t of ['/builds', '/x?y=//evil.example', '/x#//evil.example', '/%2e%2e/builds']) {
			const kept = safeNext(t, ORIGIN);
			expect(kept).not.toBeNull();
			expect(new URL(kept!, ORIGIN).origin).toBe(ORIGIN);
		}
	});
});
