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
	await shot(mp, 'quote-03-manager-review-1280x800');
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
