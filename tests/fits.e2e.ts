/**
 * "What fits here" in Chromium on the seeded demo build. Known answers, by hand: the front mount
 * takes 64 mm for a 280 (no plate); the demo's 30 mm 280 radiator with two 15 mm 140 fans is 45 mm,
 * 19 mm spare; with 25 mm fans 55 mm, 9 mm spare. The demo card in its place at "3 slots" is 2 mm
 * from the right panel: 2.0 mm spare (tight in the worst case). The variant is put back to its seeded row before and after.
 */
import { expect, test } from '@playwright/test';
import { closeDb } from '../src/lib/server/db';
import { clearRateLimits } from '../src/lib/server/testing/factories';
import { restoreDemoVariant } from './helpers/demo-variant';

test.describe.configure({ mode: 'serial' });
test.beforeAll(async () => {
	await restoreDemoVariant();
	await clearRateLimits('127.0.0.1');
});
test.afterAll(async () => {
	await restoreDemoVariant();
	await closeDb();
});

async function openEditor(page: import('@playwright/test').Page) {
	await page.setViewportSize({ width: 1440, height: 900 });
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill('designer@demo.interstice.test');
	await page.getByLabel('Password').fill('demo-password-1');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL(/\/builds$/);
	await page.goto('/builds/demo-build');
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/);
}

test('the front radiator mount: combinations with spare mm; placing one updates the report', async ({
	page
}) => {
	await openEditor(page);
	const stack = page.getByRole('meter', { name: 'Front radiator mount stack' });
	await expect(stack).toHaveAttribute('aria-valuetext', '55.0 of 64.0 mm');
	await page.getByLabel('What fits here: the place').selectOption('mount:radiator');
	await page.getByRole('button', { name: 'Find what fits' }).click();
	const combos = page.getByRole('list', { name: 'Radiator and fan combinations' });
	const slim = combos.locator('[data-combination="demo-radiator-280+2xstd-fan-140-15"]');
	await expect(slim).toContainText('19.0\u2009mm spare');
	await expect(
		combos.locator('[data-combination="demo-radiator-280+2xstd-fan-140-25"]')
	).toContainText('9.0\u2009mm spare');
	await slim.getByRole('button', { name: /^Place / }).click();
	// The report follows: the stack is 30 + 15 = 45 mm of 64.
	await expect(stack).toHaveAttribute('aria-valuetext', '45.0 of 64.0 mm');
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/);
});

test('parts × positions for two cards: the demo card at 3 slots has 2.0 mm spare, at 2 slots it collides', async ({
	page
}) => {
	await restoreDemoVariant();
	await openEditor(page);
	await page.getByLabel('What fits here: the place').selectOption('replace:card');
	await page.getByLabel('Kind of part').selectOption('gpu');
	await page.getByRole('button', { name: 'Find what fits' }).click();
	const fits = page.getByRole('list', { name: 'Parts that fit here' });
	await expect(fits.locator('[data-fit="demo-card"]')).toBeVisible();
	await fits
		.getByLabel('Compare Compact graphics card, two slots, 185 mm across positions')
		.check();
	// A second card that does not fit in the card's place at 3 slots: the one-slot 268 mm card.
	await page.getByText(/that do not fit$/).click();
	await page
		.getByLabel('Compare Graphics card with full-cover block, one slot, 268 mm across positions')
		.check();
	await page.getByLabel('Control for parts × positions').selectOption({ label: 'Spine' });
	await page.getByRole('button', { name: 'Parts × positions' }).click();
	const grid = page.getByRole('table', { name: 'Parts × positions' });
	// Tight: 2 mm from the right panel, 1 mm in the worst case (the card is ±1 mm) under a 2 mm margin.
	await expect(grid.locator('[data-cell="demo-card@3 slots"]')).toContainText('tight');
	await expect(grid.locator('[data-cell="demo-card@3 slots"]')).toContainText('2.0\u2009mm spare');
	await expect(grid.locator('[data-cell="demo-card@2 slots"]')).toContainText('collides');
	await expect(grid.locator('tbody tr')).toHaveCount(2);
	await expect(grid.locator('[data-cell^="demo-card-block@"]')).toHaveCount(3);
});

test('parts × positions in the compare view: two cards, read a cell in each variant', async ({
	page
}) => {
	await restoreDemoVariant();
	await openEditor(page);
	// A second variant to compare with: a copy of the demo variant, the same scene.
	await page.getByRole('button', { name: '+ Copy variant' }).click();
	await page.waitForURL(/variant=/);
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	const forkId = new URL(page.url()).searchParams.get('variant')!;
	await page.goto(`/builds/demo-build/compare?variants=demo-variant-a,${forkId}`);
	await page
		.getByLabel('Compare parts × positions: the place')
		.selectOption({ label: 'in place of Compact graphics card, two slots, 185 mm' });
	await page.getByLabel('Compare parts × positions: kind of part').selectOption('gpu');
	await page.getByRole('button', { name: 'List parts' }).click();
	const pick = page.getByRole('list', { name: 'Parts to compare' });
	await pick.getByLabel('Compact graphics card, two slots, 185 mm').check();
	await pick.getByLabel('Graphics card with full-cover block, one slot, 268 mm').check();
	await page.getByLabel('Compare parts × positions: control').selectOption({ label: 'Spine' });
	await page.getByRole('button', { name: 'Compare across positions' }).click();
	const grid = page.getByRole('table', { name: 'Parts × positions in each variant' });
	// The same answers as in the editor, in both variants: 2.0 mm spare at 3 slots (tight: the card
	// is ±1 mm, 1 mm in the worst case under the 2 mm margin), a collision at 2 slots.
	for (const v of [0, 1]) {
		await expect(grid.locator(`[data-cell="${v}:demo-card@3 slots"]`)).toContainText('tight');
		await expect(grid.locator(`[data-cell="${v}:demo-card@3 slots"]`)).toContainText(
			'2.0\u2009mm spare'
		);
		await expect(grid.locator(`[data-cell="${v}:demo-card@2 slots"]`)).toContainText('collides');
	}
	await expect(grid.locator('tbody tr')).toHaveCount(2);
});
