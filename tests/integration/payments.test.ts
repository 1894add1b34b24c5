import { randomUUID } from 'node:crypto';
import Stripe from 'stripe';
import { afterAll, describe, expect, it } from 'vitest';
import { sequelize } from '$lib/server/db';
import { Payment, PaymentEvent } from '$lib/server/db/models/delivery';
import { createDepositCheckout, InvalidCheckoutError, type DepositCheckoutInput } from '$lib/server/payments/checkout';
import { paymentsClient } from '$lib/server/payments/client';
import { handlePaymentEvent, onDepositPaid, recordCheckoutCompleted } from '$lib/server/payments/events';
import { BASE } from '../helpers/http';
import { sleep, waitFor } from '../helpers/services';
import { checkoutCompletedEvent } from '../helpers/payment-events';

const SECRET = process.env.PAYMENTS_WEBHOOK_SECRET ?? 'whsec_traywise_local';
const WEBHOOK = `${BASE}/api/webhooks/payments`;

afterAll(async () => {
	await sequelize.close();
});


function post(payload: string, signature?: string) {
	return fetch(WEBHOOK, {
		method: 'POST',
		headers: { 'content-type': 'application/json', ...(signature ? { 'stripe-signature': signature } : {}) },
		body: payload
	});
}

const sign = (payload: string, secret = SECRET, timestamp?: number) =>
	Stripe.webhooks.generateTestHeaderString({ payload, secret, ...(timestamp ? { timestamp } : {}) });

function checkoutInput(overrides: Partial<DepositCheckoutInput> = {}): DepositCheckoutInput {
	return {
		quoteId: randomUUID(),
		revisionId: randomUUID(),
		amountCents: 962_471,
		currency: 'EUR',
		description: 'Deposit for quote Q-2026-0042',
		customerEmail: 'dana@customer.test',
		successUrl: `${BASE}/q/token/paid?session={CHECKOUT_SESSION_ID}`,
		cancelUrl: `${BASE}/q/token`,
		...overrides
	};
}

/** Submits the fake's hosted checkout form as a browser without JavaScript would. */
async function payOnHostedPage(url: string, cardNumber: string) {
	const page = await fetch(url);
	expect(page.status).toBe(200);
	const html = await page.text();
	const action = /<form[^>]*method="post"[^>]*action="([^"]+)"/.exec(html)?.[1];
	expect(action).toBeTruthy();
	return fetch(new URL(action!, url), {
		method: 'POST',
		redirect: 'manual',
		headers: { 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams({ card_number: cardNumber, expiry: '12 / 34', cvc: '123' })
	});
}

describe('payment webhook', () => {
	it('refuses a bad signature with a JSON 400 and records nothing', async () => {
		const event = checkoutCompletedEvent();
		const payload = JSON.stringify(event);
		for (const signature of [sign(payload, 'whsec_someone_else'), 't=1,v1=deadbeef', undefined]) {
			const res = await post(payload, signature);
			expect(res.status).toBe(400);
			expect(res.headers.get('content-type')).toContain('application/json');
			expect((await res.json()).message).toMatch(/signature/);
		}
		// a correctly signed header for a different body does not match either
		const tampered = await post(JSON.stringify({ ...event, type: 'checkout.session.expired' }), sign(payload));
		expect(tampered.status).toBe(400);
		expect(await PaymentEvent.count({ where: { eventId: event.id } })).toBe(0);
		expect(await Payment.count({ where: { checkoutSessionId: event.data.object.id } })).toBe(0);
	});

	it('refuses a signature older than the tolerance (a replayed request)', async () => {
		const event = checkoutCompletedEvent();
		const payload = JSON.stringify(event);
		const res = await post(payload, sign(payload, SECRET, Math.floor(Date.now() / 1000) - 3600));
		expect(res.status).toBe(400);
		expect(await Payment.count({ where: { checkoutSessionId: event.data.object.id } })).toBe(0);
	});

	it('records one payment when the same signed event arrives five times, two of them at once', async () => {
		const quoteId = randomUUID();
		const event = checkoutCompletedEvent({ quoteId, amount: 123_457 });
		const payload = JSON.stringify(event);
		const first = await post(payload, sign(payload));
		expect(first.status).toBe(200);
		expect(await first.json()).toMatchObject({ received: true, duplicate: false, outcome: 'paid' });
		const again = [await post(payload, sign(payload)), await post(payload, sign(payload))];
		again.push(...(await Promise.all([post(payload, sign(payload)), post(payload, sign(payload))])));
		for (const res of again) {
			expect(res.status).toBe(200);
			expect(await res.json()).toMatchObject({ duplicate: true });
		}
		const payments = await Payment.findAll({ where: { checkoutSessionId: event.data.object.id } });
		expect(payments).toHaveLength(1);
		expect(payments[0]).toMatchObject({ status: 'paid', amountCents: 123_457, currency: 'eur', quoteId });
		expect(payments[0].paidAt).not.toBeNull();
		expect(await PaymentEvent.count({ where: { eventId: event.id } })).toBe(1);
	});

	it('records one payment when five deliveries of one event arrive at the same moment', async () => {
		const event = checkoutCompletedEvent({ amount: 777_777 });
		const payload = JSON.stringify(event);
		const responses = await Promise.all(Array.from({ length: 5 }, () => post(payload, sign(payload))));
		const bodies = await Promise.all(responses.map((r) => r.json()));
		expect(responses.map((r) => r.status)).toEqual([200, 200, 200, 200, 200]);
		expect(bodies.filter((b) => b.duplicate === false)).toHaveLength(1);
		expect(await Payment.count({ where: { checkoutSessionId: event.data.object.id } })).toBe(1);
		expect(await PaymentEvent.count({ where: { eventId: event.id } })).toBe(1);
	});

	it('answers a signed event of another type with 200 and records no payment', async () => {
		const event = { ...checkoutCompletedEvent(), type: 'customer.created' };
		const payload = JSON.stringify(event);
		const res = await post(payload, sign(payload));
		expect(res.status).toBe(200);
		expect(await res.json()).toMatchObject({ outcome: 'ignored' });
		expect(await Payment.count({ where: { checkoutSessionId: event.data.object.id } })).toBe(0);
	});
});

