/** The engine stays pure: nothing outside src/lib/geometry but zod, so it runs in browser, server and worker alike. */
import { readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { describe, expect, it } from 'vitest';

const here = dirname(fileURLToPath(import.meta.url));

function sourceFiles(dir: string): string[] {
	return readdirSync(dir, { withFileTypes: true }).flatMap((entry) => {
		const path = join(dir, entry.name);
		if (entry.isDirectory()) return sourceFiles(path);
		const isSource = entry.name.endsWith('.ts') && !entry.name.endsWith('.d.ts');
		return isSource && !entry.name.includes('.spec') ? [path] : [];
	});
}

/** Every module specifier in import/export-from statements and dynamic import() calls. */
export function importsOf(source: string): string[] {
	const out: string[] = [];
	const patterns = [
		/\b(?:import|export)\s[^'"]*?\bfrom\s*['"]([^'"]+)['"]/g,
		/\bimport\s*['"]([^'"]+)['"]/g,
		/\bimport\s*\(\s*['"]([^'"]+)['"]\s*\)/g,
		/\brequire\s*\(\s*['"]([^'"]+)['"]\s*\)/g
	];
	for (const pattern of patterns) {
		for (const m of source.matchAll(pattern)) out.push(m[1]);
	}
	return out;
}

function allowed(specifier: string, file: string): boolean {
	if (specifier === 'zod') return true;
	if (!specifier.startsWith('.')) return false;
	const target = join(dirname(file), specifier);
	return target === here || target.startsWith(here + '/');
}

describe('module boundary', () => {
	const files = sourceFiles(here);

	it('finds the engine sources', () => {
		expect(files.map((f) => f.slice(here.length + 1))).toEqual(
			expect.arrayContaining([
				'schema.ts',
				'check.ts',
				'sweep.ts',
				'broadphase.ts',
				'standard-library.ts',
				'index.ts'
			])
		);
	});

	it.each(sourceFiles(here).map((f) => [f.slice(here.length + 1), f]))(
		'%s imports only zod and the module itself',
		(_name, file) => {
			const bad = importsOf(readFileSync(file, 'utf8')).filter((s) => !allowed(s, file));
			expect(bad).toEqual([]);
		}
	);

	it.each([
		["import { T } from 'three';", ['three']],
		["import type { Page } from '$app/state';", ['$app/state']],
		["export * from '../server/db';", ['../server/db']],
		["const m = await import('node:fs');", ['node:fs']],
		["import 'svelte';", ['svelte']]
	])('the scanner sees %s', (line, expected) => {
		expect(importsOf(line)).toEqual(expected);
		expect(importsOf(line).every((s) => !allowed(s, join(here, 'x.ts')))).toBe(true);
	});
});
