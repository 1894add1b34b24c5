import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, client, signIn, type Client } from '../helpers/http';
import { buildQuote, chosenSurvey, demoIds, quoteState } from '../helpers/scenario';
import { mailedQuoteToken } from '../helpers/customer-link';
import { sequelize } from '$lib/server/db';
import {
	allPriceItems,
	createDraftVersion,
	getActivePriceBook
} from '$lib/server/repositories/pricing';

// The same form sent several times at once, as a double (or triple) tap on a tablet does when the
// page has not hydrated yet or the network is slow (issue 7, item 3): one survey, one quote, one
// customer, one user, one state change. The deposit payment is covered in payments.test.ts.

const TAPS = 5;
let rep: Client;
let manager: Client;
let admin: Client;
const run = Date.now().toString(36);

beforeAll(async () => {
	[rep, manager, admin] = await Promise.all([
		signIn(DEMO.rep),
		signIn(DEMO.manager),
		signIn(DEMO.admin)
	]);
});

afterAll(async () => {
	await sequelize.close();
});

const count = async (sql: string, replacements: Record<string, unknown>) =>
	Number(
		(await sequelize.query<{ n: string }>(sql, { replacements, type: QueryTypes.SELECT }))[0].n
	);

/** Sends the same action `TAPS` times at once. */
const taps = (c: Client, path: string, fields: Record<string, string>) =>
	Promise.all(Array.from({ length: TAPS }, () => c.action(path, fields)));

