/**
 * The layer rules in eslint.config.js fire: each snippet is linted as if it stood in a file of
 * that layer (ESLint's Node API, the project's own config), and the same import is allowed where
 * the layers permit it.
 */
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

describe('layer rules', () => {
	it.each([
		['a service importing a component module', SERVICE, "import X from '$lib/components/x';\n"],
		['a service importing one by path', SERVICE, "import X from '../components/x';\n"],
		['a route importing the database', ROUTE, "import { db } from '$lib/server/db';\n"],
		['a route importing the schema', ROUTE, "import { x } from '$lib/server/db/schema';\n"],
		['a route importing drizzle', ROUTE, "import { eq } from 'drizzle-orm';\n"],
		['an area module importing test support', AREA, "import { x } from '$lib/server/testing/x';\n"],
		['a service importing test support', SERVICE, "import { x } from './testing/factories';\n"],
		['a route importing test support', ROUTE, "import { x } from '$lib/server/testing/x';\n"],
		[
			'a service ending a request with error()',
			PLAIN_SERVICE,
			"import { error } from '@sveltejs/kit';\n"
		],
		['a service redirecting', PLAIN_SERVICE, "import { json, redirect } from '@sveltejs/kit';\n"],
		['the mapping importing a component', MAPPING, "import X from '$lib/components/x';\n"]
	])('refuses %s', async (_name, file, code) => {
		expect(await restricted(code, file)).toHaveLength(1);
	});

	it('refuses a component importing a service', async () => {
		const code = '<script lang="ts">\n\timport type { X } from \'$lib/server/sheet\';\n</script>\n';
		expect(await restricted(code, COMPONENT)).toHaveLength(1);
	});

	it.each([
		['a route importing a service', ROUTE, "import { x } from '$lib/server/builds';\n"],
		['a service importing an area module', SERVICE, "import { x } from '$lib/quotes/money';\n"],
		['a spec importing test support', SPEC, "import { x } from '$lib/server/testing/x';\n"],
		[
			'a service throwing a ServiceError',
			PLAIN_SERVICE,
			"import { ServiceError } from './errors';\n"
		],
		[
			'a service answering JSON',
			PLAIN_SERVICE,
			"import { json, type RequestEvent } from '@sveltejs/kit';\n"
		],
		[
			'the mapping module ending a request',
			MAPPING,
			"import { error, fail } from '@sveltejs/kit';\n"
		],
		['an access guard redirecting', SERVICE, "import { error, redirect } from '@sveltejs/kit';\n"],
		['a route ending a request', ROUTE, "import { error, redirect } from '@sveltejs/kit';\n"]
	])('allows %s', async (_name, file, code) => {
		expect(await restricted(code, file)).toEqual([]);
	});
});
