/**
 * The quote's life: every state, every action, who may take it, and the one function that decides.
 * Pure: pages, JSON routes, the payment webhook and the expiry job all call `transition` and store
 * the record it returns; none of them decides on its own.
 *
 *   draft ──submit──▶ awaiting-approval ──approve──▶ approved ──send──▶ sent ──view──▶ viewed
 *     │  ◀─(edit in place)─ changes-requested ◀─request-changes─┘        │               │
 *     └──mark-ready (no approval needed)──▶ approved                    └────accept─────┴─▶ accepted
 *                                                                              ──pay──▶ deposit-paid
 *   submit and mark-ready also need the quote's contact name, a valid contact e-mail and a tax
 *   decision (`context.missing`, from `$lib/quote-readiness`): an approved quote must be sendable.
 *   `approved` reached by mark-ready is shown as "Ready to send" (`$lib/quote-labels`).
 *   expire: draft … viewed, once the validity date has passed → expired
 *   revise: approved, sent, viewed, expired → superseded, and revision n + 1 starts as a draft
 *
 * Which states may be revised, and why:
 * - sent, viewed: the customer holds (or may hold) the document; it must stay exactly as sent, so a
 *   change is a new revision and the old one is kept, superseded.
 * - approved: the manager approved these exact figures (or the rule cleared them); changing them in
 *   place would carry the approval over to figures nobody approved. A revision keeps the record and
 *   sends the new figures through the approval rule again.
 * - expired: re-quoting an expired quote (new prices, new validity) is the usual way back.
 * - draft, changes-requested: nobody outside the dealer has seen or approved them; they are edited in
 *   place, and a revision would only clutter the history.
 * - awaiting-approval: a manager is deciding; the rep waits or the manager sends it back.
 * - accepted, deposit-paid: the customer has agreed to these figures; they can no longer change.
 * - superseded: only the latest revision is revised.
 *
 * Validity: a quote is past validity when `now` is strictly later than `validUntil` (numbering.ts
 * gives the last millisecond of the last valid day). Past validity the customer can no longer view
 * or accept it, and the system may expire it. Staff actions ignore the date: sending sets a new one.
 */
import type { Role } from '../auth/types';
import { QUOTE_STATE_LABELS } from '../../quote-labels';

export const QUOTE_STATES = [
	'draft',
	'awaiting-approval',
	'approved',
	'changes-requested',
	'sent',
	'viewed',
	'accepted',
	'deposit-paid',
	'expired',
	'superseded'
] as const;
export type QuoteState = (typeof QUOTE_STATES)[number];

export const QUOTE_ACTIONS = [
	'submit',
	'approve',
	'request-changes',
	'mark-ready',
	'send',
	'view',
	'accept',
	'pay',
	'expire',
	'revise'
] as const;
export type QuoteAction = (typeof QUOTE_ACTIONS)[number];

/** Who acts: a signed-in staff role, the customer through their private link, or the system. */
export type ActorRole = Role | 'customer' | 'system';
export const ACTOR_ROLES: readonly ActorRole[] = ['rep', 'manager', 'admin', 'customer', 'system'];

/** The state a new revision starts in. */
export const REVISION_START_STATE: QuoteState = 'draft';

/**
 * Names for the UI (from `$lib/quote-labels`, which the pages share). `approved` is also reached by
 * "mark ready" without a manager: `quoteStateLabel` there names that case "Ready to send".
 */
export const STATE_LABELS = Object.fromEntries(QUOTE_STATES.map((s) => [s, QUOTE_STATE_LABELS[s]])) as Record<QuoteState, string>;

/** Button and history labels for the UI. */
export const ACTION_LABELS: Record<QuoteAction, string> = {
	submit: 'Submit for approval',
	approve: 'Approve',
	'request-changes': 'Send back for changes',
	'mark-ready': 'Mark ready to send',
	send: 'Send to customer',
	view: 'Opened by customer',
	accept: 'Accept',
	pay: 'Deposit received',
	expire: 'Expire',
	revise: 'Revise'
};

export interface TransitionContext {
	/** the approval rule's verdict on the quote's current figures (approval.ts) */
	approvalRequired: boolean;
	now: Date;
	/** last instant the quote is valid (numbering.ts `validUntil`) */
	validUntil: Date;
	/** why; required to send a quote back for changes, stored with any action that has one */
	comment?: string;
	/**
	 * What the quote still lacks before it leaves the rep's hands (contact, e-mail, a tax decision;
	 * `$lib/quote-readiness`): when not empty, submit and mark-ready are refused with these sentences.
	 */
	missing?: readonly string[];
}

/** What to store for a transition; the caller adds the user's id. */
export interface TransitionRecord {
	from: QuoteState;
	to: QuoteState;
	action: QuoteAction;
	byRole: ActorRole;
	/** trimmed; null when none was given */
	comment: string | null;
	at: Date;
}

