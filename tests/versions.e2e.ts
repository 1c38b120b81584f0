/**
 * Approval freezes a variant, end to end: the client member approves version 1 in the app; the
 * designer finds the editor read-only with the band, starts a new variant from it, moves the spine,
 * saves it as version 2 and sends it; the client finds it on the builds page and reads what changed.
 */
import { expect, test } from '@playwright/test';
import { createShareLink } from '../src/lib/server/sharing/links';
import { demoBuild } from '../src/lib/server/testing/sharing';
import {
	clearBrowserRateLimits,
	closeDb,
	createMember,
	createStudio,
	signInAs
} from './helpers/accounts';

test.beforeAll(async () => {
	await clearBrowserRateLimits();
});
test.afterAll(async () => {
	await closeDb();
});

test('approve as the client; the designer starts a new variant from it, changes it and sends version 2; the client sees what changed', async ({
	page,
	context,
	browser,
	baseURL
}) => {
	test.setTimeout(120_000);
	const studio = await createStudio();
	const designer = await createMember(studio.id, 'designer');
	const clientMember = await createMember(studio.id, 'client');
	const build = await demoBuild({
		studioId: studio.id,
		createdBy: designer.id,
		name: 'Oak shelf build'
	});
	await createShareLink({
		studioId: studio.id,
		buildId: build.buildId,
		variantId: build.variantId,
		createdBy: designer.id,
		recipientEmail: clientMember.email,
		recipientName: 'Sam Client'
	});

	// The client member finds it on the builds page, waiting for them, and approves version 1.
	const clientContext = await browser.newContext();
	await signInAs(clientContext, baseURL!, clientMember.id);
	const client = await clientContext.newPage();
	await client.goto('/builds');
	const card = client
		.getByRole('list', { name: 'Shared with you' })
		.getByRole('link', { name: /Oak shelf build/ });
	await expect(card).toContainText('waiting for you');
	await card.click();
	await expect(client.getByTestId('client-version')).toHaveText('version 1');
	await client.getByRole('button', { name: 'Approve version 1' }).click();
	await client.getByRole('button', { name: 'Confirm approval' }).click();
	await expect(client.getByTestId('approved')).toContainText('(version 1)');

	// The designer's editor is read-only, with the band and its one button.
	await signInAs(context, baseURL!, designer.id);
	await page.goto(`/builds/${build.buildId}?variant=${build.variantId}`);
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	const band = page.getByTestId('read-only-band');
	await expect(band).toContainText('Read-only: approved by the client.');
	await expect(band).toContainText(
		/Version 1 was approved by .+ on \d{1,2} \w{3} \d{4}\. To change it, start a new variant from it\./
	);
	await band.getByRole('button', { name: 'Start a new variant from it' }).click();

	// The new variant is open for changes: move the spine one slot, save it as version 2.
	await expect(page).toHaveURL(/\?variant=/);
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await expect(page.getByTestId('read-only-band')).toHaveCount(0);
	const spine = page.getByRole('slider', { name: 'Spine' });
	await expect(spine).toHaveAttribute('aria-valuetext', '3 slots, 86.0\u2009mm');
	await spine.focus();
	await page.keyboard.press('ArrowLeft');
	await expect(spine).toHaveAttribute('aria-valuetext', '4 slots, 65.68\u2009mm');
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/);
	await page.getByLabel('Note for version 2').fill('Spine one slot over, more room for the card');
	await page.getByRole('button', { name: 'Save as version 2' }).click();
	await expect(page.getByTestId('version-done')).toHaveText('Saved as version 2.');
	await expect(page.getByTestId('version-status')).toHaveText('Version 2 · as sent');

	// Send it to the client.
	await page.goto(`/builds/${build.buildId}/share`);
	await page
		.getByRole('combobox', { name: 'Variant' })
		.selectOption({ label: 'Variant A, after version 1 (version 2)' });
	await page.getByLabel("Client's e-mail").fill(clientMember.email);
	await page.getByRole('button', { name: 'Create link' }).click();
	await expect(page.getByTestId('created-link')).toContainText(`e-mailed to ${clientMember.email}`);

	// The client sees version 2 and what changed since the version they approved.
	await client.goto('/builds');
	const next = client
		.getByRole('list', { name: 'Shared with you' })
		.getByRole('link', { name: /after version 1/ });
	await expect(next).toContainText('version 2');
	await expect(next).toContainText('waiting for you');
	await next.click();
	await expect(client.getByTestId('client-version')).toHaveText('version 2');
	const changed = client.getByTestId('what-changed');
	await expect(changed).toContainText('What changed since version 1');
	await expect(changed).toContainText(
		'Spine moved from 3 slots (86.0\u2009mm) to 4 slots (65.68\u2009mm).'
	);
	await expect(
		client.getByText('Studio’s note: Spine one slot over, more room for the card')
	).toBeVisible();
	await clientContext.close();
});