describe('the deposit-paid hook (in this process, against the real database)', () => {
	it('runs once per paid checkout, inside the transaction; a failing handler records nothing', async () => {
		const calls: string[] = [];
		let fail = true;
		const off = onDepositPaid(async (paid) => {
			if (fail) throw new Error('quote update failed');
			calls.push(`${paid.quoteId}:${paid.amountCents}`);
		});
		try {
			const quoteId = randomUUID();
			const event = checkoutCompletedEvent({ quoteId, amount: 50_001 }) as unknown as Stripe.Event;
			await expect(handlePaymentEvent(event)).rejects.toThrow('quote update failed');
			expect(await PaymentEvent.count({ where: { eventId: event.id } })).toBe(0);
			expect(await Payment.count({ where: { quoteId } })).toBe(0);

			fail = false;
			expect(await handlePaymentEvent(event)).toEqual({ duplicate: false, outcome: 'paid' });
			expect(await handlePaymentEvent(event)).toEqual({ duplicate: true, outcome: 'ignored' });
			// another event about the same checkout (a different id) finds it paid already
			const other = { ...event, id: `evt_test_${randomUUID()}` } as Stripe.Event;
			expect(await handlePaymentEvent(other)).toEqual({ duplicate: false, outcome: 'already-paid' });
			expect(calls).toEqual([`${quoteId}:50001`]);
		} finally {
			off();
		}
	});

	it('recordCheckoutCompleted says firstTime only once', async () => {
		const event = checkoutCompletedEvent() as unknown as Stripe.Event;
		const first = await sequelize.transaction((t) => recordCheckoutCompleted(event, t));
		const second = await sequelize.transaction((t) => recordCheckoutCompleted(event, t));
		expect(first).toMatchObject({ firstTime: true, paid: true, amountCents: 250_000 });
		expect(second).toMatchObject({ firstTime: false, paid: true, paymentId: first.paymentId });
	});
});

