import { expect, test, type APIRequestContext, type Browser, type Page } from '@playwright/test';
import AxeBuilder from '@axe-core/playwright';
import pg from 'pg';
import { DEMO_PASSWORD, hydrated, shot, signIn } from './helpers';
import { demoSurveySteps } from '../helpers/survey-steps';

// Accessibility (issue 7, item 2): an axe scan (WCAG 2 A and AA rules) of every main page for each
// role and for the customer, with no serious or critical findings; and the survey wizard walked
// with the keyboard alone.

const EMAIL = {
	rep: 'rep@demo.traywise.test',
	manager: 'manager@demo.traywise.test',
	admin: 'admin@demo.traywise.test'
} as const;

interface Fixture {
	surveyId: string;
	quoteId: string;
	customerId: string;
	customerLink: string;
	priceBookId: string;
	mailId: string;
}
let fixture: Fixture;

/** Form actions from a script need the Origin header and text/html (else kit answers JSON). */
function action(
	request: APIRequestContext,
	baseURL: string,
	path: string,
	form: Record<string, string>
) {
	return request.post(path, {
		form,
		headers: { origin: baseURL, accept: 'text/html' },
		maxRedirects: 0
	});
}

async function query<T>(sql: string, params: unknown[] = []): Promise<T[]> {
	const db = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await db.connect();
	try {
		return (await db.query(sql, params)).rows as T[];
	} finally {
		await db.end();
	}
}

/** A rep's chosen survey, a draft quote from it and a sent one with its customer link, through the app's own routes. */
async function prepare(browser: Browser, baseURL: string): Promise<Fixture> {
	const context = await browser.newContext();
	const page = await context.newPage();
	await signIn(page, EMAIL.rep);
	const email = `a11y-${Date.now()}@marlow-crossing.example`;
	const picker = await (await page.request.get('/api/v1/customers?q=Marlow')).json();
	const customer = picker.customers[0];
	const trucks = await (await page.request.get('/api/v1/catalogue/trucks')).json();
	const truck = trucks.trucks.find((t: { code: string }) => t.code === 'TW-B4-25');
	const batteries = await (
		await page.request.get(`/api/v1/catalogue/batteries?truck=${truck.id}`)
	).json();
	const battery = batteries.batteries.find((b: { code: string }) => b.code === 'TW-B48-775-LA');
	const chosenSurvey = async () => {
		const start = await action(page.request, baseURL, '/surveys?/start', {
			customerId: customer.id,
			siteId: customer.sites[0].id,
			clientToken: crypto.randomUUID()
		});
		const surveyId = /\/surveys\/([0-9a-f-]{36})\//.exec(start.headers()['location'])![1];
		const steps = {
			...demoSurveySteps(
				{ customerId: customer.id, siteId: customer.sites[0].id, truckId: truck.id, batteryId: battery.id },
				{ contactEmail: email }
			),
			notes: { notes: 'Hoist over bay 2.' }
		};
		for (const [step, values] of Object.entries(steps))
			expect(
				(
					await page.request.patch(`/api/v1/surveys/${surveyId}`, { data: { step, values } })
				).status(),
				step
			).toBe(200);
		expect(
			(
				await action(page.request, baseURL, `/surveys/${surveyId}/recommendation?/choose`, {
					setup: 'overhead-hoist'
				})
			).status()
		).toBe(303);
		return surveyId;
	};
	const buildQuote = async (surveyId: string) => {
		const made = await action(page.request, baseURL, `/surveys/${surveyId}/recommendation?/quote`, {
			clientToken: crypto.randomUUID()
		});
		return /\/quotes\/([0-9a-f-]{36})$/.exec(made.headers()['location'])![1];
	};
	const surveyId = await chosenSurvey();
	const quoteId = await buildQuote(surveyId);
	const sentId = await buildQuote(await chosenSurvey());
	for (const a of ['mark-ready', 'send'])
		expect(
			(
				await page.request.post(`/api/v1/quotes/${sentId}/actions`, { data: { action: a } })
			).status(),
			a
		).toBe(200);
	await context.close();

	let customerLink = '';
	for (let i = 0; i < 100 && !customerLink; i++) {
		const [row] = await query<{ text: string }>(
			`SELECT text FROM caught_mail WHERE to_address ILIKE $1 ORDER BY received_at LIMIT 1`,
			[`%${email}%`]
		);
		customerLink = (row && /https?:\/\/\S+(\/q\/[A-Za-z0-9_-]{43})/.exec(row.text)?.[1]) ?? '';
		if (!customerLink) await new Promise((r) => setTimeout(r, 200));
	}
	expect(customerLink, 'the quote mail reached the catcher').toBeTruthy();
	const [book] = await query<{ id: string }>(
		`SELECT id FROM price_book_versions WHERE status = 'active'`
	);
	const [mail] = await query<{ id: string }>(
		`SELECT id FROM caught_mail ORDER BY received_at DESC LIMIT 1`
	);
	return {
		surveyId,
		quoteId,
		customerId: customer.id,
		customerLink,
		priceBookId: book.id,
		mailId: mail.id
	};
}

