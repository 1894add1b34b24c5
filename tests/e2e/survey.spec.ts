import { expect, test, type Locator, type Page } from '@playwright/test';
import sharp from 'sharp';
import { hydrated, shot, signIn } from './helpers';

const TOKEN = `s${Date.now().toString(36)}`;
const CUSTOMER = `Wickerby Lane Depot ${TOKEN}`;

async function noSidewaysScroll(page: Page) {
	expect(await page.evaluate(() => document.documentElement.scrollWidth)).toBeLessThanOrEqual(page.viewportSize()!.width);
}

async function next(page: Page, heading: string) {
	await page.getByRole('button', { name: /Next|Review/ }).click();
	await expect(page.getByRole('heading', { level: 2, name: heading })).toBeVisible();
	await hydrated(page);
}

async function typeQuantity(page: Page, label: string | RegExp | Locator, value: string) {
	const input = typeof label === 'string' || label instanceof RegExp ? page.getByLabel(label) : label;
	await input.click();
	await input.fill(value);
	await input.press('Tab');
}

test.describe('site survey on a portrait tablet (768×1024)', () => {
	test.beforeEach(async ({ page }) => {
		await page.setViewportSize({ width: 768, height: 1024 });
	});

	test('a rep surveys a three-shift site with a drive-alongside changer and chooses a setup', async ({ page }) => {
		test.setTimeout(180_000);
		await signIn(page, 'rep@demo.traywise.test');

		// a new customer with a site
		await page.goto('/customers/new');
		await hydrated(page);
		await page.getByLabel('Customer name').fill(CUSTOMER);
		await page.getByRole('button', { name: 'Save customer' }).click();
		await expect(page.getByRole('heading', { level: 1, name: CUSTOMER })).toBeVisible();
		await page.getByRole('link', { name: 'Add a site' }).click();
		await hydrated(page);
		await page.getByLabel('Site name').fill('Cold dock');
		await page.getByLabel('Street address').fill('7 Wickerby Lane');
		await page.getByLabel('Town or city').fill('Port Aldene');
		await page.getByLabel('Country').fill('United States');
		await page.getByLabel(/^Tax region code/).fill('WA');
		await page.getByRole('button', { name: 'Save site' }).click();
		await expect(page.getByRole('heading', { level: 3, name: 'Cold dock' })).toBeVisible();

		// start the survey
		await page.goto('/surveys');
		await hydrated(page);
		await page.getByLabel('Customer').selectOption({ label: CUSTOMER });
		await page.getByRole('button', { name: 'Start survey' }).click();
		await expect(page.getByRole('heading', { level: 2, name: 'Site and contact' })).toBeVisible();
		await hydrated(page);
		const surveyUrl = page.url().replace(/\/site$/, '');
		await page.getByLabel('Who showed you the site').fill('Orla Penhallow');
		await page.getByLabel('Their e-mail').fill('orla@wickerby.example');
		await noSidewaysScroll(page);
		await shot(page, 'survey-01-site-768x1024');

		await next(page, 'Trucks and battery');
		await page.getByLabel('Truck model').selectOption({ label: 'Basalt 4 · 2.5 t — 2 500 kg (5,512 lb) capacity' });
		await page.getByLabel('How many trucks').fill('6');
		const battery = page.getByLabel('Battery for this truck');
		await battery.selectOption((await battery.locator('option', { hasText: '775 Ah lead-acid' }).getAttribute('value'))!);
		await page.getByLabel('How many trucks').press('Tab');
		await shot(page, 'survey-02-fleet-768x1024');

		await next(page, 'Operation');
		await page.getByLabel('Shifts a day').fill('3');
		await page.getByLabel('Hours per shift').fill('8');
		await page.getByLabel('Days a week').fill('5');
		await page.getByRole('radio', { name: /Medium/ }).check();
		await page.getByRole('radio', { name: /Conventional/ }).check();
		await page.getByLabel('Days a week').press('Tab');
		await expect(page.getByTestId('save-status')).toHaveAttribute('data-state', 'saved');

		// reload in the middle: nothing typed is lost, and the survey opens where it stopped
		await page.goto(surveyUrl);
		await expect(page.getByRole('heading', { level: 2, name: 'Operation' })).toBeVisible();
		await hydrated(page);
		await expect(page.getByLabel('Shifts a day')).toHaveValue('3');
		await expect(page.getByRole('radio', { name: /Medium/ })).toBeChecked();
		await shot(page, 'survey-03-operation-after-reload-768x1024');

		await next(page, 'Existing equipment');
		await page.getByRole('button', { name: '+ Add a pallet truck' }).click();
		await typeQuantity(page, 'Fork length', '1150 mm');
		await typeQuantity(page, 'Width over the forks', '540');
		await typeQuantity(page, page.locator('#pt-0-cap'), '2000 kg');
		await page.getByRole('button', { name: '+ Add a battery changer' }).click();
		await typeQuantity(page, 'Roller height above floor', '215');
		await typeQuantity(page, page.locator('#rs-0-cap'), '1800');
		await page.getByLabel('The site has an overhead hoist or crane over the battery area').check();
		await typeQuantity(page, 'Rated load (from its plate)', '4,400 lb');
		await expect(page.getByText(/4,400 lb \(1 996 kg\)|1 996 kg \(4,400 lb\)/)).toBeVisible();
		await page.getByLabel('Has an insulated lifting beam').check();
		await typeQuantity(page, 'Lifting beam weight', '90');

		// the live panel answers, and changes when the fork length changes
		const trolley = page.getByTestId('live-trolley-stand');
		// forks of 1 150 mm sit inside the latching trolley's 1 120–1 170 mm range: trolley exchange fits
		await expect(trolley).toHaveAttribute('data-verdict', 'fits');
		await expect(page.getByTestId('save-status')).toHaveAttribute('data-state', 'saved');
		await shot(page, 'survey-04-equipment-forks-1150-768x1024');
		await typeQuantity(page, 'Fork length', '43.3 in');
		await expect(page.getByText('1 100 mm (43.3 in)').first()).toBeVisible();
		await expect(trolley).toHaveAttribute('data-verdict', 'fits-with-changes');
		await expect(page.getByTestId('live-trolley-stand-problem')).toContainText(/fork/i);
		await shot(page, 'survey-05-equipment-forks-1100-768x1024');
		// back to forks that fit the latching trolley
		await typeQuantity(page, 'Fork length', '1150');
		await expect(trolley).toHaveAttribute('data-verdict', 'fits');
		await noSidewaysScroll(page);

		await next(page, 'Charging area');
		// poor Wi-Fi: saves fail, the rep sees it, nothing is lost, and it saves once the network is back
		await page.route('**/api/v1/surveys/**', (route) => route.abort('internetdisconnected'));
		await typeQuantity(page, 'Floor area', '40');
		await expect(page.getByTestId('save-status')).toContainText('Not saved yet');
		await shot(page, 'survey-06a-offline-768x1024');
		await page.unroute('**/api/v1/surveys/**');
		await expect(page.getByTestId('save-status')).toHaveAttribute('data-state', 'saved', { timeout: 20_000 });
		await typeQuantity(page, /Mechanical air flow/, '150');
		await page.getByLabel(/Eyewash station/).check();
		await shot(page, 'survey-06-charging-768x1024');

		await next(page, 'Photos and notes');
		const photo = await sharp({ create: { width: 640, height: 480, channels: 3, background: '#46b2a9' } }).png().toBuffer();
		await page.locator('[data-testid="file-drop"] input[type=file]').first().setInputFiles([{ name: 'battery room.png', mimeType: 'image/png', buffer: photo }]);
		await expect(page.getByTestId('file-drop-item').first()).toContainText('Uploaded');
		await expect(page.getByTestId('survey-uploads')).toContainText('battery room.png');
		await page.getByLabel('Notes for the quote and the installer').fill('Changer runs along the east wall; hoist over bay 2.');
		await shot(page, 'survey-07-notes-768x1024');

		await next(page, 'Review');
		await expect(page.getByText('Still needed')).toHaveCount(0);
		await shot(page, 'survey-08-review-768x1024');
		await page.getByRole('button', { name: 'See the recommendation →' }).click();

		await expect(page.getByTestId('batteries-per-truck')).toHaveText('3');
		await expect(page.getByTestId('setup-overhead-hoist')).toContainText('Recommended');
		await expect(page.getByTestId('setup-in-truck')).toHaveAttribute('data-verdict', 'does-not-fit');
		await noSidewaysScroll(page);
		await shot(page, 'survey-09-recommendation-768x1024');
		await page.getByTestId('setup-overhead-hoist').getByRole('button', { name: 'Choose' }).click();
		await expect(page.getByRole('status').filter({ hasText: 'goes ahead with' })).toContainText('Hoist exchange');
		await expect(page.getByTestId('setup-overhead-hoist')).toContainText('Chosen for the quote');
		await shot(page, 'survey-10-chosen-768x1024');

		await page.setViewportSize({ width: 1280, height: 800 });
		await page.reload();
		await expect(page.getByTestId('setup-detail')).toBeVisible();
		await shot(page, 'survey-11-recommendation-1280x800');
	});

	test('a refused answer is marked, never reported as saved, and leaving warns', async ({ page }) => {
		test.setTimeout(120_000);
		await signIn(page, 'rep@demo.traywise.test');
		await page.goto('/surveys');
		await hydrated(page);
		await page.getByLabel('Customer').selectOption({ label: 'Marlow Crossing Cold Store' });
		await page.getByRole('button', { name: 'Start survey' }).click();
		await expect(page.getByRole('heading', { level: 2, name: 'Site and contact' })).toBeVisible();
		await hydrated(page);
		const surveyUrl = page.url().replace(/\/site$/, '');
		const status = page.getByTestId('save-status');
		const steps = page.getByRole('navigation', { name: 'Survey steps' });
		// nothing is ticked before it is done: not the notes step, not the review
		await expect(steps.getByRole('link', { name: /Photos and notes/ })).not.toContainText('✓');
		await expect(steps.getByRole('link', { name: /Review/ })).not.toContainText('✓');

		await page.getByLabel('Who showed you the site').fill('Dale Prentice');
		await page.getByLabel('Their phone').fill('+1 555 0100 222');
		await page.getByLabel('Their e-mail').fill('dale@pellham');
		await page.getByLabel('Their e-mail').press('Tab');
		await expect(status).toHaveAttribute('data-state', 'refused');
		await expect(status).toContainText('Not saved: check the marked field');
		await expect(status).not.toContainText('Saved');
		await expect(page.getByLabel('Their e-mail')).toHaveAttribute('aria-invalid', 'true');
		await expect(page.locator('#contactEmail-error')).toContainText('like name@example.com');
		await shot(page, 'survey-12-site-refused-768x1024');

		// moving on by the step links asks first; staying keeps the typed e-mail
		let asked = '';
		page.once('dialog', (d) => {
			asked = d.message();
			void d.dismiss();
		});
		await steps.getByRole('link', { name: /Trucks and battery/ }).click();
		await expect.poll(() => asked).toContain('not saved');
		await expect(page.getByRole('heading', { level: 2, name: 'Site and contact' })).toBeVisible();
		await expect(page.getByLabel('Their e-mail')).toHaveValue('dale@pellham');

		// reloading asks too (the browser's own question); the phone was stored, the bad e-mail was not
		let unload = false;
		page.once('dialog', (d) => {
			unload = d.type() === 'beforeunload';
			void d.accept();
		});
		await page.reload();
		await hydrated(page);
		expect(unload).toBe(true);
		await expect(page.getByLabel('Their phone')).toHaveValue('+1 555 0100 222');
		await expect(page.getByLabel('Their e-mail')).toHaveValue('');
		await expect(status).toHaveAttribute('data-state', 'saved');

		// 4 shifts × 12 h: said at once, and "Next" does not pass it
		await page.goto(`${surveyUrl}/operation`);
		await hydrated(page);
		await page.getByLabel(/Shifts a day/).fill('4');
		await page.getByLabel(/Hours per shift/).fill('12');
		await page.getByLabel(/Days a week/).fill('6');
		await page.getByRole('radio', { name: /Heavy/ }).check();
		await page.getByRole('radio', { name: /Fast/ }).check();
		await expect(page.getByTestId('hours-per-day')).toHaveText('4 shifts × 12 h makes 48 hours a day; a day has 24 hours. With 4 shifts, enter at most 6 h per shift.');
		await page.getByRole('button', { name: 'Next →' }).click();
		await expect(page.getByRole('heading', { level: 2, name: 'Operation' })).toBeVisible();
		await expect(page.getByLabel(/Hours per shift/)).toHaveAttribute('aria-invalid', 'true');
		await expect(steps.getByRole('link', { name: /Operation/ })).not.toContainText('✓');
		await shot(page, 'survey-13-operation-4x12-768x1024');
		await page.getByLabel(/Days a week/).fill('9');
		await page.getByLabel(/Days a week/).press('Tab');
		await expect(page.locator('#daysPerWeek-error')).toHaveText('Enter 1 to 7 days a week (whole days).');

		// the fleet step shows the battery's weight range and size in both systems
		page.once('dialog', (d) => void d.accept());
		await steps.getByRole('link', { name: /Trucks and battery/ }).click();
		await expect(page.getByRole('heading', { level: 2, name: 'Trucks and battery' })).toBeVisible();
		await hydrated(page);
		await page.getByLabel('Truck model').selectOption({ label: 'Basalt 4 · 2.5 t — 2 500 kg (5,512 lb) capacity' });
		// 1 000 and 1 450 kg ÷ 0.45359237 = 2 204.6 and 3 196.7 lb
		await expect(page.getByTestId('truck-battery-range')).toContainText('1 000–1 450 kg (2,205–3,197 lb)');
		const battery = page.getByLabel('Battery for this truck');
		await battery.selectOption((await battery.locator('option', { hasText: '775 Ah lead-acid' }).getAttribute('value'))!);
		await expect(page.getByTestId('battery-size')).toContainText(/mm \(.* in\)/);
		await shot(page, 'survey-14-fleet-768x1024');
	});
});

