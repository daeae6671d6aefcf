import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

// Where a form may send the browser: our own pages and the payment page. The CSP is fixed when the
// app is built, so the build reads the Stripe base that npm start and npm test set (the local fake
// on its port, or Stripe itself).
const stripeBase = process.env.STRIPE_API_BASE ?? `http://127.0.0.1:${process.env.STRIPE_FAKE_PORT ?? 12111}`;
const payPages = [...new Set([new URL(stripeBase).origin, 'https://checkout.stripe.com'])];

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	compilerOptions: {
		// Runes for our own components only: @schedule-x/svelte 3 is written in Svelte 4 syntax.
		runes: ({ filename }) => (filename.split(/[/\\]/).includes('node_modules') ? undefined : true)
	},
	kit: {
		typescript: {
			// Scripts, the fakes and the root config files are checked with the app's settings.
			config: (config) => {
				config.include.push('../scripts/**/*.ts', '../fake-services/**/*.ts', '../*.config.ts');
				return config;
			}
		},
		adapter: adapter({ out: 'build' }),
		// The unit specs' shared fixtures live with the tests, outside the app's code.
		alias: { $fixtures: 'tests/unit-fixtures' },
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:'],
				'font-src': ['self', 'data:'],
				'connect-src': ['self'],
				'frame-ancestors': ['none'],
				'form-action': ['self', ...payPages],
				'base-uri': ['self'],
				'object-src': ['none']
			}
		}
	}
};

export default config;
