import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { hydrated, shot, signIn } from './helpers';

// Catalogue administration on a portrait tablet (768 × 1024), as an admin whose unit system is
// metric (seed-data/people.json).

const run = Date.now().toString(36).toUpperCase();

async function noSidewaysScroll(page: Page) {
	const width = page.viewportSize()!.width;
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
		width
	);
}

/** WCAG 2 A and AA rules (contrast included) on the page's main content. */
async function accessible(page: Page) {
	const result = await new AxeBuilder({ page })
		.include('main')
		.withTags(['wcag2a', 'wcag2aa'])
		.analyze();
	expect(
		result.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)
	).toEqual([]);
}

/** Touch targets: every visible button, link-button, input and select in main is at least 44 px tall. */
async function touchTargets(page: Page) {
	const small = await page.evaluate(() =>
		[
			...document.querySelectorAll(
				'main button, main a.btn-primary, main a.btn-secondary, main input:not([type=hidden]):not([type=checkbox]), main select'
			)
		]
			.filter((el) => (el as HTMLElement).offsetParent !== null)
			.map((el) => ({
				el: (el as HTMLElement).outerHTML.slice(0, 80),
				h: el.getBoundingClientRect().height
			}))
			.filter((x) => x.h < 44)
	);
	expect(small).toEqual([]);
}

/** A full-page screenshot from the top, so the sticky header sits where a person sees it first. */
async function snap(page: Page, name: string) {
	await page.evaluate(() => window.scrollTo(0, 0));
	await shot(page, name);
}

test.beforeEach(async ({ page }) => {
	await page.setViewportSize({ width: 768, height: 1024 });
	await signIn(page, 'admin@demo.traywise.test');
});

