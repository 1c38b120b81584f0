/**
 * The glossary's retired words (docs/words.md, between the retired markers) appear nowhere people
 * read: the screens (every .svelte file under src/), the word modules they share, the e-mails, the
 * CSV exports' header rows and the build sheet's PDF.
 *
 * Only what a file can show is read, through the languages' own parsers (svelte/compiler for
 * components, the TypeScript compiler for modules): the markup's text, the attribute values people
 * see, and string literals. Comments and identifiers are code, and so is a literal that is one
 * lower-case token ('revision', 'cpu-block', 'heatW': a key or an id, never a sentence).
 */
import { readFileSync, readdirSync } from 'node:fs';
import { join, relative } from 'node:path';
import { parse } from 'svelte/compiler';
import ts from 'typescript';
import { describe, expect, it } from 'vitest';

const root = join(import.meta.dirname, '..', '..', '..');

function retired(): string[] {
	const md = readFileSync(join(root, 'docs', 'words.md'), 'utf8');
	const block = /<!-- retired:start -->([\s\S]*?)<!-- retired:end -->/.exec(md)?.[1] ?? '';
	return block
		.split('\n')
		.map((l) => /^- (.+)$/.exec(l.trim())?.[1]?.trim())
		.map((w) => (w && /^`.*`$/.test(w) ? w.slice(1, -1) : w))
		.filter((w): w is string => !!w);
}

function walk(dir: string, out: string[] = []): string[] {
	for (const e of readdirSync(dir, { withFileTypes: true })) {
		const p = join(dir, e.name);
		if (e.isDirectory()) walk(p, out);
		else out.push(p);
	}
	return out;
}

/** A key, an id, a class or a path: one lower-case token, not words. */
const isCode = (s: string) => /^[a-z$./#][\w$./#:-]*$/.test(s) || !/[A-Za-z]/.test(s);

/** Attributes that hold code (names, ids, links, styles), never words people read. */
const CODE_ATTRS =
	/^(name|id|class|href|src|type|for|method|action|value|role|rel|target|autocomplete|inputmode|enctype|style|pattern|accept|lang|key|this|data-.*|aria-(controls|labelledby|describedby|current|hidden)|on.*|bind:.*|use:.*|transition:.*|in:.*|out:.*|animate:.*|style:.*|class:.*)$/;

/** Text a component can show: markup text, people-facing attribute values, script string literals. */
function svelteText(source: string): string[] {
	const ast = parse(source, { modern: true }) as unknown as Record<string, unknown>;
	const out: string[] = [];
	const visit = (node: unknown, inCodeAttr: boolean) => {
		if (!node || typeof node !== 'object') return;
		if (Array.isArray(node)) {
			for (const n of node) visit(n, inCodeAttr);
			return;
		}
		const n = node as Record<string, unknown>;
		if (n.type === 'Comment' || n.type === 'StyleSheet') return;
		// <code> shows a key as a key (a CSV column, a field name), on purpose.
		if (n.type === 'RegularElement' && n.name === 'code') return;
		if (n.type === 'Attribute' && typeof n.name === 'string') {
			visit(n.value, CODE_ATTRS.test(n.name));
			return;
		}
		if (n.type === 'Text' && typeof n.data === 'string' && !inCodeAttr) out.push(n.data);
		if (n.type === 'Literal' && typeof n.value === 'string' && !isCode(n.value)) out.push(n.value);
		if (n.type === 'TemplateElement') {
			const v = (n.value as { cooked?: string; raw: string }) ?? { raw: '' };
			if (!isCode(v.cooked ?? v.raw)) out.push(v.cooked ?? v.raw);
		}
		for (const [k, v] of Object.entries(n)) {
			if (k !== 'parent' && k !== 'loc' && k !== 'metadata') visit(v, inCodeAttr);
		}
	};
	visit(ast, false);
	return out;
}

/** String literals of a TypeScript module (template pieces included), comments left out. */
function moduleText(path: string, source: string): string[] {
	const file = ts.createSourceFile(path, source, ts.ScriptTarget.Latest, false);
	const out: string[] = [];
	const visit = (node: ts.Node) => {
		if (
			ts.isStringLiteral(node) ||
			ts.isNoSubstitutionTemplateLiteral(node) ||
			ts.isTemplateHead(node) ||
			ts.isTemplateMiddle(node) ||
			ts.isTemplateTail(node)
		) {
			// Import paths and type-only literals are code.
			const parent = node.parent;
			const isImport = parent && (ts.isImportDeclaration(parent) || ts.isExportDeclaration(parent));
			if (!isImport && !isCode(node.text)) out.push(node.text);
		}
		node.forEachChild(visit);
	};
	visit(file);
	return out;
}

const src = join(root, 'src');
const all = walk(src).filter((f) => !/\.(spec|test)\.ts$/.test(f) && !f.includes('/testing/'));
const read = (f: string) => readFileSync(f, 'utf8');

/** Modules whose strings reach people: words, reports, sheets, e-mails, CSV exports, the PDF. */
const modules = all.filter((f) => {
	if (!f.endsWith('.ts') || f.endsWith('.d.ts')) return false;
	const rel = relative(src, f);
	if (/^lib\/(words|builds|sharing|callouts|quotes|catalog)\//.test(rel)) return true;
	if (/^lib\/server\/sheet[^/]*\.ts$/.test(rel)) return true;
	const text = read(f);
	// The mail templates (anything that writes a subject) and every CSV export with its header row.
	return /\bsubject\s*:|text\/csv|toCsv\(/.test(text);
});

function found(files: string[], text: (f: string) => string[], words: string[]): string[] {
	const hits: string[] = [];
	for (const f of files) {
		const shown = text(f).join('\n');
		for (const w of words) {
			const re = new RegExp(
				`(^|[^A-Za-z])${w.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')}([^A-Za-z]|$)`
			);
			if (re.test(shown)) hits.push(`${relative(root, f)}: "${w}"`);
		}
	}
	return hits;
}

describe('retired words', () => {
	const words = retired();
	it('the glossary lists some', () => {
		expect(words.length).toBeGreaterThan(5);
		expect(words).toContain('Fork');
	});

	it('the readers find what people see and skip what they do not', () => {
		const shown = svelteText(
			`<script lang="ts">const a = 'Fork this'; const k = 'fork'; // Fork in a comment
			</script><p class="Fork" title="Fork title">Fork {a}</p><!-- Fork -->`
		);
		expect(shown.sort()).toEqual(['Fork ', 'Fork this', 'Fork title']);
		expect(
			moduleText('x.ts', `// Fork\nconst s = \`Fork \${x} done\`; const k = 'heatW';`)
		).toEqual(['Fork ', ' done']);
	});

	it('covers the e-mails, the CSV exports and the PDF', () => {
		const rel = modules.map((f) => relative(src, f));
		for (const must of [
			'lib/server/mail.ts',
			'lib/server/sharing/notify.ts',
			'lib/server/catalog/export.ts',
			'lib/builds/compare.ts',
			'lib/server/sheet-pdf.ts',
			'lib/server/sheet-pdf-drawing.ts'
		]) {
			expect(rel).toContain(must);
		}
	});

	it('none appears in the screens, as a whole word, case as listed', () => {
		const screens = all.filter((f) => f.endsWith('.svelte'));
		expect(screens.length).toBeGreaterThan(50);
		expect(found(screens, (f) => svelteText(read(f)), words)).toEqual([]);
	});

	it('none appears in the e-mails, CSV headers, the PDF and the word modules', () => {
		expect(found(modules, (f) => moduleText(f, read(f)), words)).toEqual([]);
	});
});
