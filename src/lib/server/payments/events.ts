/**
 * Signed events from the payment provider. Verified with the SDK's `webhooks.constructEvent`,
 * recorded once by event id, and turned into payment rows. The quote side plugs in with
 * `onDepositPaid` (runs inside the same transaction, once per paid checkout) or calls
 * `recordCheckoutCompleted` itself.
 */
import type Stripe from 'stripe';
import type { Transaction } from 'sequelize';
import { z } from 'zod';
import { sequelize } from '../db';
import { markCheckoutExpired, recordEventOnce, settleCheckout, type PaymentRow } from '../repositories/payments';
import { paymentsClient, webhookSecret } from './client';
import { isUuid } from '../uuid';
import { unstorableText } from '../storable-text';

export class WebhookSignatureError extends Error {}

/**
 * The verified event, or WebhookSignatureError for a missing or wrong signature, a stale
 * timestamp (the SDK's 300 s tolerance) or a body that is not an event.
 */
export function verifyPaymentEvent(rawBody: string, signature: string | null): Stripe.Event {
	if (!signature) throw new WebhookSignatureError('The request carries no payment provider signature.');
	let event: Stripe.Event;
	try {
		event = paymentsClient().webhooks.constructEvent(rawBody, signature, webhookSecret());
	} catch (err) {
		const e = err as { type?: string };
		throw new WebhookSignatureError(
			e?.type === 'StripeSignatureVerificationError'
				? 'The payment provider signature does not match this request.'
				: 'The signed body is not a payment provider event.'
		);
	}
	if (!understood(event)) throw new WebhookSignatureError('The signed body is not a payment provider event.');
	return event;
}

const ID = z.string().min(1).max(255);

/** The parts of an event the handlers read; a signed body without them is answered 400, not a 500. */
const EVENT_SHAPE = z.object({
	id: ID,
	type: ID,
	data: z.object({ object: z.record(z.string(), z.unknown()) })
});

const CHECKOUT_SHAPE = z.object({
	id: ID,
	amount_total: z.number().int().min(0).max(Number.MAX_SAFE_INTEGER).nullish(),
	currency: z.string().max(10).nullish(),
	payment_status: z.string().max(50).nullish(),
	payment_intent: z.union([ID, z.object({ id: ID })]).nullish(),
	customer_email: z.string().max(320).nullish(),
	customer_details: z.object({ email: z.string().max(320).nullish() }).nullish(),
	metadata: z.record(z.string(), z.unknown()).nullish()
});

function understood(event: unknown): boolean {
	const shape = EVENT_SHAPE.safeParse(event);
	if (!shape.success || unstorableText(event).length > 0) return false;
	return !shape.data.type.startsWith('checkout.session.') || CHECKOUT_SHAPE.safeParse(shape.data.data.object).success;
}

export interface CheckoutCompleted {
	/** true only for the one call that turned this checkout paid */
	firstTime: boolean;
	/** the provider says the money is in (false: an asynchronous method is still pending) */
	paid: boolean;
	paymentId: string;
	checkoutSessionId: string;
	quoteId: string | null;
	revisionId: string | null;
	/** what the provider charged, integer minor units: compare with the quote's deposit */
	amountCents: number;
	currency: string;
	paymentIntentId: string | null;
	customerEmail: string | null;
	paidAt: string | null;
	payment: PaymentRow;
}

const uuidOrNull = (v: unknown) => (typeof v === 'string' && isUuid(v) ? v : null);

/**
 * Records a `checkout.session.completed` (or `…async_payment_succeeded`) event in `payments`,
 * inside the caller's transaction. Safe to call for the same checkout any number of times.
 */
export async function recordCheckoutCompleted(event: Stripe.Event, transaction: Transaction): Promise<CheckoutCompleted> {
	if (event.type !== 'checkout.session.completed' && event.type !== 'checkout.session.async_payment_succeeded') {
		throw new Error(`not a completed checkout: ${event.type}`);
	}
	const session = event.data.object as Stripe.Checkout.Session;
	const intent = session.payment_intent;
	const { firstTime, payment } = await settleCheckout(
		{
			checkoutSessionId: session.id,
			quoteId: uuidOrNull(session.metadata?.quote_id),
			revisionId: uuidOrNull(session.metadata?.revision_id),
			amountCents: session.amount_total ?? 0,
			currency: (session.currency ?? '').toLowerCase(),
			paid: session.payment_status === 'paid',
			paymentIntentId: typeof intent === 'string' ? intent : (intent?.id ?? null),
			customerEmail: session.customer_details?.email ?? session.customer_email ?? null,
			rawEvent: event as unknown as Record<string, unknown>
		},
		transaction
	);
	return {
		firstTime,
		paid: payment.status === 'paid',
		paymentId: payment.id,
		checkoutSessionId: payment.checkoutSessionId,
		quoteId: payment.quoteId,
		revisionId: payment.revisionId,
		amountCents: payment.amountCents,
		currency: payment.currency,
		paymentIntentId: payment.paymentIntentId,
		customerEmail: payment.customerEmail,
		paidAt: payment.paidAt,
		payment
	};
}

export type DepositPaidHandler = (paid: CheckoutCompleted, transaction: Transaction) => Promise<void>;

const handlers = new Set<DepositPaidHandler>();

/**
 * Registers what happens when a deposit is paid (move the quote to "deposit paid", queue the
 * receipts). Runs once per paid checkout, inside the transaction that records the payment: if it
 * throws, nothing is recorded and the provider's redelivery tries again. Returns an unregister function.
 */
export function onDepositPaid(handler: DepositPaidHandler): () => void {
	handlers.add(handler);
	return () => handlers.delete(handler);
}

export interface HandledEvent {
	/** the event id was seen before: nothing was done this time */
	duplicate: boolean;
	outcome: 'paid' | 'pending' | 'already-paid' | 'expired' | 'ignored';
}

/** Handles one verified event in one transaction; a redelivered event id changes nothing. */
export async function handlePaymentEvent(event: Stripe.Event): Promise<HandledEvent> {
	const object = (event.data?.object ?? {}) as { id?: unknown };
	return sequelize.transaction(async (transaction) => {
		const first = await recordEventOnce(
			{
				id: event.id,
				type: event.type,
				objectId: typeof object.id === 'string' ? object.id : null,
				payload: event as unknown as Record<string, unknown>
			},
			transaction
		);
		if (!first) return { duplicate: true, outcome: 'ignored' };
		switch (event.type) {
			case 'checkout.session.completed':
			case 'checkout.session.async_payment_succeeded': {
				const result = await recordCheckoutCompleted(event, transaction);
				if (result.firstTime) for (const handler of handlers) await handler(result, transaction);
				return { duplicate: false, outcome: result.firstTime ? 'paid' : result.paid ? 'already-paid' : 'pending' };
			}
			case 'checkout.session.expired':
				await markCheckoutExpired((event.data.object as Stripe.Checkout.Session).id, transaction);
				return { duplicate: false, outcome: 'expired' };
			default:
				return { duplicate: false, outcome: 'ignored' };
		}
	});
}
