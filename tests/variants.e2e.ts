import { expect, test, type Page } from '@playwright/test';

async function signIn(page: Page, email: string) {
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(email);
	await page.getByLabel('Password').fill('demo-password-1');
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL(/\/builds/);
}

test('fork a variant, move the bracket in the fork, compare, cameras follow', async ({ page }) => {
	await signIn(page, 'designer@demo.interstice.test');
	await page.goto('/builds/demo-build?variant=demo-variant-a');
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await expect(page.getByTestId('save-status')).toContainText('Saved');
	await page.getByRole('button', { name: '+ Copy variant' }).click();
	await page.waitForURL(/variant=/);
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	const forkId = new URL(page.url()).searchParams.get('variant')!;
	expect(forkId).not.toBe('demo-variant-a');
	// The copy is named after its source: "<name> — copy" (a number after it when that is taken).
	await expect(page).toHaveTitle(/ — copy( \d+)? · Interstice$/);

	// Raise the card support bar one step (10 mm) with the keyboard on its slider.
	const bar = page.getByRole('slider', { name: 'Card support bar' });
	await bar.focus();
	await page.keyboard.press('ArrowRight');
	await expect(page.getByTestId('ctl-value-bar')).toHaveText('10.0\u2009mm');
	await expect(page.getByTestId('save-status')).toContainText('Saved · change 2', {
		timeout: 15_000
	});

	await page.goto(`/builds/demo-build/compare?variants=demo-variant-a,${forkId}`);
	const table = page.getByRole('table', { name: 'Differences between variants' });
	await page.getByLabel('Only differences').check();
	// The bar rose 10 mm into the card standing on it: the card's gap below now reads as that
	// overlap, in words, with no negative change beside it.
	const row = table.locator('tr[data-row="part:card:gap:-y"]');
	await expect(row).toBeVisible();
	await expect(row).toContainText('overlaps the card support bar by 10.0\u2009mm');
	await expect(row.locator('[data-delta]')).toHaveCount(0);
	await expect(row).not.toContainText('−');
	await expect(table.locator('tr[data-row="total:interference"]')).toBeVisible();

	// Orbit the first view; the second view's camera follows.
	const views = page.getByTestId('compare-view');
	await expect(views).toHaveCount(2);
	const first = views.nth(0);
	const box = (await first.boundingBox())!;
	await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
	await page.mouse.down();
	await page.mouse.move(box.x + box.width / 2 + 120, box.y + box.height / 2 + 30, { steps: 8 });
	await page.mouse.up();
	await expect(first).not.toHaveAttribute('data-camera', '');
	const moved = await first.getAttribute('data-camera');
	await expect(views.nth(1)).toHaveAttribute('data-camera', moved!);
	await page.screenshot({ path: 'test-results/compare.png', fullPage: false });

	// Unlinked: orbiting the first no longer moves the second.
	await page.getByLabel('Cameras move together').uncheck();
	await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
	await page.mouse.down();
	await page.mouse.move(box.x + box.width / 2 - 150, box.y + box.height / 2, { steps: 8 });
	await page.mouse.up();
	await expect(first).not.toHaveAttribute('data-camera', moved!);
	await expect(views.nth(1)).toHaveAttribute('data-camera', moved!);

	// Clean up: delete the fork so other tests see the seeded build.
	await page.goto('/builds/demo-build/variants');
	const item = page
		.locator('li', { has: page.locator(`input[name="variantId"][value="${forkId}"]`) })
		.first();
	await item.getByLabel('sure').check();
	await item.getByRole('button', { name: 'Delete' }).click();
	await expect(page.getByRole('status')).toContainText('Deleted');
});
