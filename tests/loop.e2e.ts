/**
 * The coolant-loop panel in Chromium on the seeded demo build. The demo pump-reservoir's ports sit
 * 13 mm under the top panel, so a run straight from them cannot bend the way 12 mm hard tube
 * needs: the editor refuses the run with the scene schema's own words (the server's) and adds
 * nothing. The variant is put back to its seeded row before and after.
 */
import { expect, test } from '@playwright/test';
import { closeDb } from '../src/lib/server/db';
import { clearRateLimits } from '../src/lib/server/testing/factories';
import { restoreDemoVariant } from './helpers/demo-variant';

const DESIGNER = { email: 'designer@demo.interstice.test', password: 'demo-password-1' };

test.beforeAll(async () => {
	await restoreDemoVariant();
	await clearRateLimits('127.0.0.1');
});
test.afterAll(async () => {
	await restoreDemoVariant();
	await closeDb();
});

test('a run the tube cannot make is refused with the words of the scene check', async ({
	browser
}) => {
	const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
	const page = await context.newPage();
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(DESIGNER.email);
	await page.getByLabel('Password').fill(DESIGNER.password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL(/\/builds$/);
	await page.goto('/builds/demo-build');
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');

	const panel = page.locator('section[aria-labelledby="loop-h"]');
	await expect(panel.getByText('No loop yet.')).toBeVisible();
	await panel.getByRole('button', { name: 'Add a run' }).click();
	const form = panel.getByRole('form', { name: 'New run' });
	await form
		.getByLabel('From port')
		.selectOption({ label: 'Compact pump-reservoir, 58 mm thick · out (G 1/4)' });
	await form
		.getByLabel('To port')
		.selectOption({ label: 'Compact CPU block, 26 mm tall · in (G 1/4)' });
	await expect(form.getByRole('combobox', { name: /^Tube/ })).toHaveValue('demo-hard-12');
	await form.getByRole('button', { name: 'Add the run' }).click();
	await expect(form.getByRole('alert')).toContainText(
		'loops[0].runs[0].to: Hard tube runs along one axis at a time: the first segment moves along'
	);
	// Nothing was added: still no loop.
	await expect(panel.getByText('No loop yet.')).toBeVisible();

	// A waypoint that is not three numbers is caught before the check.
	await form.getByLabel(/Waypoints/).fill('10, 20');
	await form.getByRole('button', { name: 'Add the run' }).click();
	await expect(form.getByRole('alert')).toContainText(
		'Waypoint line 1: three numbers in millimetres, x, y, z'
	);
	await context.close();
});
