/**
 * The build sheet at the bench: a designer opens the demo build's sheet, it prints as a paper
 * document (tools and site header gone, drawings and checklist there), ticks two checklist items,
 * reloads and finds them still ticked; a third is ticked without JavaScript; the PDF downloads.
 */
import { expect, test, type Page } from '@playwright/test';
import { eq } from 'drizzle-orm';
import { db } from '../src/lib/server/db';
import { builds } from '../src/lib/server/db/schema';
import { clearTicks, createSheetBuild } from '../src/lib/server/testing/sheet-build';
import { DEMO_SPINE_OFFSETS } from '../src/lib/geometry/standard-library';
import {
	clearBrowserRateLimits,
	closeDb,
	createMember,
	createStudio,
	signInAs
} from './helpers/accounts';

const DEMO_BUILD = 'demo-build';
const DEMO_DESIGNER = 'demo-designer';

/** The seeded demo build; until the seed has one, the same demo scene in a studio of its own. */
async function demoBuild(): Promise<{ buildId: string; userId: string }> {
	const [seeded] = await db.select({ id: builds.id }).from(builds).where(eq(builds.id, DEMO_BUILD));
	if (seeded) return { buildId: seeded.id, userId: DEMO_DESIGNER };
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const built = await createSheetBuild({
		studioId: studio.id,
		userId: designer.id,
		name: 'Quiet desk build'
	});
	return { buildId: built.buildId, userId: designer.id };
}

let target: { buildId: string; userId: string };

test.beforeAll(async () => {
	await clearBrowserRateLimits();
	target = await demoBuild();
	await clearTicks(target.buildId);
});
test.afterAll(async () => {
	await closeDb();
});

const tickBox = (page: Page, name: RegExp) => page.getByRole('checkbox', { name });

test('open the sheet, print it, tick two items, reload: still ticked', async ({
	page,
	context,
	baseURL
}, testInfo) => {
	await signInAs(context, baseURL!, target.userId);
	await page.goto(`/builds/${target.buildId}/sheet`);
	await expect(page.getByText('Build sheet', { exact: true })).toBeVisible();
	await expect(page.getByRole('heading', { name: 'Assembly checklist' })).toBeVisible();
	for (const view of ['Front', 'Top', 'Side, from the right']) {
		await expect(page.getByRole('img', { name: new RegExp(`^${view} view`) })).toBeVisible();
	}
	await expect(page.getByText(/Spine at position 3 slots/).first()).toBeVisible();

	// A4 at 96 px to the inch (210 × 297 mm), printed.
	await page.setViewportSize({ width: 794, height: 1123 });
	await page.emulateMedia({ media: 'print' });
	await expect(page.getByRole('link', { name: 'Download PDF' })).toBeHidden();
	await expect(page.getByRole('navigation', { name: 'Main' })).toBeHidden();
	await expect(page.getByRole('img', { name: /^Front view/ })).toBeVisible();
	const shot = testInfo.outputPath('sheet-print.png');
	await page.screenshot({ path: shot, fullPage: true });
	await testInfo.attach('sheet printed', { path: shot, contentType: 'image/png' });
	await page.emulateMedia({ media: 'screen' });

	const leak = tickBox(page, /^Leak-test with only the pump powered/);
	const unplug = tickBox(page, /^Unplug from the mains/);
	await expect(leak).toHaveAttribute('aria-checked', 'false');
	await leak.click();
	await expect(leak).toHaveAttribute('aria-checked', 'true');
	await unplug.click();
	await expect(unplug).toHaveAttribute('aria-checked', 'true');
	// The server's answer, not only the optimistic tick: who ticked shows once the data is back.
	await expect(page.getByText(/^Ticked by /)).toHaveCount(2);

	await page.reload();
	await expect(leak).toHaveAttribute('aria-checked', 'true');
	await expect(unplug).toHaveAttribute('aria-checked', 'true');
	await expect(tickBox(page, /^Coolants can be toxic/)).toHaveAttribute('aria-checked', 'false');
});

