import { expect, test, type APIRequestContext } from '@playwright/test';
import { hydrated, shot, signIn } from './helpers';

/** A chosen three-shift survey for the demo customer, made through the JSON API with the page's session. */
async function chosenSurvey(request: APIRequestContext, baseURL: string): Promise<string> {
	const picker = await (await request.get('/api/v1/customers?q=Marlow')).json();
	const customer = picker.customers[0];
	const start = await request.post('/surveys?/start', {
		form: { customerId: customer.id, siteId: customer.sites[0].id, clientToken: crypto.randomUUID() },
		headers: { origin: baseURL, accept: 'text/html' },
		maxRedirects: 0
	});
	const id = /\/surveys\/([0-9a-f-]{36})\//.exec(start.headers()['location'])![1];
	return id;
}

test('a rep builds a quote over their authority, a manager approves it, the rep sends it', async ({ page, browser, baseURL }) => {
	test.setTimeout(120_000);
	await page.setViewportSize({ width: 1024, height: 768 });
	await signIn(page, 'rep@demo.traywise.test');
	const surveyId = await chosenSurvey(page.request, baseURL!);

	// trucks and battery through the wizard; the other steps through its autosave route
	await page.goto(`/surveys/${surveyId}/fleet`);
	await hydrated(page);
	await page.getByLabel('Truck model').selectOption({ label: 'Basalt 4 · 2.5 t — 2 500 kg (5,512 lb) capacity' });
	await page.getByLabel('How many trucks').fill('6');
	const battery = page.getByLabel('Battery for this truck');
	await battery.selectOption((await battery.locator('option', { hasText: '775 Ah lead-acid' }).getAttribute('value'))!);
	await page.getByRole('button', { name: /Next/ }).click();
	await expect(page.getByRole('heading', { level: 2, name: 'Operation' })).toBeVisible();
	const steps: Record<string, unknown> = {
		site: { contactName: 'Dana Quillfeather', contactEmail: 'dana.q@marlow-crossing.example' },
		operation: { shiftsPerDay: 3, hoursPerShift: 8, daysPerWeek: 5, duty: 'medium', energyKwhPerHour: 3.5, charging: 'conventional' },
		equipment: { palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }], rollerStands: [], hasCrane: true, craneRatedLoadKg: 2000, hasBeam: true, beamWeightKg: 90 },
		charging: { hasArea: true, floorAreaM2: 40, ventilationM3h: 150, eyewash: true, neutraliser: true }
	};
	for (const [step, values] of Object.entries(steps)) {
		const res = await page.request.patch(`/api/v1/surveys/${surveyId}`, { data: { step, values } });
		expect(res.status(), step).toBe(200);
	}

	await page.goto(`/surveys/${surveyId}/recommendation`);
	await hydrated(page);
	await page.getByTestId('setup-overhead-hoist').getByRole('button', { name: 'Choose' }).click();
	await expect(page.getByRole('button', { name: 'Build the quote →' })).toBeVisible();
	await page.getByRole('button', { name: 'Build the quote →' }).click();
	await expect(page.getByTestId('quote-state')).toHaveText('Draft');
	await hydrated(page);

	// 15 % off the trucks is above the rep's 10 % authority
	await page.getByLabel(/^Discount on Basalt 4/).fill('15');
	await expect(page.getByTestId('approval-needed')).toBeVisible();
	await page.getByRole('button', { name: 'Save changes' }).click();
	await expect(page.getByRole('status').filter({ hasText: 'Saved.' })).toBeVisible();
	await shot(page, 'quote-01-draft-over-authority-1024x768');
	await expect(page.getByRole('button', { name: 'Send to the customer' })).toHaveCount(0);
	await page.getByRole('button', { name: 'Submit for approval' }).click();
	await expect(page.getByTestId('quote-state')).toHaveText('Awaiting approval');
	const quoteUrl = page.url();

	// the manager approves from the approvals queue
	const managerContext = await browser.newContext({ viewport: { width: 1280, height: 800 } });
	const mp = await managerContext.newPage();
	await signIn(mp, 'manager@demo.traywise.test');
	await mp.goto('/pipeline');
	await expect(mp.getByTestId('approvals-count')).not.toHaveText('0');
	await shot(mp, 'quote-02-pipeline-1280x800');
	await mp.goto('/approvals');
	await mp.getByRole('link').filter({ hasText: 'Marlow Crossing Cold Store' }).first().click();
	await hydrated(mp);
	await expect(mp.getByTestId('quote-state')).toHaveText('Awaiting approval');
	await mp.goto(quoteUrl);
	await hydrated(mp);
	// the manager sees who it goes to, and whose authority the figures are measured against
	await expect(mp.getByTestId('quote-details')).toContainText('dana.q@marlow-crossing.example');
	await expect(mp.getByTestId('authority')).toContainText("A rep's discount authority");
	await shot(mp, 'quote-03-manager-review-1280x800');
	await mp.setViewportSize({ width: 768, height: 1024 });
	await shot(mp, 'quote-03-manager-review-768x1024');
	await mp.getByRole('button', { name: 'Approve' }).click();
	await expect(mp.getByTestId('quote-state')).toHaveText('Approved');
	await managerContext.close();

	// the rep sends it; the PDF is stored
	await page.reload();
	await hydrated(page);
	await page.getByRole('button', { name: 'Send to the customer' }).click();
	await expect(page.getByTestId('quote-state')).toHaveText('Sent');
	await expect(page.getByRole('link', { name: 'PDF as sent' })).toBeVisible();
	await shot(page, 'quote-04-sent-1024x768');
	const pdf = await page.request.get(quoteUrl.replace(/\/?$/, '/pdf'));
	expect(pdf.headers()['content-type']).toBe('application/pdf');
	expect((await pdf.body()).subarray(0, 5).toString()).toBe('%PDF-');
});

