/**
 * Scale-out: a second app process from the same build, on another port, with the same settings
 * (database, upload folder, mail, payments, public origin) — two processes behind a load balancer.
 * Nothing a request needs may live only in one process's memory: sessions, sign-in throttling, survey
 * data, uploaded files, the mail queue and payment events are shared through PostgreSQL and the
 * upload folder. Process A is the app scripts/test.sh started (APP_URL); this file starts B and stops
 * it afterwards.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { randomUUID } from 'node:crypto';
import { createWriteStream, mkdirSync } from 'node:fs';
import { createServer } from 'node:net';
import path from 'node:path';
import pg from 'pg';
import Stripe from 'stripe';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sequelize } from '$lib/server/db';
import { MailOutbox } from '$lib/server/db/models/delivery';
import { config } from '$lib/server/config';
import { insertOpenCheckout } from '$lib/server/repositories/payments';
import { createUser } from '$lib/server/repositories/users';
import { SIGN_IN_LIMITS } from '$lib/server/auth/throttle';
import { BASE, DEMO, client, signIn } from '../helpers/http';
import { buildQuote, chosenSurvey, demoIds, quoteState, saveWithDiscount } from '../helpers/scenario';
import { makePng } from '../helpers/images';
import { sleep, waitFor } from '../helpers/services';
import { checkoutCompletedEvent } from '../helpers/payment-events';

const A = BASE;
let B = '';
let second: ChildProcess | null = null;
const ARTIFACTS = process.env.ARTIFACTS_DIR ?? 'artifacts';

/** A port nothing listens on right now (TEST_APP2_PORT when set). */
async function freePort(): Promise<number> {
	if (process.env.TEST_APP2_PORT) return Number(process.env.TEST_APP2_PORT);
	return new Promise((resolve, reject) => {
		const probe = createServer();
		probe.once('error', reject);
		probe.listen(0, '127.0.0.1', () => {
			const { port } = probe.address() as { port: number };
			probe.close(() => resolve(port));
		});
	});
}

beforeAll(async () => {
	const port = await freePort();
	B = `http://127.0.0.1:${port}`;
	mkdirSync(ARTIFACTS, { recursive: true });
	const log = createWriteStream(path.join(ARTIFACTS, 'app-b.log'));
	const env: NodeJS.ProcessEnv = {
		...process.env,
		NODE_ENV: 'production',
		PORT: String(port),
		HOST: '127.0.0.1'
	};
	for (const key of Object.keys(env))
		if (key.startsWith('VITEST') || key === 'TEST') delete env[key];
	// the same build and settings as A; ORIGIN stays A's: both answer for one public address
	second = spawn(process.execPath, ['build'], {
		cwd: process.cwd(),
		env,
		stdio: ['ignore', 'pipe', 'pipe']
	});
	second.stdout!.pipe(log);
	second.stderr!.pipe(log);
	let exited: number | null = null;
	second.once('exit', (code) => (exited = code ?? -1));
	await waitFor(
		`the second app process on ${B}`,
		async () => {
			if (exited !== null) throw new Error(`it exited with ${exited}; see ${ARTIFACTS}/app-b.log`);
			return (await fetch(`${B}/api/health`)).ok;
		},
		30_000,
		200
	);
}, 60_000);

afterAll(async () => {
	const proc = second;
	if (proc && proc.exitCode === null && proc.signalCode === null) {
		const gone = new Promise((resolve) => proc.once('exit', resolve));
		const asked = Date.now();
		proc.kill('SIGTERM');
		const timer = setTimeout(() => proc.kill('SIGKILL'), 10_000);
		await gone;
		clearTimeout(timer);
		// a process behind a load balancer leaves promptly when asked (rolling restarts)
		expect(proc.signalCode, 'the second process needed SIGKILL').toBeNull();
		expect(Date.now() - asked).toBeLessThan(5_000);
	}
	await sequelize.close();
});