/**
 * Serious and critical axe findings (WCAG 2 A and AA) on the page as it stands, one line each.
 * `exclude` leaves out frames that show someone else's HTML (a caught mail, sandboxed without
 * scripts, where axe cannot run).
 */
async function axeProblems(page: Page, label: string, exclude: string[] = []): Promise<string[]> {
	let builder = new AxeBuilder({ page }).withTags(['wcag2a', 'wcag2aa']);
	for (const selector of exclude) builder = builder.exclude(selector);
	const result = await builder.analyze();
	return result.violations
		.filter((v) => v.impact === 'serious' || v.impact === 'critical')
		.map(
			(v) =>
				`${label}: ${v.id} (${v.impact}) ${v.nodes
					.slice(0, 4)
					.map((n) => n.target.join(' '))
					.join(' | ')}`
		);
}

type PageToScan = [label: string, path: string, exclude?: string[]];

async function scan(page: Page, pages: PageToScan[], role: string): Promise<string[]> {
	const problems: string[] = [];
	for (const [label, path, exclude] of pages) {
		const res = await page.goto(path);
		expect(res?.status(), `${role} ${label} (${path})`).toBe(200);
		await hydrated(page);
		problems.push(...(await axeProblems(page, `${role} ${label}`, exclude)));
	}
	return problems;
}

function staffPages(f: Fixture): PageToScan[] {
	return [
		['surveys list', '/surveys'],
		['survey step', `/surveys/${f.surveyId}/site`],
		['survey equipment step', `/surveys/${f.surveyId}/equipment`],
		['survey review', `/surveys/${f.surveyId}/review`],
		['recommendation', `/surveys/${f.surveyId}/recommendation`],
		['customers', '/customers'],
		['a customer', `/customers/${f.customerId}`],
		['quotes list', '/quotes'],
		['a quote', `/quotes/${f.quoteId}`],
		['account', '/account']
	];
}

test.describe('axe finds nothing serious', () => {
	test.beforeAll(async ({ browser, baseURL }) => {
		test.setTimeout(120_000);
		fixture = await prepare(browser, baseURL!);
	});

	test('signed out: sign-in, forgotten password and the customer’s quote page', async ({
		page
	}) => {
		test.setTimeout(120_000);
		const problems = await scan(
			page,
			[
				['sign-in', '/login'],
				['forgotten password', '/forgot-password'],
				['customer quote page', fixture.customerLink]
			],
			'signed out'
		);
		expect(problems).toEqual([]);
	});

	test('rep', async ({ page }) => {
		test.setTimeout(180_000);
		await signIn(page, EMAIL.rep);
		expect(await scan(page, staffPages(fixture), 'rep')).toEqual([]);
	});

	test('manager', async ({ page }) => {
		test.setTimeout(180_000);
		await signIn(page, EMAIL.manager);
		const pages: PageToScan[] = [
			...staffPages(fixture),
			['approvals', '/approvals'],
			['pipeline', '/pipeline']
		];
		expect(await scan(page, pages, 'manager')).toEqual([]);
	});

	test('admin', async ({ page }) => {
		test.setTimeout(240_000);
		await signIn(page, EMAIL.admin);
		const pages: PageToScan[] = [
			...staffPages(fixture),
			['pipeline', '/pipeline'],
			['users', '/admin/users'],
			['catalogue: trucks', '/admin/catalogue/trucks'],
			['catalogue: batteries', '/admin/catalogue/batteries'],
			['catalogue: equipment', '/admin/catalogue/equipment'],
			['catalogue: new truck', '/admin/catalogue/trucks/new'],
			['price book', '/admin/price-book'],
			['a price-book version', `/admin/price-book/${fixture.priceBookId}`],
			['settings', '/admin/settings'],
			['caught mail', '/admin/mail'],
			['a caught message', `/admin/mail/${fixture.mailId}`, ['iframe[sandbox]']]
		];
		expect(await scan(page, pages, 'admin')).toEqual([]);
		// the frame left out above still has its own name for screen readers
		await expect(page.locator('iframe[sandbox]')).toHaveAttribute('title', /\S/);
	});
});

