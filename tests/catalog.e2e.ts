/**
 * The catalogue from a designer's chair: model an enclosure with a movable divider and watch the
 * inside (litres, compartments, 3D preview) follow; import a CSV with one bad row, commit the good
 * ones, and find an imported part by searching.
 */
import { expect, test } from '@playwright/test';
import { closeDb, createMember, createStudio, signInAs } from './helpers/accounts';

test.afterAll(async () => {
	await closeDb();
});

async function designerIn(context: Parameters<typeof signInAs>[0], baseURL: string) {
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	await signInAs(context, baseURL, designer.id);
	return { studio, designer };
}

test('a designer creates an enclosure with a divider and sees the 3D preview and the litres', async ({
	page,
	context,
	baseURL
}, testInfo) => {
	await designerIn(context, baseURL!);
	await page.goto('/enclosures');
	await page.getByRole('link', { name: 'New enclosure' }).click();
	await expect(page.getByRole('heading', { name: 'New enclosure' })).toBeVisible();

	await page.getByLabel('Name', { exact: true }).fill('Bench sandwich');
	await page.getByLabel('Width (X), mm').fill('180');
	// Worked example: (180 − 4) × (320 − 4) × (240 − 4) mm³ = 13,125,376 mm³ = 13.13 L (1 L = 10⁶ mm³, SI).
	await expect(page.getByTestId('inner-litres')).toHaveText('13.13 L');

	await page.getByRole('button', { name: 'Add divider' }).click();
	const divider = page.getByRole('group', { name: 'Divider 1' });
	await divider.getByLabel('High side is called').fill('card side');
	await divider.getByLabel('Low side is called').fill('CPU side');
	await divider.getByLabel(/Positions by slots left/).fill('2, 3');
	await divider.getByRole('button', { name: 'Fill positions' }).click();
	// PCI Express CEM spec: 20.32 mm slot pitch. Three slots on the high side of a 2 mm divider in
	// 176 mm: offset 176 − 2 − 60.96 = 113.04 mm.
	await expect(divider.getByLabel('Near face at').nth(1)).toHaveValue('113.04');

	const preview = page.getByRole('complementary', { name: 'Preview' });
	await preview.getByLabel('Show Divider 1 at').selectOption({ label: '3 slots (113.04 mm)' });
	await expect(preview.getByRole('row', { name: /card side/ })).toContainText(
		/60\.96\smm × 316\.0\smm × 236\.0\smm/
	);
	await expect(preview.getByRole('row', { name: /CPU side/ })).toContainText(
		/113\.04\smm × 316\.0\smm × 236\.0\smm/
	);
	await expect(page.getByTestId('preview-canvas').locator('canvas')).toBeVisible();

	await page.getByRole('button', { name: 'Create enclosure' }).click();
	await expect(page).toHaveURL(/\/enclosures\/\w+\?saved=1$/);
	await expect(page.getByRole('heading', { name: 'Bench sandwich' })).toBeVisible();
	await expect(page.getByTestId('inner-litres')).toHaveText('13.13 L');
	await expect(
		page.getByRole('group', { name: 'Divider 1' }).getByLabel('Position name').first()
	).toHaveValue('2 slots');
	await expect(page.getByTestId('preview-canvas').locator('canvas')).toBeVisible();
	await page.waitForTimeout(500);
	await testInfo.attach('enclosure editor', {
		body: await page.screenshot({ fullPage: true }),
		contentType: 'image/png'
	});
});

