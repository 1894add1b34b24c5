import { QueryTypes, type Transaction } from 'sequelize';
import { sequelize } from '../db';
import { config } from '../config';
import type { SessionUser } from '../auth/types';
import type { QuoteView } from '../repositories/quotes';
import { getCompanySettings } from '../repositories/pricing';
import { enqueueBuiltMail } from '../email/outbox';
import { acceptanceReceipt, approvalDecision, approvalRequest, depositReceipt, quoteToCustomer } from '../email/messages';
import { createLink, customerUrl } from './customer-links';
import type { QuoteAction, QuoteState } from './states';

export interface QuoteEventNotice {
	quote: QuoteView;
	action: QuoteAction;
	to: QuoteState;
	comment: string | null;
	actor: SessionUser | null;
	now: Date;
	/** the stored PDF, on send */
	pdf?: Buffer;
	/** the validity end set on send */
	validUntil?: Date;
	/** the customer's typed name, on accept */
	acceptedByName?: string;
	/** the provider's reference, on pay */
	paymentReference?: string;
	/** what was charged, on pay */
	amountCents?: number;
	/** the customer link token made on send (filled in here) */
	token?: string;
}

const staffLink = (quoteId: string) => `${config.publicUrl.replace(/\/$/, '')}/quotes/${quoteId}`;

/**
 * Queues the e-mails a transition causes, in the transition's own transaction, so a state change
 * and its mail commit together (or neither). On send it also makes the customer's private link.
 */
export async function notifyQuoteEvent(n: QuoteEventNotice, t: Transaction): Promise<void> {
	const q = n.quote;
	const rev = q.revision;
	const settings = await getCompanySettings();
	const present = { timeZone: settings.timeZone ?? 'UTC', locale: 'en-US' };
	const related = { type: 'quote', id: q.id };
	const currency = settings.currency ?? 'USD';

	switch (n.action) {
		case 'submit': {
			const managers = await sequelize.query<{ email: string; name: string }>(
				`SELECT email, name FROM users WHERE role = 'manager' AND active ORDER BY name`,
				{ type: QueryTypes.SELECT, transaction: t }
			);
			for (const m of managers) {
				await enqueueBuiltMail(
					'approval-request',
					m.email,
					approvalRequest({
						...present,
						quoteNumber: rev.number,
						customerName: q.customerName,
						repName: q.ownerName,
						managerName: m.name,
						totalCents: rev.totals.totalCents,
						currency,
						reasons: rev.approvalReasons,
						link: staffLink(q.id)
					}),
					{ related, dedupeKey: `approval-request:${rev.id}:${n.now.getTime()}:${m.email}` },
					{ transaction: t }
				);
			}
			return;
		}
		case 'approve':
		case 'request-changes': {
			await enqueueBuiltMail(
				'approval-decision',
				q.ownerEmail,
				approvalDecision({
					...present,
					quoteNumber: rev.number,
					customerName: q.customerName,
					repName: q.ownerName,
					managerName: n.actor?.name ?? 'A sales manager',
					decision: n.action === 'approve' ? 'approved' : 'changes-requested',
					comment: n.comment,
					link: staffLink(q.id)
				}),
				{ related, dedupeKey: `approval-decision:${rev.id}:${n.now.getTime()}` },
				{ transaction: t }
			);
			return;
		}
		case 'send': {
			const token = await createLink(q.id, rev.id, n.validUntil!, t);
			n.token = token;
			await enqueueBuiltMail(
				'quote-to-customer',
				rev.contactEmail,
				quoteToCustomer({
					...present,
					dealerName: settings.dealerName,
					quoteNumber: rev.number,
					revision: rev.revision,
					customerName: q.customerName,
					contactName: rev.contactName || q.customerName,
					repName: q.ownerName,
					repEmail: q.ownerEmail,
					totalCents: rev.totals.totalCents,
					depositCents: rev.totals.depositCents,
					currency,
					validUntil: n.validUntil!.toISOString(),
					link: customerUrl(token),
					pdf: { filename: `${rev.number}.pdf`, content: n.pdf! }
				}),
				{ related, replyTo: q.ownerEmail, dedupeKey: `quote-to-customer:${rev.id}` },
				{ transaction: t }
			);
			return;
		}
		case 'accept': {
			const base = {
				...present,
				dealerName: settings.dealerName,
				quoteNumber: rev.number,
				customerName: q.customerName,
				acceptedByName: n.acceptedByName ?? rev.contactName,
				acceptedAt: n.now,
				totalCents: rev.totals.totalCents,
				depositCents: rev.totals.depositCents,
				currency,
				repName: q.ownerName
			};
			if (rev.contactEmail) {
				await enqueueBuiltMail(
					'acceptance-receipt',
					rev.contactEmail,
					acceptanceReceipt({ ...base, audience: 'customer', recipientName: rev.contactName || q.customerName, link: n.token ? customerUrl(n.token) : staffLink(q.id) }),
					{ related, dedupeKey: `acceptance-customer:${rev.id}` },
					{ transaction: t }
				);
			}
			await enqueueBuiltMail(
				'acceptance-receipt',
				q.ownerEmail,
				acceptanceReceipt({ ...base, audience: 'rep', recipientName: q.ownerName, link: staffLink(q.id) }),
				{ related, dedupeKey: `acceptance-rep:${rev.id}` },
				{ transaction: t }
			);
			return;
		}
		case 'pay': {
			const base = {
				...present,
				dealerName: settings.dealerName,
				quoteNumber: rev.number,
				customerName: q.customerName,
				amountCents: n.amountCents ?? rev.totals.depositCents,
				currency,
				paidAt: n.now,
				paymentReference: n.paymentReference ?? '',
				repName: q.ownerName
			};
			if (rev.contactEmail) {
				await enqueueBuiltMail(
					'deposit-receipt',
					rev.contactEmail,
					depositReceipt({ ...base, audience: 'customer', recipientName: rev.contactName || q.customerName, link: staffLink(q.id).replace(/\/quotes\/.*/, '/') }),
					{ related, dedupeKey: `deposit-customer:${rev.id}` },
					{ transaction: t }
				);
			}
			await enqueueBuiltMail(
				'deposit-receipt',
				q.ownerEmail,
				depositReceipt({ ...base, audience: 'rep', recipientName: q.ownerName, link: staffLink(q.id) }),
				{ related, dedupeKey: `deposit-rep:${rev.id}` },
				{ transaction: t }
			);
			return;
		}
		default:
			return;
	}
}
