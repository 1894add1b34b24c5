import { expect, test, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import { hydrated, shot, signIn } from './helpers';
import { makePng } from '../helpers/images';

const HEADER = 'sku,description,kind,list_price,cost';
const literally = (text: string) => new RegExp(text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'));

/** The active prices as the app's own download gives them, as CSV lines. */
async function activeCsvLines(page: Page): Promise<string[]> {
	const href = await page.getByRole('link', { name: 'Download CSV' }).first().getAttribute('href');
	const res = await page.request.get(href!);
	expect(res.status()).toBe(200);
	const lines = (await res.text()).trim().split('\r\n');
	expect(lines[0]).toBe(HEADER);
	return lines;
}

/**
 * Publishes `lines` as the active prices through the app's own form actions, so the suites that
 * price quotes after this one find the prices this one started from.
 */
async function publishAgain(page: Page, lines: string[], label: string) {
	const origin = new URL(page.url()).origin;
	const upload = await page.request.post('/admin/price-book?/upload', {
		headers: { origin, accept: 'text/html' },
		multipart: {
			label,
			effectiveDate: '2026-01-01',
			file: { name: 'restore.csv', mimeType: 'text/csv', buffer: Buffer.from(lines.join('\r\n')) }
		},
		maxRedirects: 0
	});
	expect(upload.status()).toBe(303);
	const draft = upload.headers()['location'].split('?')[0];
	const publish = await page.request.post(`${draft}?/publish`, {
		headers: { origin, accept: 'text/html' },
		form: { confirm: 'publish' },
		maxRedirects: 0
	});
	expect(publish.status()).toBe(303);
}

async function noSeriousAxeViolations(page: Page) {
	const results = await new AxeBuilder({ page }).analyze();
	const serious = results.violations.filter(
		(v) => v.impact === 'serious' || v.impact === 'critical'
	);
	expect(
		serious.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)
	).toEqual([]);
}

async function noSidewaysScroll(page: Page, width: number) {
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(
		width
	);
}

test('admin uploads prices with a bad row, sees the row, fixes it and publishes', async ({
	page
}) => {
	await page.setViewportSize({ width: 1280, height: 800 });
	await signIn(page, 'admin@demo.traywise.test');
	await page.goto('/admin/price-book');
	await hydrated(page);
	await expect(page.getByRole('heading', { level: 1, name: 'Price book' })).toBeVisible();
	const oldActive = (await page
		.getByRole('heading', { name: /^Active prices: / })
		.textContent())!.replace('Active prices: ', '');
	await shot(page, 'pricebook-start-1280x800');

	const lines = await activeCsvLines(page);
	const run = Date.now().toString(36).toUpperCase();
	const label = `Autumn prices ${run}`;
	const newSku = `TW-E2E-${run}`;
	// raise the first truck by $500.00 and add one new accessory
	const truckIndex = lines.findIndex((l) => l.split(',')[2] === 'truck');
	const [sku, description, kind, list, cost] = lines[truckIndex].split(',');
	const raised = (Number(list) + 500).toFixed(2);
	const good = [...lines];
	good[truckIndex] = [sku, description, kind, raised, cost].join(',');
	good.push(`${newSku},Anti-slip mat for the charging area,accessory,189.00,95.00`);
	// the bad file: the same, with a kind nobody knows on the last row
	const bad = [
		...good.slice(0, -1),
		`${newSku},Anti-slip mat for the charging area,doormat,189.00,95.00`
	];
	const badRow = bad.length; // header is row 1

	await page.getByLabel('Name of the version').fill(label);
	await page.getByLabel('Effective from').fill('2026-09-01');
	await page.getByLabel('CSV file (at most 2 MB)').setInputFiles({
		name: 'autumn-prices.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from(bad.join('\r\n'))
	});
	await page.getByRole('button', { name: 'Upload as a draft' }).click();
	const problems = page.getByRole('alert').filter({ hasText: 'Nothing was imported' });
	await expect(problems).toBeVisible();
	await expect(problems).toContainText('autumn-prices.csv has a problem');
	await expect(
		problems.getByRole('row', {
			name: new RegExp(`^${badRow} kind Row ${badRow}: kind "doormat" is not one of`)
		})
	).toBeVisible();
	// nothing was imported: no draft appeared in the versions list
	await expect(page.getByRole('link', { name: label })).toHaveCount(0);
	await noSeriousAxeViolations(page);
	await shot(page, 'pricebook-upload-errors-1280x800');

	// the fixed file: the form kept the name and date, the file is chosen again
	await expect(page.getByLabel('Name of the version')).toHaveValue(label);
	await page.getByLabel('CSV file (at most 2 MB)').setInputFiles({
		name: 'autumn-prices.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from(good.join('\r\n'))
	});
	await page.getByRole('button', { name: 'Upload as a draft' }).click();
	await expect(page).toHaveURL(/\/admin\/price-book\/[0-9a-f-]{36}\?uploaded=1$/);
	await hydrated(page);
	await expect(page.getByRole('heading', { level: 1, name: label })).toBeVisible();
	await expect(page.getByRole('status')).toContainText(`this draft holds ${good.length - 1} items`);
	const summary = page.getByRole('list', { name: 'Summary' });
	await expect(summary).toContainText('1 new');
	await expect(summary).toContainText('0 removed');
	await expect(summary).toContainText('1 changed');
	await expect(page.getByRole('row', { name: new RegExp(`^${sku} `) }).first()).toContainText(
		'+$500.00'
	);
	await noSeriousAxeViolations(page);
	await shot(page, 'pricebook-draft-review-1280x800');

	// publishing asks first
	await page.getByText('Publish…').click();
	const confirm = page.getByRole('button', { name: 'Yes, publish these prices' });
	await expect(confirm).toBeVisible();
	await expect(page.getByText(`“${oldActive}” is archived`)).toBeVisible();
	await shot(page, 'pricebook-publish-confirm-1280x800');
	await confirm.click();

	await expect(page).toHaveURL(/\/admin\/price-book\?published=/);
	await expect(page.getByRole('status')).toContainText(`“${label}” is now the active price book`);
	await expect(page.getByRole('heading', { name: `Active prices: ${label}` })).toBeVisible();
	const versions = page.getByRole('table').first();
	await expect(versions.getByRole('row', { name: literally(label) })).toContainText('Active');
	await expect(versions.getByRole('row', { name: literally(oldActive) }).first()).toContainText(
		'Archived'
	);
	await page.getByLabel('SKU or description').fill(newSku.toLowerCase());
	await page.getByRole('button', { name: 'Search' }).click();
	await expect(page).toHaveURL(new RegExp(`q=${newSku.toLowerCase()}`));
	await expect(page.getByRole('cell', { name: newSku })).toBeVisible();
	await expect(page.getByText('1 item matches')).toBeVisible();
	await shot(page, 'pricebook-published-1280x800');

	await publishAgain(page, lines, `${oldActive.replace(/ \(again\)$/, '')} (again)`);
});

test('the price book and a draft fit a portrait tablet', async ({ page }) => {
	await page.setViewportSize({ width: 768, height: 1024 });
	await signIn(page, 'admin@demo.traywise.test');
	await page.goto('/admin/price-book');
	await hydrated(page);
	await noSidewaysScroll(page, 768);
	await shot(page, 'pricebook-768x1024');
	await page
		.getByRole('link', { name: /^Open / })
		.first()
		.click();
	await expect(page.getByRole('heading', { name: 'Items in this version' })).toBeVisible();
	await noSidewaysScroll(page, 768);
	await shot(page, 'pricebook-version-768x1024');

	// a draft reviewed on the tablet, then thrown away
	await page.goto('/admin/price-book');
	await hydrated(page);
	const lines = await activeCsvLines(page);
	await page.getByLabel('Name of the version').fill('Tablet draft');
	await page.getByLabel('CSV file (at most 2 MB)').setInputFiles({
		name: 'tablet.csv',
		mimeType: 'text/csv',
		buffer: Buffer.from(
			[
				...lines.slice(0, -1),
				'TW-E2E-TAB,"Wall chart, battery-room cautions",accessory,35.00,12.00'
			].join('\n')
		)
	});
	await page.getByRole('button', { name: 'Upload as a draft' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Tablet draft' })).toBeVisible();
	await hydrated(page);
	await expect(page.getByRole('list', { name: 'Summary' })).toContainText('1 removed');
	await noSidewaysScroll(page, 768);
	await shot(page, 'pricebook-draft-768x1024');
	await page.getByText('Delete draft…').click();
	await page.getByRole('button', { name: 'Yes, delete this draft' }).click();
	await expect(page).toHaveURL(/\/admin\/price-book\?deleted=1$/);
	await expect(page.getByRole('status')).toHaveText('The draft was deleted.');
	await expect(page.getByRole('link', { name: 'Tablet draft' })).toHaveCount(0);
});

test('admin sets the rules, is told off for a 150 % deposit, and uploads a logo', async ({
	page
}) => {
	for (const [w, h] of [
		[1280, 800],
		[768, 1024]
	] as const) {
		await page.setViewportSize({ width: w, height: h });
		await page.context().clearCookies();
		await signIn(page, 'admin@demo.traywise.test');
		await page.goto('/admin/settings');
		await hydrated(page);
		await expect(page.getByRole('heading', { level: 1, name: 'Company settings' })).toBeVisible();
		await noSidewaysScroll(page, w);

		const deposit = page.getByLabel('Deposit share (%)');
		const kept = await deposit.inputValue();
		await deposit.fill('150 %');
		await page.getByRole('button', { name: 'Save settings' }).click();
		await expect(
			page.getByText('The deposit share must be between 0 and 100 %; 150 % is more than the whole.')
		).toBeVisible();
		await expect(page.getByText('Nothing was saved.')).toBeVisible();
		// the form scrolled to the field in error; from the top, the sticky header draws where it belongs
		await page.evaluate(() => window.scrollTo(0, 0));
		await shot(page, `settings-error-${w}x${h}`);
		await deposit.fill(kept);
		await page.getByRole('button', { name: 'Save settings' }).click();
		await expect(page.getByText('Settings saved.')).toBeVisible();

		await page
			.getByLabel(/a PNG or JPEG$/)
			.setInputFiles({ name: 'orrin-bay.png', mimeType: 'image/png', buffer: makePng(360, 120) });
		await page.getByRole('button', { name: 'Upload logo' }).click();
		await expect(page.getByText('Logo saved.')).toBeVisible();
		const preview = page.getByRole('img', { name: 'The current logo' });
		await expect(preview).toBeVisible();
		expect(await preview.evaluate((img: HTMLImageElement) => img.naturalWidth)).toBe(360);
		await noSeriousAxeViolations(page);
		await shot(page, `settings-${w}x${h}`);
	}
});
