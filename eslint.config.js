import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

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
	{
		// The fit engine is pure: no framework, no server, no three.js, no DOM, no Node.
		files: ['src/lib/geometry/**/*.ts'],
		ignores: ['src/lib/geometry/**/*.spec.ts'],
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
						}
					]
				}
			],
			'no-restricted-globals': ['error', 'window', 'document', 'process']
		}
	},
	{
		files: ['**/*.js', 'scripts/**/*.mjs'],
		...ts.configs.disableTypeChecked
	}
);
