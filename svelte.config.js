import adapter from '@sveltejs/adapter-node';
import { vitePreprocess } from '@sveltejs/vite-plugin-svelte';

/** @type {import('@sveltejs/kit').Config} */
const config = {
	preprocess: vitePreprocess(),
	kit: {
		// Separate folders let several checkouts' builds run side by side (defaults for everyone else).
		adapter: adapter({ out: process.env.BUILD_DIR ?? 'build' }),
		outDir: process.env.KIT_OUT_DIR ?? '.svelte-kit',
		typescript: {
			config(tsconfig) {
				tsconfig.include.push(
					'../scripts/**/*.ts',
					'../drizzle.config.ts',
					'../tailwind.config.ts',
					'../playwright.config.ts'
				);
			}
		},
		csp: {
			mode: 'auto',
			directives: {
				'default-src': ['self'],
				'script-src': ['self'],
				'style-src': ['self', 'unsafe-inline'],
				'img-src': ['self', 'data:', 'blob:'],
				'font-src': ['self'],
				'connect-src': ['self'],
				'worker-src': ['self', 'blob:'],
				'object-src': ['none'],
				'base-uri': ['self'],
				'form-action': ['self'],
				'frame-ancestors': ['none']
			}
		}
	}
};

export default config;
