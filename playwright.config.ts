import { defineConfig } from '@playwright/test';

const port = Number(process.env.E2E_PORT ?? 3101);
export const baseURL = `http://127.0.0.1:${port}`;

/** Debian's Chromium, never a downloaded browser; WebGL through SwiftShader so 3D scenes draw. */
export default defineConfig({
	testDir: 'tests',
	testMatch: '**/*.e2e.ts',
	fullyParallel: false,
	workers: 1,
	retries: 0,
	timeout: 60_000,
	expect: { timeout: 10_000 },
	reporter: process.env.PW_JSON
		? [['list'], ['json', { outputFile: process.env.PW_JSON }]]
		: 'list',
	outputDir: 'test-results',
	use: {
		baseURL,
		screenshot: 'only-on-failure',
		trace: 'off',
		launchOptions: {
			executablePath: '/usr/bin/chromium',
			args: [
				'--headless',
				'--no-sandbox',
				'--disable-gpu',
				'--disable-quic',
				'--no-first-run',
				'--disable-background-networking',
				'--disable-component-update',
				'--disable-sync',
				'--use-angle=swiftshader',
				'--enable-unsafe-swiftshader'
			]
		}
	},
	webServer: {
		command: 'node build',
		url: `${baseURL}/`,
		reuseExistingServer: false,
		timeout: 60_000,
		env: {
			PORT: String(port),
			HOST: '127.0.0.1',
			ORIGIN: baseURL,
			INTERSTICE_DEV_TOOLS: '1',
			DATABASE_URL: process.env.DATABASE_URL ?? '',
			BODY_SIZE_LIMIT: '12M'
		}
	}
});
