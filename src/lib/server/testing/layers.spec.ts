/**
 * The layer rules in eslint.config.js fire: each snippet is linted as if it stood in a file of
 * that layer (ESLint's Node API, the project's own config), and the same import is allowed where
 * the layers permit it. And the components folder holds components only.
 */
import { readdirSync } from 'node:fs';
import { ESLint } from 'eslint';
import { describe, expect, it } from 'vitest';

// Only the import rule, and without type information (which the rule does not use) to stay quick.
const eslint = new ESLint({
	cwd: new URL('../../../..', import.meta.url).pathname,
	ruleFilter: ({ ruleId }) => ruleId === 'no-restricted-imports',
	overrideConfig: { languageOptions: { parserOptions: { projectService: false, project: null } } }
});

async function restricted(code: string, filePath: string): Promise<string[]> {
	const [result] = await eslint.lintText(code, { filePath });
	return result.messages.filter((m) => m.ruleId === 'no-restricted-imports').map((m) => m.message);
}

// Files of each layer (the config matches on the path); only the text is ours.
const SERVICE = 'src/lib/server/access.ts';
const PLAIN_SERVICE = 'src/lib/server/builds.ts';
const MAPPING = 'src/lib/server/errors.ts';
const ROUTE = 'src/routes/builds/+page.server.ts';
const COMPONENT = 'src/lib/components/sheet/StatusMark.svelte';
const AREA = 'src/lib/quotes/money.ts';
const SPEC = 'src/lib/quotes/money.spec.ts';

/** The import statement of `names` from `module`, as a line of a file. */
const from = (names: string, module: string) => `import ${names} from '${module}';\n`;
const KIT = '@sveltejs/kit';
const TEST_SUPPORT = '$lib/server/testing/x';
const SVELTE_IMPORTING_A_SERVICE = `<script lang="ts">\n\t${from('type { X }', '$lib/server/sheet')}</script>\n`;

describe('layer rules', () => {
	it.each([
		['refuses', 'a service importing a component module', SERVICE, from('X', '$lib/components/x')],
		['refuses', 'a service importing one by path', SERVICE, from('X', '../components/x')],
		['refuses', 'a route importing the database', ROUTE, from('{ db }', '$lib/server/db')],
		['refuses', 'a route importing the schema', ROUTE, from('{ x }', '$lib/server/db/schema')],
		['refuses', 'a route importing drizzle', ROUTE, from('{ eq }', 'drizzle-orm')],
		['refuses', 'an area module importing test support', AREA, from('{ x }', TEST_SUPPORT)],
		['refuses', 'a service importing test support', SERVICE, from('{ x }', './testing/factories')],
		['refuses', 'a route importing test support', ROUTE, from('{ x }', TEST_SUPPORT)],
		['refuses', 'a service ending a request with error()', PLAIN_SERVICE, from('{ error }', KIT)],
		['refuses', 'a service redirecting', PLAIN_SERVICE, from('{ json, redirect }', KIT)],
		['refuses', 'the mapping importing a component', MAPPING, from('X', '$lib/components/x')],
		['refuses', 'a component importing a service', COMPONENT, SVELTE_IMPORTING_A_SERVICE],
		['allows', 'a route importing a service', ROUTE, from('{ x }', '$lib/server/builds')],
		['allows', 'a service importing an area module', SERVICE, from('{ x }', '$lib/quotes/money')],
		['allows', 'a spec importing test support', SPEC, from('{ x }', TEST_SUPPORT)],
		[
			'allows',
			'a service throwing a ServiceError',
			PLAIN_SERVICE,
			from('{ ServiceError }', './errors')
		],
		['allows', 'a service answering JSON', PLAIN_SERVICE, from('{ json, type RequestEvent }', KIT)],
		['allows', 'the mapping module ending a request', MAPPING, from('{ error, fail }', KIT)],
		['allows', 'an access guard redirecting', SERVICE, from('{ error, redirect }', KIT)],
		['allows', 'a route ending a request', ROUTE, from('{ error, redirect }', KIT)]
	])('%s %s', async (verdict, _name, file, code) => {
		expect(await restricted(code, file)).toHaveLength(verdict === 'refuses' ? 1 : 0);
	});
});

describe('the components layer', () => {
	it('holds only Svelte components, their .svelte.ts state and specs (plain modules go to an area)', () => {
		const dir = new URL('../../components', import.meta.url).pathname;
		const files = readdirSync(dir, { recursive: true, withFileTypes: true })
			.filter((f) => f.isFile())
			.map((f) => f.name);
		expect(files.length).toBeGreaterThan(20);
		expect(files.filter((f) => !/\.(svelte|svelte\.ts|spec\.ts|md)$/.test(f))).toEqual([]);
	});
});