test('a designer imports a CSV with one bad row, commits the good rows and finds a part by searching', async ({
	page,
	context,
	baseURL
}, testInfo) => {
	await designerIn(context, baseURL!);
	const tag = Date.now().toString(36);
	const csv = [
		'name,category,width_mm,height_mm,depth_mm,price,provenance',
		`Flow meter ${tag},other,30,25,60,39.00,measured`,
		`Short pump ${tag},pump,62,50,-4,,estimate`,
		`Tall reservoir ${tag},reservoir,60,180,60,,datasheet`
	].join('\n');

	await page.goto('/parts');
	await page.getByRole('link', { name: 'Import CSV' }).click();
	await page
		.getByLabel(/CSV file/)
		.setInputFiles({ name: 'bench.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) });
	await page.getByRole('button', { name: 'Check the file' }).click();
	await expect(page.getByRole('heading', { name: /2 rows ready, 1 with problems/ })).toBeVisible();
	await expect(page.getByRole('row', { name: new RegExp(`Short pump ${tag}`) })).toContainText(
		'row 3: depth must be a positive number in mm'
	);
	await testInfo.attach('import preview', {
		body: await page.screenshot({ fullPage: true }),
		contentType: 'image/png'
	});

	await page.getByRole('button', { name: 'Import 2 valid rows' }).click();
	await expect(
		page.getByRole('heading', { name: 'Imported: 2 created, 0 updated, 1 skipped' })
	).toBeVisible();

	await page.goto('/parts');
	await page.getByRole('searchbox', { name: 'Search' }).fill(`meter ${tag}`);
	await page.getByRole('button', { name: 'Find' }).click();
	const table = page.getByRole('table');
	await expect(table.getByRole('link', { name: `Flow meter ${tag}` })).toBeVisible();
	await expect(table.getByRole('link', { name: `Tall reservoir ${tag}` })).toHaveCount(0);
	await expect(table.getByRole('link', { name: `Short pump ${tag}` })).toHaveCount(0);
	await expect(page.getByText('1 part · page 1 of 1')).toBeVisible();
	await testInfo.attach('search', {
		body: await page.screenshot({ fullPage: true }),
		contentType: 'image/png'
	});
});

test('a second save of the same enclosure is stopped, keeps what was typed and offers the newer version', async ({
	page,
	context,
	baseURL
}) => {
	await designerIn(context, baseURL!);
	await page.goto('/enclosures/new');
	// A new enclosure starts from a plain box, shown at once with its inside, and says to change it.
	// 200 × 320 × 240 mm outside less two 2 mm panels per axis = 196 × 316 × 236 mm inside.
	await expect(page.getByText(/Inside 196\.0\smm × 316\.0\smm × 236\.0\smm/)).toBeVisible();
	await expect(page.getByRole('note')).toContainText('change the sizes');
	await page.getByLabel('Name', { exact: true }).fill('Shared bench box');
	await page.getByRole('button', { name: 'Create enclosure' }).click();
	await expect(page).toHaveURL(/\/enclosures\/\w+\?saved=1$/);
	const address = page.url().replace(/\?.*$/, '');

	const other = await context.newPage();
	await other.goto(address);
	await other.getByLabel('Name', { exact: true }).fill('Renamed in the other tab');
	await other.getByRole('button', { name: 'Save enclosure' }).click();
	await expect(other.getByRole('status')).toHaveText('Saved.');

	await page.goto(address);
	await other.close();
	// This tab loaded revision 2; make the other save first again, then save here.
	const third = await context.newPage();
	await third.goto(address);
	await third.getByLabel('Width (X), mm').fill('210');
	await third.getByRole('button', { name: 'Save enclosure' }).click();
	await expect(third.getByRole('status')).toHaveText('Saved.');
	await third.close();

	await page.getByLabel('Name', { exact: true }).fill('Typed here');
	await page.getByRole('button', { name: 'Save enclosure' }).click();
	await expect(
		page.getByRole('alert').filter({ hasText: 'Not saved: someone else saved first' })
	).toBeVisible();
	await expect(page.getByLabel('Name', { exact: true })).toHaveValue('Typed here');
	await page.getByRole('button', { name: 'Load their version into the form' }).click();
	await expect(page.getByLabel('Width (X), mm')).toHaveValue('210');
	await expect(page.getByLabel('Name', { exact: true })).toHaveValue('Renamed in the other tab');
});

test('a standard part reads in words: spec labels and where its dimensions come from, never keys', async ({
	page,
	context,
	baseURL
}) => {
	await designerIn(context, baseURL!);
	await page.goto('/parts/std-card-dual-slot');
	await expect(
		page.getByRole('heading', { name: 'Add-in card, full length, two slots' })
	).toBeVisible();
	const main = page.locator('main');
	await expect(main).toContainText('Card length');
	await expect(main).toContainText('312\u2009mm');
	await expect(main).toContainText('Slots taken');
	await expect(main).toContainText('Dimensions from');
	// No schema key (camelCase or a dashed category) and no retired label on the page.
	const text = await main.innerText();
	expect(text).not.toMatch(/\b[a-z]+[A-Z][A-Za-z]*\b/);
	expect(text).not.toMatch(/\bProvenance\b|\bcpu-block\b/);
	await expect(page.getByRole('button', { name: 'Copy part' })).toBeVisible();
});
