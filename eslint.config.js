import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

/** Specs and test support itself may import test support; nothing else may. */
const TEST_FILES = ['**/*.spec.ts', 'src/lib/server/testing/**'];
const TEST_SUPPORT = {
	group: ['$lib/server/testing', '$lib/server/testing/*', '**/testing/*'],
	message: 'Test support (src/lib/server/testing/) is for specs, tests/ and scripts/ only.'
};

/** Services may not import components. */
const NO_COMPONENTS = {
	group: ['$lib/components', '$lib/components/*', '**/components/*'],
	message:
		'Services do not import components: move the shared code to its area module ($lib/catalog, $lib/quotes, $lib/sharing, $lib/builds, $lib/words).'
};
/**
 * Services refuse by throwing a ServiceError (./errors.ts), which routes map to HTTP in one place;
 * only that mapping, the JSON helper, the hooks' address check and the guards (access, share
 * links, rate limits) end a request themselves.
 */
const SERVICE_HTTP_EXITS = [
	'src/lib/server/errors.ts',
	'src/lib/server/api.ts',
	'src/lib/server/boundary.ts',
	'src/lib/server/access.ts',
	'src/lib/server/limits.ts',
	'src/lib/server/sharing/actors.ts'
];
const NO_KIT_EXITS = {
	name: '@sveltejs/kit',
	importNames: ['error', 'redirect'],
	message:
		'Services throw a ServiceError (src/lib/server/errors.ts); routes map it to HTTP with forJson/forForm/forPage or jsonRoute/pageRoute.'
};

export default ts.config(
	{
		ignores: [
			'build/',
			'.svelte-kit/',
			'node_modules/',
			'.data/',
			'drizzle/',
			'test-results/',
			'playwright-report/'
		]
	},
	js.configs.recommended,
	...ts.configs.recommended,
	...svelte.configs.recommended,
	{
		languageOptions: {
			globals: { ...globals.browser, ...globals.node },
			parserOptions: {
				projectService: true,
				extraFileExtensions: ['.svelte'],
				tsconfigRootDir: import.meta.dirname
			}
		},
		rules: {
			'@typescript-eslint/no-floating-promises': 'error',
			'@typescript-eslint/no-misused-promises': [
				'error',
				{ checksVoidReturn: { attributes: false } }
			],
			'@typescript-eslint/no-unused-vars': [
				'error',
				{ argsIgnorePattern: '^_', varsIgnorePattern: '^_' }
			],
			curly: ['error', 'multi-line'],
			'svelte/button-has-type': 'error',
			'svelte/no-navigation-without-resolve': 'off',
			'no-undef': 'off'
		}
	},
	{
		files: ['**/*.svelte', '**/*.svelte.ts', '**/*.svelte.js'],
		languageOptions: { parserOptions: { parser: ts.parser, svelteConfig } }
	},
	// Layers (DEVELOPERS.md): each rule below names what a layer may not import. ESLint keeps one
	// no-restricted-imports per file, so every layer's entry also carries the test-support rule.
	{
		files: ['src/**/*.ts', 'src/**/*.svelte'],
		ignores: TEST_FILES,
		rules: { 'no-restricted-imports': ['error', { patterns: [TEST_SUPPORT] }] }
	},
	{
		// The fit engine is pure: no framework, no server, no three.js, no DOM, no Node.
		files: ['src/lib/geometry/**/*.ts'],
		ignores: TEST_FILES,
		rules: {
			'no-restricted-imports': [
				'error',
				{
					patterns: [
						{
							group: [
								'svelte',
								'svelte/*',
								'$app/*',
								'$lib/server/*',
								'$lib/components/*',
								'three',
								'three/*',
								'node:*',
								'@sveltejs/*'
							],
							message: 'The geometry module stays pure.'
						},
						TEST_SUPPORT
					]
				}
			],
			'no-restricted-globals': ['error', 'window', 'document', 'process']
		}
	},
	{
		files: ['src/lib/server/**/*.ts'],
		ignores: TEST_FILES,
		rules: {
			'no-restricted-imports': [
				'error',
				{ paths: [NO_KIT_EXITS], patterns: [NO_COMPONENTS, TEST_SUPPORT] }
			]
		}
	},
	{
		files: SERVICE_HTTP_EXITS,
		rules: {
			'no-restricted-imports': ['error', { patterns: [NO_COMPONENTS, TEST_SUPPORT] }]
		}
	},
	{
		files: ['src/routes/**/*.ts', 'src/routes/**/*.svelte'],
		ignores: TEST_FILES,
		rules: {
			'no-restricted-imports': [
				'error',
				{
					patterns: [
						{
							group: ['$lib/server/db', '$lib/server/db/*', 'drizzle-orm', 'drizzle-orm/*'],
							message: 'Routes call a service in $lib/server; only services touch the database.'
						},
						TEST_SUPPORT
					]
				}
			]
		}
	},
	{
		files: ['src/lib/components/**/*.ts', 'src/lib/components/**/*.svelte'],
		ignores: TEST_FILES,
		rules: {
			'no-restricted-imports': [
				'error',
				{
					patterns: [
						{
							group: ['$lib/server', '$lib/server/*', '**/server/*'],
							message:
								'Components run in the browser: take data from the page, types from an area module.'
						},
						TEST_SUPPORT
					]
				}
			]
		}
	},
	{
		files: ['**/*.js', 'scripts/**/*.mjs'],
		...ts.configs.disableTypeChecked
	}
);
