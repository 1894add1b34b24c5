/**
 * PostgreSQL stopped and started again under the running app (scripts/test.sh's private cluster).
 *
 * - Writes caught half-way: the test holds row locks so that a quote build, a quote revision, a
 *   draft save, a survey autosave, a customer create, a payment webhook and a user's deactivation
 *   each stop inside their transaction (after some of their statements ran), then stops PostgreSQL. Afterwards each is
 *   either wholly there or not at all, and doing it again works.
 * - While the database is down: pages answer a plain 503 page, JSON routes a 503 JSON body, none
 *   takes 10 s; sign-in answers 503 and counts no failure.
 * - Once PostgreSQL is back the same app process recovers by itself (/api/health turns 200) and the
 *   session cookie from before still works.
 * - PostgreSQL frozen (SIGSTOP: connections open, nothing answers, like a hung server or a network
 *   dropping packets): requests still end with a 503 inside 10 s, and all is well once it answers.
 * PostgreSQL is always started again in afterAll, even when a test fails: later files need it.
 */
import { randomUUID } from 'node:crypto';
import pg from 'pg';
import Stripe from 'stripe';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '$lib/server/db';
import { insertOpenCheckout } from '$lib/server/repositories/payments';
import { createUser } from '$lib/server/repositories/users';
import { BASE, DEMO, signIn, type Client } from '../helpers/http';
import { buildQuote, chosenSurvey, demoIds, quoteLines } from '../helpers/scenario';
import { postgres, postgresControlProblem } from '../helpers/postgres';
import { sleep, waitFor } from '../helpers/services';
import { checkoutCompletedEvent } from '../helpers/payment-events';

/** No request may take longer than this while the database is away. */
const HANG_MS = 10_000;
const WEBHOOK_SECRET = process.env.PAYMENTS_WEBHOOK_SECRET ?? 'whsec_traywise_local';

interface Timed {
	what: string;
	status: number;
	ms: number;
	contentType: string;
	retryAfter: string | null;
	body: string;
}

/** Runs one request and measures it; a request still open after 15 s is aborted and reported as status 0. */
async function timed(
	what: string,
	request: (signal: AbortSignal) => Promise<Response>
): Promise<Timed> {
	const started = performance.now();
	try {
		const res = await request(AbortSignal.timeout(15_000));
		const body = await res.text();
		return {
			what,
			status: res.status,
			ms: performance.now() - started,
			contentType: res.headers.get('content-type') ?? '',
			retryAfter: res.headers.get('retry-after'),
			body
		};
	} catch (err) {
		return {
			what,
			status: 0,
			ms: performance.now() - started,
			contentType: '',
			retryAfter: null,
			body: String(err)
		};
	}
}

function expectDownPage(r: Timed) {
	expect(r.status, `${r.what}: ${r.body.slice(0, 300)}`).toBe(503);
	expect(r.ms, r.what).toBeLessThan(HANG_MS);
	expect(r.contentType, r.what).toMatch(/^text\/html/);
	expect(r.retryAfter, r.what).not.toBeNull();
	expect(r.body, r.what).toContain('The database is not answering right now');
	expect(r.body, r.what).not.toMatch(/\b500\b|Internal Error/);
}

function expectDownJson(r: Timed) {
	expect(r.status, `${r.what}: ${r.body.slice(0, 300)}`).toBe(503);
	expect(r.ms, r.what).toBeLessThan(HANG_MS);
	expect(r.contentType, r.what).toMatch(/^application\/json/);
	expect(r.retryAfter, r.what).not.toBeNull();
	expect(JSON.parse(r.body).message, r.what).toMatch(/database is not answering/);
}

const one = async <T extends object>(sql: string, replacements: Record<string, unknown>) =>
	(await sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT }))[0];

