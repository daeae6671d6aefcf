import type { Config } from 'tailwindcss';

// Slateroom's own identity: slate ink on warm paper, a pine accent for action and a brass
// highlight for money. Colours are named by role, not by hue, so screens stay consistent.
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				ink: { DEFAULT: '#1f2a30', soft: '#45545c', faint: '#7a8a92' },
				paper: { DEFAULT: '#f5f3ee', raised: '#ffffff', sunk: '#ebe7df' },
				line: '#d8d2c6',
				pine: { DEFAULT: '#2e5e4e', dark: '#224638', light: '#dcebe4' },
				brass: { DEFAULT: '#a8741a', light: '#f6ead2' },
				busy: '#8a96a0',
				warn: { DEFAULT: '#9a3b22', light: '#f8e4dc' }
			},
			fontFamily: {
				sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
				mono: ['"IBM Plex Mono"', 'ui-monospace', 'monospace']
			},
			borderRadius: { card: '0.625rem' }
		}
	}
} satisfies Config;
