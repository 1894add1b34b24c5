/**
 * The words people read for a quote's states and history, shared by the staff pages, the badge and
 * the server. The stored values (`approved`, `awaiting-approval`, …) never change; only what is
 * shown does.
 *
 * One stored state has two honest names: `approved` is reached either by a manager approving
 * figures that needed it, or by the rep marking a quote within their own authority ready to send.
 * A revision in `approved` whose figures needed approval was approved by a manager (the states
 * module refuses "mark ready" on such figures); one whose figures did not was marked ready by the
 * rep, and nobody approved it.
 */

export const QUOTE_STATE_LABELS: Readonly<Record<string, string>> = {
	draft: 'Draft',
	'awaiting-approval': 'Awaiting approval',
	approved: 'Approved',
	'changes-requested': 'Changes requested',
	sent: 'Sent',
	viewed: 'Viewed',
	accepted: 'Accepted',
	'deposit-paid': 'Deposit paid',
	expired: 'Expired',
	superseded: 'Superseded'
};

/** `approved` reached by "Mark ready to send": within the rep's authority, no manager involved. */
export const READY_TO_SEND_LABEL = 'Ready to send';
/** `approved` when it is not known how it was reached (a count over many quotes). */
export const APPROVED_OR_READY_LABEL = 'Approved or ready to send';

/**
 * The label of a quote state. For `approved`, pass the revision's `approvalRequired`: true means a
 * manager approved it, false that the rep marked it ready; leave it out when unknown.
 */
export function quoteStateLabel(state: string, opts: { approvalRequired?: boolean } = {}): string {
	if (state === 'approved') {
		if (opts.approvalRequired === false) return READY_TO_SEND_LABEL;
		if (opts.approvalRequired === undefined) return APPROVED_OR_READY_LABEL;
	}
	return QUOTE_STATE_LABELS[state] ?? state;
}

/** What each recorded action is called in a quote's history. */
export const EVENT_ACTION_LABELS: Readonly<Record<string, string>> = {
	create: 'Created',
	submit: 'Submitted for approval',
	approve: 'Approved by a manager',
	'request-changes': 'Sent back for changes',
	'mark-ready': 'Marked ready to send (within the rep’s authority)',
	send: 'Sent to the customer',
	view: 'Opened by the customer',
	accept: 'Accepted by the customer',
	pay: 'Deposit received',
	expire: 'Expired',
	revise: 'Revised'
};

export interface HistoryEvent {
	action: string;
	fromState: string | null;
	toState: string;
	revision: number;
}

/**
 * Human labels for each event's from and to states, in order: `approved` is "Ready to send" when
 * that revision got there by "mark ready", and "Approved" when a manager approved it.
 */
export function historyStateLabels(events: readonly HistoryEvent[]): { from: string | null; to: string; action: string }[] {
	const readyByRep = new Map<number, boolean>();
	const label = (state: string, revision: number) => {
		const byRep = readyByRep.get(revision);
		return state === 'approved' && byRep !== undefined ? quoteStateLabel(state, { approvalRequired: !byRep }) : (QUOTE_STATE_LABELS[state] ?? state);
	};
	return events.map((e) => {
		const from = e.fromState ? label(e.fromState, e.revision) : null;
		if (e.toState === 'approved') readyByRep.set(e.revision, e.action === 'mark-ready');
		return { from, to: label(e.toState, e.revision), action: EVENT_ACTION_LABELS[e.action] ?? e.action };
	});
}
