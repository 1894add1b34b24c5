/**
 * A `checkout.session.completed` event as the payment provider sends it for a paid deposit, for the
 * webhook tests. Every id not given is fresh.
 */
import { randomUUID } from 'node:crypto';
import Stripe from 'stripe';

const fresh = (prefix: string) => `${prefix}_test_${randomUUID().replaceAll('-', '')}`;

export function checkoutCompletedEvent(
	o: { eventId?: string; sessionId?: string; quoteId?: string; amount?: number } = {}
) {
	return {
		id: o.eventId ?? fresh('evt'),
		object: 'event',
		api_version: Stripe.API_VERSION,
		created: Math.floor(Date.now() / 1000),
		livemode: false,
		pending_webhooks: 1,
		request: { id: null, idempotency_key: null },
		type: 'checkout.session.completed',
		data: {
			object: {
				id: o.sessionId ?? fresh('cs'),
				object: 'checkout.session',
				amount_total: o.amount ?? 250_000,
				currency: 'eur',
				customer_details: { email: 'dana@customer.test' },
				metadata: { quote_id: o.quoteId ?? randomUUID(), revision_id: randomUUID(), purpose: 'deposit' },
				mode: 'payment',
				payment_intent: fresh('pi'),
				payment_status: 'paid',
				status: 'complete'
			}
		}
	};
}
