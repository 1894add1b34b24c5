import { json } from '@sveltejs/kit';
import '$lib/server/quotes/deposit';
import { WebhookSignatureError, handlePaymentEvent, verifyPaymentEvent } from '$lib/server/payments/events';
import type { RequestHandler } from './$types';

/**
 * Signed events from the payment provider (or the local fake). No session: the signature over the
 * raw body is the guard. 400 with nothing changed on a missing or bad signature; 200 for an event
 * handled now or before (a redelivery).
 */
export const POST: RequestHandler = async ({ request }) => {
	const rawBody = await request.text();
	let event;
	try {
		event = verifyPaymentEvent(rawBody, request.headers.get('stripe-signature'));
	} catch (err) {
		if (err instanceof WebhookSignatureError) return json({ message: err.message }, { status: 400 });
		throw err;
	}
	const handled = await handlePaymentEvent(event);
	return json({ received: true, ...handled });
};
