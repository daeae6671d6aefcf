import { fileURLToPath } from 'node:url';
import { defineConfig } from 'vitest/config';

// The domain specs alone, for `npm run mutation` (Stryker). The domain imports no framework, so
// none of the app's Vite plugins are needed here. The generous timeout is for a busy machine:
// Stryker judges a mutant's hang by its own clock, not by this one.
export default defineConfig({
	// svelte.config.js's alias, which the SvelteKit plugin would otherwise supply.
	resolve: { alias: { $fixtures: fileURLToPath(new URL('tests/unit-fixtures', import.meta.url)) } },
	test: {
		name: 'unit',
		environment: 'node',
		include: ['src/lib/domain/**/*.spec.ts'],
		expect: { requireAssertions: true },
		testTimeout: 120_000,
		setupFiles: ['scripts/mutation/fast-check-setup.ts']
	}
});
