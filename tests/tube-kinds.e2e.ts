/** The catalogue's tube kinds page from a designer's chair: add a 14 mm hard tube, see it listed. */
import { expect, test } from '@playwright/test';
import { closeDb, createMember, createStudio, signInAs } from './helpers/accounts';

test.afterAll(async () => {
	await closeDb();
});

test('a designer adds a 14 mm hard tube kind and sees it in the list', async ({
	page,
	context,
	baseURL
}) => {
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	await signInAs(context, baseURL!, designer.id);
	await page.goto('/parts');
	await page.getByRole('link', { name: 'Tube kinds' }).click();
	await expect(page.getByRole('heading', { name: 'Tube kinds', level: 1 })).toBeVisible();

	const add = page.getByRole('form', { name: 'Add a tube kind' });
	await add.getByLabel('Name').fill('Hard tube 14 mm');
	await add.getByLabel('Kind').selectOption('hard');
	await add.getByLabel('Inner diameter (mm)').fill('10');
	await add.getByLabel('Outer diameter (mm)').fill('14');
	await add.getByLabel('Minimum bend radius (mm)').fill('28');
	await add.getByLabel('Price per metre').fill('6.50');
	await add.getByRole('button', { name: 'Add tube kind' }).click();

	await expect(page.getByRole('status')).toHaveText('Tube kind added.');
	const row = page
		.getByRole('table', { name: 'Tube kinds' })
		.getByRole('row', { name: /Hard tube 14 mm/ });
	await expect(row).toContainText('14 mm');
	await expect(row).toContainText('28 mm');
	await expect(row).toContainText('6.50 EUR');
	await expect(row).toContainText('In use');
});
