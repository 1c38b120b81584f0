/**
 * "Suggest a route" in Chromium on the seeded demo build (the spine and bulkhead have tube
 * cut-outs): a loop of three 12 mm hard runs is drawn by hand, the route search suggests every run
 * of the loop in its worker, the builder accepts them all, and the runs come back checked (no
 * problem on any run, every loop check in words) and priced (the quote's tube line). Then the demo's power cables, routed the same way, come back clear with their
 * lengths to order. A power cable is removed, added back from the cable form, routed, accepted
 * and read on the sheet; a run still being drafted gets its route before it is added. The variant
 * is put back to its seeded row before and after each test.
 */
import { expect, test, type Locator } from '@playwright/test';
import { closeDb } from '../src/lib/server/db';
import { clearRateLimits } from '../src/lib/server/testing/factories';
import { openDemoEditor } from './helpers/editor';
import { restoreDemoVariant } from './helpers/demo-variant';

test.beforeEach(async () => {
	await restoreDemoVariant({ cables: 'straight' });
	await clearRateLimits('127.0.0.1');
});
test.afterAll(async () => {
	await restoreDemoVariant();
	await closeDb();
});

async function addRun(panel: Locator, from: string, to: string, waypoints: string) {
	await panel.getByRole('button', { name: 'Add a run' }).click();
	const form = panel.getByRole('form', { name: 'New run' });
	await form.getByLabel('From port').selectOption({ label: `${from} (G 1/4)` });
	await form.getByLabel('Fitting at the start').selectOption('');
	await form.getByLabel('To port').selectOption({ label: `${to} (G 1/4)` });
	await form.getByLabel('Fitting at the end').selectOption('');
	await form.getByRole('combobox', { name: /^Tube/ }).selectOption('demo-hard-12');
	await form.getByLabel(/Waypoints/).fill(waypoints);
	await form.getByRole('button', { name: 'Add the run' }).click();
	await expect(form).toBeHidden();
}

