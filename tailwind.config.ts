import type { Config } from 'tailwindcss';

/**
 * Twofold's theme: a calm light UI; deep teal for liquid, amber for gas, slate for structure.
 * Numbers and code in JetBrains Mono, text in Inter (both shipped with the app).
 */
export default {
	content: ['./src/**/*.{html,js,svelte,ts}'],
	theme: {
		extend: {
			colors: {
				liquid: {
					50: '#effaf9',
					100: '#d5f1ee',
					200: '#a9e2dc',
					300: '#74cbc3',
					400: '#44aea6',
					500: '#2a918a',
					600: '#1f7470',
					700: '#1b5d5a',
					800: '#184b49',
					900: '#153e3d',
					950: '#082423'
				},
				gas: {
					50: '#fffaeb',
					100: '#fff0c6',
					200: '#ffdf88',
					300: '#ffc94a',
					400: '#ffb320',
					500: '#f99107',
					600: '#dd6a02',
					700: '#b74906',
					800: '#94380c',
					900: '#7a2f0d',
					950: '#461602'
				},
				structure: {
					50: '#f8fafc',
					100: '#f1f5f9',
					200: '#e2e8f0',
					300: '#cbd5e1',
					400: '#94a3b8',
					500: '#64748b',
					600: '#475569',
					700: '#334155',
					800: '#1e293b',
					900: '#0f172a'
				},
				ok: '#2f855a',
				warn: '#b7791f',
				bad: '#c53030'
			},
			fontFamily: {
				sans: ['"Inter Variable"', 'system-ui', 'sans-serif'],
				mono: ['"JetBrains Mono"', 'ui-monospace', 'monospace']
			}
		}
	}
} satisfies Config;
