import { QueryTypes } from 'sequelize';
import { sequelize } from '../db';

export interface TrailStep {
	step: 'queued' | 'sent' | 'viewed' | 'accepted' | 'paid';
	at: string | null;
	detail?: string;
}

/**
 * The delivery trail of a quote's latest sent revision: mail queued and sent, viewed, accepted,
 * deposit paid, with times. One query.
 */
export async function deliveryTrail(quoteId: string): Promise<TrailStep[]> {
	const rows = await sequelize.query<{ to_state: string; at: Date }>(
		`SELECT to_state, min(at) AS at FROM quote_events
		 WHERE quote_id = :id AND to_state IN ('sent', 'viewed', 'accepted', 'deposit-paid')
		   AND revision_id = (SELECT id FROM quote_revisions WHERE quote_id = :id ORDER BY revision DESC LIMIT 1)
		 GROUP BY to_state`,
		{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
	);
	const at = (s: string) => {
		const r = rows.find((x) => x.to_state === s);
		return r ? new Date(r.at).toISOString() : null;
	};
	return [
		{ step: 'sent', at: at('sent') },
		{ step: 'viewed', at: at('viewed') },
		{ step: 'accepted', at: at('accepted') },
		{ step: 'paid', at: at('deposit-paid') }
	];
}
