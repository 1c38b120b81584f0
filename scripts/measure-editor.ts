/**
 * Measures what issue 5 asks for beside the tests (not a test; run `npx tsx scripts/measure-editor.ts`
 * after `npx vite build`, with DATABASE_URL on the seeded test database):
 *
 * 1. The JavaScript each page loads in Chromium (every script request, counted at its gzip size as
 *    adapter-node serves it, the `.gz` file beside it in build/client), and whether any of it is
 *    three.js: /builds and /parts must load none, the editor may.
 * 2. The editor's re-check in the browser: what EditorState does on every change (compose the
 *    scene, parse it with the engine's schema, resolve, report), bundled from the same source and
 *    timed in the page, for the demo scene and for a 100-part scene while a shelf is dragged
 *    through its positions.
 *
 * Prints a table, then one JSON object as the last line.
 */
import { chromium } from '@playwright/test';
import { build } from 'esbuild';
import { existsSync, readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { gzipSync } from 'node:zlib';
import { startApp } from '../src/lib/server/testing/app-server';
import { Client } from '../src/lib/server/testing/client';

const root = resolve(import.meta.dirname, '..');
const PAGES = ['/builds', '/parts', '/enclosures', '/builds/demo-build'];
const DESIGNER = { email: 'designer@demo.interstice.test', password: 'demo-password-1' };
const CHROMIUM_ARGS = [
	'--headless',
	'--no-sandbox',
	'--disable-gpu',
	'--use-angle=swiftshader',
	'--enable-unsafe-swiftshader',
	'--disable-background-networking'
];

/** KB here are KiB (1024 bytes). Strings only three.js's own code carries (its warnings are prefixed "THREE."). */
const isThree = (code: string) =>
	code.includes('THREE.WebGLRenderer') || code.includes('THREE.Object3D');

function gzipSize(urlPath: string): number {
	const file = resolve(root, 'build/client', `.${urlPath}`);
	if (existsSync(`${file}.gz`)) return readFileSync(`${file}.gz`).length;
	return gzipSync(readFileSync(file), { level: 9 }).length;
}

/** The re-check the editor runs on each change, and a 100-part scene to run it on. */
const RECHECK_ENTRY = `
import { reportFor, resolveScene, sceneSchema } from '$lib/geometry';
import { demoEnclosure, demoParts, demoSceneInput } from '../src/lib/geometry/standard-library';
import { composeScene, variantSettingsSchema } from '$lib/builds/settings';

function recheck(enclosure, parts, settings) {
	const parsed = sceneSchema.safeParse(composeScene(enclosure, parts, settings));
	if (!parsed.success) throw new Error(parsed.error.message);
	const resolved = resolveScene(parsed.data);
	return reportFor(parsed.data, resolved);
}

function demo() {
	const s = demoSceneInput();
	return { enclosure: demoEnclosure(), parts: demoParts(), settings: variantSettingsSchema.parse(s), control: ['spine', [65.68, 86, 106.32]] };
}

/**
 * 100 of the demo's CPU blocks and pump-reservoirs (one body and one keep-out each) in a 650 × 300 ×
 * 500 mm enclosure, ten across, five deep, two layers, with a shelf that slides through the upper
 * layer's feet: some positions collide, some clear.
 */
function hundred() {
	const panel = { thicknessMm: 2, kind: 'solid', offsetMm: 0 };
	const enclosure = {
		...demoEnclosure(),
		name: 'Measurement enclosure',
		outerMm: [654, 304, 504],
		walls: { left: panel, right: panel, bottom: panel, top: panel, front: panel, back: panel },
		dividers: [{ id: 'shelf', label: 'Shelf', axis: 'y', thicknessMm: 2, positions: { kind: 'range', minMm: 120, maxMm: 180, stepMm: 5 }, sides: { low: 'lower', high: 'upper' } }],
		brackets: [],
		mounts: []
	};
	const kinds = demoParts().filter((p) => p.id === 'demo-cpu-block' || p.id === 'demo-pump-res');
	const placements = [];
	for (let i = 0; i < 100; i++) {
		const part = kinds[i % 2];
		placements.push({ id: 'p' + i, partId: part.id, position: [(i % 10) * 65 + 2, Math.floor(i / 50) * 150 + 2, (Math.floor(i / 10) % 5) * 100 + 5], rotation: { x: 0, y: 0, z: 0 } });
	}
	const settings = variantSettingsSchema.parse({ dividerPositions: { shelf: 150 }, placements, marginMm: 2 });
	const steps = [];
	for (let v = 120; v <= 180; v += 5) steps.push(v);
	return { enclosure, parts: kinds, settings, control: ['shelf', steps] };
}

function time(s, runs) {
	const [id, positions] = s.control;
	const ms = [];
	let report;
	for (let i = 0; i < runs; i++) {
		const at = positions[i % positions.length];
		const settings = { ...s.settings, dividerPositions: { ...s.settings.dividerPositions, [id]: at } };
		const t = performance.now();
		report = recheck(s.enclosure, s.parts, settings);
		ms.push(performance.now() - t);
	}
	const warm = ms.slice(Math.floor(runs / 5)).sort((a, b) => a - b);
	const q = (p) => warm[Math.min(warm.length - 1, Math.floor(p * warm.length))];
	return { placements: s.settings.placements.length, overlapsAtLast: report.overlaps.length, medianMs: q(0.5), p95Ms: q(0.95), maxMs: warm[warm.length - 1] };
}

window.__measure = () => ({ demo: time(demo(), 300), hundred: time(hundred(), 300) });
`;

async function recheckBundle(): Promise<string> {
	const out = await build({
		stdin: { contents: RECHECK_ENTRY, resolveDir: root, loader: 'js' },
		bundle: true,
		minify: true,
		format: 'iife',
		platform: 'browser',
		target: 'es2022',
		alias: { $lib: resolve(root, 'src/lib') },
		write: false,
		logLevel: 'warning'
	});
	return out.outputFiles[0].text;
}

async function main() {
	const app = await startApp();
	const browser = await chromium.launch({
		executablePath: '/usr/bin/chromium',
		args: CHROMIUM_ARGS
	});
	try {
		const client = new Client(app.baseURL);
		const signedIn = await client.signIn(DESIGNER.email, DESIGNER.password);
		if (signedIn.status !== 303 || !client.sessionId) {
			throw new Error(`sign-in answered ${signedIn.status}; seed the database first`);
		}
		const context = await browser.newContext({
			baseURL: app.baseURL,
			viewport: { width: 1440, height: 900 }
		});
		await context.addCookies([
			{ name: 'interstice_session', value: client.sessionId, url: app.baseURL }
		]);

		const pages: {
			path: string;
			scripts: number;
			gzipKB: number;
			threeKB: number;
			threeChunks: string[];
			largest: string[];
		}[] = [];
		for (const path of PAGES) {
			const page = await context.newPage();
			const scripts = new Set<string>();
			page.on('response', (r) => {
				const url = new URL(r.url());
				if (url.origin === app.baseURL && url.pathname.endsWith('.js')) scripts.add(url.pathname);
			});
			const res = await page.goto(path, { waitUntil: 'networkidle' });
			if (!res?.ok()) throw new Error(`${path} answered ${res?.status()}`);
			let gzip = 0;
			let three = 0;
			const threeChunks: string[] = [];
			const sizes: [string, number][] = [];
			for (const s of scripts) {
				const size = gzipSize(s);
				sizes.push([s.split('/').slice(-2).join('/'), size]);
				gzip += size;
				if (isThree(readFileSync(resolve(root, 'build/client', `.${s}`), 'utf8'))) {
					three += size;
					threeChunks.push(s.split('/').pop() ?? s);
				}
			}
			const largest = sizes
				.sort((a, b) => b[1] - a[1])
				.slice(0, 5)
				.map(([name, size]) => `${name} ${(size / 1024).toFixed(1)}`);
			pages.push({
				path,
				scripts: scripts.size,
				gzipKB: Math.round(gzip / 102.4) / 10,
				threeKB: Math.round(three / 102.4) / 10,
				threeChunks,
				largest
			});
			await page.close();
		}

		// A blank page of its own: the app's CSP (rightly) refuses inline scripts.
		const page = await browser.newPage();
		await page.goto('about:blank');
		await page.addScriptTag({ content: await recheckBundle() });
		const recheck = (await page.evaluate(() =>
			(window as unknown as { __measure: () => unknown }).__measure()
		)) as Record<
			'demo' | 'hundred',
			{ placements: number; overlapsAtLast: number; medianMs: number; p95Ms: number; maxMs: number }
		>;

		console.log('page                    scripts   JS gzip KB   of it three.js KB');
		for (const p of pages) {
			console.log(
				`${p.path.padEnd(22)} ${String(p.scripts).padStart(8)} ${p.gzipKB.toFixed(1).padStart(12)} ${p.threeKB.toFixed(1).padStart(19)}  ${p.threeChunks.join(', ')}`
			);
			console.log(`${''.padEnd(22)} largest (KB gzip): ${p.largest.join(' · ')}`);
		}
		console.log(
			'\nre-check in Chromium (compose + parse + resolve + report, as EditorState does on each change):'
		);
		for (const [name, r] of Object.entries(recheck)) {
			console.log(
				`${name.padEnd(8)} ${r.placements} placements: median ${r.medianMs.toFixed(2)} ms, p95 ${r.p95Ms.toFixed(2)} ms, max ${r.maxMs.toFixed(2)} ms`
			);
		}
		console.log(JSON.stringify({ pages, recheck }));
	} finally {
		await browser.close();
		await app.stop();
	}
}

await main();
