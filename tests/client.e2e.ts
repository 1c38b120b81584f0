/**
 * The client's side, end to end: a designer shares a variant by e-mail and shows the quote; the
 * client opens the mailed link in a fresh browser (no account), reads the fit, turns the model,
 * comments on a part, approves, and pays the deposit on the local payment fake's hosted page; the
 * designer's build then shows the approval and the payment.
 */
import { expect, test, type Page } from '@playwright/test';
import { demoBuild } from '../src/lib/server/testing/sharing';
import {
	clearBrowserRateLimits,
	closeDb,
	createMember,
	createStudio,
	signInAs,
	uniqueEmail
} from './helpers/accounts';
import { extractLink, waitForMail } from './helpers/mail';

test.beforeAll(async () => {
	await clearBrowserRateLimits();
});
test.afterAll(async () => {
	await closeDb();
});

async function shot(page: Page, testInfo: import('@playwright/test').TestInfo, name: string) {
	const path = testInfo.outputPath(`${name}.png`);
	await page.screenshot({ path, fullPage: true });
	await testInfo.attach(name, { path, contentType: 'image/png' });
}

test('share by e-mail, the client reviews, comments, approves and pays the deposit', async ({
	page,
	context,
	browser,
	baseURL
}, testInfo) => {
	test.setTimeout(120_000);
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const build = await demoBuild({
		studioId: studio.id,
		createdBy: designer.id,
		name: 'Walnut desk build'
	});
	const clientEmail = uniqueEmail('client');

	// The designer shares Variant A with the client by e-mail, and shows the quote.
	await signInAs(context, baseURL!, designer.id);
	await page.goto(`/builds/${build.buildId}/share`);
	await expect(page.getByRole('heading', { name: 'Share with client' })).toBeVisible();
	await page.getByLabel("Client's e-mail").fill(clientEmail);
	await page.getByLabel("Client's name").fill('Rowan Client');
	await page.getByLabel('Stops working').selectOption('30');
	await page.getByRole('button', { name: 'Create link' }).click();
	await expect(page.getByTestId('created-link')).toContainText(`e-mailed to ${clientEmail}`);
	await expect(page.getByTestId('links')).toContainText('Rowan Client');

	await page.getByRole('link', { name: 'Quote' }).first().click();
	await expect(page.getByRole('heading', { name: 'Quote' })).toBeVisible();
	// Opening the page stores nothing; the quote starts on the designer's click.
	await page.getByRole('button', { name: 'Start the quote' }).click();
	await page.getByLabel('Labour (EUR)').fill('150');
	await page.getByLabel('Tax rate (%)').fill('20');
	// Worked example: parts 1,038.40 + labour 150.00 = 1,188.40; 20 % tax 237.68; total 1,426.08.
	await expect(page.getByTestId('live-total')).toHaveText('€1,426.08');
	await page.getByRole('button', { name: 'Save quote' }).click();
	await expect(page.getByText('Saved.')).toBeVisible();
	await page.getByRole('button', { name: 'Show to the client' }).click();
	await expect(page.getByText(/sent .*: the client sees it/)).toBeVisible();

	// The client opens the mailed link in a browser of their own.
	const mail = await waitForMail(clientEmail, { subject: 'Your build preview' });
	const link = extractLink(mail.text, '/s/');
	const clientContext = await browser.newContext();
	const client = await clientContext.newPage();
	await client.setViewportSize({ width: 1280, height: 900 });
	await client.goto(link);
	await expect(client.getByRole('heading', { name: 'Walnut desk build' })).toBeVisible();
	// The demo's card (±1 mm) is 2 mm from the right panel: under the 2 mm margin in the worst case.
	await expect(client.getByTestId('fit-headline')).toHaveText(
		/^Everything fits, but 2 places are closer than .*2\.0\u2009mm \(1\.0 worst case\) to the right of the graphics card/
	);
	await expect(client.getByRole('heading', { name: 'Good to know' })).toBeVisible();
	await expect(client.getByTestId('quote-total')).toHaveText('€1,426.08');

	// The model arrives after the summary; dragging turns it.
	const preview = client.getByTestId('preview');
	await expect(preview).toHaveAttribute('data-ready', 'yes', { timeout: 30_000 });
	const canvas = preview.locator('canvas');
	await expect(canvas).toBeVisible();
	const box = (await canvas.boundingBox())!;
	await client.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
	await client.mouse.down();
	await client.mouse.move(box.x + box.width / 2 + 160, box.y + box.height / 2 + 30, { steps: 12 });
	await client.mouse.up();
	await expect(preview).not.toHaveAttribute('data-camera', '');
	const turned = await preview.getAttribute('data-camera');
	await client.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
	await client.mouse.down();
	await client.mouse.move(box.x + box.width / 2 - 200, box.y + box.height / 2, { steps: 12 });
	await client.mouse.up();
	await expect(preview).not.toHaveAttribute('data-camera', turned!);
	await shot(client, testInfo, 'client-page-desktop');

	// Tap a part: its name and size; comment on it. Markup in a comment stays text.
	await client.mouse.click(box.x + box.width / 2, box.y + box.height / 2);
	const picked = preview.locator('..').getByText(/\(width × height × depth\)/);
	await expect(picked).toBeVisible();
	await client.getByRole('button', { name: 'Comment on this part' }).click();
	const pinned = await client
		.getByLabel('About')
		.evaluate((s: HTMLSelectElement) => s.selectedOptions[0].textContent ?? '');
	expect(pinned).toMatch(/^.+ — .+$/);
	const partName = pinned.split(' — ')[1];
	await client
		.getByLabel('Comment', { exact: true })
		.fill('Is there room to reach the <b>fittings</b> here?');
	await client.getByRole('button', { name: 'Post comment' }).click();
	const thread = client.getByTestId('thread');
	await expect(thread).toContainText('Is there room to reach the <b>fittings</b> here?');
	await expect(thread).toContainText(`(${partName})`);
	await expect(thread.locator('b')).toHaveCount(0);
	await waitForMail(designer.email, { subject: 'New comment on Walnut desk build' });

	// Approve version 1, then pay.
	await client.getByRole('button', { name: 'Approve version 1' }).click();
	await client.getByLabel('Message (optional)').fill('Looks right, go ahead.');
	await client.getByRole('button', { name: 'Confirm approval' }).click();
	await expect(client.getByTestId('approved')).toContainText('Approved by Rowan Client');
	await waitForMail(designer.email, { subject: 'Approved: Walnut desk build' });

	// Deposit: 30 % of 1,426.08 = 427.824 → 427.82 (half up).
	await client.getByRole('button', { name: 'Pay the €427.82 deposit' }).click();
	await expect(client.getByRole('heading', { name: 'Test checkout' })).toBeVisible();
	await client.getByLabel('Card number').fill('4242 4242 4242 4242');
	await client.getByLabel('Expiry (MM/YY)').fill('12/39');
	await client.getByLabel('CVC').fill('123');
	await client.getByLabel('Name on card').fill('Rowan Client');
	await client.getByRole('button', { name: /^Pay / }).click();
	await expect(client).toHaveURL(/\/s\/[A-Za-z0-9_-]{43}\?deposit=paid#deposit$/);
	await expect(client.getByTestId('deposit-paid')).toContainText('Deposit paid: €427.82');
	await waitForMail(designer.email, { subject: 'Deposit paid: Walnut desk build' });

	// A phone, 390 px wide.
	await client.setViewportSize({ width: 390, height: 844 });
	await client.goto(link);
	await expect(client.getByTestId('fit-headline')).toBeVisible();
	await expect(client.getByTestId('preview')).toHaveAttribute('data-ready', 'yes', {
		timeout: 30_000
	});
	const width = await client.evaluate(() => document.documentElement.scrollWidth);
	expect(width, 'nothing wider than the phone').toBeLessThanOrEqual(390);
	await shot(client, testInfo, 'client-page-phone');
	await clientContext.close();

	// The designer's build shows both.
	await page.goto(`/builds/${build.buildId}/share`);
	const row = page.getByTestId('variant-Variant A');
	await expect(row.getByTestId('approval-state')).toHaveText('Approved');
	await expect(row).toContainText('Rowan Client');
	await expect(row.getByTestId('deposit-state')).toContainText('Deposit paid €427.82');
	await expect(page.getByTestId('links')).toContainText(/Last opened .*\(3×\)/);
});

test('a revoked link shows a clear page, and so does one that never existed', async ({ page }) => {
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const build = await demoBuild({ studioId: studio.id, createdBy: designer.id });
	const { createShareLink, revokeShareLink } = await import('../src/lib/server/sharing/links');
	const { link, token } = await createShareLink({
		studioId: studio.id,
		buildId: build.buildId,
		variantId: build.variantId,
		createdBy: designer.id
	});
	await revokeShareLink(build.buildId, link.id);
	const res = await page.goto(`/s/${token}`);
	expect(res?.status()).toBe(410);
	await expect(page.getByRole('heading', { name: 'This link no longer works' })).toBeVisible();
	await expect(page.getByText(`${studio.name} withdrew this link`)).toBeVisible();
	const missing = await page.goto(`/s/${'Q'.repeat(43)}`);
	expect(missing?.status()).toBe(404);
	await expect(page.getByRole('heading', { name: 'This link does not work' })).toBeVisible();
});

test('photos: the designer uploads with progress, a disguised file is refused, the client sees the photo', async ({
	page,
	context,
	browser,
	baseURL
}) => {
	const sharp = (await import('sharp')).default;
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const build = await demoBuild({ studioId: studio.id, createdBy: designer.id });
	const { createShareLink } = await import('../src/lib/server/sharing/links');
	const { token } = await createShareLink({
		studioId: studio.id,
		buildId: build.buildId,
		variantId: build.variantId,
		createdBy: designer.id
	});
	const photo = await sharp({
		create: { width: 1600, height: 1200, channels: 3, background: '#7f8b9c' }
	})
		.jpeg({ quality: 90 })
		.toBuffer();

	await signInAs(context, baseURL!, designer.id);
	await page.goto(`/builds/${build.buildId}/photos`);
	await page.getByLabel(/^Photos \(JPEG, PNG or WebP/).setInputFiles([
		{ name: 'bench.jpg', mimeType: 'image/jpeg', buffer: photo },
		{
			name: 'notes.jpg',
			mimeType: 'image/jpeg',
			buffer: Buffer.from('a text file wearing a photo name')
		}
	]);
	await page.getByLabel('Caption (optional)').fill('Loop filled, leak test running');
	await page.getByRole('button', { name: 'Upload' }).click();
	const uploads = page.getByRole('list', { name: 'Uploads' });
	await expect(uploads.getByText('done')).toBeVisible();
	await expect(uploads.getByRole('alert')).toContainText('Only JPEG, PNG and WebP');
	await expect(page.getByTestId('photos').getByRole('img')).toHaveCount(1);

	const clientContext = await browser.newContext();
	const client = await clientContext.newPage();
	await client.goto(`/s/${token}`);
	const img = client.getByRole('img', { name: 'Loop filled, leak test running' });
	await img.scrollIntoViewIfNeeded();
	await expect.poll(() => img.evaluate((i: HTMLImageElement) => i.naturalWidth)).toBe(480);
	await clientContext.close();
});