async function quoteShape(quoteId: string) {
	const revisions = await sequelize.query<{
		id: string;
		revision: number;
		state: string;
		notes: string;
	}>(
		`SELECT id, revision, state, notes FROM quote_revisions WHERE quote_id = :quoteId ORDER BY revision`,
		{ replacements: { quoteId }, type: QueryTypes.SELECT }
	);
	const events = await sequelize.query<{ action: string; to_state: string }>(
		`SELECT action, to_state FROM quote_events WHERE quote_id = :quoteId ORDER BY at, id`,
		{ replacements: { quoteId }, type: QueryTypes.SELECT }
	);
	const lines = await sequelize.query<{ revision_id: string; n: string }>(
		`SELECT revision_id, count(*) AS n FROM quote_lines l JOIN quote_revisions r ON r.id = l.revision_id
		 WHERE r.quote_id = :quoteId GROUP BY revision_id`,
		{ replacements: { quoteId }, type: QueryTypes.SELECT }
	);
	const linesOf = new Map(lines.map((l) => [l.revision_id, Number(l.n)]));
	return {
		revisions: revisions.map((r) => ({
			revision: r.revision,
			state: r.state,
			lines: linesOf.get(r.id) ?? 0
		})),
		notes: revisions.at(-1)?.notes,
		events: events.map((e) => `${e.action}→${e.to_state}`)
	};
}

async function surveyState(id: string) {
	return one<{ version: number; data: { fleet?: { trucks?: number } } }>(
		`SELECT version, data FROM surveys WHERE id = :id`,
		{ id }
	);
}

function completedEvent(sessionId: string, quoteId: string) {
	const payload = JSON.stringify(checkoutCompletedEvent({ sessionId, quoteId }));
	return { id: (JSON.parse(payload) as { id: string }).id, payload };
}

/** Delivers a signed webhook the way the provider does (a fresh signature on every delivery). */
function deliver(payload: string, signal?: AbortSignal) {
	return fetch(`${BASE}/api/webhooks/payments`, {
		method: 'POST',
		signal,
		headers: {
			'content-type': 'application/json',
			'stripe-signature': Stripe.webhooks.generateTestHeaderString({
				payload,
				secret: WEBHOOK_SECRET
			})
		},
		body: payload
	});
}

let rep: Client;
let rep2: Client;
let admin: Client;

beforeAll(async () => {
	const problem = postgresControlProblem();
	if (problem) throw new Error(`This test stops and starts the test database: ${problem}.`);
	expect(await postgres.isReady()).toBe(true);
	rep = await signIn(DEMO.rep);
	rep2 = await signIn(DEMO.rep2);
	admin = await signIn(DEMO.admin);
});

afterAll(async () => {
	// whatever happened above, the next test files need the database
	await postgres.ensureRunning();
	await waitFor(
		'the app to see the database again',
		async () => (await fetch(`${BASE}/api/health`)).ok,
		30_000,
		250
	);
	await sequelize.close();
});

