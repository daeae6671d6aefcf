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
					// Property specs run many cases: room for a busy machine (no spec asserts on time).
					testTimeout: 60_000,
					include: ['src/**/*.spec.ts', 'fake-services/**/*.spec.ts']
				}
			},
			{
				extends: './vite.config.ts',
				test: {
					name: 'integration',
					environment: 'node',
					include: ['tests/integration/**/*.test.ts'],
					testTimeout: 30_000,
					hookTimeout: 60_000,
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