export type TransitionResult =
	| {
			ok: true;
			to: QuoteState;
			/** null when nothing changed (a second view, a repeated payment notice): store nothing */
			record: TransitionRecord | null;
			/** true for `revise`: the caller starts revision n + 1 in REVISION_START_STATE */
			startsNewRevision: boolean;
	  }
	| { ok: false; message: string };

interface ActionRule {
	roles: readonly ActorRole[];
	from: readonly QuoteState[];
	to: QuoteState;
	/** a state in which the action is accepted but changes nothing */
	noOpIn?: QuoteState;
	roleMessage: string;
	/** past participle for the generic refusal, "cannot be …" */
	done: string;
}

const STAFF: readonly ActorRole[] = ['rep', 'manager'];

const RULES: Record<QuoteAction, ActionRule> = {
	submit: {
		roles: STAFF,
		from: ['draft', 'changes-requested'],
		to: 'awaiting-approval',
		roleMessage: 'Only a sales rep or sales manager can submit a quote for approval.',
		done: 'submitted for approval'
	},
	approve: {
		roles: ['manager'],
		from: ['awaiting-approval'],
		to: 'approved',
		roleMessage: 'Only a sales manager can approve a quote.',
		done: 'approved'
	},
	'request-changes': {
		roles: ['manager'],
		from: ['awaiting-approval'],
		to: 'changes-requested',
		roleMessage: 'Only a sales manager can send a quote back for changes.',
		done: 'sent back for changes'
	},
	'mark-ready': {
		roles: STAFF,
		from: ['draft', 'changes-requested'],
		to: 'approved',
		roleMessage: 'Only a sales rep or sales manager can mark a quote ready to send.',
		done: 'marked ready to send'
	},
	send: {
		roles: STAFF,
		from: ['approved'],
		to: 'sent',
		roleMessage: 'Only a sales rep or sales manager can send a quote.',
		done: 'sent'
	},
	view: {
		roles: ['customer'],
		from: ['sent', 'viewed'],
		to: 'viewed',
		noOpIn: 'viewed',
		roleMessage: 'Only the customer opening the quote marks it as viewed.',
		done: 'marked as viewed'
	},
	accept: {
		roles: ['customer'],
		from: ['sent', 'viewed'],
		to: 'accepted',
		roleMessage: 'Only the customer can accept a quote.',
		done: 'accepted'
	},
	pay: {
		roles: ['system'],
		from: ['accepted', 'deposit-paid'],
		to: 'deposit-paid',
		noOpIn: 'deposit-paid',
		roleMessage: 'Only the payment system can mark a deposit as paid.',
		done: 'marked as paid'
	},
	expire: {
		roles: ['system'],
		from: ['draft', 'awaiting-approval', 'approved', 'changes-requested', 'sent', 'viewed'],
		to: 'expired',
		roleMessage: 'Only the system expires a quote, when its validity ends.',
		done: 'expired'
	},
	revise: {
		roles: STAFF,
		from: ['approved', 'sent', 'viewed', 'expired'],
		to: 'superseded',
		roleMessage: 'Only a sales rep or sales manager can revise a quote.',
		done: 'revised'
	}
};

const STATE_PHRASES: Record<QuoteState, string> = {
	draft: 'is still a draft',
	'awaiting-approval': "is waiting for a manager's approval",
	approved: 'is ready to send',
	'changes-requested': 'was sent back for changes',
	sent: 'has been sent to the customer',
	viewed: 'has been opened by the customer',
	accepted: 'has been accepted by the customer',
	'deposit-paid': 'has been accepted and its deposit paid',
	expired: 'has expired',
	superseded: 'has been replaced by a newer revision'
};

/** True when `now` is strictly after `validUntil`. */
export function isPastValidity(now: Date, validUntil: Date): boolean {
	return now.getTime() > validUntil.getTime();
}

const NEEDS_APPROVAL_TO_SEND = "This quote needs a manager's approval before it can be sent.";
const VALIDITY_ENDED = "This quote's validity has ended; ask your sales rep for a new revision.";
const NOT_SENT_YET = 'This quote has not been sent yet.';
const ALREADY_ACCEPTED = 'This quote has already been accepted.';

