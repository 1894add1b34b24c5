import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, client, signIn, type Client } from '../helpers/http';
import { buildQuote, chosenSurvey, demoIds } from '../helpers/scenario';
import { QueryTypes } from 'sequelize';
import { sequelize } from '$lib/server/db';
import { User } from '$lib/server/db/models';
import { Contact, Customer, Site } from '$lib/server/db/models/customers';
import { addSite, createCustomer } from '$lib/server/repositories/customers';

// A token no seed or other test uses, so searches here see only this file's customers.
const TOKEN = `zq${Date.now().toString(36)}`;
let rep: Client;
let repUser: User;

beforeAll(async () => {
	rep = await signIn(DEMO.rep);
	repUser = (await User.findOne({ where: { email: DEMO.rep } }))!;
});

afterAll(async () => {
	await sequelize.close();
});

/** The customer id a create action redirected to. */
function createdId(res: Response): string {
	const location = res.headers.get('location') ?? '';
	const m = location.match(/^\/customers\/([0-9a-f-]{36})$/);
	if (!m) throw new Error(`expected a redirect to the new customer, got ${res.status} ${location}`);
	return m[1];
}

/** Customer names in the order the list page shows them. */
async function listNames(c: Client, query: string): Promise<string[]> {
	const res = await c.get(`/customers?${query}`);
	expect(res.status).toBe(200);
	const html = await res.text();
	return [...html.matchAll(/data-testid="customer-name">([^<]*)</g)].map((m) => m[1]);
}

describe('creating customers through the form action', () => {
	it('stores a customer owned by the rep and their team, and redirects to its page', async () => {
		const res = await rep.action('/customers/new', {
			name: `${TOKEN} Harrowgate Depot`,
			accountNumber: `${TOKEN}-7`,
			notes: 'Two shifts.\nBattery room by gate 2.'
		});
		expect(res.status).toBe(303);
		const id = createdId(res);
		const row = await Customer.findByPk(id);
		expect(row?.name).toBe(`${TOKEN} Harrowgate Depot`);
		expect(row?.ownerId).toBe(repUser.id);
		expect(row?.teamId).toBe(repUser.teamId);
		expect(row?.notes).toBe('Two shifts.\nBattery room by gate 2.');

		const page = await rep.get(`/customers/${id}`);
		expect(page.status).toBe(200);
		expect(await page.text()).toContain(`${TOKEN} Harrowgate Depot`);
	});

	it('answers bad input with 400 and a message on each field, and stores nothing', async () => {
		const before = await Customer.count();
		const res = await rep.action('/customers/new', { name: '   ', accountNumber: '#12;drop', notes: 'x'.repeat(4001) });
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('Enter the customer name.');
		expect(html).toContain('Account numbers use letters, digits, spaces and . / - only.');
		expect(html).toContain('Keep the notes to 4000 characters or fewer.');
		expect(await Customer.count()).toBe(before);
	});

	it('refuses control characters (PostgreSQL cannot store NUL) with a message, not a crash', async () => {
		const before = await Customer.count();
		const res = await rep.action('/customers/new', { name: `${TOKEN} Null\u0000Byte`, accountNumber: '', notes: '' });
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Use plain text, without control characters.');
		expect(await Customer.count()).toBe(before);
	});

	it('keeps HTML in a name as text', async () => {
		const res = await rep.action('/customers/new', { name: `${TOKEN} <script>alert(1)</script> & Co`, accountNumber: '', notes: '' });
		const html = await (await rep.get(`/customers/${createdId(res)}`)).text();
		expect(html).toContain(`${TOKEN} &lt;script>alert(1)&lt;/script> &amp; Co`);
		expect(html).not.toContain('<script>alert(1)</script>');
	});

	it('refuses an account number another customer has, whatever its case', async () => {
		await rep.action('/customers/new', { name: `${TOKEN} First`, accountNumber: `${TOKEN}-dup`, notes: '' });
		const before = await Customer.count();
		const res = await rep.action('/customers/new', { name: `${TOKEN} Second`, accountNumber: `${TOKEN.toUpperCase()}-DUP`, notes: '' });
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Another customer already has this account number.');
		expect(await Customer.count()).toBe(before);
	});

	it('lets a rep of another team see and edit the customer (a shared book)', async () => {
		const id = createdId(await rep.action('/customers/new', { name: `${TOKEN} Shared Book`, accountNumber: '', notes: '' }));
		const other = await signIn(DEMO.rep2);
		expect((await other.get(`/customers/${id}`)).status).toBe(200);
		const res = await other.action(`/customers/${id}/edit`, { name: `${TOKEN} Shared Book Renamed`, accountNumber: '', notes: 'seen' });
		expect(res.status).toBe(303);
		expect((await Customer.findByPk(id))?.name).toBe(`${TOKEN} Shared Book Renamed`);
	});
});