// ---------------------------------------------------------------------------------------------
// The survey wizard with the keyboard alone: Tab, Shift+Tab, Enter, Space, arrow keys and typing.
// Every stop the focus makes must show it: the focused element's outline, ring, border or
// background differs from how it looks once the focus has moved on.
// ---------------------------------------------------------------------------------------------

const FOCUS_STYLE = (el: Element) => {
	const cs = getComputedStyle(el);
	return [
		cs.outlineStyle,
		cs.outlineWidth,
		cs.outlineColor,
		cs.boxShadow,
		cs.borderColor,
		cs.backgroundColor
	].join('|');
};

class Keyboard {
	problems: string[] = [];
	stops = 0;
	private last: {
		handle: import('@playwright/test').ElementHandle<Element>;
		style: string;
		name: string;
	} | null = null;

	constructor(private page: Page) {}

	/** Presses a key, then checks the focus indicator of the element that had the focus before. */
	async press(key: string) {
		await this.page.keyboard.press(key);
		await this.check();
	}

	async type(text: string) {
		await this.page.keyboard.type(text);
	}

	/** Enter on a submit button or field: the page changes, so there is no focus to compare until it has. */
	async submit() {
		await this.page.keyboard.press('Enter');
		this.last = null;
	}

	/** Checks the element that has the focus now (and how the one before looks without it). */
	async check() {
		const previous = this.last;
		if (previous) {
			try {
				const unfocused = await previous.handle.evaluate(
					(el, css) =>
						document.activeElement === el ? null : new Function('el', `return (${css})(el)`)(el),
					FOCUS_STYLE.toString()
				);
				if (unfocused !== null && unfocused === previous.style)
					this.problems.push(`no visible focus on ${previous.name}`);
			} catch {
				// the element went away (a step was submitted): nothing left to compare
			}
		}
		const handle = await this.page.evaluateHandle(() => document.activeElement);
		const element = handle.asElement();
		if (!element || (await element.evaluate((el) => el === document.body))) {
			this.last = null;
			return;
		}
		// a date field's calendar button lives inside the browser's own control, which draws its own
		// focus ring there: the field itself then is not :focus, and there is nothing of ours to check
		if (
			await element.evaluate(
				(el) =>
					/^(date|time|datetime-local|month|week)$/.test((el as HTMLInputElement).type ?? '') &&
					!el.matches(':focus')
			)
		) {
			this.last = null;
			return;
		}
		this.stops++;
		const info = await element.evaluate((el, css) => {
			const r = el.getBoundingClientRect();
			const inView =
				r.width > 0 &&
				r.height > 0 &&
				r.bottom > 0 &&
				r.top < window.innerHeight &&
				r.right > 0 &&
				r.left < window.innerWidth;
			const name = `${el.tagName.toLowerCase()}${el.id ? '#' + el.id : ''} "${(el.getAttribute('aria-label') ?? (el as HTMLElement).innerText ?? '').trim().slice(0, 40)}"`;
			return {
				style: new Function('el', `return (${css})(el)`)(el) as string,
				inView,
				name,
				keyboardFocus: el.matches(':focus-visible')
			};
		}, FOCUS_STYLE.toString());
		if (!info.inView) this.problems.push(`${info.name} has the focus but is off screen`);
		if (!info.keyboardFocus)
			this.problems.push(`${info.name} has the focus but not :focus-visible`);
		this.last = { handle: element, style: info.style, name: info.name };
	}

