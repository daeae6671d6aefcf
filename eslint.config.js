import js from '@eslint/js';
import svelte from 'eslint-plugin-svelte';
import globals from 'globals';
import ts from 'typescript-eslint';
import svelteConfig from './svelte.config.js';

// Where each layer may reach. The domain rules are plain TypeScript: no framework, database,
// server, component or route code. Components run in the browser too: nothing from the server.
const outsideDomain = [
	{ group: ['$lib/server', '$lib/server/*', '**/server/**'], message: 'The domain does not reach into the server.' },
	{ group: ['$lib/components', '$lib/components/*', '**/components/**'], message: 'The domain does not know components.' },
	{ group: ['**/routes/**', '$app/*', '$env/*', '@sveltejs/*', 'svelte', 'svelte/*'], message: 'The domain is framework-free.' },
	{
		group: ['drizzle-orm', 'drizzle-orm/*', 'postgres', 'stripe', 'nodemailer', 'better-auth', 'better-auth/*'],
		message: 'The domain does no I/O.'
	}
];
const outsideComponents = [
	{
		group: ['$lib/server', '$lib/server/*', '**/server/**', '$env/static/private', '$env/dynamic/private'],
		message: 'Components may run in the browser: nothing from the server.'
	}
];

export default ts.config(
	{ ignores: ['build/', '.svelte-kit/', 'node_modules/', '.data/', 'drizzle/meta/', 'test-results/', 'playwright-report/'] },
	js.configs.recommended,
	...ts.configs.recommendedTypeChecked,
	...svelte.configs.recommended,
	{
		languageOptions: {
			globals: { ...globals.browser, ...globals.node },
			parserOptions: { projectService: true, tsconfigRootDir: import.meta.dirname }
		},
		rules: {
			'no-undef': 'off',
			// The app is served from the root with no base path, so plain hrefs are right.
			'svelte/no-navigation-without-resolve': 'off',
			'@typescript-eslint/no-unused-vars': ['error', { argsIgnorePattern: '^_', varsIgnorePattern: '^_' }],
			'@typescript-eslint/no-floating-promises': 'error',
			'@typescript-eslint/no-misused-promises': 'error',
			'@typescript-eslint/require-await': 'error'
		}
	},
	{
		files: ['**/*.svelte', '**/*.svelte.ts'],
		languageOptions: {
			parserOptions: { projectService: true, extraFileExtensions: ['.svelte'], parser: ts.parser, svelteConfig }
		}
	},
	{
		// Plain JavaScript (the configuration files) is outside the TypeScript project.
		files: ['**/*.js', '**/*.mjs', '**/*.cjs'],
		...ts.configs.disableTypeChecked
	},
	{
		files: ['src/lib/domain/**/*.ts'],
		rules: { 'no-restricted-imports': ['error', { patterns: outsideDomain }] }
	},
	{
		files: ['src/lib/components/**/*.ts', 'src/lib/components/**/*.svelte'],
		rules: { 'no-restricted-imports': ['error', { patterns: outsideComponents }] }
	}
);
