// Mutation testing of the domain rules: `npm run mutation` (see DEVELOPERS.md).
/** @type {import('@stryker-mutator/api/core').PartialStrykerOptions} */
export default {
	testRunner: 'vitest',
	plugins: ['@stryker-mutator/vitest-runner'],
	vitest: { configFile: 'vitest.mutation.config.ts', related: true },
	mutate: [
		'src/lib/domain/**/*.ts',
		'!src/lib/domain/**/*.spec.ts',
		// Type declarations and re-exports only: nothing to mutate.
		'!src/lib/domain/types.ts',
		'!src/lib/domain/pricing/index.ts',
		'!src/lib/domain/invoice/index.ts',
		'!src/lib/domain/time/index.ts',
		'!src/lib/domain/pricing/types.ts'
	],
	coverageAnalysis: 'perTest',
	concurrency: 2,
	timeoutFactor: 3,
	timeoutMS: 20000,
	tempDirName: '.data/stryker-tmp',
	// Stryker never copies .svelte-kit into its sandbox, but tsconfig.json extends the one in it.
	ignorePatterns: [
		'!.svelte-kit/tsconfig.json',
		'.data',
		'build',
		'test-results',
		'playwright-report',
		'coverage',
		// Of the tests, only the unit specs' fixtures ($fixtures in svelte.config.js).
		'tests/*',
		'!tests/unit-fixtures',
		'static',
		'drizzle'
	],
	reporters: ['clear-text', 'progress-append-only', 'html', 'json'],
	htmlReporter: { fileName: '.data/mutation/index.html' },
	jsonReporter: { fileName: '.data/mutation/report.json' },
	clearTextReporter: { allowColor: false, logTests: false, reportScoreTable: true, reportMutants: true },
	thresholds: { high: 90, low: 85, break: null }
};
