/**
 * The build editor in Chromium on the seeded demo build ("Quiet desk build", variant "Spine at
 * three slots"). Known answer from the demo data (geometry/standard-library.ts): with the spine at "2 slots" the card side is
 * 2 × 20.32 mm (PCI Express CEM spec slot pitch) + 1.04 mm wide, the two-slot card stands 0.96 mm
 * into the spine, a 0.96 × 185 × 120 mm interference (21.3 cm³). The variant is put back to its
 * seeded row before and after, so other tests see the seed.
 */
import { expect, test, type Browser, type Page } from '@playwright/test';
import { closeDb } from '../src/lib/server/db';
import { clearRateLimits } from '../src/lib/server/testing/factories';
import { restoreDemoVariant } from './helpers/demo-variant';

const BUILD = '/builds/demo-build';
const DESIGNER = { email: 'designer@demo.interstice.test', password: 'demo-password-1' };

test.describe.configure({ mode: 'serial' });
test.beforeAll(async () => {
	await restoreDemoVariant();
	// Every browser here signs in from 127.0.0.1; start with a fresh sign-in budget.
	await clearRateLimits('127.0.0.1');
});
test.afterAll(async () => {
	await restoreDemoVariant();
	await closeDb();
});

async function signIn(page: Page) {
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(DESIGNER.email);
	await page.getByLabel('Password').fill(DESIGNER.password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL(/\/builds$/);
}

async function openEditor(browser: Browser) {
	const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
	const page = await context.newPage();
	await signIn(page);
	await page.goto(BUILD);
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/);
	return { context, page };
}

const versionOf = async (page: Page) =>
	Number(/change (\d+)/.exec((await page.getByTestId('save-status').textContent()) ?? '')?.[1]);

