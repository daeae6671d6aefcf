import tailwindcss from '@tailwindcss/vite';
import { sveltekit } from '@sveltejs/kit/vite';
import { defineConfig } from 'vitest/config';

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1' },
	test: {
		expect: { requireAssertions: true },
		// Integration specs share one database: run files one after another.
		fileParallelism: false,
		projects: [
			{
				extends: './vite.config.ts',
				test: {
					name: 'unit',
					environment: 'node',
					// No spec is timed: on a loaded machine a property run or a PDF rendering can take
					// minutes, and the limit is only there to end a test that hangs.
					testTimeout: 600_000,
					include: ['src/**/*.spec.ts', 'fake-services/**/*.spec.ts']
				}
			},
			{
				extends: './vite.config.ts',
				test: {
					name: 'integration',
					environment: 'node',
					include: ['tests/integration/**/*.test.ts'],
					// No assertion is on time; the limits only end a test or hook that hangs. A test that
					// books, pays and renders PDFs takes minutes on a loaded two-core machine.
					testTimeout: 600_000,
					hookTimeout: 600_000,
					fileParallelism: false
				}
			},
			{
				extends: './vite.config.ts',
				test: {
					name: 'outage',
					environment: 'node',
					include: ['tests/outage/**/*.test.ts'],
					testTimeout: 60_000
				}
			}
		]
	}
});
