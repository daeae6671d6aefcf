import { defineConfig, devices } from '@playwright/test';

// Runs against the production build that scripts/test.sh starts (SvelteKit's origin check only
// runs there), in Debian's Chromium: no downloaded browser.
const baseURL = process.env.APP_URL ?? 'http://127.0.0.1:3100';

// Under `npm run test:clock` every process of the run has libfaketime preloaded (FAKETIME is the
// clock's offset). Chromium does not start with the library loaded, so it gets the environment
// without it and tests/e2e/support.ts gives each browser context the run's clock instead.
const FAKETIME_VARS = ['LD_PRELOAD', 'FAKETIME', 'FAKETIME_DONT_FAKE_MONOTONIC', 'FAKETIME_SHARED'];
const browserEnv = process.env.FAKETIME
	? Object.fromEntries(
			Object.entries(process.env).filter((e): e is [string, string] => e[1] !== undefined && !FAKETIME_VARS.includes(e[0]))
		)
	: undefined;

export default defineConfig({
	testDir: 'tests/e2e',
	fullyParallel: false,
	workers: 1,
	retries: 0,
	// No test is timed: a journey of many pages takes minutes on a loaded two-core machine, and an
	// expectation polls until it holds. The limits only end a test, or a run, that hangs; a hung run
	// still fails well inside CI's budget rather than eating it.
	timeout: 300_000,
	globalTimeout: 60 * 60_000,
	expect: { timeout: 30_000 },
	reporter: [['list']],
	use: {
		baseURL,
		trace: 'retain-on-failure',
		screenshot: 'only-on-failure',
		locale: 'en-GB',
		// A visitor far from the studio: pages must still show the studio's own time zone.
		timezoneId: 'America/New_York',
		launchOptions: {
			executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
			env: browserEnv,
			args: [
				'--no-sandbox',
				'--disable-gpu',
				'--disable-dev-shm-usage',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync',
				'--no-first-run',
				'--disable-quic'
			]
		}
	},
	projects: [{ name: 'chromium', use: { ...devices['Desktop Chrome'] } }]
});
