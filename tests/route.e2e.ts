/**
 * "Suggest a route" in Chromium on the seeded demo build (the spine and bulkhead have tube
 * cut-outs): a loop of three 12 mm hard runs is drawn by hand, the route search suggests every run
 * of the loop in its worker, the builder accepts them all, and the runs come back checked (no
 * problem on any run, every loop check in words) and priced (the quote's tube line). Then the demo's power cables, routed the same way, come back clear with their
 * lengths to order. The variant is put back to its seeded row before and after.
 */
import { expect, test, type Locator } from '@playwright/test';
import { closeDb } from '../src/lib/server/db';
import { clearRateLimits } from '../src/lib/server/testing/factories';
import { openDemoEditor } from './helpers/editor';
import { restoreDemoVariant } from './helpers/demo-variant';

test.beforeAll(async () => {
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