test('suggests every run of the demo loop, and the accepted routes are checked and priced', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const { context, page } = await openDemoEditor(browser);

	const panel = page.locator('section[aria-labelledby="loop-h"]');
	const pump = 'Compact pump-reservoir, 58 mm thick';
	const block = 'Compact CPU block, 26 mm tall';
	const radiator = 'Slim 280 radiator, 30 mm';
	// Drawn by hand through the cut-outs first (a hard run needs its waypoints to be added at all).
	await addRun(
		panel,
		`${pump} · out`,
		`${block} · in`,
		'129, 320.5, 100\n129, 225, 100\n75, 225, 100\n75, 225, 153'
	);
	await addRun(panel, `${block} · out`, `${radiator} · in`, '75, 245, 153\n75, 320.5, 153');
	await addRun(panel, `${radiator} · out`, `${pump} · in`, '');
	// The runs themselves, not the waypoint lists inside each run's entry.
	const runs = panel.getByRole('list', { name: 'Runs' }).locator(':scope > li');
	await expect(runs).toHaveCount(3);

	const suggest = panel.locator('section[aria-labelledby="route-h"]');
	await expect(suggest.getByLabel('Route')).toHaveValue('all');
	await suggest.getByRole('button', { name: 'Suggest', exact: true }).click();
	const list = suggest.getByRole('list', { name: 'Suggested routes' });
	await expect(list.getByRole('listitem')).toHaveCount(3, { timeout: 60_000 });
	// Each run: up to three routes with their bends and length; none says "No route".
	for (const item of await list.getByRole('listitem').all()) {
		await expect(
			item.getByRole('radio', { name: /^Route 1: \d+ bends?, \d+\.\d+\s?mm$/ })
		).toBeChecked();
	}
	await expect(list).not.toContainText('No route');
	await suggest.getByRole('button', { name: 'Accept all 3 routes' }).click();
	await expect(list).toBeHidden();

	// Checked: no run has a problem, each has a cut length; the loop's checks are in words.
	for (const n of [1, 2, 3]) {
		await expect(
			panel.getByRole('list', { name: `Run ${n} problems` }).getByRole('listitem')
		).toHaveCount(0);
	}
	await expect(runs.nth(0)).toContainText(/Cut \d+\.\d+\s?mm, \d+\s+bends?/);
	await expect(
		panel.getByRole('list', { name: 'Loop checks' }).getByRole('listitem')
	).not.toHaveCount(0);
	// The routes are saved with the variant.
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/);

	// The power cables, drawn straight through the processor block, routed the same way.
	const cables = suggest.getByRole('list', { name: 'Power cables' });
	await expect(cables.locator('[data-cable="cable-24"]')).toHaveAttribute(
		'data-status',
		'collides'
	);
	await suggest.getByRole('button', { name: 'Suggest cable routes' }).click();
	await expect(list.getByRole('listitem')).toHaveCount(3, { timeout: 60_000 });
	// The card's cable has a route now too (its socket sits low on the card's end).
	await expect(
		list
			.locator('[data-suggestion="cable-card"]')
			.getByRole('radio', { name: /^Route 1: \d+ bends?, \d+\.\d+\s?mm$/ })
	).toBeChecked();
	const status = page.getByTestId('save-status');
	const revision = async () => Number(/change (\d+)/.exec((await status.textContent()) ?? '')?.[1]);
	const before = await revision();
	const routed = list.locator('[data-suggestion="cable-24"]');
	await routed.getByRole('button', { name: 'Accept the route for 24-pin' }).click();
	await expect(cables.locator('[data-cable="cable-24"]')).toHaveAttribute('data-status', 'clear');
	await expect(cables.locator('[data-cable="cable-24"]')).toContainText(
		/24-pin: about \d+0\u2009mm, behind the supply, up the board/
	);

	// Priced: the quote follows the variant, with the tube the runs use (once it is saved).
	await expect.poll(revision, { timeout: 20_000 }).toBeGreaterThan(before);
	await expect(status).toHaveText(/^Saved · change \d+$/);
	await page.goto('/builds/demo-build/quote/demo-variant-a');
	const start = page.getByRole('button', { name: 'Start the quote' });
	if (await start.isVisible()) await start.click();
	const refresh = page.getByRole('button', { name: 'Update parts from the variant' });
	await refresh.click();
	const tube = page.getByRole('row', { name: /^Loop · Hard tube 12 mm: \d\.\d\d m cut/ });
	await expect(tube).toBeVisible();
	// The studio's price for the tube, per whole metre.
	await expect(tube).toContainText('7.00');
	// Put the quote's lines back to the seeded variant's.
	await restoreDemoVariant();
	await page.reload();
	await refresh.click();
	await expect(tube).toHaveCount(0);
	await context.close();
});