describe('sites and contacts', () => {
	let customerId: string;
	beforeAll(async () => {
		customerId = createdId(await rep.action('/customers/new', { name: `${TOKEN} Sites Co`, accountNumber: '', notes: '' }));
	});

	const site = {
		name: 'North warehouse',
		addressLine1: '3 Kiln Lane',
		addressLine2: '',
		city: `${TOKEN}ville`,
		postalCode: 'AB1 2CD',
		country: 'United Kingdom',
		regionCode: 'eu-de'
	};

	it('adds a site, upper-casing the region code', async () => {
		const res = await rep.action(`/customers/${customerId}/sites/new`, site);
		expect(res.status).toBe(303);
		const rows = await Site.findAll({ where: { customerId } });
		expect(rows).toHaveLength(1);
		expect(rows[0].regionCode).toBe('EU-DE');
		expect(rows[0].postalCode).toBe('AB1 2CD');
	});

	it('refuses a bad site with messages and stores nothing', async () => {
		const before = await Site.count({ where: { customerId } });
		const res = await rep.action(`/customers/${customerId}/sites/new`, {
			...site,
			name: '',
			city: '',
			regionCode: 'Washington State',
			postalCode: '<>'
		});
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('Enter the site name.');
		expect(html).toContain('Enter the town or city.');
		expect(html).toContain('Use a short region code such as WA or EU-DE');
		expect(html).toContain('Postal codes use letters, digits, spaces and hyphens only.');
		expect(await Site.count({ where: { customerId } })).toBe(before);
	});

	it('edits a site', async () => {
		const row = (await Site.findOne({ where: { customerId } }))!;
		const res = await rep.action(`/customers/${customerId}/sites/${row.id}`, { ...site, name: 'North warehouse (cold)', regionCode: 'WA' });
		expect(res.status).toBe(303);
		await row.reload();
		expect(row.name).toBe('North warehouse (cold)');
		expect(row.regionCode).toBe('WA');
	});

	it('adds a contact on a site, and refuses one with no way to reach them', async () => {
		const siteRow = (await Site.findOne({ where: { customerId } }))!;
		const bad = await rep.action(`/customers/${customerId}/contacts/new`, { name: 'Noor', roleTitle: '', email: '', phone: '', siteId: '' });
		expect(bad.status).toBe(400);
		expect(await bad.text()).toContain('Give an e-mail address or a phone number.');
		expect(await Contact.count({ where: { customerId } })).toBe(0);

		const badPhone = await rep.action(`/customers/${customerId}/contacts/new`, { name: 'Noor', roleTitle: '', email: 'not-mail', phone: 'call me', siteId: '' });
		expect(badPhone.status).toBe(400);
		const html = await badPhone.text();
		expect(html).toContain('Enter a valid e-mail address');
		expect(html).toContain('Enter a phone number with at least 5 digits');

		const ok = await rep.action(`/customers/${customerId}/contacts/new`, {
			name: 'Noor Castellane',
			roleTitle: 'Shift lead',
			email: 'Noor@Example.test',
			phone: '+1 (360) 555-0100',
			siteId: siteRow.id
		});
		expect(ok.status).toBe(303);
		const contact = (await Contact.findOne({ where: { customerId } }))!;
		expect(contact.siteId).toBe(siteRow.id);
		expect(contact.email).toBe('noor@example.test');
	});

	it("refuses a contact on another customer's site", async () => {
		const otherId = createdId(await rep.action('/customers/new', { name: `${TOKEN} Other Co`, accountNumber: '', notes: '' }));
		const saved = await addSite(otherId, { ...site, city: 'Elsewhere', regionCode: '' });
		if (!saved.ok) throw new Error('site not saved');
		const before = await Contact.count();
		const res = await rep.action(`/customers/${customerId}/contacts/new`, { name: 'Wrong Site', roleTitle: '', email: 'w@example.test', phone: '', siteId: saved.id });
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Choose one of this customer’s sites, or no particular site.');
		expect(await Contact.count()).toBe(before);
	});

	it('edits a contact and moves it off its site', async () => {
		const contact = (await Contact.findOne({ where: { customerId } }))!;
		const res = await rep.action(`/customers/${customerId}/contacts/${contact.id}`, {
			name: 'Noor Castellane',
			roleTitle: 'Site manager',
			email: 'noor@example.test',
			phone: '',
			siteId: ''
		});
		expect(res.status).toBe(303);
		await contact.reload();
		expect(contact.roleTitle).toBe('Site manager');
		expect(contact.siteId).toBeNull();
	});

	it('answers 404 for a customer that does not exist and for a malformed id', async () => {
		expect((await rep.get('/customers/00000000-0000-4000-8000-000000000000')).status).toBe(404);
		expect((await rep.get('/customers/not-a-uuid')).status).toBe(404);
		const res = await rep.action('/customers/00000000-0000-4000-8000-000000000000/sites/new', site);
		expect(res.status).toBe(404);
	});
});

