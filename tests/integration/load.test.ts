/**
 * Load (issue 7, item 3): 100 connections for 30 s on the public engine route and on the customer's
 * quote page, against the app scripts/test.sh started on 127.0.0.1. Every answer must be a 2xx with
 * the real content (a body check counts mismatches): no connection errors, no timeouts, no 5xx.
 * Bounded: two runs of 30 s, about 65 s for the file.
 */
import autocannon from 'autocannon';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { BASE, DEMO, client, signIn, type Client } from '../helpers/http';
import { currentLines, demoChosenSurvey, demoQuote, saveDraft, sendQuote } from '../helpers/flows';
import { customerPageExists, mailedQuoteToken } from '../helpers/customer-link';
import { DESIGN_EXAMPLE_REQUEST } from '$lib/server/rules';
import { getQuote } from '$lib/server/repositories/quotes';
import { sequelize } from '$lib/server/db';

const CONNECTIONS = 100;
const SECONDS = 30;
const RUN_TIMEOUT_MS = (SECONDS + 25) * 1000;

const hasCustomerPage = customerPageExists();

let rep: Client;

beforeAll(async () => {
	// only this machine is ever a load target
	expect(new URL(BASE).hostname).toBe('127.0.0.1');
	rep = await signIn(DEMO.rep);
});
afterAll(async () => {
	await sequelize.close();
});

/** What must hold after a load run: all answered, all 2xx, all with the expected body. */
function expectClean(r: autocannon.Result): void {
	const summary = {
		errors: r.errors,
		timeouts: r.timeouts,
		non2xx: r.non2xx,
		'5xx': r['5xx'],
		mismatches: r.mismatches,
		statusCodes: r.statusCodeStats
	};
	expect(summary).toEqual({
		errors: 0,
		timeouts: 0,
		non2xx: 0,
		'5xx': 0,
		mismatches: 0,
		statusCodes: { '200': { count: r['2xx'] } }
	});
	// the run really happened: at least one answer per connection per 10 s
	expect(r['2xx']).toBeGreaterThan((CONNECTIONS * SECONDS) / 10);
}

async function expectHealthyAfter(): Promise<void> {
	const res = await client().get('/api/health');
	expect(res.status).toBe(200);
}

describe(`load: ${CONNECTIONS} connections for ${SECONDS} s`, () => {
	it(
		'POST /api/v1/evaluate signed in: every answer is a 200 with the engine’s result',
		async () => {
			const r = await autocannon({
				url: `${BASE}/api/v1/evaluate`,
				method: 'POST',
				headers: {
					cookie: rep.cookie,
					origin: BASE,
					'content-type': 'application/json',
					accept: 'application/json'
				},
				body: JSON.stringify(DESIGN_EXAMPLE_REQUEST),
				connections: CONNECTIONS,
				duration: SECONDS,
				timeout: 10,
				verifyBody: (body) => body.includes('"recommended"') && body.includes('"setups"')
			});
			expectClean(r);
			await expectHealthyAfter();
		},
		RUN_TIMEOUT_MS
	);

	it.skipIf(!hasCustomerPage)(
		hasCustomerPage
			? 'GET /q/<token> (the customer’s quote page, no account): every answer is a 200 showing the quote'
			: 'GET /q/<token> — skipped: this branch has no customer page route (src/routes/**/q/[token])',
		async () => {
			const contact = `load-${Date.now()}@test.traywise.test`;
			const quoteId = await demoQuote(rep, await demoChosenSurvey(rep));
			const since = new Date();
			await saveDraft(rep, quoteId, await currentLines(quoteId), contact);
			await sendQuote(rep, quoteId);
			const token = await mailedQuoteToken(quoteId, { to: contact, since });
			expect(token, 'sending the quote queued a mail with a /q/<token> link').toBeTruthy();
			const view = await getQuote(quoteId, null);
			if (!view.ok) throw new Error('the sent quote vanished');
			const number = view.value.revision.number;

			const path = `/q/${encodeURIComponent(token!)}`;
			const first = await client().get(path, { headers: { accept: 'text/html' } });
			expect(first.status).toBe(200);
			expect(await first.text()).toContain(number);

			const r = await autocannon({
				url: BASE + path,
				headers: { accept: 'text/html' },
				connections: CONNECTIONS,
				duration: SECONDS,
				timeout: 10,
				verifyBody: (body) => body.includes(number)
			});
			expectClean(r);
			await expectHealthyAfter();
		},
		RUN_TIMEOUT_MS
	);
});