test('the spine at "2 slots": the card collides in the report and in 3D; back at "3 slots" it fits, and the positions persist', async ({
	browser
}, testInfo) => {
	const { context, page } = await openEditor(browser);
	const spine = page.getByRole('slider', { name: 'Spine' });
	const collides = page.getByRole('group', { name: /^collides \(\d+\)$/ });
	const scene = page.getByRole('region', { name: '3D view of the build' });
	const labels = scene.getByTestId('interference-label');
	const status = page.getByTestId('save-status');

	await expect(spine).toHaveAttribute('aria-valuetext', '3 slots, 86.0\u2009mm');
	await expect(page.getByRole('group', { name: /^clear \(\d+\)$/ })).toBeVisible();
	await expect(collides).toHaveCount(0);
	await expect(labels).toHaveCount(0);
	const firstVersion = await versionOf(page);

	// Keyboard on the slider: one step right is the next allowed position, "2 slots".
	await spine.focus();
	await page.keyboard.press('ArrowRight');
	await expect(spine).toHaveAttribute('aria-valuetext', '2 slots, 106.32\u2009mm');

	// The fit report: a "collides" group naming the card and the spine, with the 0.96 mm.
	await expect(collides).toBeVisible();
	await expect(collides).toHaveAttribute('data-status', 'collides');
	await expect(
		collides.getByRole('button', {
			name: /graphics card.*and the spine overlap by 0\.96\smm along width/
		})
	).toBeVisible();
	// The scene: an interference box with its label (volume, depth, the move that clears it).
	await expect(labels.filter({ hasText: /21\.3\scm³/ })).toBeVisible();
	await expect(labels.filter({ hasText: /21\.3\scm³/ })).toContainText(/mm deep/);
	await expect(labels.filter({ hasText: /21\.3\scm³/ })).toContainText(
		/graphics card.* ↔ spine: .*move the compact graphics card.*0\.96\smm right, or the spine one slot left/
	);
	// Every label over the view names both things it is between ("… ↔ …"), and no two labels
	// overlap on the page (bounding boxes in CSS pixels), with nothing selected and with the card
	// selected (its gap labels join the callouts).
	const everyLabel = scene.locator('[data-testid="interference-label"], [data-testid="gap-label"]');
	const noOverlap = async () => {
		const rects = await everyLabel.evaluateAll((els) =>
			els.map((e) => {
				const r = e.getBoundingClientRect();
				return { x: r.x, y: r.y, w: r.width, h: r.height, text: e.textContent ?? '' };
			})
		);
		for (let i = 0; i < rects.length; i++) {
			for (let j = i + 1; j < rects.length; j++) {
				const [a, b] = [rects[i], rects[j]];
				const apart = a.x + a.w <= b.x || b.x + b.w <= a.x || a.y + a.h <= b.y || b.y + b.h <= a.y;
				expect(apart, `"${a.text}" and "${b.text}" overlap`).toBe(true);
			}
		}
		return rects.length;
	};
	for (const text of await labels.allTextContents()) expect(text).toMatch(/\S ↔ \S.*: .* deep — /);
	expect(await noOverlap()).toBeGreaterThan(0);
	await page.screenshot({ path: testInfo.outputPath('spine-at-two-slots.png') });
	await scene.screenshot({ path: testInfo.outputPath('scene-at-two-slots.png') });

	// Back with the keyboard: nothing collides, no marker.
	await page.keyboard.press('ArrowLeft');
	await expect(spine).toHaveAttribute('aria-valuetext', '3 slots, 86.0\u2009mm');
	await expect(collides).toHaveCount(0);
	await expect(labels).toHaveCount(0);

	// Autosave, and a reload shows what was saved. Back at the saved state nothing new is written
	// unless the autosave of "2 slots" went out in between (then two revisions), so the revision is
	// at least the first; the "4 slots" move below must write exactly one more.
	await expect(status).toHaveText(/^Saved · change \d+$/);
	expect(await versionOf(page)).toBeGreaterThanOrEqual(firstVersion);
	const savedVersion = await versionOf(page);
	await page.reload();
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await expect(spine).toHaveAttribute('aria-valuetext', '3 slots, 86.0\u2009mm');
	await expect(status).toHaveText(`Saved · change ${savedVersion}`);

	// A position other than the one it opened with persists too: "4 slots" with the −1 button.
	await page.getByRole('button', { name: 'Spine: one position lower' }).click();
	await expect(spine).toHaveAttribute('aria-valuetext', '4 slots, 65.68\u2009mm');
	await expect(status).toHaveText(`Saved · change ${savedVersion + 1}`);
	await page.reload();
	await expect(spine).toHaveAttribute('aria-valuetext', '4 slots, 65.68\u2009mm');
	await expect(page.getByRole('slider', { name: 'Card support bar' })).toHaveAttribute(
		'aria-valuetext',
		/^0\.0\u2009mm/
	);
	await context.close();
});