describe('search, sort and paging in the URL', () => {
	const names = Array.from({ length: 23 }, (_, i) => `${TOKEN}page ${String(i + 1).padStart(2, '0')}`);
	beforeAll(async () => {
		for (const [i, name] of names.entries()) {
			const saved = await createCustomer({ name, accountNumber: '', notes: '' }, { id: repUser.id, teamId: repUser.teamId });
			if (!saved.ok) throw new Error('not saved');
			// one minute apart, so date sorts cannot tie
			const at = new Date(Date.UTC(2025, 0, 1, 8, i));
			await sequelize.query('UPDATE customers SET created_at = :at, updated_at = :at WHERE id = :id', {
				replacements: { at, id: saved.id }
			});
		}
	});

	it('pages 20 at a time by name, A to Z, with no overlap; a page past the end shows the last', async () => {
		const p1 = await listNames(rep, `q=${TOKEN}page`);
		const p2 = await listNames(rep, `q=${TOKEN}page&page=2`);
		expect(p1).toEqual(names.slice(0, 20));
		expect(p2).toEqual(names.slice(20));
		expect(await listNames(rep, `q=${TOKEN}page&page=99`)).toEqual(names.slice(20));
	});

	it('sorts Z to A, and by date added newest first', async () => {
		expect(await listNames(rep, `q=${TOKEN}page&sort=name&dir=desc`)).toEqual([...names].reverse().slice(0, 20));
		const newest = await listNames(rep, `q=${TOKEN}page&sort=created`);
		expect(newest[0]).toBe(names[22]);
		expect(newest.at(-1)).toBe(names[3]);
	});

	it('sorts by last change: editing a site moves its customer to the top', async () => {
		const target = (await Customer.findOne({ where: { name: names[5] } }))!;
		const res = await rep.action(`/customers/${target.id}/sites/new`, {
			name: 'Yard',
			addressLine1: '1 Dock Road',
			addressLine2: '',
			city: 'Somewhere',
			postalCode: '',
			country: 'Nowhere',
			regionCode: ''
		});
		expect(res.status).toBe(303);
		expect((await listNames(rep, `q=${TOKEN}page&sort=updated&dir=desc`))[0]).toBe(names[5]);
	});

	it('finds a customer by account number and by a site town, case-insensitively', async () => {
		expect(await listNames(rep, `q=${TOKEN.toUpperCase()}-7`)).toEqual([`${TOKEN} Harrowgate Depot`]);
		expect(await listNames(rep, `q=${TOKEN}VILLE`)).toEqual([`${TOKEN} Sites Co`]);
	});

	it('takes % and _ literally and survives odd parameters', async () => {
		// unescaped, `%` and `_` would match the "p" and the "e" of "page"
		expect(await listNames(rep, `q=${TOKEN}page 0`)).toHaveLength(9);
		expect(await listNames(rep, `q=${TOKEN}%25age`)).toEqual([]);
		expect(await listNames(rep, `q=${TOKEN}pag_`)).toEqual([]);
		const odd = await rep.get(`/customers?q=${TOKEN}page%00&sort=drop+table&dir=sideways&page=-4`);
		expect(odd.status).toBe(200);
	});
});

