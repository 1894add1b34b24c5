import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { Payment, PaymentEvent, type PaymentStatus } from '../db/models/delivery';

export interface PaymentRow {
	id: string;
	checkoutSessionId: string;
	quoteId: string | null;
	revisionId: string | null;
	purpose: string;
	amountCents: number;
	currency: string;
	status: PaymentStatus;
	checkoutUrl: string | null;
	expiresAt: string | null;
	paymentIntentId: string | null;
	customerEmail: string | null;
	paidAt: string | null;
	createdAt: string;
}

function toRow(p: Payment): PaymentRow {
	return {
		id: p.id,
		checkoutSessionId: p.checkoutSessionId,
		quoteId: p.quoteId,
		revisionId: p.revisionId,
		purpose: p.purpose,
		amountCents: p.amountCents,
		currency: p.currency,
		status: p.status,
		checkoutUrl: p.checkoutUrl,
		expiresAt: p.expiresAt ? p.expiresAt.toISOString() : null,
		paymentIntentId: p.paymentIntentId ?? null,
		customerEmail: p.customerEmail,
		paidAt: p.paidAt ? p.paidAt.toISOString() : null,
		createdAt: p.createdAt.toISOString()
	};
}

/** The newest checkout of a quote revision, if any. */
export async function latestCheckoutForRevision(revisionId: string): Promise<PaymentRow | null> {
	const p = await Payment.findOne({ where: { revisionId }, order: [['createdAt', 'DESC']] });
	return p ? toRow(p) : null;
}

/** A paid checkout of a quote revision, if any. */
export async function paidCheckoutForRevision(revisionId: string): Promise<PaymentRow | null> {
	const p = await Payment.findOne({ where: { revisionId, status: 'paid' } });
	return p ? toRow(p) : null;
}

export async function countCheckoutsForRevision(revisionId: string): Promise<number> {
	return Payment.count({ where: { revisionId } });
}

/** Every payment row of a quote, oldest first. */
export async function paymentsForQuote(quoteId: string): Promise<PaymentRow[]> {
	const rows = await Payment.findAll({ where: { quoteId }, order: [['createdAt', 'ASC']] });
	return rows.map(toRow);
}

export async function paymentBySession(checkoutSessionId: string): Promise<PaymentRow | null> {
	const p = await Payment.findOne({ where: { checkoutSessionId } });
	return p ? toRow(p) : null;
}

/** Records a checkout session the app created; a second call for the same session changes nothing. */
export async function insertOpenCheckout(input: {
	checkoutSessionId: string;
	quoteId: string;
	revisionId: string;
	amountCents: number;
	currency: string;
	checkoutUrl: string | null;
	expiresAt: Date | null;
	idempotencyKey: string;
	customerEmail: string | null;
}): Promise<void> {
	await sequelize.query(
		`INSERT INTO payments (checkout_session_id, quote_id, revision_id, amount_cents, currency, status, checkout_url, expires_at, idempotency_key, customer_email)
		 VALUES (:checkoutSessionId, :quoteId, :revisionId, :amountCents, :currency, 'open', :checkoutUrl, :expiresAt, :idempotencyKey, :customerEmail)
		 ON CONFLICT (checkout_session_id) DO NOTHING`,
		{ replacements: { ...input } }
	);
}

/** Marks an open checkout expired (the provider let it lapse, or no longer knows it). */
export async function markCheckoutExpired(checkoutSessionId: string, transaction?: Transaction): Promise<void> {
	await Payment.update(
		{ status: 'expired' },
		{ where: { checkoutSessionId, status: 'open' }, transaction }
	);
}

/**
 * Records a webhook event id. True the first time; false when the event was handled before
 * (a redelivery). Concurrent deliveries of one event wait on the primary key; one wins.
 */
export async function recordEventOnce(
	event: { id: string; type: string; objectId: string | null; payload: Record<string, unknown> },
	transaction: Transaction
): Promise<boolean> {
	const rows = await sequelize.query<{ event_id: string }>(
		`INSERT INTO payment_events (event_id, type, object_id, payload) VALUES (:id, :type, :objectId, CAST(:payload AS jsonb))
		 ON CONFLICT (event_id) DO NOTHING RETURNING event_id`,
		{
			type: QueryTypes.SELECT,
			transaction,
			replacements: { id: event.id, type: event.type, objectId: event.objectId, payload: JSON.stringify(event.payload) }
		}
	);
	return rows.length === 1;
}

export async function eventsForObject(objectId: string): Promise<{ eventId: string; type: string }[]> {
	const rows = await PaymentEvent.findAll({ where: { objectId }, order: [['receivedAt', 'ASC']] });
	return rows.map((e) => ({ eventId: e.eventId, type: e.type }));
}

export interface SettledCheckout {
	checkoutSessionId: string;
	quoteId: string | null;
	revisionId: string | null;
	amountCents: number;
	currency: string;
	paid: boolean;
	paymentIntentId: string | null;
	customerEmail: string | null;
	rawEvent: Record<string, unknown>;
}

/**
 * Moves a checkout to paid (or pending, when the provider still waits for the money), creating the
 * row when the app never saw the session. `firstTime` is true only for the call that turned it paid.
 */
export async function settleCheckout(
	input: SettledCheckout,
	transaction: Transaction
): Promise<{ firstTime: boolean; payment: PaymentRow }> {
	const status: PaymentStatus = input.paid ? 'paid' : 'pending';
	const replacements = {
		sessionId: input.checkoutSessionId,
		quoteId: input.quoteId,
		revisionId: input.revisionId,
		amountCents: input.amountCents,
		currency: input.currency,
		status,
		paymentIntentId: input.paymentIntentId,
		customerEmail: input.customerEmail,
		rawEvent: JSON.stringify(input.rawEvent)
	};
	// the row lock taken here serialises two different events about the same session
	const updated = await sequelize.query<{ id: string }>(
		`UPDATE payments
		 SET status = :status, amount_cents = :amountCents, currency = :currency,
		     payment_intent_id = coalesce(:paymentIntentId, payment_intent_id),
		     customer_email = coalesce(customer_email, :customerEmail),
		     quote_id = coalesce(quote_id, CAST(:quoteId AS uuid)), revision_id = coalesce(revision_id, CAST(:revisionId AS uuid)),
		     paid_at = CASE WHEN :status = 'paid' THEN now() ELSE paid_at END,
		     raw_event = CAST(:rawEvent AS jsonb), updated_at = now()
		 WHERE checkout_session_id = :sessionId AND status <> 'paid'
		 RETURNING id`,
		{ type: QueryTypes.SELECT, transaction, replacements }
	);
	let changed = updated.length === 1;
	if (!changed) {
		const inserted = await sequelize.query<{ id: string }>(
			`INSERT INTO payments (checkout_session_id, quote_id, revision_id, amount_cents, currency, status, payment_intent_id, customer_email, paid_at, raw_event)
			 VALUES (:sessionId, CAST(:quoteId AS uuid), CAST(:revisionId AS uuid), :amountCents, :currency, :status, :paymentIntentId, :customerEmail,
			         CASE WHEN :status = 'paid' THEN now() END, CAST(:rawEvent AS jsonb))
			 ON CONFLICT (checkout_session_id) DO NOTHING RETURNING id`,
			{ type: QueryTypes.SELECT, transaction, replacements }
		);
		changed = inserted.length === 1;
	}
	const row = await Payment.findOne({ where: { checkoutSessionId: input.checkoutSessionId }, transaction });
	return { firstTime: changed && input.paid, payment: toRow(row!) };
}
