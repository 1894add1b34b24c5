import { onDepositPaid } from '../payments/events';
import { getQuote } from '../repositories/quotes';
import { act } from './workflow';

/**
 * When the provider's signed webhook reports a paid deposit checkout, the quote moves to "deposit
 * paid" and the receipts are queued — in the same transaction that records the payment, once.
 * A charge that does not equal the revision's deposit to the cent is refused (the payment stays
 * recorded for a person to look at; the quote does not move).
 */
onDepositPaid(async (paid, transaction) => {
	if (!paid.quoteId || !paid.paid) return;
	const found = await getQuote(paid.quoteId, null, { transaction });
	if (!found.ok) return;
	if (found.value.revision.totals.depositCents !== paid.amountCents) {
		console.error(`[traywise] deposit for ${paid.quoteId}: charged ${paid.amountCents}, expected ${found.value.revision.totals.depositCents}`);
		return;
	}
	const done = await act(paid.quoteId, { user: null, role: 'system' }, 'pay', {
		transaction,
		revisionId: paid.revisionId ?? undefined,
		notice: { paymentReference: paid.paymentIntentId ?? paid.checkoutSessionId, amountCents: paid.amountCents }
	});
	if (!done.ok) console.error(`[traywise] deposit for ${paid.quoteId} not applied: ${done.message}`);
});