describe('GET /api/v1/customers', () => {
	it('returns id, name and sites of matching customers by name', async () => {
		const res = await rep.get(`/api/v1/customers?q=${TOKEN}ville`);
		expect(res.status).toBe(200);
		const body = await res.json();
		expect(body.customers).toHaveLength(1);
		const [c] = body.customers;
		expect(c.name).toBe(`${TOKEN} Sites Co`);
		expect(c.id).toMatch(/^[0-9a-f-]{36}$/);
		expect(c.sites).toHaveLength(1);
		expect(c.sites[0]).toMatchObject({ name: 'North warehouse (cold)', city: `${TOKEN}ville`, regionCode: 'WA' });
	});

	it('limits the answer and refuses a bad limit or a long query with 400 and field errors', async () => {
		const limited = await (await rep.get(`/api/v1/customers?q=${TOKEN}page&limit=5`)).json();
		expect(limited.customers).toHaveLength(5);
		const bad = await rep.get('/api/v1/customers?limit=500');
		expect(bad.status).toBe(400);
		expect((await bad.json()).errors.limit[0]).toBe('limit must be a whole number from 1 to 50.');
		const long = await rep.get(`/api/v1/customers?q=${'x'.repeat(101)}`);
		expect(long.status).toBe(400);
		expect((await long.json()).errors.q[0]).toBe('Search for at most 100 characters.');
	});

	it('finds the demo customers for every staff role', async () => {
		for (const email of [DEMO.rep, DEMO.manager, DEMO.admin]) {
			const c = await signIn(email);
			const body = await (await c.get('/api/v1/customers?q=Marlow%20Crossing')).json();
			expect(body.customers.map((x: { name: string }) => x.name), email).toEqual(['Marlow Crossing Cold Store']);
		}
	});

	it('refuses signed-out callers: JSON 401, and the pages redirect to sign in', async () => {
		const api = await client().get('/api/v1/customers?q=a');
		expect(api.status).toBe(401);
		const page = await client().get('/customers');
		expect(page.status).toBe(303);
		expect(page.headers.get('location')).toBe('/login?next=%2Fcustomers');
		const before = await Customer.count();
		const action = await client().action('/customers/new', { name: 'Signed out', accountNumber: '', notes: '' });
		expect(action.status).toBe(303);
		expect(await Customer.count()).toBe(before);
	});
});

describe('a customer’s page shows the work for that customer', () => {
	it('lists the rep’s surveys and quotes for the customer, starts a survey at a site, and hides another team’s work', async () => {
		const ids = await demoIds();
		const surveyId = await chosenSurvey(rep);
		const quoteId = await buildQuote(rep, surveyId);
		const [{ number }] = await sequelize.query<{ number: string }>(
			`SELECT number FROM quote_revisions WHERE quote_id = :quoteId`,
			{ replacements: { quoteId }, type: QueryTypes.SELECT }
		);

		const page = await rep.get(`/customers/${ids.customerId}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain(`/surveys/${surveyId}/recommendation`);
		expect(html).toContain(`/quotes/${quoteId}`);
		expect(html).toContain(number);
		expect(html).toContain('Start a survey here');

		// the form on a site card starts a survey for that customer and site, once for a double tap
		const token = randomUUID();
		const first = await rep.action('/surveys?/start', { customerId: ids.customerId, siteId: ids.siteId, clientToken: token });
		const again = await rep.action('/surveys?/start', { customerId: ids.customerId, siteId: ids.siteId, clientToken: token });
		expect(first.status).toBe(303);
		expect(again.headers.get('location')).toBe(first.headers.get('location'));
		const started = /\/surveys\/([0-9a-f-]{36})\/site$/.exec(first.headers.get('location')!)![1];
		const [row] = await sequelize.query<{ customer_id: string; site_id: string }>(
			`SELECT customer_id, site_id FROM surveys WHERE id = :started`,
			{ replacements: { started }, type: QueryTypes.SELECT }
		);
		expect(row).toEqual({ customer_id: ids.customerId, site_id: ids.siteId });

		// a rep of another team sees the customer but none of this team's surveys or quotes
		const other = await signIn(DEMO.rep2);
		const theirs = await (await other.get(`/customers/${ids.customerId}`)).text();
		expect(theirs).not.toContain(surveyId);
		expect(theirs).not.toContain(quoteId);
		// an admin manages customers but does not run surveys: no start button
		const admin = await signIn(DEMO.admin);
		expect(await (await admin.get(`/customers/${ids.customerId}`)).text()).not.toContain('Start a survey here');
	});
});