test('a sweep of the spine loads its charts on demand and says where nothing collides', async ({
	browser
}, testInfo) => {
	await restoreDemoVariant();
	const { context, page } = await openEditor(browser);
	await page.getByRole('button', { name: 'every position at once' }).click();
	await expect(page.getByRole('combobox', { name: /^Move/ })).toHaveValue('divider:spine');
	await page.getByRole('button', { name: 'Run sweep' }).click();
	const table = page.getByRole('table', { name: 'Sweep results' });
	// "4 slots" and "3 slots" fit; at "2 slots" the card (21.3 cm³) and the pump-reservoir (16.0 cm³) collide.
	await expect(table.getByRole('row', { name: /^4 slots.*fits/ })).toBeVisible();
	await expect(table.getByRole('row', { name: /^3 slots.*fits/ })).toBeVisible();
	await expect(table.getByRole('row', { name: /^2 slots.*37\.3/ })).toBeVisible();
	await expect(page.getByText(/Nothing collides at 65\.68\smm – 86\.0\smm/)).toBeVisible();
	await expect(page.getByText(/Compartment size along the spine's axis/)).toBeVisible();
	const spine = page.getByRole('slider', { name: 'Spine' });
	// The bulkhead has one position: text, no slider, no ±1, no drag.
	await expect(page.getByRole('slider', { name: 'Bulkhead' })).toHaveCount(0);
	await expect(page.getByTestId('ctl-fixed-bulkhead')).toContainText('its only position');
	await expect(page.getByRole('button', { name: 'Bulkhead: one position lower' })).toHaveCount(0);
	// The chart: one mark per allowed position (3), the band over the two that fit and no further.
	const chart = page.getByRole('radiogroup', { name: 'Positions of Spine' });
	const marks = chart.getByRole('radio');
	await expect(marks).toHaveCount(3);
	const band = chart.getByTestId('sweep-band');
	await expect(band).toHaveCount(1);
	const markX = async (name: RegExp) => {
		const b = (await chart.getByRole('radio', { name }).locator('circle').first().boundingBox())!;
		return b.x + b.width / 2;
	};
	const bandBox = (await band.boundingBox())!;
	const [x4, x3, x2] = [await markX(/^4 slots/), await markX(/^3 slots/), await markX(/^2 slots/)];
	// Band edges 6 px past the first and last feasible mark; the colliding mark lies well outside.
	expect(bandBox.x).toBeGreaterThan(x4 - 8);
	expect(bandBox.x).toBeLessThan(x4);
	expect(bandBox.x + bandBox.width).toBeGreaterThan(x3);
	expect(bandBox.x + bandBox.width).toBeLessThan(x3 + 8);
	expect(x2).toBeGreaterThan(bandBox.x + bandBox.width + 20);
	await chart.screenshot({ path: testInfo.outputPath('sweep-chart.png') });

	// Clicking a mark applies that position; the arrow keys pick the neighbours.
	// (on the mark's column, the group around its circles, so the click lands on the mark itself)
	await chart.getByRole('radio', { name: /^2 slots/ }).click();
	await expect(spine).toHaveAttribute('aria-valuetext', '2 slots, 106.32\u2009mm');
	await expect(chart.getByRole('radio', { name: /^2 slots/ })).toHaveAttribute(
		'aria-checked',
		'true'
	);
	await chart.getByRole('radio', { name: /^2 slots/ }).focus();
	await page.keyboard.press('ArrowLeft');
	await expect(spine).toHaveAttribute('aria-valuetext', '3 slots, 86.0\u2009mm');
	await table.getByRole('button', { name: 'Use 2 slots' }).click();
	await expect(spine).toHaveAttribute('aria-valuetext', '2 slots, 106.32\u2009mm');
	await context.close();
});

test('a second browser saving first: the stale save gets the conflict view, and "keep mine" saves over it', async ({
	browser
}) => {
	await restoreDemoVariant();
	const a = await openEditor(browser);
	const b = await openEditor(browser);
	const opened = await versionOf(a.page);

	// B saves first: the spine to "4 slots".
	await b.page.getByRole('button', { name: 'Spine: one position lower' }).click();
	await expect(b.page.getByTestId('save-status')).toHaveText(`Saved · change ${opened + 1}`);

	// A, still on the version it opened, moves the spine the other way and autosaves: 409.
	await a.page.getByRole('button', { name: 'Spine: one position higher' }).click();
	const dialog = a.page.getByRole('dialog', {
		name: 'Someone saved this variant after you opened it'
	});
	await expect(dialog).toBeVisible();
	await expect(a.page.getByTestId('save-status')).toHaveText(
		'Not saved: someone saved a newer change'
	);
	// Both scenes side by side: mine at "2 slots", theirs at "4 slots".
	await expect(dialog.getByRole('heading', { name: 'Yours' }).locator('..')).toContainText(
		'Spine: 106.32\u2009mm'
	);
	await expect(
		dialog.getByRole('heading', { name: `Saved (change ${opened + 1})` }).locator('..')
	).toContainText('Spine: 65.68\u2009mm');

	await dialog.getByRole('button', { name: 'Keep mine and save it' }).click();
	await expect(dialog).toBeHidden();
	await expect(a.page.getByTestId('save-status')).toHaveText(`Saved · change ${opened + 2}`);

	// B reloads and sees A's scene.
	await b.page.reload();
	await expect(b.page.getByRole('slider', { name: 'Spine' })).toHaveAttribute(
		'aria-valuetext',
		'2 slots, 106.32\u2009mm'
	);
	await a.context.close();
	await b.context.close();
});

test('"use the saved version" takes the other browser’s scene and keeps mine one undo away', async ({
	browser
}) => {
	await restoreDemoVariant();
	const a = await openEditor(browser);
	const b = await openEditor(browser);
	await b.page.getByRole('button', { name: 'Spine: one position lower' }).click();
	await expect(b.page.getByTestId('save-status')).toHaveText('Saved · change 2');

	await a.page.getByRole('button', { name: 'Spine: one position higher' }).click();
	const dialog = a.page.getByRole('dialog', {
		name: 'Someone saved this variant after you opened it'
	});
	await dialog.getByRole('button', { name: 'Use the saved version' }).click();
	await expect(dialog).toBeHidden();
	const spine = a.page.getByRole('slider', { name: 'Spine' });
	await expect(spine).toHaveAttribute('aria-valuetext', '4 slots, 65.68\u2009mm');
	await expect(a.page.getByTestId('save-status')).toHaveText('Saved · change 2');
	await a.page.getByRole('button', { name: 'Undo' }).click();
	await expect(spine).toHaveAttribute('aria-valuetext', '2 slots, 106.32\u2009mm');
	await a.context.close();
	await b.context.close();
});

test('skip links: the fit report in three Tab presses at most, the 3D view likewise; adding a part is one stop', async ({
	browser
}, testInfo) => {
	const { context, page } = await openEditor(browser);
	await page.reload();
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	const active = () => page.evaluate(() => document.activeElement?.textContent?.trim() ?? '');
	let presses = 0;
	while (presses < 3 && (await active()) !== 'Skip to the fit report') {
		await page.keyboard.press('Tab');
		presses++;
	}
	expect(await active()).toBe('Skip to the fit report');
	await page.screenshot({ path: testInfo.outputPath('skip-link.png') });
	await page.keyboard.press('Enter');
	await expect(page.locator('#fit-report')).toBeFocused();
	// The next Tab lands inside the report.
	await page.keyboard.press('Tab');
	expect(await page.evaluate(() => !!document.activeElement?.closest('#fit-report, aside'))).toBe(
		true
	);

	await page.reload();
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await page.keyboard.press('Tab');
	await expect(page.getByRole('link', { name: 'Skip to the 3D view' })).toBeFocused();
	await page.keyboard.press('Enter');
	await expect(page.locator('#scene-view')).toBeFocused();

	// The catalogue search and its Add buttons stay closed until asked for.
	const add = page.getByRole('button', { name: 'Add a part' });
	await expect(add).toHaveAttribute('aria-expanded', 'false');
	await expect(page.getByRole('list', { name: 'Catalogue matches' })).toHaveCount(0);
	await add.click();
	await expect(page.getByRole('searchbox', { name: 'Search the catalogue' })).toBeVisible();

	// The toolbar keeps one height whatever the save status says.
	const bar = page.getByTestId('save-status').locator('xpath=../..');
	const before = (await bar.boundingBox())!.height;
	await page.getByRole('button', { name: 'Spine: one position lower' }).click();
	await expect(page.getByTestId('save-status')).toHaveText(/Saved · change \d+/);
	expect((await bar.boundingBox())!.height).toBe(before);
	await restoreDemoVariant();
	await context.close();
});