describe('PostgreSQL stopped and started again under the running app', () => {
	it('rolls back writes caught half-way, answers 503 quickly while down, and recovers without a restart', async () => {
		// ---- what the interrupted writes work on ----
		const ids = await demoIds();
		const [surveyForQuote, surveyForSent, surveyForDraft, autosaveSurvey, trafficSurvey] =
			await Promise.all(Array.from({ length: 5 }, () => chosenSurvey(rep)));
		const quoteToken = randomUUID();

		const sentQuote = await buildQuote(rep, surveyForSent);
		expect(
			(await rep.post(`/api/v1/quotes/${sentQuote}/actions`, { action: 'mark-ready' })).status
		).toBe(200);
		expect((await rep.post(`/api/v1/quotes/${sentQuote}/actions`, { action: 'send' })).status).toBe(
			200
		);
		const sentBefore = await quoteShape(sentQuote);
		expect(sentBefore.revisions).toEqual([
			{ revision: 1, state: 'sent', lines: expect.any(Number) }
		]);

		const draftQuote = await buildQuote(rep, surveyForDraft);
		const draftLinesBefore = await quoteLines(draftQuote);
		const draftBefore = await quoteShape(draftQuote);
		const draftNotes = `Saved during the outage ${randomUUID()}`;
		const draftPayload = JSON.stringify({
			lines: draftLinesBefore.map((l) => ({
				sku: l.sku,
				quantity: l.quantity + 1,
				discountPercent: 0
			})),
			overallDiscountPercent: 0,
			taxRegion: 'WA',
			notes: draftNotes,
			contactName: 'Dana Quillfeather',
			contactEmail: 'dana.q@marlow-crossing.example'
		});

		const autosaveBefore = await surveyState(autosaveSurvey);
		const customerName = `Outage Freight Yard ${randomUUID()}`;

		const sessionId = `cs_test_outage_${randomUUID().replaceAll('-', '')}`;
		const paidQuoteId = randomUUID();
		await insertOpenCheckout({
			checkoutSessionId: sessionId,
			quoteId: paidQuoteId,
			revisionId: randomUUID(),
			amountCents: 250_000,
			currency: 'eur',
			checkoutUrl: null,
			expiresAt: null,
			idempotencyKey: `outage:${sessionId}`,
			customerEmail: 'dana@customer.test'
		});
		const webhook = completedEvent(sessionId, paidQuoteId);

		// a user the admin deactivates: their account and their sessions change together
		const leaverEmail = `leaver-${randomUUID()}@test.traywise.test`;
		const leaverPassword = `leaver-password-${randomUUID()}`;
		const repTeam = (
			await one<{ team_id: string }>(`SELECT team_id FROM users WHERE email = :email`, {
				email: DEMO.rep
			})
		).team_id;
		const leaverId = await createUser({
			name: 'Leaving Rep',
			email: leaverEmail,
			role: 'rep',
			teamId: repTeam,
			password: leaverPassword
		});
		const leaver = await signIn(leaverEmail, leaverPassword);
		const deactivate = { id: leaverId, role: 'rep', teamId: repTeam };

		const active = await one<{ id: string }>(
			`SELECT id FROM price_book_versions WHERE status = 'active'`,
			{}
		);
		const rep2Id = (
			await one<{ id: string }>(`SELECT id FROM users WHERE email = :email`, { email: DEMO.rep2 })
		).id;

		// ---- row locks that stop each write part-way through its transaction ----
		// quote build and revise: after inserting the quote / superseding revision 1, at the new
		// revision's price-book reference; draft save: after replacing the lines, at the quote row;
		// autosave: at the survey row; customer: at its owner reference; webhook: after recording the
		// event id, at the payment row; deactivation: after updating the user, at their sessions.
		const locker = new pg.Client({ connectionString: process.env.DATABASE_URL });
		locker.on('error', () => {}); // the shutdown ends this session too
		await locker.connect();
		await locker.query('BEGIN');
		await locker.query('SELECT 1 FROM price_book_versions WHERE id = $1 FOR UPDATE', [active.id]);
		await locker.query('SELECT 1 FROM quotes WHERE id = $1 FOR UPDATE', [draftQuote]);
		await locker.query('SELECT 1 FROM surveys WHERE id = $1 FOR UPDATE', [autosaveSurvey]);
		await locker.query('SELECT 1 FROM users WHERE id = $1 FOR UPDATE', [rep2Id]);
		await locker.query('SELECT 1 FROM payments WHERE checkout_session_id = $1 FOR UPDATE', [
			sessionId
		]);
		await locker.query('SELECT 1 FROM sessions WHERE user_id = $1 FOR UPDATE', [leaverId]);
		const lockerPid = (await locker.query<{ pid: number }>('SELECT pg_backend_pid() AS pid'))
			.rows[0].pid;

		// ---- background traffic through the whole outage: every answer 200 or 503, none slow ----
		const traffic: (Timed & { at: number; version?: number; trucks?: number })[] = [];
		let trafficOn = true;
		const trafficLoop = (async () => {
			let n = 0;
			while (trafficOn) {
				n++;
				const trucks = 1 + (n % 40);
				const at = Date.now();
				const [page, data, save] = await Promise.all([
					timed('GET /surveys', (signal) =>
						rep.get('/surveys', { signal, headers: { accept: 'text/html' } })
					),
					timed('GET survey JSON', (signal) =>
						rep.get(`/api/v1/surveys/${trafficSurvey}`, { signal })
					),
					timed('PATCH autosave', (signal) =>
						rep.post(
							`/api/v1/surveys/${trafficSurvey}`,
							{ step: 'fleet', values: { trucks } },
							{ method: 'PATCH', signal }
						)
					)
				]);
				traffic.push({ ...page, at }, { ...data, at });
				traffic.push({
					...save,
					at,
					trucks,
					version:
						save.status === 200 ? (JSON.parse(save.body) as { version: number }).version : undefined
				});
				await sleep(150);
			}
		})();

		const inFlight = {
			build: timed('build quote', (signal) =>
				fetch(`${BASE}/surveys/${surveyForQuote}/recommendation?/quote`, {
					method: 'POST',
					signal,
					redirect: 'manual',
					headers: {
						cookie: rep.cookie,
						origin: BASE,
						accept: 'text/html',
						'content-type': 'application/x-www-form-urlencoded'
					},
					body: new URLSearchParams({ clientToken: quoteToken })
				})
			),
			revise: timed('revise quote', (signal) =>
				rep.post(`/api/v1/quotes/${sentQuote}/actions`, { action: 'revise' }, { signal })
			),
			save: timed('save draft', (signal) =>
				fetch(`${BASE}/quotes/${draftQuote}?/save`, {
					method: 'POST',
					signal,
					redirect: 'manual',
					headers: {
						cookie: rep.cookie,
						origin: BASE,
						accept: 'text/html',
						'content-type': 'application/x-www-form-urlencoded'
					},
					body: new URLSearchParams({ payload: draftPayload })
				})
			),
			autosave: timed('autosave', (signal) =>
				rep.post(
					`/api/v1/surveys/${autosaveSurvey}`,
					{ step: 'fleet', values: { trucks: 17 } },
					{ method: 'PATCH', signal }
				)
			),
			customer: timed('create customer', (signal) =>
				fetch(`${BASE}/customers/new`, {
					method: 'POST',
					signal,
					redirect: 'manual',
					headers: {
						cookie: rep2.cookie,
						origin: BASE,
						accept: 'text/html',
						'content-type': 'application/x-www-form-urlencoded'
					},
					body: new URLSearchParams({
						name: customerName,
						accountNumber: '',
						notes: 'made while the database went away'
					})
				})
			),
			webhook: timed('payment webhook', (signal) => deliver(webhook.payload, signal)),
			deactivate: timed('deactivate user', (signal) =>
				fetch(`${BASE}/admin/users?/update`, {
					method: 'POST',
					signal,
					redirect: 'manual',
					headers: {
						cookie: admin.cookie,
						origin: BASE,
						accept: 'text/html',
						'content-type': 'application/x-www-form-urlencoded'
					},
					body: new URLSearchParams(deactivate)
				})
			)
		};

		try {
			// all seven wait on the test's locks, part-way through
			await waitFor(
				'seven writes waiting on the test’s locks',
				async () => {
					const [row] = await sequelize.query<{ n: string }>(
						`SELECT count(*) AS n FROM pg_stat_activity
						 WHERE datname = current_database() AND wait_event_type = 'Lock' AND :pid = ANY(pg_blocking_pids(pid))`,
						{ replacements: { pid: lockerPid }, type: QueryTypes.SELECT }
					);
					return Number(row.n) === 7;
				},
				10_000
			);
			// the quote build and the revision already wrote rows inside their transactions
			const midway = await sequelize.query<{ query: string }>(
				`SELECT query FROM pg_stat_activity WHERE :pid = ANY(pg_blocking_pids(pid))`,
				{ replacements: { pid: lockerPid }, type: QueryTypes.SELECT }
			);
			expect(midway.filter((m) => /INSERT INTO quote_revisions/.test(m.query))).toHaveLength(2);
			expect(midway.some((m) => /UPDATE quotes SET updated_at/.test(m.query))).toBe(true);
			expect(midway.some((m) => /UPDATE payments/.test(m.query))).toBe(true);
			expect(midway.some((m) => /DELETE FROM "sessions"/.test(m.query))).toBe(true);
			await sleep(600); // some background traffic before the stop

			// ---- the database goes away ----
			const stoppedAt = Date.now();
			// all at once, like a crash: a fast shutdown may end the locking session first and let a
			// waiting write commit just before its own session is ended (seen once in a suite run)
			await postgres.stop('immediate');
			const interrupted = await Promise.all(Object.values(inFlight));
			for (const r of interrupted) expect(r.ms, r.what).toBeLessThan(HANG_MS);
			const [build, revise, save, autosave, customer, hook, deactivated] = interrupted;
			expectDownPage(build);
			expectDownJson(revise);
			expectDownPage(save);
			expectDownJson(autosave);
			expectDownPage(customer);
			expectDownJson(hook);
			expectDownPage(deactivated);

			// ---- while it is down ----
			const probes = await Promise.all([
				timed('page', (signal) =>
					rep.get('/surveys', { signal, headers: { accept: 'text/html' } })
				),
				timed('quote page', (signal) =>
					rep.get(`/quotes/${draftQuote}`, { signal, headers: { accept: 'text/html' } })
				),
				timed('page data (client-side navigation)', (signal) =>
					rep.get('/surveys/__data.json?x-sveltekit-invalidated=01', { signal })
				),
				timed('JSON read', (signal) => rep.get(`/api/v1/surveys/${autosaveSurvey}`, { signal })),
				timed('JSON evaluate', (signal) =>
					rep.post('/api/v1/evaluate', { truck: { modelId: 'TW-B4-25' } }, { signal })
				),
				timed('form action', (signal) =>
					fetch(`${BASE}/surveys?/start`, {
						method: 'POST',
						signal,
						redirect: 'manual',
						headers: {
							cookie: rep.cookie,
							origin: BASE,
							accept: 'text/html',
							'content-type': 'application/x-www-form-urlencoded'
						},
						body: new URLSearchParams({
							customerId: ids.customerId,
							siteId: ids.siteId,
							clientToken: randomUUID()
						})
					})
				),
				timed('enhanced form action', (signal) =>
					fetch(`${BASE}/customers/new`, {
						method: 'POST',
						signal,
						headers: {
							cookie: rep.cookie,
							origin: BASE,
							accept: 'application/json',
							'x-sveltekit-action': 'true',
							'content-type': 'application/x-www-form-urlencoded'
						},
						body: new URLSearchParams({
							name: `Never stored ${randomUUID()}`,
							accountNumber: '',
							notes: ''
						})
					})
				),
				timed('sign in', (signal) =>
					fetch(`${BASE}/login`, {
						method: 'POST',
						signal,
						redirect: 'manual',
						headers: {
							origin: BASE,
							accept: 'text/html',
							'content-type': 'application/x-www-form-urlencoded'
						},
						body: new URLSearchParams({ email: DEMO.rep, password: 'not-the-password' })
					})
				),
				timed('health', (signal) => fetch(`${BASE}/api/health`, { signal })),
				timed('sign-in page', (signal) => fetch(`${BASE}/login`, { signal }))
			]);
			const [
				page,
				quotePage,
				pageData,
				jsonRead,
				evaluate,
				action,
				enhanced,
				signInDown,
				health,
				loginPage
			] = probes;
			expectDownPage(page);
			expectDownPage(quotePage);
			expectDownPage(action);
			expectDownPage(signInDown);
			expectDownJson(jsonRead);
			expectDownJson(evaluate);
			// the client router and use:enhance read these as an error with the same message
			expect(pageData.status, pageData.body).toBe(503);
			expect(pageData.ms).toBeLessThan(HANG_MS);
			expect(pageData.body).toContain('The database is not answering right now');
			expect(enhanced.status, enhanced.body).toBe(503);
			expect(enhanced.ms).toBeLessThan(HANG_MS);
			expect(JSON.parse(enhanced.body)).toMatchObject({
				type: 'error',
				error: { message: expect.stringMatching(/database is not answering/) }
			});
			expect(health.status).toBe(503);
			expect(health.ms).toBeLessThan(HANG_MS);
			expect(JSON.parse(health.body)).toMatchObject({ db: 'down' });
			// what needs no database still works
			expect(loginPage.status).toBe(200);
			await sleep(1_500); // the traffic keeps hitting the stopped database

			// ---- the database returns; the same app process recovers on its own ----
			await postgres.start();
			const restartedAt = Date.now();
			await waitFor(
				'GET /api/health → 200',
				async () => (await fetch(`${BASE}/api/health`, { signal: AbortSignal.timeout(5_000) })).ok,
				30_000,
				200
			);
			const recoveredMs = Date.now() - restartedAt;
			expect(recoveredMs).toBeLessThan(30_000);
			const slowest = Math.max(...[...interrupted, ...probes].map((r) => r.ms));
			console.log(
				`[db-outage] stopped for ${restartedAt - stoppedAt} ms; slowest answer while down ${Math.round(slowest)} ms; healthy ${recoveredMs} ms after the restart`
			);
			await sleep(1_000); // a little traffic after recovery
			trafficOn = false;
			await trafficLoop;

			// every answer during the whole episode was 200 or 503, and quick
			expect(
				traffic
					.filter((t) => t.status !== 200 && t.status !== 503)
					.map((t) => `${t.what} ${t.status} ${t.body.slice(0, 200)}`)
			).toEqual([]);
			expect(
				traffic.filter((t) => t.ms >= HANG_MS).map((t) => `${t.what} ${Math.round(t.ms)} ms`)
			).toEqual([]);
			const during = traffic.filter((t) => t.at > stoppedAt && t.at < restartedAt);
			for (const what of ['GET /surveys', 'GET survey JSON', 'PATCH autosave']) {
				expect(
					during.some((t) => t.what === what && t.status === 503),
					`${what} answered 503 while down`
				).toBe(true);
			}
			for (const t of during.filter((d) => d.status === 503)) {
				if (t.what === 'GET /surveys') expectDownPage(t);
				else expectDownJson(t);
			}
			const after = traffic.filter((t) => t.at > restartedAt + recoveredMs);
			expect(after.length).toBeGreaterThan(0);
			expect(after.filter((t) => t.status !== 200).map((t) => `${t.what} ${t.status}`)).toEqual([]);

			// ---- nothing half-written ----
			// the interrupted quote build left no quote (not even one without its revision)
			expect(
				await sequelize.query(`SELECT id FROM quotes WHERE client_token = :quoteToken`, {
					replacements: { quoteToken },
					type: QueryTypes.SELECT
				})
			).toEqual([]);
			// the interrupted revision left revision 1 sent and no revision 2
			expect(await quoteShape(sentQuote)).toEqual(sentBefore);
			// the interrupted draft save left the old lines and notes
			expect(await quoteShape(draftQuote)).toEqual(draftBefore);
			expect(await quoteLines(draftQuote)).toEqual(draftLinesBefore);
			// the interrupted autosave changed nothing
			expect(await surveyState(autosaveSurvey)).toEqual(autosaveBefore);
			// no customer was made
			expect(
				await sequelize.query(`SELECT id FROM customers WHERE name = :customerName`, {
					replacements: { customerName },
					type: QueryTypes.SELECT
				})
			).toEqual([]);
			// the webhook recorded neither its event id (so a redelivery is not taken for a duplicate) nor the payment
			expect(
				await sequelize.query(`SELECT event_id FROM payment_events WHERE event_id = :id`, {
					replacements: { id: webhook.id },
					type: QueryTypes.SELECT
				})
			).toEqual([]);
			expect(
				(
					await one<{ status: string }>(
						`SELECT status FROM payments WHERE checkout_session_id = :sessionId`,
						{ sessionId }
					)
				).status
			).toBe('open');
			// the user is still active and still signed in (not deactivated with their sessions kept)
			expect(
				(
					await one<{ active: boolean }>(`SELECT active FROM users WHERE id = :leaverId`, {
						leaverId
					})
				).active
			).toBe(true);
			expect((await leaver.get('/surveys', { headers: { accept: 'text/html' } })).status).toBe(200);
			// no sign-in failure was counted for the attempt the database never saw
			expect(
				(
					await one<{ n: string }>(
						`SELECT count(*) AS n FROM sign_in_failures WHERE key = :key AND at >= to_timestamp(:since / 1000.0)`,
						{
							key: `email:${DEMO.rep}`,
							since: stoppedAt
						}
					)
				).n
			).toBe('0');

			// every write acknowledged to the autosave traffic is there
			const acked = traffic
				.filter((t) => t.version !== undefined)
				.sort((a, b) => a.version! - b.version!);
			expect(acked.length).toBeGreaterThan(0);
			const last = acked.at(-1)!;
			const stored = await surveyState(trafficSurvey);
			expect(stored.version).toBeGreaterThanOrEqual(last.version!);
			if (stored.version === last.version) expect(stored.data.fleet?.trucks).toBe(last.trucks);

			// ---- doing each again now works, once ----
			const rebuilt = await fetch(`${BASE}/surveys/${surveyForQuote}/recommendation?/quote`, {
				method: 'POST',
				redirect: 'manual',
				headers: {
					cookie: rep.cookie,
					origin: BASE,
					accept: 'text/html',
					'content-type': 'application/x-www-form-urlencoded'
				},
				body: new URLSearchParams({ clientToken: quoteToken })
			});
			expect(rebuilt.status).toBe(303);
			const rebuiltId = /\/quotes\/([0-9a-f-]{36})$/.exec(rebuilt.headers.get('location')!)![1];
			const rebuiltShape = await quoteShape(rebuiltId);
			expect(rebuiltShape.revisions).toEqual([
				{ revision: 1, state: 'draft', lines: sentBefore.revisions[0].lines }
			]);
			expect(rebuiltShape.events).toEqual(['create→draft']);

			expect(
				(await rep.post(`/api/v1/quotes/${sentQuote}/actions`, { action: 'revise' })).status
			).toBe(200);
			expect((await quoteShape(sentQuote)).revisions.map((r) => [r.revision, r.state])).toEqual([
				[1, 'superseded'],
				[2, 'draft']
			]);

			expect(
				(await rep.action(`/quotes/${draftQuote}?/save`, { payload: draftPayload })).status
			).toBe(200);
			expect((await quoteShape(draftQuote)).notes).toBe(draftNotes);
			expect((await quoteLines(draftQuote)).map((l) => l.quantity)).toEqual(
				draftLinesBefore.map((l) => l.quantity + 1)
			);

			const saved = await rep.post(
				`/api/v1/surveys/${autosaveSurvey}`,
				{ step: 'fleet', values: { trucks: 17 } },
				{ method: 'PATCH' }
			);
			expect(saved.status).toBe(200);
			expect(await surveyState(autosaveSurvey)).toMatchObject({
				version: autosaveBefore.version + 1,
				data: { fleet: { trucks: 17 } }
			});

			expect(
				(await rep2.action('/customers/new', { name: customerName, accountNumber: '', notes: '' }))
					.status
			).toBe(303);
			expect(
				await sequelize.query(`SELECT id FROM customers WHERE name = :customerName`, {
					replacements: { customerName },
					type: QueryTypes.SELECT
				})
			).toHaveLength(1);

			// the provider's redelivery is handled as new, once
			const redelivered = await deliver(webhook.payload);
			expect(redelivered.status).toBe(200);
			expect(await redelivered.json()).toMatchObject({ duplicate: false, outcome: 'paid' });
			expect(await (await deliver(webhook.payload)).json()).toMatchObject({ duplicate: true });
			expect(
				(
					await one<{ status: string }>(
						`SELECT status FROM payments WHERE checkout_session_id = :sessionId`,
						{ sessionId }
					)
				).status
			).toBe('paid');

			expect((await admin.action('/admin/users?/update', deactivate)).status).toBe(200);
			expect(
				(
					await one<{ active: boolean }>(`SELECT active FROM users WHERE id = :leaverId`, {
						leaverId
					})
				).active
			).toBe(false);
			expect(
				(
					await one<{ n: string }>(`SELECT count(*) AS n FROM sessions WHERE user_id = :leaverId`, {
						leaverId
					})
				).n
			).toBe('0');
			expect((await leaver.get('/surveys')).status).toBe(303);

			// the session from before the outage still signs the rep in
			const back = await rep.get('/surveys', { headers: { accept: 'text/html' } });
			expect(back.status).toBe(200);
			expect(await back.text()).toContain('Rowan Vale');
		} finally {
			trafficOn = false;
			await Promise.allSettled([trafficLoop, ...Object.values(inFlight)]);
			await locker.end().catch(() => {});
			await postgres.ensureRunning();
		}
	});

	it('answers 503 within 10 s while PostgreSQL hangs without answering, and carries on when it answers again', async () => {
		const surveyId = await chosenSurvey(rep);
		// open connections in the app's pool: their next query will hang, not fail
		await Promise.all(
			Array.from({ length: 6 }, () =>
				rep.get(`/api/v1/surveys/${surveyId}`).then((r) => expect(r.status).toBe(200))
			)
		);

		let results: Timed[] = [];
		await postgres.freeze();
		try {
			// more requests at once than the pool has connections
			results = await Promise.all([
				...Array.from({ length: 7 }, (_, i) =>
					timed(`page ${i}`, (signal) =>
						rep.get('/surveys', { signal, headers: { accept: 'text/html' } })
					)
				),
				...Array.from({ length: 7 }, (_, i) =>
					timed(`JSON ${i}`, (signal) => rep.get(`/api/v1/surveys/${surveyId}`, { signal }))
				),
				timed('sign in', (signal) =>
					fetch(`${BASE}/login`, {
						method: 'POST',
						signal,
						redirect: 'manual',
						headers: {
							origin: BASE,
							accept: 'text/html',
							'content-type': 'application/x-www-form-urlencoded'
						},
						body: new URLSearchParams({ email: DEMO.rep2, password: 'not-the-password' })
					})
				),
				timed('health', (signal) => fetch(`${BASE}/api/health`, { signal }))
			]);
		} finally {
			await postgres.thaw();
		}
		console.log(
			`[db-outage] frozen: ${results.length} requests, slowest answer ${Math.round(Math.max(...results.map((r) => r.ms)))} ms`
		);
		for (const r of results) {
			if (r.what === 'health') {
				expect(r.status).toBe(503);
				expect(r.ms).toBeLessThan(HANG_MS);
			} else if (r.what.startsWith('JSON')) expectDownJson(r);
			else expectDownPage(r);
		}

		await waitFor(
			'GET /api/health → 200',
			async () => (await fetch(`${BASE}/api/health`, { signal: AbortSignal.timeout(5_000) })).ok,
			30_000,
			200
		);
		// no connection left over from the hang poisons later requests
		for (let i = 0; i < 12; i++) {
			const [page, data] = await Promise.all([
				rep.get('/surveys', { headers: { accept: 'text/html' } }),
				rep.get(`/api/v1/surveys/${surveyId}`)
			]);
			expect([page.status, data.status]).toEqual([200, 200]);
		}
	});
});
