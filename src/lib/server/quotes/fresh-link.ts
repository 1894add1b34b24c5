import { sequelize } from '../db';
import { getQuote, revisionPdf } from '../repositories/quotes';
import { getCompanySettings } from '../repositories/pricing';
import { enqueueBuiltMail } from '../email/outbox';
import { quoteToCustomer } from '../email/messages';
import { createLink, customerUrl, type ResolvedLink } from './customer-links';

/**
 * A superseded link's holder asks for the current revision: a new private link is made for the
 * latest revision and mailed to the contact on file (never to an address the requester gives).
 * Returns false when the latest revision has not been sent yet.
 */
export async function sendFreshLink(link: ResolvedLink): Promise<boolean> {
	if (!['sent', 'viewed', 'accepted', 'deposit-paid'].includes(link.latestState) || !link.contactEmail) return false;
	const found = await getQuote(link.quoteId, null);
	if (!found.ok || !found.value.revision.validUntil) return false;
	const q = found.value;
	const rev = q.revision;
	const [pdf, settings] = await Promise.all([revisionPdf(rev.id), getCompanySettings()]);
	if (!pdf) return false;
	await sequelize.transaction(async (t) => {
		const token = await createLink(q.id, rev.id, new Date(rev.validUntil!), t);
		await enqueueBuiltMail(
			'fresh-link',
			rev.contactEmail,
			quoteToCustomer({
				timeZone: settings.timeZone ?? 'UTC',
				dealerName: settings.dealerName,
				quoteNumber: rev.number,
				revision: rev.revision,
				customerName: q.customerName,
				contactName: rev.contactName || q.customerName,
				repName: q.ownerName,
				repEmail: q.ownerEmail,
				totalCents: rev.totals.totalCents,
				depositCents: rev.totals.depositCents,
				currency: settings.currency ?? 'USD',
				validUntil: rev.validUntil!,
				link: customerUrl(token),
				pdf: { filename: `${rev.number}.pdf`, content: pdf.pdf }
			}),
			{ related: { type: 'quote', id: q.id }, replyTo: q.ownerEmail },
			{ transaction: t }
		);
	});
	return true;
}