/** A quote built from a complete survey for the demo customer (six trucks, hoist exchange); returns its id. */
async function builtQuote(request: APIRequestContext, baseURL: string): Promise<string> {
	const form = (path: string, fields: Record<string, string>) =>
		request.post(path, { form: fields, headers: { origin: baseURL, accept: 'text/html' }, maxRedirects: 0 });
	const surveyId = await chosenSurvey(request, baseURL);
	const trucks = await (await request.get('/api/v1/catalogue/trucks')).json();
	const truck = trucks.trucks.find((t: { code: string }) => t.code === 'TW-B4-25');
	const batteries = await (await request.get(`/api/v1/catalogue/batteries?truck=${truck.id}`)).json();
	const battery = batteries.batteries.find((b: { code: string }) => b.code === 'TW-B48-775-LA');
	const steps: Record<string, unknown> = {
		site: { contactName: 'Dana Quillfeather', contactEmail: 'dana.q@marlow-crossing.example' },
		fleet: { truckModelId: truck.id, trucks: 6, batterySource: 'catalogue', batteryId: battery.id },
		operation: { shiftsPerDay: 3, hoursPerShift: 8, daysPerWeek: 5, duty: 'medium', energyKwhPerHour: 3.5, charging: 'conventional' },
		equipment: { palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }], rollerStands: [], hasCrane: true, craneRatedLoadKg: 2000, hasBeam: true, beamWeightKg: 90 },
		charging: { hasArea: true, floorAreaM2: 40, ventilationM3h: 150, eyewash: true, neutraliser: true }
	};
	for (const [step, values] of Object.entries(steps)) expect((await request.patch(`/api/v1/surveys/${surveyId}`, { data: { step, values } })).status(), step).toBe(200);
	expect((await form(`/surveys/${surveyId}/recommendation?/choose`, { setup: 'overhead-hoist' })).status()).toBe(303);
	const made = await form(`/surveys/${surveyId}/recommendation?/quote`, { clientToken: crypto.randomUUID() });
	return /\/quotes\/([0-9a-f-]{36})$/.exec(made.headers()['location'])![1];
}

