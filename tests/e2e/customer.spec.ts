import { expect, test, type APIRequestContext, type Page } from '@playwright/test';
import pg from 'pg';
import { hydrated, shot, signIn } from './helpers';

/** Form actions from a script need the Origin header and text/html (else kit answers JSON). */
async function action(request: APIRequestContext, baseURL: string, path: string, form: Record<string, string>) {
	return request.post(path, { form, headers: { origin: baseURL, accept: 'text/html' }, maxRedirects: 0 });
}

/** The rep prepares and sends a quote (through the same routes the pages use); returns its id and contact. */
async function sendQuote(page: Page, baseURL: string): Promise<{ quoteId: string; email: string }> {
	const email = `e2e-${Date.now()}@marlow-crossing.example`;
	const picker = await (await page.request.get('/api/v1/customers?q=Marlow')).json();
	const customer = picker.customers[0];
	const start = await action(page.request, baseURL, '/surveys?/start', { customerId: customer.id, siteId: customer.sites[0].id, clientToken: crypto.randomUUID() });
	const surveyId = /\/surveys\/([0-9a-f-]{36})\//.exec(start.headers()['location'])![1];
	const trucks = await (await page.request.get('/api/v1/catalogue/trucks')).json();
	const truck = trucks.trucks.find((t: { code: string }) => t.code === 'TW-B4-25');
	const batteries = await (await page.request.get(`/api/v1/catalogue/batteries?truck=${truck.id}`)).json();
	const battery = batteries.batteries.find((b: { code: string }) => b.code === 'TW-B48-775-LA');
	const steps: Record<string, unknown> = {
		site: { contactName: 'Dana Quillfeather', contactEmail: email },
		fleet: { truckModelId: truck.id, trucks: 6, batterySource: 'catalogue', batteryId: battery.id },
		operation: { shiftsPerDay: 3, hoursPerShift: 8, daysPerWeek: 5, duty: 'medium', energyKwhPerHour: 3.5, charging: 'conventional' },
		equipment: { palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }], rollerStands: [], hasCrane: true, craneRatedLoadKg: 2000, hasBeam: true, beamWeightKg: 90 },
		charging: { hasArea: true, floorAreaM2: 40, ventilationM3h: 150, eyewash: true, neutraliser: true }
	};
	for (const [step, values] of Object.entries(steps)) expect((await page.request.patch(`/api/v1/surveys/${surveyId}`, { data: { step, values } })).status()).toBe(200);
	expect((await action(page.request, baseURL, `/surveys/${surveyId}/recommendation?/choose`, { setup: 'overhead-hoist' })).status()).toBe(303);
	const made = await action(page.request, baseURL, `/surveys/${surveyId}/recommendation?/quote`, { clientToken: crypto.randomUUID() });
	const quoteId = /\/quotes\/([0-9a-f-]{36})$/.exec(made.headers()['location'])![1];
	for (const a of ['mark-ready', 'send']) expect((await page.request.post(`/api/v1/quotes/${quoteId}/actions`, { data: { action: a } })).status(), a).toBe(200);
	return { quoteId, email };
}

/** The link as the customer got it: read from the mail the SMTP catcher stored. */
async function linkFromCaughtMail(email: string): Promise<string> {
	const db = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await db.connect();
	try {
		for (let i = 0; i < 100; i++) {
			const r = await db.query(`SELECT text FROM caught_mail WHERE to_address ILIKE $1 ORDER BY received_at LIMIT 1`, [`%${email}%`]);
			const m = r.rows[0] && /(https?:\/\/\S+\/q\/[A-Za-z0-9_-]{43})/.exec(r.rows[0].text);
			if (m) return m[1];
			await new Promise((res) => setTimeout(res, 200));
		}
		throw new Error('the quote e-mail never reached the catcher');
	} finally {
		await db.end();
	}
}

test('the customer opens the e-mailed link, downloads the PDF, accepts, pays the deposit; the rep sees it paid', async ({ page, browser, baseURL }) => {
	test.setTimeout(120_000);
	await signIn(page, 'rep@demo.traywise.test');
	const { quoteId, email } = await sendQuote(page, baseURL!);
	const link = await linkFromCaughtMail(email);

	// the customer, on a phone-sized tablet, with no account
	const customer = await browser.newContext({ viewport: { width: 768, height: 1024 }, acceptDownloads: true });
	const cp = await customer.newPage();
	await cp.goto(link);
	await hydrated(cp);
	await expect(cp.getByRole('heading', { level: 1 })).toContainText('Quote TW-');
	await shot(cp, 'customer-01-quote-768x1024');
	const download = cp.waitForEvent('download');
	await cp.getByTestId('download-pdf').click();
	expect((await download).suggestedFilename()).toMatch(/^TW-\d{4}-\d{6}\.pdf$/);

	await cp.getByRole('button', { name: 'Accept the quote' }).click();
	await expect(cp.getByText('Tick the box to agree to the terms.')).toBeVisible();
	await cp.getByLabel('Your full name').fill('Dana Quillfeather');
	await cp.getByRole('checkbox').check();
	await cp.getByRole('button', { name: 'Accept the quote' }).click();
	await expect(cp.getByTestId('customer-state')).toContainText('Accepted by Dana Quillfeather');
	await shot(cp, 'customer-02-accepted-768x1024');

	await cp.getByRole('button', { name: /Pay the deposit/ }).click();
	await expect(cp).toHaveURL(/\/pay\/cs_test_/);
	await cp.getByLabel(/Card number/i).fill('4242 4242 4242 4242');
	await cp.getByLabel(/Expiry/i).fill('12 / 30');
	await cp.getByLabel(/CVC/i).fill('123');
	await shot(cp, 'customer-03-checkout-768x1024');
	await cp.getByRole('button', { name: /Pay/ }).click();
	await expect(cp).toHaveURL(/\/paid/);
	await expect(async () => {
		await cp.reload();
		await expect(cp.getByTestId('paid-heading')).toHaveText('Deposit received — thank you');
	}).toPass({ timeout: 20_000 });
	await shot(cp, 'customer-04-paid-768x1024');
	await customer.close();

	await page.goto(`/quotes/${quoteId}`);
	await expect(page.getByTestId('quote-state')).toHaveText('Deposit paid');
	await expect(page.locator('[data-step="paid"]')).toHaveAttribute('data-done', 'yes');
	await shot(page, 'customer-05-rep-sees-paid-1280x800');
});
