import type { Config } from 'tailwindcss';

/** Interstice's identity: graphite for the 3D workspace, warm paper for documents, one brass accent. */
export default {
	content: ['./src/**/*.{html,svelte,ts}'],
	theme: {
		extend: {
			fontFamily: {
				sans: ['"Space Grotesk"', 'ui-sans-serif', 'system-ui', 'sans-serif']
			},
			colors: {
				graphite: {
					50: '#eef0f3',
					100: '#d5dae1',
					200: '#aab3c0',
					300: '#7f8b9c',
					400: '#5c6778',
					500: '#434d5c',
					600: '#333b48',
					700: '#262d38',
					800: '#1b2029',
					900: '#12161c',
					950: '#0b0e12'
				},
				paper: { DEFAULT: '#f7f3ea', deep: '#efe8da', line: '#ddd3c0' },
				brass: { light: '#e2c07d', DEFAULT: '#c1964a', dark: '#8f6a2b' },
				fit: {
					clear: '#3aae90',
					tight: '#f0c24a',
					blocked: '#8357cc',
					collides: '#8a1c12',
					outside: '#f4f5f6'
				}
			}
		}
	}
} satisfies Config;