test('a refused save keeps every edit on screen and marks the line; the next step stays shut; leaving with unsaved edits asks first', async ({ page, baseURL }) => {
	test.setTimeout(120_000);
	await page.setViewportSize({ width: 768, height: 1024 });
	await signIn(page, 'rep@demo.traywise.test');
	const quoteId = await builtQuote(page.request, baseURL!);
	await page.goto(`/quotes/${quoteId}`);
	await hydrated(page);
	await expect(page.getByRole('button', { name: 'Mark ready to send' })).toBeEnabled();

	// the edit: trucks 6 → 8, 3 % overall, a note, and 150 % off the batteries in the trucks (line 2)
	const quantity = page.getByLabel(/^Quantity of Basalt 4/);
	await quantity.fill('8');
	await page.getByLabel('Overall discount (%)').fill('3');
	await page.getByLabel('Notes printed on the quote').fill('Deliver in two lots.');
	const lineDiscount = page.locator('#disc-1');
	await lineDiscount.fill('150');
	await expect(page.getByTestId('unsaved')).toBeVisible();
	await page.getByRole('button', { name: 'Save changes' }).click();

	const alert = page.getByTestId('quote-error');
	await expect(alert).toContainText('Line 2 (48 V 775 Ah lead-acid, 24 cells — one fitted in each truck), discount: A discount cannot exceed 100 %: enter 0 to 100 %.');
	await expect(page.getByTestId('totals-stale')).toBeVisible();
	// every edit is still there, still unsaved, and the offending field is marked with its range
	await expect(quantity).toHaveValue('8');
	await expect(page.getByLabel('Overall discount (%)')).toHaveValue('3');
	await expect(page.getByLabel('Notes printed on the quote')).toHaveValue('Deliver in two lots.');
	await expect(lineDiscount).toHaveValue('150');
	await expect(lineDiscount).toHaveAttribute('aria-invalid', 'true');
	await expect(page.locator('#disc-1-error')).toHaveText('A discount cannot exceed 100 %: enter 0 to 100 %.');
	await expect(page.getByTestId('line-1')).toHaveAttribute('data-invalid', 'yes');
	await expect(page.getByTestId('unsaved')).toBeVisible();
	await expect(page.getByRole('button', { name: 'Mark ready to send' })).toBeDisabled();
	await shot(page, 'quote-05-refused-save-768x1024');
	await page.setViewportSize({ width: 1280, height: 800 });
	await shot(page, 'quote-05-refused-save-1280x800');

	// leaving through a link asks first; staying keeps the edits
	let asked = '';
	page.once('dialog', (d) => {
		asked = d.message();
		void d.dismiss();
	});
	await page.getByRole('link', { name: 'Survey', exact: true }).click();
	await expect.poll(() => asked).toMatch(/not saved/);
	await expect(page).toHaveURL(new RegExp(`/quotes/${quoteId}$`));
	await expect(quantity).toHaveValue('8');

	// corrected, it saves; the screen shows what was stored and the next step opens
	await lineDiscount.fill('5');
	await page.getByRole('button', { name: 'Save changes' }).click();
	await expect(page.getByRole('status').filter({ hasText: 'Saved.' })).toBeVisible();
	await expect(page.getByTestId('unsaved')).toHaveCount(0);
	await expect(quantity).toHaveValue('8');
	await expect(page.getByLabel('Overall discount (%)')).toHaveValue('3');
	await expect(lineDiscount).toHaveValue('5');
	await expect(page.getByTestId('quote-error')).toHaveCount(0);
	await expect(page.getByRole('button', { name: /Mark ready to send|Submit for approval/ })).toBeEnabled();

	// nothing unsaved: the link just goes
	page.once('dialog', (d) => {
		asked = `unexpected: ${d.message()}`;
		void d.dismiss();
	});
	await page.getByRole('link', { name: 'Survey', exact: true }).click();
	await expect(page).toHaveURL(/\/recommendation$/);
	expect(asked).not.toMatch(/unexpected/);
	page.removeAllListeners('dialog');

	// back on the quote, an unsaved edit and a closing tab: the browser asks (beforeunload)
	await page.goto(`/quotes/${quoteId}`);
	await hydrated(page);
	await page.getByLabel('Notes printed on the quote').fill('Deliver in three lots.');
	const dialog = page.waitForEvent('dialog');
	await page.close({ runBeforeUnload: true });
	const d = await dialog;
	expect(d.type()).toBe('beforeunload');
	await d.accept();
});