	private async focused(target: import('@playwright/test').Locator) {
		return target.evaluateAll((els) => els.some((el) => el === document.activeElement));
	}

	/** Tabs (or Shift+Tabs) until `target` (or one of the elements it matches) has the focus. */
	async tabTo(
		target: import('@playwright/test').Locator,
		opts: { back?: boolean; max?: number } = {}
	) {
		for (let i = 0; i < (opts.max ?? 60); i++) {
			if (await this.focused(target)) return;
			await this.press(opts.back ? 'Shift+Tab' : 'Tab');
		}
		throw new Error(`could not reach ${target} with ${opts.back ? 'Shift+Tab' : 'Tab'}`);
	}

	/** Picks an option of a focused select with the arrow keys (Home, then down) until `label` matches. */
	async choose(select: import('@playwright/test').Locator, label: RegExp) {
		await this.tabTo(select);
		await this.page.keyboard.press('Home');
		for (let i = 0; i < 60; i++) {
			const text = await select.evaluate(
				(el) => (el as HTMLSelectElement).selectedOptions[0]?.textContent ?? ''
			);
			if (label.test(text)) return;
			await this.page.keyboard.press('ArrowDown');
		}
		throw new Error(`no option ${label} in ${select}`);
	}

	/** Replaces the value of the focused-by-Tab field by typing. */
	async fill(field: import('@playwright/test').Locator, text: string) {
		await this.tabTo(field);
		await this.page.keyboard.press('Control+A');
		await this.page.keyboard.press('Delete');
		await this.type(text);
	}
}