describe('two app processes on one database', () => {
	it('serves both processes', async () => {
		const [a, b] = await Promise.all([fetch(`${A}/api/health`), fetch(`${B}/api/health`)]);
		expect([a.status, b.status]).toEqual([200, 200]);
		expect(B).not.toBe(A);
	});

	it('signs in on A, continues the survey on B, reads it back on A; signing out on B ends the session on A', async () => {
		const onA = await signIn(DEMO.rep, undefined, A);
		const onB = client(onA.cookie, B);
		const page = await onB.get('/surveys', { headers: { accept: 'text/html' } });
		expect(page.status).toBe(200);
		expect(await page.text()).toContain('Rowan Vale');

		const ids = await demoIds();
		const start = await onA.action('/surveys?/start', {
			customerId: ids.customerId,
			siteId: ids.siteId,
			clientToken: randomUUID()
		});
		expect(start.status).toBe(303);
		const surveyId = /\/surveys\/([0-9a-f-]{36})\//.exec(start.headers.get('location')!)![1];

		const saved = await onB.post(
			`/api/v1/surveys/${surveyId}`,
			{
				step: 'fleet',
				values: {
					truckModelId: ids.truckId,
					trucks: 9,
					batterySource: 'catalogue',
					batteryId: ids.batteryId
				}
			},
			{ method: 'PATCH' }
		);
		expect(saved.status).toBe(200);
		const { version } = (await saved.json()) as { version: number };

		const read = await onA.get(`/api/v1/surveys/${surveyId}`);
		expect(read.status).toBe(200);
		const survey = (await read.json()) as {
			version: number;
			currentStep: string;
			data: { fleet: Record<string, unknown> };
		};
		expect(survey.version).toBe(version);
		expect(survey.currentStep).toBe('fleet');
		expect(survey.data.fleet).toMatchObject({
			truckModelId: ids.truckId,
			trucks: 9,
			batteryId: ids.batteryId
		});

		// the wizard page on A shows what was saved on B
		const step = await onA.get(`/surveys/${surveyId}/fleet`, { headers: { accept: 'text/html' } });
		expect(step.status).toBe(200);

		expect((await onB.action('/logout', {})).status).toBe(303);
		const after = await onA.get('/surveys');
		expect(after.status).toBe(303);
		expect(after.headers.get('location')).toMatch(/^\/login/);
	});

	it('counts sign-in failures made on either process against one limit', async () => {
		const since = new Date();
		const email = `throttled-${randomUUID()}@test.traywise.test`;
		const password = `right-password-${randomUUID()}`;
		const repTeam = await sequelize.query<{ team_id: string }>(
			`SELECT team_id FROM users WHERE email = :email`,
			{
				replacements: { email: DEMO.rep },
				type: QueryTypes.SELECT
			}
		);
		await createUser({
			name: 'Throttled Rep',
			email,
			role: 'rep',
			teamId: repTeam[0].team_id,
			password
		});
		const attempt = (base: string, pw: string) =>
			client('', base).action('/login', { email, password: pw });

		try {
			// 8 wrong passwords, alternating A and B: each process saw only 4
			const limit = SIGN_IN_LIMITS.perEmail;
			expect(limit).toBe(8);
			for (let i = 0; i < limit; i++) {
				const res = await attempt(i % 2 === 0 ? A : B, `wrong-${i}`);
				expect(res.status, `failure ${i + 1} on ${i % 2 === 0 ? 'A' : 'B'}`).toBe(400);
			}
			// now even the right password is refused, on both processes, with a clear message
			for (const base of [A, B]) {
				const res = await attempt(base, password);
				expect(res.status, base).toBe(429);
				expect(res.headers.getSetCookie().some((c) => c.startsWith('traywise_session='))).toBe(
					false
				);
				expect(await res.text()).toContain('Too many sign-in attempts');
			}
		} finally {
			// keep the shared per-address count for the files after this one
			await sequelize.query(
				`DELETE FROM sign_in_failures WHERE (key = :emailKey OR key LIKE 'ip:%') AND at >= :since`,
				{
					replacements: { emailKey: `email:${email}`, since }
				}
			);
		}
		// once the window has passed (here: the failures cleared) the right password works on either
		expect((await attempt(B, password)).status).toBe(303);
	});

	it('serves on B a photo uploaded through A (one upload folder)', async () => {
		const onA = await signIn(DEMO.rep, undefined, A);
		const photo = makePng(640, 400);
		const form = new FormData();
		form.append('ownerType', 'customer');
		form.append('ownerId', (await demoIds()).customerId);
		form.append('kind', 'photo');
		form.append(
			'files',
			new Blob([new Uint8Array(photo)], { type: 'image/png' }),
			'Charging bay.png'
		);
		const res = await fetch(`${A}/api/v1/uploads`, {
			method: 'POST',
			headers: { cookie: onA.cookie, origin: A, accept: 'application/json' },
			body: form
		});
		expect(res.status).toBe(200);
		const { results } = (await res.json()) as {
			results: { ok: boolean; upload: { id: string; thumbUrl: string } }[];
		};
		expect(results[0].ok).toBe(true);
		const { id, thumbUrl } = results[0].upload;

		const onB = client(onA.cookie, B);
		const original = await onB.get(`/uploads/${id}`);
		expect(original.status).toBe(200);
		expect(original.headers.get('content-type')).toBe('image/png');
		expect(Buffer.from(await original.arrayBuffer()).equals(photo)).toBe(true);
		const thumb = await onB.get(thumbUrl);
		expect(thumb.status).toBe(200);
		expect(thumb.headers.get('content-type')).toBe('image/webp');
	});

	it('sends each queued message once while both processes run the mail worker', async () => {
		const batch = randomUUID();
		const total = 200;
		// queued as enqueueMail does, due 1.5 s from now so the test can lock them first
		const ids = (
			await sequelize.query<{ id: string }>(
				`WITH x AS (SELECT i, gen_random_uuid() AS id FROM generate_series(1, :total) AS i)
				 INSERT INTO mail_outbox (id, kind, to_address, subject, text, message_id, dedupe_key, next_attempt_at)
				 SELECT id, 'test', 'scale-' || i || '@customer.test', :subject || i, 'message ' || i, '<' || id || '@traywise.test>',
				        'scale-out:' || :batch || ':' || i, now() + interval '1.5 seconds'
				 FROM x
				 RETURNING id`,
				{
					replacements: { subject: `Two workers ${batch} #`, batch, total },
					type: QueryTypes.SELECT
				}
			)
		).map((r) => r.id);
		expect(ids).toHaveLength(total);

		// While the rows are due but locked elsewhere, both workers poll at least once: a claim that
		// did not skip locked rows would wait on them and then take rows the other worker took too.
		const locker = new pg.Client({ connectionString: process.env.DATABASE_URL });
		await locker.connect();
		try {
			await locker.query('BEGIN');
			await locker.query('SELECT id FROM mail_outbox WHERE id = ANY($1::uuid[]) FOR UPDATE', [ids]);
			await sleep(1_500 + 2 * config.mail.pollMs + 500);
			await locker.query('COMMIT');
		} finally {
			await locker.end();
		}

		// Each worker runs one pass at a time, and no other worker runs here (this file's process has
		// none): two claims in flight at once are A's and B's workers draining side by side.
		let overlaps = 0;
		await waitFor(
			`all ${total} sent`,
			async () => {
				const [row] = await sequelize.query<{ claims: string; sent: string }>(
					`SELECT count(DISTINCT claim_id) FILTER (WHERE status = 'sending') AS claims, count(*) FILTER (WHERE status = 'sent') AS sent
					 FROM mail_outbox WHERE id IN (:ids)`,
					{ replacements: { ids }, type: QueryTypes.SELECT }
				);
				if (Number(row.claims) >= 2) overlaps++;
				return Number(row.sent) === total;
			},
			60_000,
			5
		);
		expect(overlaps, 'both workers were claiming at the same moment').toBeGreaterThan(0);
		const rows = await MailOutbox.findAll({ where: { id: ids } });
		expect(
			rows.filter((r) => r.attempts !== 1).map((r) => `${r.subject}: ${r.attempts} attempts`)
		).toEqual([]);
		const counts = await sequelize.query<{ message_id: string; n: string }>(
			`SELECT message_id, count(*) AS n FROM caught_mail WHERE subject LIKE :like GROUP BY message_id`,
			{ replacements: { like: `Two workers ${batch} #%` }, type: QueryTypes.SELECT }
		);
		expect(counts.filter((c) => c.n !== '1')).toEqual([]);
		expect(new Set(counts.map((c) => c.message_id))).toEqual(new Set(rows.map((r) => r.messageId)));
		console.log(
			`[scale-out] ${total} messages, both workers seen claiming at once ${overlaps} times`
		);
	});

	it('records a payment once when the provider delivers its event to both processes at the same time', async () => {
		const sessionId = `cs_test_scale_${randomUUID().replaceAll('-', '')}`;
		const quoteId = randomUUID();
		await insertOpenCheckout({
			checkoutSessionId: sessionId,
			quoteId,
			revisionId: randomUUID(),
			amountCents: 480_000,
			currency: 'eur',
			checkoutUrl: null,
			expiresAt: null,
			idempotencyKey: `scale:${sessionId}`,
			customerEmail: 'dana@customer.test'
		});
		const eventId = `evt_test_${randomUUID().replaceAll('-', '')}`;
		const payload = JSON.stringify(checkoutCompletedEvent({ eventId, sessionId, quoteId, amount: 480_000 }));
		const secret = process.env.PAYMENTS_WEBHOOK_SECRET ?? 'whsec_traywise_local';
		const deliver = (base: string) =>
			fetch(`${base}/api/webhooks/payments`, {
				method: 'POST',
				headers: {
					'content-type': 'application/json',
					'stripe-signature': Stripe.webhooks.generateTestHeaderString({ payload, secret })
				},
				body: payload
			});
		const answers = await Promise.all([deliver(A), deliver(B), deliver(A), deliver(B)]);
		expect(answers.map((r) => r.status)).toEqual([200, 200, 200, 200]);
		const bodies = (await Promise.all(answers.map((r) => r.json()))) as {
			duplicate: boolean;
			outcome: string;
		}[];
		expect(bodies.filter((b) => !b.duplicate)).toEqual([
			{ received: true, duplicate: false, outcome: 'paid' }
		]);
		expect(bodies.filter((b) => b.duplicate)).toHaveLength(3);
		const events = await sequelize.query(
			`SELECT event_id FROM payment_events WHERE event_id = :eventId`,
			{
				replacements: { eventId },
				type: QueryTypes.SELECT
			}
		);
		expect(events).toHaveLength(1);
		const payments = await sequelize.query<{ status: string }>(
			`SELECT status FROM payments WHERE checkout_session_id = :sessionId`,
			{
				replacements: { sessionId },
				type: QueryTypes.SELECT
			}
		);
		expect(payments).toEqual([{ status: 'paid' }]);
	});

	// Send a quote on A, open its link and accept on B, start the deposit checkout on B, pay on the
	// provider fake's hosted page, and see the quote "deposit paid" on both processes, paid once.
	it('accepts a quote on one process and pays its deposit on the other', async () => {
		const rep = await signIn(DEMO.rep);
		const email = `two-processes-${Date.now()}@marlow-crossing.example`;
		const quoteId = await buildQuote(rep, await chosenSurvey(rep, { contactEmail: email }));
		expect((await saveWithDiscount(rep, quoteId, 5, { contactEmail: email })).status).toBe(200);
		for (const action of ['mark-ready', 'send']) expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action })).status).toBe(200);
		const [mail] = await sequelize.query<{ text: string }>(
			`SELECT text FROM mail_outbox WHERE to_address = :email AND kind = 'quote-to-customer'`,
			{ replacements: { email }, type: QueryTypes.SELECT }
		);
		const token = /\/q\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1];
		// both processes answer for one public address (A's ORIGIN), as behind a load balancer
		const onB = (p: string, form: Record<string, string>) =>
			fetch(`${B}${p}`, {
				method: 'POST',
				redirect: 'manual',
				headers: { origin: A, accept: 'text/html', 'content-type': 'application/x-www-form-urlencoded' },
				body: new URLSearchParams(form)
			});
		expect((await fetch(`${B}/q/${token}`)).status).toBe(200);
		expect((await onB(`/q/${token}?/accept`, { fullName: 'Dana Quillfeather', agree: 'on' })).status).toBe(303);
		const pay = await onB(`/q/${token}?/pay`, {});
		expect(pay.status).toBe(303);
		const checkout = pay.headers.get('location')!;
		const paid = await fetch(checkout, {
			method: 'POST',
			redirect: 'manual',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({ card_number: '4242 4242 4242 4242', expiry: '12 / 30', cvc: '123' })
		});
		expect(paid.status).toBe(303);
		await waitFor('deposit paid', async () => ((await quoteState(quoteId)) === 'deposit-paid' ? true : null), 20_000);
		for (const base of [A, B]) expect(await (await fetch(`${base}/q/${token}/paid`)).text()).toContain('Deposit received');
		const rows = await sequelize.query<{ status: string }>(`SELECT status FROM payments WHERE quote_id = :id`, {
			replacements: { id: quoteId },
			type: QueryTypes.SELECT
		});
		expect(rows).toEqual([{ status: 'paid' }]);
	});
});
