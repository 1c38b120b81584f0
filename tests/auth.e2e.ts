/**
 * The first thing a studio does: a new person signs up, confirms the address from the mailed link,
 * makes a studio and invites a designer by e-mail; the designer opens the mailed link in their own
 * browser, signs up (the invitation proves the address), accepts, and works in the studio.
 */
import { expect, test } from '@playwright/test';
import {
	clearBrowserRateLimits,
	closeDb,
	createInvite,
	createUser,
	signInAs,
	studioWithMembers,
	uniqueEmail
} from './helpers/accounts';
import { extractLink, waitForMail } from './helpers/mail';

test.beforeAll(async () => {
	await clearBrowserRateLimits();
});
test.afterAll(async () => {
	await closeDb();
});

test('sign up, make a studio, invite a designer who signs up from the mail and sees the studio', async ({
	page,
	browser,
	baseURL
}, testInfo) => {
	const ownerEmail = uniqueEmail('owner');
	const designerEmail = uniqueEmail('designer');
	const studioName = `Dockside Bench ${Date.now().toString(36)}`;

	await page.goto('/');
	await page.getByRole('link', { name: 'Create an account' }).first().click();
	await expect(page.getByRole('heading', { name: 'Create an account' })).toBeVisible();
	await page.getByLabel('Name').fill('Ola Owner');
	await page.getByLabel('E-mail').fill(ownerEmail);
	await page.getByLabel('Password').fill('long-enough-1');
	await page.getByRole('button', { name: 'Create account' }).click();

	// The address is confirmed by mail before the account opens.
	await expect(page).toHaveURL(/\/check-mail$/);
	await expect(page.getByRole('heading', { name: 'Check your mail' })).toBeVisible();
	const confirm = await waitForMail(ownerEmail, { subject: 'Confirm your address' });
	await page.goto(extractLink(confirm.text, '/verify/'));
	await expect(page.getByRole('heading', { name: 'Confirm your address' })).toBeVisible();
	await page.getByRole('button', { name: 'Confirm and continue' }).click();

	await expect(page).toHaveURL(/\/studios\/new$/);
	await page.getByLabel('Studio name').fill(studioName);
	await page.getByRole('button', { name: 'Start the studio' }).click();
	await expect(page).toHaveURL(/\/builds$/);
	await expect(page.getByRole('heading', { name: 'Builds', exact: true })).toBeVisible();
	await expect(page.getByRole('banner')).toContainText(`${studioName} · owner`);

	await page
		.getByRole('navigation', { name: 'Main' })
		.getByRole('link', { name: 'Members' })
		.click();
	await expect(page.getByRole('heading', { name: `Members of ${studioName}` })).toBeVisible();
	await page.getByLabel('E-mail').fill(designerEmail);
	await page.getByRole('combobox', { name: 'Role', exact: true }).selectOption('designer');
	await page.getByRole('button', { name: 'Send invitation' }).click();
	await expect(page.getByRole('status')).toHaveText(`Invitation sent to ${designerEmail}.`);
	await expect(page.getByText(`${designerEmail} · designer`)).toBeVisible();

	const mail = await waitForMail(designerEmail, { subject: studioName });
	const link = extractLink(mail.text, '/invite/');
	expect(new URL(link).origin).toBe(baseURL);

	// The designer, in a browser of their own.
	const designerContext = await browser.newContext();
	const designer = await designerContext.newPage();
	await designer.goto(link);
	await expect(designer.getByRole('heading', { name: `Join ${studioName}` })).toBeVisible();
	await expect(designer.getByText('You are invited as designer')).toBeVisible();
	await designer.getByRole('link', { name: 'Create an account to accept' }).click();
	await designer.getByLabel('Name').fill('Dev Designer');
	await designer.getByLabel('E-mail').fill(designerEmail);
	await designer.getByLabel('Password').fill('long-enough-2');
	await designer.getByRole('button', { name: 'Create account' }).click();

	await expect(designer).toHaveURL(new RegExp(`/invite/[^/]+$`));
	await expect(designer.getByText(`You are signed in as ${designerEmail}`)).toBeVisible();
	await designer.getByRole('button', { name: 'Accept invitation' }).click();
	await expect(designer).toHaveURL(/\/builds$/);
	await expect(designer.getByRole('banner')).toContainText(`${studioName} · designer`);
	await expect(designer.getByRole('heading', { name: 'Builds', exact: true })).toBeVisible();
	// Designers do not manage members.
	await expect(
		designer.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Members' })
	).toHaveCount(0);
	await designerContext.close();

	// The owner sees the designer among the members, and no invitation left open.
	await page.reload();
	const row = page.getByRole('row').filter({ hasText: designerEmail });
	await expect(row).toContainText('Dev Designer');
	await expect(row.getByLabel('Role of Dev Designer')).toHaveValue('designer');
	await expect(page.getByText('No open invitations.')).toBeVisible();
	await page.screenshot({ path: testInfo.outputPath('members.png'), fullPage: true });
	await testInfo.attach('members page', {
		path: testInfo.outputPath('members.png'),
		contentType: 'image/png'
	});
});