test('the survey wizard, from signing in to the recommendation, with the keyboard alone', async ({
	page
}) => {
	test.setTimeout(240_000);
	await page.setViewportSize({ width: 1024, height: 768 });
	const keys = new Keyboard(page);
	const heading = (name: string) => page.getByRole('heading', { level: 2, name });

	await page.goto('/login');
	await hydrated(page);
	await keys.fill(page.getByLabel('E-mail'), EMAIL.rep);
	await keys.fill(page.getByLabel('Password'), DEMO_PASSWORD);
	await keys.submit();
	await expect(page).toHaveURL(/\/surveys$/);
	await hydrated(page);

	// start a survey for the demo customer
	await keys.choose(page.getByLabel('Customer'), /^Marlow Crossing Cold Store/);
	await keys.choose(page.getByLabel('Site'), /Freezer halls/);
	await keys.tabTo(page.getByRole('button', { name: 'Start survey' }));
	await keys.submit();
	await expect(heading('Site and contact')).toBeVisible();
	await hydrated(page);

	// 1 site: the skip link first, then the fields, then Next
	await keys.press('Tab');
	await expect(page.getByRole('link', { name: 'Skip to content' })).toBeFocused();
	await keys.fill(page.getByLabel('Who showed you the site'), 'Orla Penhallow');
	await keys.fill(page.getByLabel('Their e-mail'), 'orla@wickerby.example');
	// and back a field with Shift+Tab, to correct the name
	await keys.tabTo(page.getByLabel('Who showed you the site'), { back: true });
	await keys.type(' (site lead)');
	await keys.tabTo(page.getByRole('button', { name: 'Next →' }));
	await keys.submit();
	await expect(heading('Trucks and battery')).toBeVisible();
	await hydrated(page);

	// 2 trucks and battery
	await keys.choose(page.getByLabel('Truck model'), /^Basalt 4 · 2\.5 t/);
	await keys.fill(page.getByLabel('How many trucks'), '6');
	await keys.choose(page.getByLabel('Battery for this truck'), /775 Ah lead-acid/);
	await keys.tabTo(page.getByRole('button', { name: 'Next →' }));
	await keys.submit();
	await expect(heading('Operation')).toBeVisible();
	await hydrated(page);

	// 3 operation: numbers, then the radio groups with the arrow keys
	await keys.fill(page.getByLabel('Shifts a day'), '3');
	await keys.fill(page.getByLabel('Hours per shift'), '8');
	await keys.fill(page.getByLabel('Days a week'), '5');
	await keys.press('Tab');
	// the first stop in a radio group is its checked radio, or its first one
	const duty = page.getByRole('radio', { name: /Medium/ });
	for (let i = 0; i < 4 && !(await duty.isChecked()); i++) await keys.press('ArrowDown');
	await expect(duty).toBeChecked();
	const charging = page.getByRole('radio', { name: /Conventional/ });
	await keys.tabTo(page.locator('input[type=radio][name=charging]'));
	for (let i = 0; i < 3 && !(await charging.isChecked()); i++) await keys.press('ArrowUp');
	await keys.press('Space');
	await expect(charging).toBeChecked();
	await keys.tabTo(page.getByRole('button', { name: 'Next →' }));
	await keys.submit();
	await expect(heading('Existing equipment')).toBeVisible();
	await hydrated(page);

	// 4 equipment: buttons that add rows, typed quantities, checkboxes with Space
	await keys.tabTo(page.getByRole('button', { name: '+ Add a pallet truck' }));
	await keys.press('Enter');
	await keys.fill(page.getByLabel('Fork length'), '1150');
	await keys.fill(page.getByLabel('Width over the forks'), '540');
	await keys.fill(page.locator('#pt-0-cap'), '2000');
	await keys.press('Tab');
	const hoist = page.getByLabel('The site has an overhead hoist or crane over the battery area');
	await keys.tabTo(hoist);
	await keys.press('Space');
	await expect(hoist).toBeChecked();
	await keys.fill(page.getByLabel('Rated load (from its plate)'), '2000');
	const beam = page.getByLabel('Has an insulated lifting beam');
	await keys.tabTo(beam);
	await keys.press('Space');
	await keys.fill(page.getByLabel('Lifting beam weight'), '90');
	await keys.press('Tab');
	await expect(page.getByTestId('live-overhead-hoist')).toHaveAttribute('data-verdict', /fits/);
	await keys.tabTo(page.getByRole('button', { name: 'Next →' }));
	await keys.submit();
	await expect(heading('Charging area')).toBeVisible();
	await hydrated(page);

	// 5 charging area: the tick box first, then back up to the air flow with Shift+Tab, and Enter in
	// that field goes on to the next step (as the main button does), not back a step
	await keys.fill(page.getByLabel('Floor area'), '40');
	const eyewash = page.getByLabel(/Eyewash station/);
	await keys.tabTo(eyewash);
	await keys.press('Space');
	await expect(eyewash).toBeChecked();
	await keys.tabTo(page.getByLabel(/Mechanical air flow/), { back: true });
	await keys.type('150');
	await keys.submit();
	await expect(heading('Photos and notes')).toBeVisible();
	await hydrated(page);

	// 6 notes, past the file pickers
	await keys.fill(
		page.getByLabel('Notes for the quote and the installer'),
		'Hoist over bay 2; walked with the keyboard.'
	);
	await keys.tabTo(page.getByRole('button', { name: /Review/ }));
	await keys.submit();
	await expect(heading('Review')).toBeVisible();
	await hydrated(page);
	await expect(page.getByText('Still needed')).toHaveCount(0);

	// 7 review → the recommendation, and a setup chosen with Enter
	await keys.tabTo(page.getByRole('button', { name: 'See the recommendation →' }));
	await keys.submit();
	await expect(page.getByTestId('batteries-per-truck')).toHaveText('3');
	await hydrated(page);
	await keys.tabTo(
		page.getByTestId('setup-overhead-hoist').getByRole('button', { name: 'Choose' }),
		{ max: 150 }
	);
	await keys.submit();
	const saved = page.getByRole('status').filter({ hasText: 'goes ahead with' });
	await expect(saved).toContainText('Hoist exchange');
	// the focus follows to the confirmation, where "Build the quote" comes next; not left on a button scrolled away
	await expect(saved).toBeFocused();
	await keys.check();
	await keys.press('Tab');
	await expect(page.getByRole('button', { name: 'Build the quote →' })).toBeFocused();
	await shot(page, 'a11y-keyboard-recommendation');

	expect(keys.stops, 'focus stops checked').toBeGreaterThan(30);
	expect(keys.problems).toEqual([]);
});