describe('the same form sent several times at once', () => {
	it('“Start survey” makes one survey, and every tap lands on it', async () => {
		const { customerId, siteId } = await demoIds();
		const clientToken = randomUUID();
		const answers = await taps(rep, '/surveys?/start', { customerId, siteId, clientToken });
		expect(answers.map((r) => r.status)).toEqual(Array(TAPS).fill(303));
		expect(new Set(answers.map((r) => r.headers.get('location'))).size).toBe(1);
		expect(
			await count(`SELECT count(*) AS n FROM surveys WHERE client_token = :clientToken`, {
				clientToken
			})
		).toBe(1);
		// another form (a new token) is another survey: the token decides, not the customer
		const other = await rep.action('/surveys?/start', {
			customerId,
			siteId,
			clientToken: randomUUID()
		});
		expect(other.headers.get('location')).not.toBe(answers[0].headers.get('location'));
	});

	it('“Build the quote” makes one quote, and every tap lands on it', async () => {
		const surveyId = await chosenSurvey(rep);
		const clientToken = randomUUID();
		const answers = await taps(rep, `/surveys/${surveyId}/recommendation?/quote`, { clientToken });
		expect(answers.map((r) => r.status)).toEqual(Array(TAPS).fill(303));
		expect(new Set(answers.map((r) => r.headers.get('location'))).size).toBe(1);
		expect(
			await count(`SELECT count(*) AS n FROM quotes WHERE survey_id = :surveyId`, { surveyId })
		).toBe(1);
		expect(
			await count(
				`SELECT count(*) AS n FROM quote_events WHERE quote_id = :id AND action = 'create'`,
				{
					id: /\/quotes\/([0-9a-f-]{36})$/.exec(answers[0].headers.get('location')!)![1]
				}
			)
		).toBe(1);
	});

	it('“Save customer” makes one customer, and every tap lands on it', async () => {
		const page = await (await rep.get('/customers/new')).text();
		const clientToken =
			/name="clientToken"[^>]*value="([0-9a-f-]{36})"/.exec(page)?.[1] ??
			/value="([0-9a-f-]{36})"[^>]*name="clientToken"/.exec(page)?.[1];
		expect(clientToken, 'the form carries a token of its own').toBeTruthy();
		const name = `Double Tap Haulage ${run}`;
		const answers = await taps(rep, '/customers/new', {
			name,
			accountNumber: `DT-${run}`,
			notes: '',
			clientToken: clientToken!
		});
		expect(answers.map((r) => r.status)).toEqual(Array(TAPS).fill(303));
		expect(new Set(answers.map((r) => r.headers.get('location'))).size).toBe(1);
		expect(await count(`SELECT count(*) AS n FROM customers WHERE name = :name`, { name })).toBe(1);
		// a second customer of the same name from a fresh form is still possible (names are not unique)
		const again = await (await rep.get('/customers/new')).text();
		const second =
			/name="clientToken"[^>]*value="([0-9a-f-]{36})"/.exec(again)?.[1] ??
			/value="([0-9a-f-]{36})"[^>]*name="clientToken"/.exec(again)?.[1];
		expect(second).not.toBe(clientToken);
		expect(
			(
				await rep.action('/customers/new', {
					name,
					accountNumber: '',
					notes: '',
					clientToken: second!
				})
			).status
		).toBe(303);
		expect(await count(`SELECT count(*) AS n FROM customers WHERE name = :name`, { name })).toBe(2);
	});

	it('“Add user” makes one user; the other taps are told the e-mail is taken, without a server error', async () => {
		const email = `double-${run}@test.traywise.test`;
		const answers = await taps(admin, '/admin/users?/create', {
			name: 'Double Tap',
			email,
			role: 'rep',
			teamId: '',
			password: 'a-long-password-7'
		});
		const statuses = answers.map((r) => r.status).sort();
		expect(statuses).toEqual([200, ...Array(TAPS - 1).fill(400)]);
		for (const r of answers.filter((a) => a.status === 400))
			expect(await r.text()).toContain('A user with this e-mail already exists.');
		expect(
			await count(`SELECT count(*) AS n FROM users WHERE lower(email) = :email`, { email })
		).toBe(1);
	});

	it('“Add rate” makes one tax rate; the other taps are told the region has one', async () => {
		const regionCode = `D${run.slice(-6).toUpperCase()}`;
		const answers = await taps(admin, '/admin/settings?/addTaxRate', {
			regionCode,
			label: 'Double tap county',
			rate: '7.5'
		});
		expect(answers.map((r) => r.status).sort()).toEqual([200, ...Array(TAPS - 1).fill(409)]);
		expect(
			await count(`SELECT count(*) AS n FROM tax_rates WHERE region_code = :regionCode`, {
				regionCode
			})
		).toBe(1);
		await sequelize.query(`DELETE FROM tax_rates WHERE region_code = :regionCode`, {
			replacements: { regionCode }
		});
	});

	it('“Publish” makes one active price book; the other taps are told it is published already', async () => {
		const active = (await getActivePriceBook())!;
		// the same prices under a new label, so other suites price as before
		const draft = await createDraftVersion({
			label: `Double tap ${run}`,
			effectiveDate: '2026-01-01',
			createdBy: null,
			items: await allPriceItems(active.id)
		});
		const answers = await taps(admin, `/admin/price-book/${draft}?/publish`, {
			confirm: 'publish'
		});
		expect(answers.map((r) => r.status).sort()).toEqual([303, ...Array(TAPS - 1).fill(409)]);
		expect(
			await count(`SELECT count(*) AS n FROM price_book_versions WHERE status = 'active'`, {})
		).toBe(1);
		expect((await getActivePriceBook())!.id).toBe(draft);
	});

	it('“Submit”, “Approve” and “Send” each change the quote once, with one event and one mail to the customer', async () => {
		const quoteId = await buildQuote(
			rep,
			await chosenSurvey(rep, { contactEmail: `double-${run}@customer.test` })
		);
		const act = (c: Client, action: string) => taps(c, `/quotes/${quoteId}?/act`, { action });
		const events = (action: string) =>
			count(
				`SELECT count(*) AS n FROM quote_events WHERE quote_id = :quoteId AND action = :action`,
				{ quoteId, action }
			);

		// within the rep's authority: "mark ready" approves it without a manager
		const ready = await act(rep, 'mark-ready');
		expect(ready.some((r) => r.status === 303)).toBe(true);
		for (const r of ready) expect(r.status).toBeLessThan(500);
		expect(await events('mark-ready')).toBe(1);
		expect(await quoteState(quoteId)).toBe('approved');

		const sent = await act(rep, 'send');
		expect(sent.some((r) => r.status === 303)).toBe(true);
		for (const r of sent) expect(r.status).toBeLessThan(500);
		expect(await events('send')).toBe(1);
		expect(await quoteState(quoteId)).toBe('sent');
		expect(
			await count(
				`SELECT count(*) AS n FROM quote_revisions WHERE quote_id = :quoteId AND pdf IS NOT NULL`,
				{ quoteId }
			)
		).toBe(1);
		expect(
			await count(`SELECT count(*) AS n FROM mail_outbox WHERE to_address = :to`, {
				to: `double-${run}@customer.test`
			})
		).toBe(1);

		// the customer taps "Accept" several times at once: one acceptance, one event
		const token = (await mailedQuoteToken(quoteId))!;
		const accepted = await taps(client(), `/q/${token}?/accept`, {
			fullName: 'Dana Quillfeather',
			agree: 'on'
		});
		expect(accepted.some((r) => r.status === 303)).toBe(true);
		for (const r of accepted) expect(r.status).toBeLessThan(500);
		expect(await events('accept')).toBe(1);
		expect(
			await count(`SELECT count(*) AS n FROM quote_acceptances WHERE quote_id = :quoteId`, {
				quoteId
			})
		).toBe(1);
		expect(await quoteState(quoteId)).toBe('accepted');
	});

	it('two dozen “Send”s on one quote at once: each answered 200 or 409 (none 5xx), the quote sent once', async () => {
		// more requests than the pool has connections (10): a request waiting for the quote's lock
		// must not hold a connection while it waits, or the others find the pool empty
		const quoteId = await buildQuote(
			rep,
			await chosenSurvey(rep, { contactEmail: `crowd-${run}@customer.test` })
		);
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' })).status).toBe(200);
		const answers = await Promise.all(
			Array.from({ length: 24 }, () => rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'send' }))
		);
		const statuses = answers.map((r) => r.status);
		expect(statuses.filter((s) => s !== 200 && s !== 409), statuses.join(' ')).toEqual([]);
		expect(statuses).toContain(200);
		expect(await quoteState(quoteId)).toBe('sent');
		expect(
			await count(`SELECT count(*) AS n FROM quote_events WHERE quote_id = :quoteId AND action = 'send'`, { quoteId })
		).toBe(1);
	});

	it('a manager’s “Approve” tapped twice approves once', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		// 15 % off every line is over the demo rep's 10 % authority (company settings): needs approval
		const lines = await sequelize.query<{ sku: string; quantity: number; unit_list_cents: string }>(
			`SELECT l.sku, l.quantity, l.unit_list_cents FROM quote_lines l JOIN quote_revisions r ON r.id = l.revision_id WHERE r.quote_id = :quoteId ORDER BY l.position`,
			{ replacements: { quoteId }, type: QueryTypes.SELECT }
		);
		const payload = {
			lines: lines.map((l) => ({
				sku: l.sku,
				quantity: l.quantity,
				discountPercent: Number(l.unit_list_cents) === 0 ? 0 : 15
			})),
			overallDiscountPercent: 0,
			taxRegion: 'WA',
			notes: '',
			contactName: 'Dana Quillfeather',
			contactEmail: 'dana.q@marlow-crossing.example'
		};
		expect(
			(await rep.action(`/quotes/${quoteId}?/save`, { payload: JSON.stringify(payload) })).status
		).toBe(200);
		const submitted = await taps(rep, `/quotes/${quoteId}?/act`, { action: 'submit' });
		for (const r of submitted) expect(r.status).toBeLessThan(500);
		expect(await quoteState(quoteId)).toBe('awaiting-approval');
		const approved = await taps(manager, `/quotes/${quoteId}?/act`, { action: 'approve' });
		for (const r of approved) expect(r.status).toBeLessThan(500);
		expect(approved.filter((r) => r.status === 303).length).toBeGreaterThanOrEqual(1);
		expect(await quoteState(quoteId)).toBe('approved');
		const events = await sequelize.query<{ action: string }>(
			`SELECT action FROM quote_events WHERE quote_id = :quoteId ORDER BY id`,
			{
				replacements: { quoteId },
				type: QueryTypes.SELECT
			}
		);
		expect(events.map((e) => e.action)).toEqual(['create', 'submit', 'approve']);
	});
});