describe('deposit checkout through the real SDK against the local fake', () => {
	it('creates a session for the exact amount in cents; a double tap gets the same session', async () => {
		const input = checkoutInput({ amountCents: 962_471 });
		const [a, b] = await Promise.all([createDepositCheckout(input), createDepositCheckout(input)]);
		expect(a.status).toBe('open');
		expect(b).toMatchObject({ status: 'open', sessionId: a.sessionId });
		if (a.status !== 'open') throw new Error('unreachable');
		expect(a.amountCents).toBe(962_471);
		expect(a.url).toMatch(new RegExp(`^http://127\\.0\\.0\\.1:${process.env.PAYMENTS_API_PORT}/pay/cs_test_`));

		const session = await paymentsClient().checkout.sessions.retrieve(a.sessionId);
		expect(session).toMatchObject({ amount_total: 962_471, currency: 'eur', payment_status: 'unpaid', status: 'open' });
		expect(session.metadata).toMatchObject({ quote_id: input.quoteId, revision_id: input.revisionId });

		const rows = await Payment.findAll({ where: { revisionId: input.revisionId } });
		expect(rows).toHaveLength(1);
		expect(rows[0]).toMatchObject({ status: 'open', amountCents: 962_471, checkoutSessionId: a.sessionId });
		// a later visit reuses the open session
		expect(await createDepositCheckout(input)).toMatchObject({ sessionId: a.sessionId, reused: true });
	});

	it('refuses fractional or negative cents and odd currencies before calling the provider', async () => {
		for (const bad of [{ amountCents: 10.5 }, { amountCents: -1 }, { amountCents: 0 }, { currency: 'euro' }, { successUrl: 'javascript:x' }]) {
			await expect(createDepositCheckout(checkoutInput(bad))).rejects.toThrow(InvalidCheckoutError);
		}
	});

	it('declines 4000 0000 0000 0002 with a clear message, posts no event, and lets the customer try again with 4242', async () => {
		const input = checkoutInput({ amountCents: 100_000 });
		const checkout = await createDepositCheckout(input);
		if (checkout.status !== 'open') throw new Error('expected an open checkout');

		const declined = await payOnHostedPage(checkout.url, '4000 0000 0000 0002');
		expect(declined.status).toBe(402);
		const page = await declined.text();
		expect(page).toContain('role="alert"');
		expect(page).toContain('The card was declined. No money was taken.');
		expect(page).toContain(`href="${input.cancelUrl}"`); // the way back to the quote

		const funds = await payOnHostedPage(checkout.url, '4000 0000 0000 9995');
		expect(await funds.text()).toContain('does not have enough funds');

		await sleep(1_000);
		expect(await PaymentEvent.count({ where: { objectId: checkout.sessionId } })).toBe(0);
		expect((await Payment.findOne({ where: { checkoutSessionId: checkout.sessionId } }))!.status).toBe('open');
		expect(await paymentsClient().checkout.sessions.retrieve(checkout.sessionId)).toMatchObject({ payment_status: 'unpaid' });

		const paid = await payOnHostedPage(checkout.url, '4242 4242 4242 4242');
		expect(paid.status).toBe(303);
		await waitFor('payment recorded', async () => (await Payment.findOne({ where: { checkoutSessionId: checkout.sessionId } }))?.status === 'paid');
	});

	it('paying with 4242 4242 4242 4242 redirects to the success page and posts a webhook the app verifies', async () => {
		const input = checkoutInput({ amountCents: 481_235 });
		const checkout = await createDepositCheckout(input);
		if (checkout.status !== 'open') throw new Error('expected an open checkout');

		const res = await payOnHostedPage(checkout.url, '4242 4242 4242 4242');
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(`${BASE}/q/token/paid?session=${checkout.sessionId}`);

		// only the app's webhook route writes these rows, and only after verifying the signature
		const payment = await waitFor('the verified webhook', async () => {
			const p = await Payment.findOne({ where: { checkoutSessionId: checkout.sessionId } });
			return p?.status === 'paid' ? p : null;
		});
		expect(payment).toMatchObject({ amountCents: 481_235, currency: 'eur', quoteId: input.quoteId, revisionId: input.revisionId });
		const events = await PaymentEvent.findAll({ where: { objectId: checkout.sessionId } });
		expect(events.map((e) => e.type)).toEqual(['checkout.session.completed']);

		const session = await paymentsClient().checkout.sessions.retrieve(checkout.sessionId);
		expect(session).toMatchObject({ payment_status: 'paid', status: 'complete', amount_total: 481_235 });
		const intent = await paymentsClient().paymentIntents.retrieve(session.payment_intent as string);
		expect(intent).toMatchObject({ amount: 481_235, currency: 'eur', status: 'succeeded' });
		expect(payment.paymentIntentId).toBe(intent.id);

		// the deposit of that revision is paid: no second checkout
		expect(await createDepositCheckout(input)).toEqual({ status: 'paid', sessionId: checkout.sessionId });
		// paying again on the same page just returns to the success page, with no second event
		const again = await fetch(checkout.url, { redirect: 'manual' });
		expect(again.status).toBe(303);
		await sleep(500);
		expect(await PaymentEvent.count({ where: { objectId: checkout.sessionId } })).toBe(1);
	});
});