test('admin adds a battery, then edits its weight typing "2,900 lb" and sees both units', async ({
	page
}) => {
	const code = `E2E-B-${run}`;
	await page.goto('/admin/catalogue/batteries');
	await hydrated(page);
	await expect(page.getByRole('heading', { level: 1, name: 'Batteries' })).toBeVisible();
	await noSidewaysScroll(page);
	await accessible(page);
	await snap(page, 'catalogue-batteries-768x1024');

	await page.getByRole('link', { name: 'Add a battery' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Add a battery' })).toBeVisible();
	await hydrated(page);
	await page.getByLabel('Battery code').fill(code);
	await page.getByLabel('Name', { exact: true }).fill('48 V 700 Ah lead-acid, test tray');
	await page.getByLabel('Voltage').fill('48');
	await page.getByLabel('Capacity').fill('700');
	await page.getByLabel('Length', { exact: true }).fill('820');
	await page.getByLabel('Width', { exact: true }).fill('32.7 in');
	await page.getByLabel('Height', { exact: true }).fill('600 mm');
	await page.getByLabel('Weight', { exact: true }).fill('1050');
	await page.getByLabel('List price').fill('8,300');
	await page.getByLabel('Cost').fill('5,400.00');
	// 32.7 in × 25.4 = 830.58 mm
	await expect(page.getByTestId('battery-width-reading')).toHaveText('Reads as 831 mm (32.7 in)');
	await touchTargets(page);
	await accessible(page);
	await snap(page, 'catalogue-battery-new-768x1024');
	await page.getByRole('button', { name: 'Add battery' }).click();

	await expect(page.getByRole('heading', { level: 1, name: new RegExp(code) })).toBeVisible();
	await expect(page.getByRole('status').filter({ hasText: `Added ${code}.` })).toBeVisible();
	await hydrated(page);

	const weight = page.getByLabel('Weight', { exact: true });
	await expect(weight).toHaveValue('1050 kg');
	await weight.fill('2,900 lb');
	// 2 900 lb × 0.45359237 = 1 315.4 kg; shown in the user's system first, then the other
	await expect(page.getByTestId('battery-weight-reading')).toHaveText(
		'Reads as 1 315 kg (2,900 lb)'
	);
	await noSidewaysScroll(page);
	await snap(page, 'catalogue-battery-weight-typed-768x1024');

	await page.getByRole('button', { name: 'Save changes' }).click();
	await expect(page.getByRole('status').filter({ hasText: `Saved ${code}.` })).toBeVisible();
	await expect(page.getByText(`Added ${code}.`)).toHaveCount(0);
	// the stored value, written back in the admin's metric system, still reads as both units
	await expect(weight).toHaveValue('1315.4 kg');
	await expect(page.getByTestId('battery-weight-reading')).toHaveText(
		'Reads as 1 315 kg (2,900 lb)'
	);
	await snap(page, 'catalogue-battery-saved-768x1024');

	await page.goto(`/admin/catalogue/batteries?chemistry=lead-acid`);
	await hydrated(page);
	const card = page.getByTestId('battery-card').filter({ hasText: code });
	await expect(card.getByTestId('battery-weight')).toHaveText('1 315 kg (2,900 lb)');
	await noSidewaysScroll(page);
});

test('admin is told what is wrong with a truck model, retires it and restores it', async ({
	page
}) => {
	await page.goto('/admin/catalogue/trucks');
	await hydrated(page);
	await noSidewaysScroll(page);
	await accessible(page);
	await snap(page, 'catalogue-trucks-768x1024');

	// start from a copy of a demo model (seed-data/catalogue.json) and break two rules
	await page
		.getByRole('link', { name: /TW-B4-25/ })
		.first()
		.click();
	await expect(page.getByRole('heading', { level: 1, name: /TW-B4-25/ })).toBeVisible();
	await hydrated(page);
	await page.getByRole('link', { name: 'Copy to a new model' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Add a truck model' })).toBeVisible();
	await hydrated(page);
	const code = `E2E-T-${run}`;
	await page.getByLabel('Model code').fill(code);
	await page.getByLabel('Height with roller bed', { exact: true }).fill('26 in'); // 660 mm, above the 640 mm compartment
	await page.getByLabel('Heaviest battery', { exact: true }).fill('800 kg'); // below the 1 000 kg minimum
	await page.getByRole('button', { name: 'Add truck model' }).click();
	await expect(page.getByRole('alert').filter({ hasText: 'Nothing was saved.' })).toBeVisible();
	await expect(page.locator('#truck-compartmentHeightWithRollerBed-error')).toContainText(
		'must not be above the compartment height'
	);
	await expect(page.locator('#truck-batteryWeightMax-error')).toHaveText(
		'The maximum battery weight must not be below the minimum.'
	);
	await noSidewaysScroll(page);
	await snap(page, 'catalogue-truck-refused-768x1024');

	await page.getByLabel('Height with roller bed', { exact: true }).fill('610');
	await page.getByLabel('Heaviest battery', { exact: true }).fill('3,200 lb');
	await page.getByRole('button', { name: 'Add truck model' }).click();
	await expect(page.getByRole('heading', { level: 1, name: new RegExp(code) })).toBeVisible();
	await hydrated(page);

	await page.getByRole('button', { name: 'Retire' }).click();
	await expect(page.getByRole('status').filter({ hasText: 'Retired:' })).toBeVisible();
	await expect(page.getByText('Retired', { exact: true })).toBeVisible();
	await snap(page, 'catalogue-truck-retired-768x1024');

	await page.goto('/admin/catalogue/trucks?family=Basalt%204');
	await hydrated(page);
	const card = page.getByTestId('truck-card').filter({ hasText: code });
	await expect(card.getByText('Retired', { exact: true })).toBeVisible();
	await accessible(page);
	await snap(page, 'catalogue-trucks-with-retired-768x1024');

	await card.getByRole('link', { name: new RegExp(code) }).click();
	await expect(page.getByRole('heading', { level: 1, name: new RegExp(code) })).toBeVisible();
	await hydrated(page);
	await page.getByRole('button', { name: 'Restore' }).click();
	await expect(page.getByRole('status').filter({ hasText: 'Restored:' })).toBeVisible();

	// deleting asks once more; nothing uses the new model, so it goes
	await page.getByRole('button', { name: 'Delete…' }).click();
	await expect(page.getByRole('button', { name: `Delete ${code}` })).toBeVisible();
	await snap(page, 'catalogue-truck-delete-confirm-768x1024');
	await page.getByRole('button', { name: `Delete ${code}` }).click();
	await expect(page).toHaveURL(/\/admin\/catalogue\/trucks\?deleted=/);
	await expect(page.getByRole('status')).toHaveText(`Deleted ${code}.`);
});

test('the equipment form shows the fields of the chosen kind', async ({ page }) => {
	await page.goto('/admin/catalogue/equipment');
	await hydrated(page);
	await noSidewaysScroll(page);
	await accessible(page);
	await snap(page, 'catalogue-equipment-768x1024');

	await page.getByRole('link', { name: 'Add equipment' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Add equipment' })).toBeVisible();
	await hydrated(page);
	await page.getByLabel('Kind').selectOption('pallet-truck');
	await expect(page.getByLabel('Fork length', { exact: true })).toBeVisible();
	await expect(page.getByLabel('Roller height', { exact: true })).toHaveCount(0);
	await page.getByLabel('Kind').selectOption('roller-stand');
	await expect(page.getByLabel('Roller height', { exact: true })).toBeVisible();
	await expect(page.getByLabel('Lowest setting', { exact: true })).toHaveCount(0);
	await page.getByLabel('Roller height adjusts').check();
	await expect(page.getByLabel('Lowest setting', { exact: true })).toBeVisible();

	const sku = `E2E-RS-${run}`;
	await page.getByLabel('SKU').fill(sku);
	await page.getByLabel('Name', { exact: true }).fill('Test roller stand');
	await page.getByLabel('List price').fill('2,000');
	await page.getByLabel('Cost').fill('1,300');
	await page.getByLabel('Roller height', { exact: true }).fill('8.5 in');
	await page.getByLabel('Lowest setting', { exact: true }).fill('7 in');
	// a bare number takes the unit picked beside it: 10 in = 254 mm, not 10 mm
	await page.getByLabel('Unit of a plain number for highest setting').selectOption('in');
	await page.getByLabel('Highest setting', { exact: true }).fill('10');
	await expect(page.getByTestId('equipment-adjustMax-reading')).toHaveText(
		'Reads as 254 mm (10.0 in)'
	);
	await page.getByLabel('Rated capacity', { exact: true }).fill('4,400 lb');
	await touchTargets(page);
	await accessible(page);
	await snap(page, 'catalogue-equipment-new-roller-stand-768x1024');
	await page.getByRole('button', { name: 'Add equipment' }).click();
	await expect(page.getByRole('heading', { level: 1, name: new RegExp(sku) })).toBeVisible();
	// 8.5 in = 215.9 mm → 216 mm; 4 400 lb = 1 995.8 kg
	await expect(page.getByLabel('Roller height', { exact: true })).toHaveValue('216 mm');
	await expect(page.getByLabel('Rated capacity', { exact: true })).toHaveValue('1995.8 kg');
	await expect(page.getByLabel('Highest setting', { exact: true })).toHaveValue('254 mm');
});

test('the truck list becomes a table on a landscape tablet', async ({ page }) => {
	await page.setViewportSize({ width: 1024, height: 768 });
	await page.goto('/admin/catalogue/trucks');
	await hydrated(page);
	await expect(page.getByRole('table', { name: 'Truck models' })).toBeVisible();
	// the catalogue's own content fits; the shared header is measured by the sign-in journey
	const overflow = await page.evaluate(() => {
		const main = document.querySelector('main')!;
		return [...main.querySelectorAll('*')]
			.filter((el) => el.getBoundingClientRect().right > window.innerWidth)
			.map((el) => el.outerHTML.slice(0, 80));
	});
	expect(overflow).toEqual([]);
	await snap(page, 'catalogue-trucks-1024x768');
});
