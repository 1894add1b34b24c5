/**
 * The deposit checkout: a hosted checkout session at the payment provider, created server-side
 * (from a POST action, never a load) through the one SDK client.
 */
import type Stripe from 'stripe';
import {
	countCheckoutsForRevision,
	insertOpenCheckout,
	latestCheckoutForRevision,
	markCheckoutExpired,
	paidCheckoutForRevision
} from '../repositories/payments';
import { paymentsClient } from './client';
import { isUuid } from '../uuid';

export interface DepositCheckoutInput {
	quoteId: string;
	/** the accepted quote revision: one deposit checkout per revision and amount */
	revisionId: string;
	/** integer minor units, > 0 */
	amountCents: number;
	/** ISO 4217, any case */
	currency: string;
	/** the line the customer sees at checkout, e.g. "Deposit for quote Q-2026-0042" */
	description: string;
	customerEmail?: string | null;
	/** where the provider sends the customer after paying; `{CHECKOUT_SESSION_ID}` is filled in */
	successUrl: string;
	/** where "back" leads from the checkout page */
	cancelUrl: string;
}

export type DepositCheckoutResult =
	| { status: 'open'; sessionId: string; url: string; amountCents: number; currency: string; reused: boolean }
	| { status: 'paid'; sessionId: string };

/** The provider could not be reached: nothing was created or charged; try again later. */
export class PaymentsUnavailableError extends Error {}
/** The provider refused the request (bad amount, currency, ...). */
export class PaymentsRequestError extends Error {}
/** The input was unusable; nothing was sent to the provider. */
export class InvalidCheckoutError extends Error {}

/** Keep a session this long before its expiry; closer to it, start a fresh one. */
const EXPIRY_MARGIN_MS = 5 * 60_000;

function validate(input: DepositCheckoutInput): void {
	if (!isUuid(input.quoteId) || !isUuid(input.revisionId)) throw new InvalidCheckoutError('quote and revision ids must be uuids');
	if (!Number.isSafeInteger(input.amountCents) || input.amountCents <= 0) {
		throw new InvalidCheckoutError(`the deposit must be a positive whole number of cents, got ${input.amountCents}`);
	}
	if (!/^[a-z]{3}$/i.test(input.currency)) throw new InvalidCheckoutError(`not a currency code: ${input.currency}`);
	if (!input.description.trim()) throw new InvalidCheckoutError('a checkout needs a description');
	for (const url of [input.successUrl, input.cancelUrl]) {
		const protocol = URL.canParse(url) ? new URL(url).protocol : '';
		if (protocol !== 'https:' && protocol !== 'http:') throw new InvalidCheckoutError(`not an http(s) address: ${url}`);
	}
}

function translate(err: unknown): Error {
	const e = err as { type?: string; message?: string };
	if (e?.type === 'StripeConnectionError' || e?.type === 'StripeAPIError') {
		return new PaymentsUnavailableError('The payment provider is not reachable right now. Nothing was charged; try again in a moment.');
	}
	if (typeof e?.type === 'string' && e.type.startsWith('Stripe')) {
		return new PaymentsRequestError(`The payment provider refused the checkout: ${e.message ?? e.type}`);
	}
	return err as Error;
}

function isMissing(err: unknown): boolean {
	const e = err as { type?: string; code?: string; statusCode?: number };
	return e?.type === 'StripeInvalidRequestError' && (e.code === 'resource_missing' || e.statusCode === 404);
}

/**
 * Returns a checkout for the deposit of one quote revision: the open one already made for it (a
 * double tap or a return visit gets the same session), or a new one. The SDK call carries an
 * idempotency key derived from the revision, amount and the number of earlier sessions, so two
 * simultaneous requests also end with one session. `status: 'paid'` when the revision's deposit is
 * already paid. Throws PaymentsUnavailableError / PaymentsRequestError / InvalidCheckoutError.
 */
export async function createDepositCheckout(input: DepositCheckoutInput): Promise<DepositCheckoutResult> {
	validate(input);
	const currency = input.currency.toLowerCase();
	const paid = await paidCheckoutForRevision(input.revisionId);
	if (paid) return { status: 'paid', sessionId: paid.checkoutSessionId };

	const stripe = paymentsClient();
	const latest = await latestCheckoutForRevision(input.revisionId);
	if (
		latest?.status === 'open' &&
		latest.amountCents === input.amountCents &&
		latest.currency === currency &&
		(!latest.expiresAt || Date.parse(latest.expiresAt) - Date.now() > EXPIRY_MARGIN_MS)
	) {
		try {
			const session = await stripe.checkout.sessions.retrieve(latest.checkoutSessionId);
			if (session.status === 'open' && session.url) {
				return { status: 'open', sessionId: session.id, url: session.url, amountCents: latest.amountCents, currency, reused: true };
			}
			if (session.payment_status === 'paid') return { status: 'paid', sessionId: session.id };
			await markCheckoutExpired(latest.checkoutSessionId);
		} catch (err) {
			if (!isMissing(err)) throw translate(err);
			await markCheckoutExpired(latest.checkoutSessionId);
		}
	} else if (latest?.status === 'open') {
		// a different amount, or close to expiry: that session is no longer offered
		await markCheckoutExpired(latest.checkoutSessionId);
	}

	const earlier = await countCheckoutsForRevision(input.revisionId);
	const idempotencyKey = `deposit-checkout:${input.revisionId}:${input.amountCents}:${currency}:${earlier}`;
	let session: Stripe.Checkout.Session;
	try {
		session = await stripe.checkout.sessions.create(
			{
				mode: 'payment',
				line_items: [
					{
						quantity: 1,
						price_data: { currency, unit_amount: input.amountCents, product_data: { name: input.description.trim() } }
					}
				],
				metadata: { quote_id: input.quoteId, revision_id: input.revisionId, purpose: 'deposit' },
				payment_intent_data: { metadata: { quote_id: input.quoteId, revision_id: input.revisionId } },
				success_url: input.successUrl,
				cancel_url: input.cancelUrl,
				...(input.customerEmail ? { customer_email: input.customerEmail } : {})
			},
			{ idempotencyKey }
		);
	} catch (err) {
		throw translate(err);
	}
	if (!session.url) throw new PaymentsRequestError('The payment provider returned a checkout without an address.');
	await insertOpenCheckout({
		checkoutSessionId: session.id,
		quoteId: input.quoteId,
		revisionId: input.revisionId,
		amountCents: session.amount_total ?? input.amountCents,
		currency: session.currency ?? currency,
		checkoutUrl: session.url,
		expiresAt: session.expires_at ? new Date(session.expires_at * 1000) : null,
		idempotencyKey,
		customerEmail: input.customerEmail ?? null
	});
	return {
		status: 'open',
		sessionId: session.id,
		url: session.url,
		amountCents: session.amount_total ?? input.amountCents,
		currency: session.currency ?? currency,
		reused: false
	};
}
