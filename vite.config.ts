import tailwindcss from '@tailwindcss/vite';
import { sveltekit } from '@sveltejs/kit/vite';
import { defineConfig } from 'vitest/config';

/** Specs that use PostgreSQL, the built app, mail, payments or the photo store, or run the scripts. */
const SERVICE_SPECS = ['src/lib/server/**/*.spec.ts', 'scripts/**/*.spec.ts'];

export default defineConfig({
	plugins: [tailwindcss(), sveltekit()],
	server: { host: '127.0.0.1' },
	test: {
		environment: 'node',
		testTimeout: 30_000,
		hookTimeout: 60_000,
		// Files run one at a time: the service specs share one database, mail catcher and photo store.
		fileParallelism: false,
		// Two groups so that npm test can run them as two processes side by side: `engine` is pure
		// (no database, no network) and cannot disturb `services`.
		projects: [
			{
				extends: true,
				test: { name: 'engine', include: ['src/**/*.spec.ts'], exclude: SERVICE_SPECS }
			},
			{ extends: true, test: { name: 'services', include: SERVICE_SPECS } }
		]
	}
});
