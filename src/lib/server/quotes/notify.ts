import type { Transaction } from 'sequelize';
import type { SessionUser } from '../auth/types';
import type { QuoteView } from '../repositories/quotes';
import type { QuoteAction, QuoteState } from './states';

export interface QuoteEventNotice {
	quote: QuoteView;
	action: QuoteAction;
	to: QuoteState;
	comment: string | null;
	actor: SessionUser | null;
	now: Date;
}

/**
 * Queues the e-mails a transition causes, in the transition's own transaction (so a state change
 * and its mail commit together). Filled in by the delivery module.
 */
export async function notifyQuoteEvent(notice: QuoteEventNotice, t: Transaction): Promise<void> {
	void notice;
	void t;
}
