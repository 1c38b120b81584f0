/**
 * The glossary's retired words (docs/words.md, between the retired markers) appear nowhere in the
 * screens' source: every .svelte file under src/ and the word modules the screens share.
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..', '..');

function retired(): string[] {
	const md = readFileSync(join(root, 'docs', 'words.md'), 'utf8');
	const block = /<!-- retired:start -->([\s\S]*?)<!-- retired:end -->/.exec(md)?.[1] ?? '';
	return block
		.split('\n')
		.map((l) => /^- (.+)$/.exec(l.trim())?.[1]?.trim())
		.filter((w): w is string => !!w);
}

function files(dir: string, out: string[] = []): string[] {
	for (const e of readdirSync(dir, { withFileTypes: true })) {
		const p = join(dir, e.name);
		if (e.isDirectory()) files(p, out);
		else if (e.name.endsWith('.svelte') || /words?\.ts$|sheet\.ts$|mail\.ts$/.test(e.name)) {
			out.push(p);
		}
	}
	return out;
}

describe('retired words', () => {
	const words = retired();
	it('the glossary lists some', () => {
		expect(words.length).toBeGreaterThan(5);
		expect(words).toContain('Fork');
	});

	it('none appears in the screens, as a whole word, case as listed', () => {
		const found: string[] = [];
		for (const f of files(join(root, 'src'))) {
			const text = readFileSync(f, 'utf8');
			for (const w of words) {
				const re = new RegExp(
					`(^|[^A-Za-z])${w.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}([^A-Za-z]|$)`
				);
				if (re.test(text)) found.push(`${f.slice(root.length + 1)}: "${w}"`);
			}
		}
		expect(found).toEqual([]);
	});
});