/** The message for an action whose role is right but whose from-state is not. */
function stateRefusal(action: QuoteAction, state: QuoteState, context: TransitionContext): string {
	if (state === 'superseded') {
		return action === 'revise'
			? 'Only the latest revision can be revised.'
			: 'This revision has been replaced by a newer one; open the latest revision.';
	}
	switch (action) {
		case 'submit':
			if (state === 'awaiting-approval')
				return "This quote is already waiting for a manager's approval.";
			if (state === 'approved') return 'This quote is already approved.';
			break;
		case 'approve':
		case 'request-changes':
			if (state === 'draft' || state === 'changes-requested')
				return 'This quote has not been submitted for approval.';
			if (action === 'approve' && state === 'approved') return 'This quote is already approved.';
			break;
		case 'mark-ready':
			if (state === 'approved') return 'This quote is already ready to send.';
			if (state === 'awaiting-approval')
				return "This quote is waiting for a manager's approval and cannot be marked ready.";
			break;
		case 'send':
			if (state === 'awaiting-approval') return NEEDS_APPROVAL_TO_SEND;
			if (state === 'draft' || state === 'changes-requested') {
				return context.approvalRequired
					? NEEDS_APPROVAL_TO_SEND
					: 'Mark this quote ready to send before sending it.';
			}
			if (state === 'sent' || state === 'viewed')
				return 'This quote has already been sent; revise it to send changed figures.';
			break;
		case 'view':
		case 'accept':
			if (['draft', 'awaiting-approval', 'approved', 'changes-requested'].includes(state))
				return NOT_SENT_YET;
			if (state === 'accepted' || state === 'deposit-paid') return ALREADY_ACCEPTED;
			if (state === 'expired') return VALIDITY_ENDED;
			break;
		case 'pay':
			return 'A deposit can only be marked as paid on an accepted quote.';
		case 'expire':
			if (state === 'expired') return 'This quote has already expired.';
			if (state === 'accepted' || state === 'deposit-paid')
				return 'An accepted quote does not expire.';
			break;
		case 'revise':
			if (state === 'draft' || state === 'changes-requested')
				return 'This quote has not been sent yet: edit it directly instead of starting a revision.';
			if (state === 'awaiting-approval')
				return 'A manager is reviewing this quote; wait for the decision before revising it.';
			if (state === 'accepted' || state === 'deposit-paid')
				return 'The customer has accepted this quote, so it can no longer be revised.';
			break;
	}
	return `This quote ${STATE_PHRASES[state]}, so it cannot be ${RULES[action].done}.`;
}

function missingRefusal(done: string, missing: readonly string[] | undefined): string | null {
	if (!missing || missing.length === 0) return null;
	return `Before this quote can be ${done}: ${missing.join(' ')}`;
}

/** The message for an action allowed from this state whose condition is not met, or null. */
function conditionRefusal(
	action: QuoteAction,
	context: TransitionContext,
	comment: string | null,
	commentComesLater: boolean
): string | null {
	const past = isPastValidity(context.now, context.validUntil);
	switch (action) {
		case 'submit':
			if (!context.approvalRequired)
				return "This quote is within the rep's discount authority and above the margin floor, so it needs no approval: mark it ready to send instead.";
			return missingRefusal('submitted for approval', context.missing);
		case 'mark-ready':
			if (context.approvalRequired)
				return "This quote needs a manager's approval before it can be sent: submit it for approval.";
			return missingRefusal('marked ready to send', context.missing);
		case 'request-changes':
			return comment === null && !commentComesLater
				? 'Write a comment saying what needs to change before sending the quote back.'
				: null;
		case 'view':
		case 'accept':
			return past ? VALIDITY_ENDED : null;
		case 'expire':
			return past ? null : 'This quote is still within its validity period.';
		default:
			return null;
	}
}

/**
 * Decide one transition. Checks, in order: that the state and action exist, that the actor's role
 * may take the action, that the quote is in a state the action starts from, and the action's
 * condition (approval needed or not, a comment, the validity date). Returns the new state and the
 * record to store, or a plain-English message saying why not.
 */
export function transition(
	state: QuoteState,
	action: QuoteAction,
	actor: { role: ActorRole },
	context: TransitionContext
): TransitionResult {
	return decide(state, action, actor.role, context, false);
}

function decide(
	state: QuoteState,
	action: QuoteAction,
	role: ActorRole,
	context: TransitionContext,
	commentComesLater: boolean
): TransitionResult {
	if (!(QUOTE_STATES as readonly string[]).includes(state)) {
		return { ok: false, message: `Unknown quote state "${String(state)}".` };
	}
	if (!(QUOTE_ACTIONS as readonly string[]).includes(action)) {
		return { ok: false, message: `Unknown quote action "${String(action)}".` };
	}
	const rule = RULES[action];
	if (!rule.roles.includes(role)) return { ok: false, message: rule.roleMessage };
	if (!rule.from.includes(state)) {
		return { ok: false, message: stateRefusal(action, state, context) };
	}
	const comment = context.comment?.trim() ? context.comment.trim() : null;
	const refused = conditionRefusal(action, context, comment, commentComesLater);
	if (refused !== null) return { ok: false, message: refused };

	if (rule.noOpIn === state) {
		return { ok: true, to: state, record: null, startsNewRevision: false };
	}
	return {
		ok: true,
		to: rule.to,
		record: {
			from: state,
			to: rule.to,
			action,
			byRole: role,
			comment,
			at: new Date(context.now.getTime())
		},
		startsNewRevision: action === 'revise'
	};
}

/**
 * The actions a role may take on a quote in this state right now, in QUOTE_ACTIONS order: those for
 * which `transition` would succeed, except that the comment `request-changes` needs is not asked
 * for yet (the manager types it after pressing the button). For the UI's buttons; the server still
 * calls `transition` on every request.
 */
export function allowedActions(
	state: QuoteState,
	role: ActorRole,
	context: TransitionContext
): QuoteAction[] {
	return QUOTE_ACTIONS.filter((action) => decide(state, action, role, context, true).ok);
}