/** The forms work without JavaScript too (plain posts), and each mode is a separate browser here. */
for (const javaScript of [true, false]) {
	test.describe(javaScript ? 'with JavaScript' : 'without JavaScript', () => {
		test.use({ javaScriptEnabled: javaScript });

		test('forgot password: the mailed link sets a new one, and works only once', async ({
			page
		}) => {
			const user = await createUser();
			await page.goto('/signin');
			await page.getByRole('link', { name: 'Forgot your password?' }).click();
			await expect(page.getByRole('heading', { name: 'Reset your password' })).toBeVisible();
			// Typed before the enhanced form hydrates, the value is lost to its client-side state.
			if (javaScript) await expect(page.locator('html')).toHaveAttribute('data-hydrated', 'true');
			await page.getByLabel('E-mail').fill(user.email);
			await page.getByRole('button', { name: 'Send the link' }).click();
			await expect(page.getByRole('status')).toContainText(
				'a link to choose a new password is on its way'
			);

			const link = extractLink(
				(await waitForMail(user.email, { subject: 'Reset your Interstice password' })).text,
				'/reset/'
			);
			await page.goto(link);
			await page.getByLabel('New password').fill('fresh-password-2');
			await page.getByRole('button', { name: 'Save password' }).click();
			await expect(page).toHaveURL(/\/signin\?reset=1$/);
			await expect(page.getByRole('status')).toHaveText(
				'Your password was changed. Sign in with the new one.'
			);

			await page.getByLabel('E-mail').fill(user.email);
			await page.getByLabel('Password').fill('fresh-password-2');
			await page.getByRole('button', { name: 'Sign in' }).click();
			await expect(page).toHaveURL(/\/studios\/new$/);

			await page.goto(link);
			await expect(page.getByRole('heading', { name: 'This link no longer works' })).toBeVisible();
		});

		test('an invitation is accepted by someone already signed in', async ({
			page,
			context,
			baseURL
		}) => {
			const f = await studioWithMembers();
			const invitee = await createUser();
			const inv = await createInvite({
				studioId: f.studio.id,
				role: 'client',
				email: invitee.email,
				invitedBy: f.owner.id
			});
			await signInAs(context, baseURL ?? '', invitee.id);
			await page.goto(`/invite/${inv.token}`);
			await expect(page.getByRole('heading', { name: `Join ${f.studio.name}` })).toBeVisible();
			await page.getByRole('button', { name: 'Accept invitation' }).click();
			await expect(page).toHaveURL(/\/builds$/);
			await expect(page.getByRole('banner')).toContainText(`${f.studio.name} · client`);
			await expect(
				page.getByRole('heading', { name: 'Nothing shared with you yet' })
			).toBeVisible();
		});
	});
}
