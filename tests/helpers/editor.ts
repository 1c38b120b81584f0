/**
 * The demo build's editor as the demo designer sees it: signed in through the form, in a wide
 * window, once the editor says it is ready.
 */
import { expect, type Browser } from '@playwright/test';

const DESIGNER = { email: 'designer@demo.interstice.test', password: 'demo-password-1' };

export async function openDemoEditor(browser: Browser) {
	const context = await browser.newContext({ viewport: { width: 1440, height: 900 } });
	const page = await context.newPage();
	await page.goto('/signin');
	await page.getByLabel('E-mail').fill(DESIGNER.email);
	await page.getByLabel('Password').fill(DESIGNER.password);
	await page.getByRole('button', { name: 'Sign in' }).click();
	await page.waitForURL(/\/builds$/);
	await page.goto('/builds/demo-build');
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	return { context, page };
}
