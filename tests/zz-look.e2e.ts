// Throwaway: screenshots of the main screens for a read-through (not committed).
import { test } from '@playwright/test';
import { writeFileSync } from 'node:fs';
import { closeDb, signInAs } from './helpers/accounts';

test.afterAll(async () => closeDb());

test('screens', async ({ page, context, baseURL }) => {
	test.setTimeout(180_000);
	await page.setViewportSize({ width: 1440, height: 1000 });
	await signInAs(context, baseURL!, 'demo-designer');
	const shots: [string, string][] = [
		['editor-b', '/builds/demo-build?variant=demo-variant-b'],
		['compare', '/builds/demo-build/compare'],
		['sheet-b', '/builds/demo-build/sheet?variant=demo-variant-b'],
		['client', '/s/v/demo-variant-a'],
		['share', '/builds/demo-build/share'],
		['parts', '/parts'],
		['enclosure', '/enclosures']
	];
	for (const [name, url] of shots) {
		await page.goto(url);
		await page.waitForLoadState('networkidle').catch(() => {});
		await page.waitForTimeout(2500);
		await page.screenshot({ path: `/tmp/e-look/${name}.png`, fullPage: true });
		const text = await page.locator('body').innerText();
		writeFileSync(`/tmp/e-look/${name}.txt`, text);
	}
});
