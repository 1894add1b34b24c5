import { fail, redirect } from '@sveltejs/kit';
import { z } from 'zod';
import { sequelize } from '$lib/server/db';
import { config } from '$lib/server/config';
import { act } from '$lib/server/quotes/workflow';
import { checkLink, customerSafe, openLink } from '$lib/server/quotes/customer-view';
import { acceptanceOf, recordAcceptance, resolveLink } from '$lib/server/quotes/customer-links';
import { sendFreshLink } from '$lib/server/quotes/fresh-link';
import { getCompanySettings } from '$lib/server/repositories/pricing';
import { revisionPdf, withQuoteLock } from '$lib/server/repositories/quotes';
import { createDepositCheckout, PaymentsRequestError, PaymentsUnavailableError } from '$lib/server/payments/checkout';
import type { Actions, PageServerLoad } from './$types';

const acceptSchema = z.object({
	fullName: z
		.string()
		.trim()
		.min(2, 'Type your full name as it should appear on the acceptance.')
		.max(120, 'Keep the name under 120 characters.')
		// one line of plain text (the database layer would store a NUL as the two characters "\0")
		// eslint-disable-next-line no-control-regex
		.refine((v) => !/[\u0000-\u001f\u007f]/.test(v), 'Type your name as plain text.'),
	agree: z.literal('on', { error: 'Tick the box to agree to the terms.' })
});

/** The customer's page: the quote as the PDF shows it, the PDF, acceptance and the deposit. No account. */
export const load: PageServerLoad = async ({ params, setHeaders }) => {
	const { link, quote } = await openLink(params.token);
	setHeaders({ 'cache-control': 'private, no-store', 'x-robots-tag': 'noindex' });
	const [settings, acceptance] = await Promise.all([getCompanySettings(), acceptanceOf(link.revisionId)]);
	return {
		quote: customerSafe(quote),
		acceptance,
		dealer: { name: settings.dealerName, address: settings.address, phone: settings.phone, email: settings.email },
		currency: settings.currency ?? 'USD',
		timeZone: settings.timeZone || 'UTC'
	};
};

export const actions: Actions = {
	accept: async ({ params, request, getClientAddress }) => {
		const link = await checkLink(params.token);
		const form = Object.fromEntries(await request.formData());
		const parsed = acceptSchema.safeParse(form);
		if (!parsed.success) {
			const errors = z.flattenError(parsed.error).fieldErrors;
			return fail(400, { fullName: typeof form.fullName === 'string' ? form.fullName.slice(0, 120) : '', errors });
		}
		const stored = await revisionPdf(link.revisionId);
		const outcome = await withQuoteLock(async (t) => {
			const done = await act(link.quoteId, { user: null, role: 'customer' }, 'accept', {
				transaction: t,
				revisionId: link.revisionId,
				notice: { acceptedByName: parsed.data.fullName }
			});
			if (done.ok && done.value.changed) {
				await recordAcceptance(
					{
						quoteId: link.quoteId,
						revisionId: link.revisionId,
						fullName: parsed.data.fullName,
						ip: getClientAddress(),
						userAgent: (request.headers.get('user-agent') ?? '').slice(0, 300),
						pdfSha256: stored?.sha256 ?? ''
					},
					t
				);
			}
			return done;
		});
		if (!outcome.ok) return fail(409, { fullName: parsed.data.fullName, errors: { form: [outcome.message] } });
		// straight to the deposit step, which follows the acceptance (the page focuses it too)
		redirect(303, `/q/${params.token}?accepted=1#deposit`);
	},
	pay: async ({ params }) => {
		const { link, quote } = await openLink(params.token);
		if (quote.revision.state === 'deposit-paid') redirect(303, `/q/${params.token}/paid`);
		if (quote.revision.state !== 'accepted') return fail(409, { payError: 'Accept the quote first; the deposit follows.' });
		const base = config.publicUrl.replace(/\/$/, '');
		const settings = await getCompanySettings();
		let checkout;
		try {
			checkout = await createDepositCheckout({
				quoteId: link.quoteId,
				revisionId: link.revisionId,
				amountCents: quote.revision.totals.depositCents,
				currency: settings.currency ?? 'USD',
				description: `Deposit for quote ${quote.revision.number}`,
				customerEmail: quote.revision.contactEmail || null,
				successUrl: `${base}/q/${params.token}/paid?session={CHECKOUT_SESSION_ID}`,
				// back without paying: the page says the deposit is still due, at the deposit step
				cancelUrl: `${base}/q/${params.token}?payment=cancelled#deposit`
			});
		} catch (err) {
			if (err instanceof PaymentsUnavailableError || err instanceof PaymentsRequestError) {
				return fail(503, { payError: 'The payment service is not answering right now. Nothing was charged; please try again in a few minutes.' });
			}
			throw err;
		}
		if (checkout.status === 'paid') redirect(303, `/q/${params.token}/paid`);
		redirect(303, checkout.url);
	},
	fresh: async ({ params }) => {
		const link = await resolveLink(params.token);
		if (!link) return fail(404, { freshError: 'This link is not valid.' });
		if (link.revision >= link.latestRevision) return fail(400, { freshError: 'This link already shows the latest revision.' });
		const sent = await sendFreshLink(link);
		if (!sent) return fail(409, { freshError: 'The newer revision is not ready yet; your sales contact will send it.' });
		return { freshSent: true };
	}
};