test('ticking works without JavaScript, and the PDF downloads', async ({ browser, baseURL }) => {
	const context = await browser.newContext({ javaScriptEnabled: false });
	await signInAs(context, baseURL!, target.userId);
	const page = await context.newPage();
	await page.goto(`/builds/${target.buildId}/sheet?paper=letter`);
	const coolant = tickBox(page, /^Coolants can be toxic/);
	await expect(coolant).toHaveAttribute('aria-checked', 'false');
	await coolant.click();
	await page.waitForLoadState('load');
	await expect(coolant).toHaveAttribute('aria-checked', 'true');
	await page.goto(`/builds/${target.buildId}/sheet?paper=letter`);
	await expect(coolant).toHaveAttribute('aria-checked', 'true');
	await expect(page.getByRole('link', { name: 'Letter' })).toHaveAttribute('aria-current', 'true');

	const href = await page.getByRole('link', { name: 'Download PDF' }).getAttribute('href');
	expect(href).toMatch(/\/sheet\.pdf\?variant=.+&paper=letter$/);
	const res = await context.request.get(href!);
	expect(res.status()).toBe(200);
	expect(res.headers()['content-type']).toBe('application/pdf');
	expect((await res.body()).subarray(0, 5).toString('latin1')).toBe('%PDF-');
	await context.close();
});

test('the drawing key in grey-scale keeps every status tellable: mean lightness per swatch distinct and ordered like L*', async ({
	page,
	context,
	baseURL
}, testInfo) => {
	const sharp = (await import('sharp')).default;
	await signInAs(context, baseURL!, target.userId);
	await page.goto(`/builds/${target.buildId}/sheet`);
	const key = page.getByRole('complementary', { name: 'Drawing key' });
	await expect(key).toBeVisible();
	await key.screenshot({ path: testInfo.outputPath('drawing-key.png') });
	// The projection symbol prints at its stated size (15 × 5 mm for 2.5 mm lettering), not squeezed.
	const symbol = await key.getByTestId('projection-symbol').boundingBox();
	expect(symbol!.width).toBeCloseTo((15 / 25.4) * 96, 0);
	await expect(key).toContainText('Third-angle projection');
	const means: [string, number][] = [];
	// In the fills' lightness order, darkest first: L* 30, 47, 64, 81, 97 (drawing-style.ts).
	for (const status of ['collides', 'blocked', 'clear', 'tight', 'outside']) {
		const swatch = key.locator(`[data-status="${status}"] svg`).first();
		const png = await swatch.screenshot({
			scale: 'css',
			path: testInfo.outputPath(`swatch-${status}.png`)
		});
		// Grey as a grey-scale print makes it (sharp's luminance), then the swatch's mean 0–255.
		// Inside the mark's edge only (the page around it is white for every status).
		const { width = 0, height = 0 } = await sharp(png).metadata();
		const inset = Math.round(width * 0.2);
		// sharp's stats() reads its input, not the pipeline's output: make the grey image first.
		const grey = await sharp(png)
			.extract({ left: inset, top: inset, width: width - 2 * inset, height: height - 2 * inset })
			.greyscale()
			.toColourspace('b-w')
			.png()
			.toBuffer();
		const stats = await sharp(grey).stats();
		expect(stats.channels.length).toBeLessThanOrEqual(2);
		means.push([status, stats.channels[0].mean]);
		console.log(`${status}: mean grey ${stats.channels[0].mean.toFixed(1)} of 255`);
	}
	for (let i = 0; i < means.length; i++) {
		for (let j = i + 1; j < means.length; j++) {
			const [a, la] = means[i];
			const [b, lb] = means[j];
			// Distinct, and in the fills' order: no pattern (dots, hatch, edge) turns the order round.
			expect(lb - la, `${a} ${la.toFixed(0)} vs ${b} ${lb.toFixed(0)}`).toBeGreaterThan(12);
		}
	}
});

test('a colliding body is cross-hatched on the drawing itself, not only in the key', async ({
	page,
	context,
	baseURL
}, testInfo) => {
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const two = await createSheetBuild({
		studioId: studio.id,
		userId: designer.id,
		name: 'Spine one slot left',
		adjust: (s) => (s.dividerPositions.spine = DEMO_SPINE_OFFSETS['2 slots'])
	});
	await signInAs(context, baseURL!, designer.id);
	await page.goto(`/builds/${two.buildId}/sheet`);
	const front = page.getByRole('img', { name: /^Front view/ });
	await expect(front).toBeVisible();
	await front.screenshot({ path: testInfo.outputPath('front-collides.png') });
	const collides = front.locator('g[data-kind="body"][data-status="collides"]');
	expect(await collides.count()).toBeGreaterThan(0);
	// Its pattern layer is the collides cross-hatch; the clear bodies have none.
	await expect(collides.first().locator('rect[fill$="-collides)"]')).toHaveCount(1);
	const clear = front.locator('g[data-kind="body"][data-status="clear"]');
	if (await clear.count()) await expect(clear.first().locator('rect[fill^="url("]')).toHaveCount(0);
	const hatch = front.locator('pattern[id$="-collides"] line');
	await expect(hatch).toHaveCount(2);
});
