import { expect, test, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import sharp from 'sharp';
import { hydrated, shot, signIn } from './helpers';

const TOKEN = `e2e${Date.now().toString(36)}`;
const CUSTOMER = `Quarrow Hill Logistics ${TOKEN}`;

/** No sideways scrolling, controls at least 44 px tall, no serious or critical axe findings. */
async function tabletChecks(page: Page, label: string) {
	const width = page.viewportSize()!.width;
	expect(await page.evaluate(() => document.documentElement.scrollWidth), `${label}: page width`).toBeLessThanOrEqual(width);
	const small = await page
		.locator('main :is(button, select, input:not([type=file]), textarea, a.btn-primary, a.btn-secondary, nav a)')
		.evaluateAll((els) =>
			els
				.map((el) => ({ el, r: el.getBoundingClientRect() }))
				.filter(({ r }) => r.width > 0 && r.height > 0 && r.height < 44)
				.map(({ el, r }) => `${el.tagName} "${(el.textContent ?? '').trim().slice(0, 30)}" ${Math.round(r.height)}px`)
		);
	expect(small, `${label}: touch targets under 44 px`).toEqual([]);
	const axe = await new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa']).analyze();
	const serious = axe.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
	expect(serious.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`), `${label}: axe`).toEqual([]);
}

test.describe('customers on a portrait tablet (768×1024)', () => {
	test.beforeEach(async ({ page }) => {
		await page.setViewportSize({ width: 768, height: 1024 });
	});

	test('a rep creates a customer with a site and a contact, finds it, and uploads a photo', async ({ page }) => {
		await signIn(page, 'rep@demo.traywise.test');
		await page.goto('/customers');
		await hydrated(page);
		await expect(page.getByRole('heading', { level: 1, name: 'Customers' })).toBeVisible();
		await expect(page.getByTestId('customer-name').first()).toBeVisible();
		await tabletChecks(page, 'list');
		await shot(page, 'customers-01-list-768x1024');

		// a form sent empty shows a message on the field and stores nothing
		await page.getByRole('link', { name: 'Add a customer' }).click();
		await expect(page.getByRole('heading', { level: 1, name: 'Add a customer' })).toBeVisible();
		await hydrated(page);
		await page.getByRole('button', { name: 'Save customer' }).click();
		await expect(page.getByText('Enter the customer name.')).toBeVisible();
		await expect(page.getByRole('alert')).toContainText('Nothing was saved');
		await tabletChecks(page, 'new customer with errors');
		await shot(page, 'customers-02-new-errors-768x1024');

		await page.getByLabel('Customer name').fill(CUSTOMER);
		await page.getByLabel(/^Account number/).fill(`QH-${TOKEN}`);
		await page.getByLabel(/^Notes/).fill('Three shifts. The battery room is behind the loading dock; overhead crane rated 2 t.');
		await page.getByRole('button', { name: 'Save customer' }).click();
		await expect(page.getByRole('heading', { level: 1, name: CUSTOMER })).toBeVisible();
		const customerUrl = page.url();

		await page.getByRole('link', { name: 'Add a site' }).click();
		await expect(page.getByRole('heading', { level: 1, name: 'Add a site' })).toBeVisible();
		await hydrated(page);
		await page.getByLabel('Site name').fill('Dockside warehouse');
		await page.getByLabel('Street address').fill('42 Tollgate Road');
		await page.getByLabel('Town or city').fill(`Hobbs Ferry ${TOKEN}`);
		await page.getByLabel(/^Postal code/).fill('98420');
		await page.getByLabel('Country').fill('United States');
		await page.getByLabel(/^Tax region code/).fill('wa ');
		await expect(page.getByLabel('Street address')).toHaveAttribute('autocomplete', 'off');
		await tabletChecks(page, 'new site');
		await shot(page, 'customers-03-new-site-768x1024');
		await page.getByRole('button', { name: 'Save site' }).click();
		await expect(page.getByRole('heading', { level: 3, name: 'Dockside warehouse' })).toBeVisible();
		await expect(page.getByText('WA', { exact: true })).toBeVisible();

		await page.getByRole('link', { name: 'Add a contact', exact: true }).click();
		await expect(page.getByRole('heading', { level: 1, name: 'Add a contact' })).toBeVisible();
		await hydrated(page);
		await page.getByLabel('Name', { exact: true }).fill('Wren Achterberg');
		await page.getByLabel(/^Role or title/).fill('Warehouse manager');
		await page.getByLabel('E-mail').fill('wren@quarrow.example');
		await page.getByLabel('Phone').fill('+1 360 555 0188');
		await expect(page.getByLabel('E-mail')).toHaveAttribute('inputmode', 'email');
		await expect(page.getByLabel('Phone')).toHaveAttribute('inputmode', 'tel');
		await page.getByLabel('Site').selectOption({ label: `Dockside warehouse (Hobbs Ferry ${TOKEN})` });
		await shot(page, 'customers-04-new-contact-768x1024');
		await page.getByRole('button', { name: 'Save contact' }).click();
		await expect(page.getByRole('heading', { level: 3, name: 'Wren Achterberg' })).toBeVisible();
		await expect(page.getByText('Warehouse manager · Dockside warehouse')).toBeVisible();

		// find it again from the list by its site's town
		await page.goto('/customers');
		await hydrated(page);
		await page.getByLabel('Search by name, account number or town').fill(`hobbs ferry ${TOKEN}`);
		await page.getByRole('button', { name: 'Search' }).click();
		await expect(page).toHaveURL(/q=hobbs\+ferry/);
		await expect(page.getByTestId('customer-count')).toHaveText(/1 customer matching/);
		await expect(page.getByTestId('customer-name')).toHaveText([CUSTOMER]);
		await shot(page, 'customers-05-search-768x1024');
		await page.getByTestId('customer-name').click();
		await expect(page).toHaveURL(customerUrl);
		await hydrated(page);

		// a photo made here, and a PDF that pretends to be a photo
		const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#2b968e' } })
			.composite([{ input: Buffer.from('<svg width="640" height="480"><rect x="160" y="120" width="320" height="240" fill="#d97706"/></svg>') }])
			.png()
			.toBuffer();
		const fakePdf = Buffer.from('%PDF-1.4\n1 0 obj\n<< >>\nendobj\n%%EOF\n');
		await page.locator('[data-testid="file-drop"] input[type=file]').setInputFiles([
			{ name: 'battery-room.png', mimeType: 'image/png', buffer: photo },
			{ name: 'charger-wall.jpg', mimeType: 'image/jpeg', buffer: fakePdf }
		]);
		const items = page.getByTestId('file-drop-item');
		await expect(items).toHaveCount(2);
		await expect(items.nth(0)).toContainText('Uploaded');
		await expect(items.nth(0).getByRole('progressbar')).toHaveAttribute('aria-valuenow', '100');
		await expect(items.nth(1)).toContainText('This file is a PDF document; a photo must be JPEG, PNG, WebP or HEIC.');
		const stored = page.getByRole('list', { name: 'Stored photos' }).getByRole('img', { name: 'battery-room.png' });
		await expect(stored).toBeVisible();
		// the thumbnail really loaded from /uploads/[id]/thumb
		await expect.poll(() => stored.evaluate((img: HTMLImageElement) => img.naturalWidth)).toBe(480);
		await tabletChecks(page, 'customer page');
		await shot(page, 'customers-06-customer-with-photo-768x1024');

		// the same page on a landscape tablet
		await page.setViewportSize({ width: 1024, height: 768 });
		await page.reload();
		await hydrated(page);
		await expect(page.getByRole('list', { name: 'Stored photos' }).getByRole('img')).toHaveCount(1);
		await tabletChecks(page, 'customer page, landscape');
		await shot(page, 'customers-07-customer-1024x768');
	});
});
