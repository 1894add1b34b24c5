import { QueryTypes } from 'sequelize';
import { sequelize } from '../db';

export interface TrailStep {
	step: 'queued' | 'e-mailed' | 'viewed' | 'accepted' | 'paid';
	at: string | null;
	detail?: string;
}

/**
 * The delivery trail of a quote's latest revision: the customer e-mail queued and handed to the
 * mail relay, then viewed, accepted and deposit paid, with times. Two queries.
 */
export async function deliveryTrail(quoteId: string): Promise<TrailStep[]> {
	const [events, mail] = await Promise.all([
		sequelize.query<{ to_state: string; at: Date }>(
			`SELECT to_state, min(at) AS at FROM quote_events
			 WHERE quote_id = :id AND to_state IN ('viewed', 'accepted', 'deposit-paid')
			   AND revision_id = (SELECT id FROM quote_revisions WHERE quote_id = :id ORDER BY revision DESC LIMIT 1)
			 GROUP BY to_state`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		),
		sequelize.query<{ status: string; created_at: Date; sent_at: Date | null; attempts: number; last_error: string | null }>(
			`SELECT status, created_at, sent_at, attempts, last_error FROM mail_outbox
			 WHERE related_type = 'quote' AND related_id = :id AND kind IN ('quote-to-customer', 'fresh-link')
			 ORDER BY created_at DESC LIMIT 1`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		)
	]);
	const at = (s: string) => {
		const r = events.find((x) => x.to_state === s);
		return r ? new Date(r.at).toISOString() : null;
	};
	const m = mail[0];
	return [
		{ step: 'queued', at: m ? new Date(m.created_at).toISOString() : null, detail: m && m.status !== 'sent' ? (m.status === 'failed' ? `failed: ${m.last_error ?? ''}` : `waiting for the mail relay (${m.attempts} tries)`) : undefined },
		{ step: 'e-mailed', at: m?.sent_at ? new Date(m.sent_at).toISOString() : null },
		{ step: 'viewed', at: at('viewed') },
		{ step: 'accepted', at: at('accepted') },
		{ step: 'paid', at: at('deposit-paid') }
	];
}
