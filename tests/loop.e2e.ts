/**
 * The coolant-loop panel in Chromium on the seeded demo build. The demo pump-reservoir's ports sit
 * 13 mm under the top panel, so a run straight from them cannot bend the way 12 mm hard tube
 * needs: the editor refuses the run with the scene schema's own words (the server's) and adds
 * nothing. The variant is put back to its seeded row before and after.
 */
import { expect, test } from '@playwright/test';
import { closeDb } from '../src/lib/server/db';
import { clearRateLimits } from '../src/lib/server/testing/factories';
import { openDemoEditor } from './helpers/editor';
import { restoreDemoVariant } from './helpers/demo-variant';

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
	const { context, page } = await openDemoEditor(browser);

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

test('the demo loop drawn from the 3D view: a waypoint dragged into the card collides, dragged out it clears, and the tube and fittings reach the sheet and the quote', async ({
	browser
}) => {
	await restoreDemoVariant();
	const { context, page } = await openDemoEditor(browser);
	const panel = page.locator('section[aria-labelledby="loop-h"]');
	const scene = page.getByRole('region', { name: '3D view of the build' });

	// Each run starts and ends with a click on a port's marker in the 3D view. Hard-tube waypoints
	// are typed: a square route to the half millimetre is not something a pointer draws.
	async function run(from: string, to: string, waypoints: string, fitting?: string) {
		await scene.locator(`[data-port="${from}"]`).click();
		await scene.locator(`[data-port="${to}"]`).click();
		const form = panel.getByRole('form', { name: 'New run' });
		await expect(form.getByLabel('To port')).toHaveValue(to);
		await expect(form.getByLabel('From port')).toHaveValue(from);
		if (fitting) await form.getByLabel('Fitting at the start').selectOption({ label: fitting });
		await form.getByLabel(/Waypoints/).fill(waypoints);
		await form.getByRole('button', { name: 'Add the run' }).click();
		await expect(form).toHaveCount(0);
	}
	const straight = 'Straight compression fitting, 16 mm hard tube';
	await expect(scene.locator('[data-port="pump-res/out"]')).toHaveAttribute(
		'aria-label',
		'Port Compact pump-reservoir, 58 mm thick · out (G 1/4), free'
	);
	await run(
		'pump-res/out',
		'cpu-block/in',
		'129, 320.5, 82\n129, 150, 82\n75, 150, 82\n75, 225, 82\n75, 225, 153',
		straight
	);
	await expect(scene.locator('[data-port="pump-res/out"]')).toHaveAttribute(
		'aria-label',
		/, joined$/
	);
	await run('cpu-block/out', 'radiator/in', '75, 245, 153\n75, 320.5, 153');
	await run('radiator/out', 'pump-res/in', '');
	await panel
		.getByRole('button', { name: 'Plug Compact pump-reservoir, 58 mm thick · fill' })
		.click();
	await panel.getByRole('button', { name: 'fill here' }).click();
	const checks = panel.getByRole('list', { name: 'Loop checks' });
	for (const id of ['closed', 'reservoir', 'fill', 'bends', 'ports', 'threads', 'fit']) {
		await expect(checks.locator(`[data-check="${id}"]`)).toHaveAttribute('data-status', 'pass');
	}

	// Drag run 1's second waypoint back (z) with the mouse in the side view, along one axis: its
	// horizontal stretch in front of the card follows and meets the card.
	await scene.getByRole('button', { name: 'Side' }).click();
	await scene.getByLabel('Drag waypoints').selectOption('z');
	const problems = panel.getByRole('list', { name: 'Run 1 problems' });
	const handle = scene.locator('[data-waypoint="0:0:1"]');
	const zOf = async () =>
		Number((await handle.getAttribute('aria-label'))!.match(/, ([\d.]+) mm\)$/)![1]);
	async function dragUntil(done: () => Promise<boolean>, sign: 1 | -1) {
		const box = (await handle.boundingBox())!;
		let x = box.x + box.width / 2;
		const y = box.y + box.height / 2;
		await page.mouse.move(x, y);
		await page.mouse.down();
		let dir = sign;
		const z0 = await zOf();
		for (let i = 0; i < 120 && !(await done()); i++) {
			x += 2 * dir;
			await page.mouse.move(x, y);
			// The screen's right is −z in one camera and +z in another: turn round if z went the wrong way.
			if (i === 5 && Math.sign((await zOf()) - z0) === -sign) dir = -dir as 1 | -1;
		}
		await page.mouse.up();
	}
	await dragUntil(
		async () => (await problems.textContent())!.includes('against the compact graphics card'),
		1
	);
	await expect(problems).toContainText('Run 1, second segment, against the compact graphics card');
	await expect(checks.locator('[data-check="fit"]')).toHaveAttribute('data-status', 'fail');
	expect(await zOf()).toBeGreaterThan(82);
	// And back out, the same way, until the run is clear again.
	await dragUntil(
		async () => (await problems.locator('li').count()) === 0 && (await zOf()) < 92,
		-1
	);
	await expect(checks.locator('[data-check="fit"]')).toHaveAttribute('data-status', 'pass');
	const cut = panel.locator('[data-run="run-1"]').getByText(/^Cut /);
	await expect(cut).toContainText('mm');
	await expect(page.getByText('Saved ·')).toBeVisible({ timeout: 15_000 });

	// The sheet's cut list and fittings.
	await page.goto('/builds/demo-build/sheet?variant=demo-variant-a');
	await expect(page.getByText(/Run 1: [\d.]+\s?mm of/)).toBeVisible();
	await expect(page.getByText(straight).first()).toBeVisible();
	await expect(page.getByText(/Stop plug/).first()).toBeVisible();
	await expect(page.getByText(/leak-test/i).first()).toBeVisible();

	// The quote's loop lines follow the variant: tube by the metre, the fitting and the plug.
	await page.goto('/builds/demo-build/quote/demo-variant-a');
	const refresh = page.getByRole('button', { name: 'Update parts from the variant' });
	await refresh.click();
	const descriptions = () =>
		page
			.getByRole('textbox', { name: 'Description' })
			.evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value));
	await expect
		.poll(descriptions)
		.toEqual(
			expect.arrayContaining([
				expect.stringMatching(/^Loop · Hard tube 12 mm: [\d.]+ m cut \+ 10 % allowance/),
				`Loop · ${straight} (G 1/4)`,
				'Loop · Stop plug (G 1/4)'
			])
		);
	// Put the seeded quote's lines back: the variant as seeded, then the same refresh.
	await restoreDemoVariant();
	await page.reload();
	await refresh.click();
	await expect
		.poll(async () => (await descriptions()).filter((d) => d.startsWith('Loop ·')))
		.toEqual([]);
	await context.close();
});