test('a power cable is removed, added from the form, routed, accepted and read on the sheet', async ({
	browser
}) => {
	test.setTimeout(120_000);
	await restoreDemoVariant();
	const { context, page } = await openDemoEditor(browser);
	const panel = page.locator('section[aria-labelledby="loop-h"]');
	const cables = panel.getByRole('list', { name: 'Power cables' });
	// Seeded with all three demo cables routed clear.
	await expect(cables.getByRole('listitem')).toHaveCount(3);
	for (const id of ['cable-24', 'cable-eps', 'cable-card']) {
		await expect(cables.locator(`[data-cable="${id}"]`)).toHaveAttribute('data-status', 'clear');
	}
	await cables.getByRole('button', { name: 'Remove Card power' }).click();
	await expect(cables.getByRole('listitem')).toHaveCount(2);

	await panel.getByRole('button', { name: 'Add a power cable' }).click();
	const form = panel.getByRole('form', { name: 'New power cable' });
	await form.getByLabel('From power port').selectOption({ label: 'SFX supply, 600 W · pcie' });
	await form
		.getByLabel('To power port')
		.selectOption({ label: 'Compact graphics card, two slots, 185 mm · power' });
	await form.getByRole('combobox', { name: /^Cable/ }).selectOption('card8');
	await form.getByLabel('Where it runs (optional)').fill('across to the card side');
	await form.getByRole('button', { name: 'Add the cable' }).click();
	await expect(form).toBeHidden();
	const added = cables.locator('[data-cable="cable-1"]');
	await expect(added).toContainText('Card power');

	const suggest = panel.locator('section[aria-labelledby="route-h"]');
	await suggest.getByRole('button', { name: 'Suggest cable routes' }).click();
	const list = suggest.getByRole('list', { name: 'Suggested routes' });
	await expect(list.getByRole('listitem')).toHaveCount(3, { timeout: 60_000 });
	await list.getByRole('button', { name: 'Accept the route for Card power' }).click();
	await expect(added).toHaveAttribute('data-status', 'clear');
	await expect(added).toContainText(/Card power: about \d+0\u2009mm, across to the card side/);
	const length = /about (\d+0)\u2009mm/.exec((await added.textContent()) ?? '')![1];
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/, {
		timeout: 20_000
	});

	// The sheet's group of cables to order has it, with the same length.
	await page.goto('/builds/demo-build/sheet?variant=demo-variant-a');
	await expect(
		page.getByText(`Card power: about ${length}\u2009mm, across to the card side.`)
	).toBeVisible();

	// Removed again, it leaves the sheet.
	await page.goto('/builds/demo-build');
	await expect(page.getByTestId('editor')).toHaveAttribute('data-ready', 'true');
	await cables.getByRole('button', { name: 'Remove Card power' }).click();
	await expect(cables.locator('[data-cable="cable-1"]')).toHaveCount(0);
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/, {
		timeout: 20_000
	});
	await page.goto('/builds/demo-build/sheet?variant=demo-variant-a');
	await expect(page.getByText(/24-pin: about \d+0\u2009mm/)).toBeVisible();
	await expect(page.getByText(/Card power: about/)).toHaveCount(0);
	await context.close();
});

test('a run still being drafted gets a suggested route, and accepting it adds the run', async ({
	browser
}) => {
	test.setTimeout(120_000);
	const { context, page } = await openDemoEditor(browser);
	const panel = page.locator('section[aria-labelledby="loop-h"]');
	await panel.getByRole('button', { name: 'Add a run' }).click();
	const form = panel.getByRole('form', { name: 'New run' });
	await form
		.getByLabel('From port')
		.selectOption({ label: 'Slim 280 radiator, 30 mm · out (G 1/4)' });
	await form.getByLabel('Fitting at the start').selectOption('');
	await form
		.getByLabel('To port')
		.selectOption({ label: 'Compact pump-reservoir, 58 mm thick · in (G 1/4)' });
	await form.getByLabel('Fitting at the end').selectOption('');
	await form.getByRole('combobox', { name: /^Tube/ }).selectOption('demo-hard-12');
	await form.getByRole('button', { name: 'Suggest a route for the new run' }).click();
	const list = form.getByRole('list', { name: 'Suggested routes' });
	await expect(list.getByRole('listitem')).toHaveCount(1, { timeout: 60_000 });
	await expect(
		list.getByRole('radio', { name: /^Route 1: \d+ bends?, \d+\.\d+\s?mm$/ })
	).toBeChecked();
	await list.getByRole('button', { name: 'Accept the route for the new run' }).click();
	await expect(form).toBeHidden();
	const runs = panel.getByRole('list', { name: 'Runs' }).locator(':scope > li');
	await expect(runs).toHaveCount(1);
	await expect(
		panel.getByRole('list', { name: 'Run 1 problems' }).getByRole('listitem')
	).toHaveCount(0);
	await expect(runs.nth(0)).toContainText(/Cut \d+\.\d+\s?mm, \d+\s+bends?/);
	await expect(page.getByTestId('save-status')).toHaveText(/^Saved · change \d+$/, {
		timeout: 20_000
	});
	await context.close();
});
