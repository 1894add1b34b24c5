import { describe, expect, it } from 'vitest';
import {
	ACTOR_ROLES,
	QUOTE_ACTIONS,
	QUOTE_STATES,
	REVISION_START_STATE,
	allowedActions,
	transition,
	type ActorRole,
	type QuoteAction,
	type QuoteState,
	type TransitionContext
} from './states';

const NOW = new Date('2026-03-10T15:00:00.000Z');
const STILL_VALID = new Date('2026-04-09T23:59:59.999Z');
const ENDED = new Date('2026-03-01T23:59:59.999Z');
const COMMENT = 'Take the truck discount back to 15 %.';

/** Every (state, action, role) triple for which `transition` says yes, as "state action role". */
function generatedAllowed(context: TransitionContext): string[] {
	const allowed: string[] = [];
	for (const state of QUOTE_STATES)
		for (const action of QUOTE_ACTIONS)
			for (const role of ACTOR_ROLES)
				if (transition(state, action, { role }, context).ok)
					allowed.push(`${state} ${action} ${role}`);
	return allowed.sort();
}

function generatedRefusals(context: TransitionContext): string[] {
	const messages: string[] = [];
	for (const state of QUOTE_STATES)
		for (const action of QUOTE_ACTIONS)
			for (const role of ACTOR_ROLES) {
				const result = transition(state, action, { role }, context);
				if (!result.ok) messages.push(result.message);
			}
	return messages;
}

// The expected tables, written out by hand from the design (§5) and the module's revise rule.
// Anything not listed must be refused. 10 states × 10 actions × 5 roles = 500 triples per context.

/** Within validity, approval needed, comment given. */
const APPROVAL_NEEDED = [
	'draft submit rep',
	'draft submit manager',
	'awaiting-approval approve manager',
	'awaiting-approval request-changes manager',
	'approved send rep',
	'approved send manager',
	'approved revise rep',
	'approved revise manager',
	'changes-requested submit rep',
	'changes-requested submit manager',
	'sent view customer',
	'sent accept customer',
	'sent revise rep',
	'sent revise manager',
	'viewed view customer',
	'viewed accept customer',
	'viewed revise rep',
	'viewed revise manager',
	'accepted pay system',
	'deposit-paid pay system',
	'expired revise rep',
	'expired revise manager'
];

/** Within validity, no approval needed, comment given. */
const NO_APPROVAL_NEEDED = [
	'draft mark-ready rep',
	'draft mark-ready manager',
	'awaiting-approval approve manager',
	'awaiting-approval request-changes manager',
	'approved send rep',
	'approved send manager',
	'approved revise rep',
	'approved revise manager',
	'changes-requested mark-ready rep',
	'changes-requested mark-ready manager',
	'sent view customer',
	'sent accept customer',
	'sent revise rep',
	'sent revise manager',
	'viewed view customer',
	'viewed accept customer',
	'viewed revise rep',
	'viewed revise manager',
	'accepted pay system',
	'deposit-paid pay system',
	'expired revise rep',
	'expired revise manager'
];

/** Past validity, no approval needed, comment given: the customer is locked out, expiry opens. */
const PAST_VALIDITY = [
	'draft mark-ready rep',
	'draft mark-ready manager',
	'draft expire system',
	'awaiting-approval approve manager',
	'awaiting-approval request-changes manager',
	'awaiting-approval expire system',
	'approved send rep',
	'approved send manager',
	'approved revise rep',
	'approved revise manager',
	'approved expire system',
	'changes-requested mark-ready rep',
	'changes-requested mark-ready manager',
	'changes-requested expire system',
	'sent revise rep',
	'sent revise manager',
	'sent expire system',
	'viewed revise rep',
	'viewed revise manager',
	'viewed expire system',
	'accepted pay system',
	'deposit-paid pay system',
	'expired revise rep',
	'expired revise manager'
];

/** Within validity, approval needed, no comment: a manager cannot send a quote back in silence. */
const NO_COMMENT = [
	'draft submit rep',
	'draft submit manager',
	'awaiting-approval approve manager',
	'approved send rep',
	'approved send manager',
	'approved revise rep',
	'approved revise manager',
	'changes-requested submit rep',
	'changes-requested submit manager',
	'sent view customer',
	'sent accept customer',
	'sent revise rep',
	'sent revise manager',
	'viewed view customer',
	'viewed accept customer',
	'viewed revise rep',
	'viewed revise manager',
	'accepted pay system',
	'deposit-paid pay system',
	'expired revise rep',
	'expired revise manager'
];

const contexts: [string, TransitionContext, string[]][] = [
	[
		'approval needed',
		{ approvalRequired: true, now: NOW, validUntil: STILL_VALID, comment: COMMENT },
		APPROVAL_NEEDED
	],
	[
		'no approval needed',
		{ approvalRequired: false, now: NOW, validUntil: STILL_VALID, comment: COMMENT },
		NO_APPROVAL_NEEDED
	],
	[
		'past validity',
		{ approvalRequired: false, now: NOW, validUntil: ENDED, comment: COMMENT },
		PAST_VALIDITY
	],
	['no comment', { approvalRequired: true, now: NOW, validUntil: STILL_VALID }, NO_COMMENT]
];

// Where each allowed action leads (hand-written); a repeat view or payment stays put.
const DESTINATION: Record<QuoteAction, QuoteState> = {
	submit: 'awaiting-approval',
	approve: 'approved',
	'request-changes': 'changes-requested',
	'mark-ready': 'approved',
	send: 'sent',
	view: 'viewed',
	accept: 'accepted',
	pay: 'deposit-paid',
	expire: 'expired',
	revise: 'superseded'
};

describe('every (state × action × role) against the hand-written tables', () => {
	it('the table is the full 500 triples per context', () => {
		expect(QUOTE_STATES.length * QUOTE_ACTIONS.length * ACTOR_ROLES.length).toBe(500);
	});

	for (const [name, context, expected] of contexts) {
		describe(name, () => {
			it('allows exactly the listed triples and refuses the other ones', () => {
				const allowed = generatedAllowed(context);
				expect(allowed).toEqual([...expected].sort());
				expect(generatedRefusals(context)).toHaveLength(500 - expected.length);
			});

			it('every refusal is a plain sentence', () => {
				for (const message of generatedRefusals(context)) {
					expect(message).toMatch(/^[A-Z].{10,}[.]$/);
					expect(message).not.toMatch(/undefined|null|\[object/);
				}
			});

			it('every allowed transition leads where the design says and records who did it', () => {
				for (const triple of expected) {
					const [state, action, role] = triple.split(' ') as [QuoteState, QuoteAction, ActorRole];
					const result = transition(state, action, { role }, context);
					if (!result.ok) throw new Error(`${triple} refused: ${result.message}`);
					expect(result.to).toBe(DESTINATION[action]);
					const repeat = state === DESTINATION[action];
					if (repeat) {
						expect(result.record).toBeNull();
					} else {
						expect(result.record).toEqual({
							from: state,
							to: DESTINATION[action],
							action,
							byRole: role,
							comment: context.comment ?? null,
							at: NOW
						});
					}
					expect(result.startsNewRevision).toBe(action === 'revise');
				}
			});
		});
	}

	it('an admin can take no action on a quote in any state', () => {
		for (const [, context] of contexts)
			for (const state of QUOTE_STATES) expect(allowedActions(state, 'admin', context)).toEqual([]);
	});

	it('only these states can be revised (accepted and deposit-paid never)', () => {
		const context = contexts[0][1];
		const revisable = QUOTE_STATES.filter(
			(s) => transition(s, 'revise', { role: 'rep' }, context).ok
		);
		expect(revisable).toEqual(['approved', 'sent', 'viewed', 'expired']);
		expect(REVISION_START_STATE).toBe('draft');
	});
});

describe('allowedActions, for the buttons', () => {
	it('matches the tables, in action order', () => {
		const [, context] = contexts[0];
		expect(allowedActions('draft', 'rep', context)).toEqual(['submit']);
		expect(allowedActions('awaiting-approval', 'manager', context)).toEqual([
			'approve',
			'request-changes'
		]);
		expect(allowedActions('awaiting-approval', 'rep', context)).toEqual([]);
		expect(allowedActions('approved', 'manager', context)).toEqual(['send', 'revise']);
		expect(allowedActions('viewed', 'customer', context)).toEqual(['view', 'accept']);
		expect(allowedActions('accepted', 'system', context)).toEqual(['pay']);
		expect(allowedActions('superseded', 'manager', context)).toEqual([]);
	});
	it('offers "send back for changes" before the comment is typed', () => {
		const [, noComment] = contexts[3];
		expect(
			transition('awaiting-approval', 'request-changes', { role: 'manager' }, noComment).ok
		).toBe(false);
		expect(allowedActions('awaiting-approval', 'manager', noComment)).toEqual([
			'approve',
			'request-changes'
		]);
	});
	it('agrees with transition everywhere else', () => {
		for (const [, context] of contexts)
			for (const state of QUOTE_STATES)
				for (const role of ACTOR_ROLES) {
					const byTransition = QUOTE_ACTIONS.filter(
						(a) => a !== 'request-changes' && transition(state, a, { role }, context).ok
					);
					expect(
						allowedActions(state, role, context).filter((a) => a !== 'request-changes')
					).toEqual(byTransition);
				}
	});
});

describe('refusal messages', () => {
	const needs: TransitionContext = { approvalRequired: true, now: NOW, validUntil: STILL_VALID };
	const clear: TransitionContext = { approvalRequired: false, now: NOW, validUntil: STILL_VALID };
	const refusal = (
		state: QuoteState,
		action: QuoteAction,
		role: ActorRole,
		context: TransitionContext
	): string => {
		const result = transition(state, action, { role }, context);
		if (result.ok) throw new Error(`expected ${state} ${action} ${role} to be refused`);
		return result.message;
	};

	it('name who may act', () => {
		expect(refusal('awaiting-approval', 'approve', 'rep', needs)).toBe(
			'Only a sales manager can approve a quote.'
		);
		expect(refusal('awaiting-approval', 'approve', 'admin', needs)).toBe(
			'Only a sales manager can approve a quote.'
		);
		expect(refusal('awaiting-approval', 'request-changes', 'rep', needs)).toBe(
			'Only a sales manager can send a quote back for changes.'
		);
		expect(refusal('approved', 'send', 'customer', needs)).toBe(
			'Only a sales rep or sales manager can send a quote.'
		);
		expect(refusal('sent', 'accept', 'rep', needs)).toBe('Only the customer can accept a quote.');
		expect(refusal('accepted', 'pay', 'manager', needs)).toBe(
			'Only the payment system can mark a deposit as paid.'
		);
	});

	it('refuse to send an unapproved quote, even for a manager', () => {
		const message = "This quote needs a manager's approval before it can be sent.";
		expect(refusal('draft', 'send', 'rep', needs)).toBe(message);
		expect(refusal('changes-requested', 'send', 'manager', needs)).toBe(message);
		expect(refusal('awaiting-approval', 'send', 'manager', needs)).toBe(message);
		expect(refusal('awaiting-approval', 'send', 'rep', clear)).toBe(message);
		expect(refusal('draft', 'send', 'rep', clear)).toBe(
			'Mark this quote ready to send before sending it.'
		);
		expect(refusal('sent', 'send', 'rep', clear)).toMatch(/already been sent; revise it/);
	});

	it('steer submit and mark-ready to the right one', () => {
		expect(refusal('draft', 'submit', 'rep', clear)).toMatch(/needs no approval: mark it ready/);
		expect(refusal('draft', 'mark-ready', 'rep', needs)).toBe(
			"This quote needs a manager's approval before it can be sent: submit it for approval."
		);
	});

	it('refuse submit and mark-ready while the quote lacks a contact, an address or a tax decision', () => {
		const missing = ["Add the customer contact's e-mail address: the quote and its private link are sent there."];
		expect(refusal('draft', 'submit', 'rep', { ...needs, missing })).toBe(`Before this quote can be submitted for approval: ${missing[0]}`);
		expect(refusal('changes-requested', 'mark-ready', 'rep', { ...clear, missing })).toBe(`Before this quote can be marked ready to send: ${missing[0]}`);
		// the approval rule still speaks first: the rep learns which button is the right one
		expect(refusal('draft', 'submit', 'rep', { ...clear, missing })).toMatch(/needs no approval/);
		expect(transition('draft', 'submit', { role: 'rep' }, { ...needs, missing: [] }).ok).toBe(true);
		expect(transition('draft', 'mark-ready', { role: 'rep' }, { ...clear, missing: [] }).ok).toBe(true);
		// other actions do not look at it
		expect(transition('awaiting-approval', 'approve', { role: 'manager' }, { ...needs, missing }).ok).toBe(true);
	});

	it('require a real comment to send a quote back', () => {
		const blank = { ...needs, comment: '   ' };
		expect(refusal('awaiting-approval', 'request-changes', 'manager', blank)).toBe(
			'Write a comment saying what needs to change before sending the quote back.'
		);
	});

	it('explain why a state cannot be revised', () => {
		expect(refusal('accepted', 'revise', 'rep', needs)).toBe(
			'The customer has accepted this quote, so it can no longer be revised.'
		);
		expect(refusal('deposit-paid', 'revise', 'manager', needs)).toMatch(/can no longer be revised/);
		expect(refusal('draft', 'revise', 'rep', needs)).toMatch(/edit it directly/);
		expect(refusal('awaiting-approval', 'revise', 'rep', needs)).toMatch(/manager is reviewing/);
		expect(refusal('superseded', 'revise', 'rep', needs)).toBe(
			'Only the latest revision can be revised.'
		);
		expect(refusal('superseded', 'send', 'rep', needs)).toMatch(/replaced by a newer one/);
	});

	it('fall back to a sentence naming the state and the action', () => {
		expect(refusal('deposit-paid', 'submit', 'rep', needs)).toBe(
			'This quote has been accepted and its deposit paid, so it cannot be submitted for approval.'
		);
	});

	it('refuse unknown states and actions', () => {
		expect(refusal('lost' as QuoteState, 'send', 'rep', needs)).toBe('Unknown quote state "lost".');
		expect(refusal('draft', 'delete' as QuoteAction, 'rep', needs)).toBe(
			'Unknown quote action "delete".'
		);
	});
});

describe('the validity date, at its boundary', () => {
	// validUntil is the last valid millisecond: equal is still valid, one millisecond later is not
	const at = (now: Date): TransitionContext => ({
		approvalRequired: false,
		now,
		validUntil: STILL_VALID
	});
	const lastMoment = at(new Date(STILL_VALID.getTime()));
	const justAfter = at(new Date(STILL_VALID.getTime() + 1));

	it('the customer can accept at the last valid millisecond, not one later', () => {
		expect(transition('viewed', 'accept', { role: 'customer' }, lastMoment).ok).toBe(true);
		expect(transition('viewed', 'accept', { role: 'customer' }, justAfter)).toEqual({
			ok: false,
			message: "This quote's validity has ended; ask your sales rep for a new revision."
		});
		expect(transition('sent', 'view', { role: 'customer' }, justAfter).ok).toBe(false);
	});
	it('the system can expire it one millisecond after, not at the last valid one', () => {
		expect(transition('sent', 'expire', { role: 'system' }, lastMoment)).toEqual({
			ok: false,
			message: 'This quote is still within its validity period.'
		});
		expect(transition('sent', 'expire', { role: 'system' }, justAfter).ok).toBe(true);
	});
	it('a deposit for an accepted quote is recorded even after the date', () => {
		expect(transition('accepted', 'pay', { role: 'system' }, justAfter).ok).toBe(true);
	});
});

describe('records', () => {
	const context: TransitionContext = {
		approvalRequired: true,
		now: NOW,
		validUntil: STILL_VALID,
		comment: '  Freight is missing.  '
	};
	it('keep the comment trimmed, and null when there is none', () => {
		const back = transition('awaiting-approval', 'request-changes', { role: 'manager' }, context);
		expect(back.ok && back.record?.comment).toBe('Freight is missing.');
		const approved = transition(
			'awaiting-approval',
			'approve',
			{ role: 'manager' },
			{ ...context, comment: undefined }
		);
		expect(approved.ok && approved.record?.comment).toBeNull();
	});
	it('a second view and a repeated payment notice change nothing and record nothing', () => {
		expect(transition('viewed', 'view', { role: 'customer' }, context)).toEqual({
			ok: true,
			to: 'viewed',
			record: null,
			startsNewRevision: false
		});
		expect(transition('deposit-paid', 'pay', { role: 'system' }, context)).toEqual({
			ok: true,
			to: 'deposit-paid',
			record: null,
			startsNewRevision: false
		});
	});
	it('a revision supersedes the old one and asks for a new draft', () => {
		const result = transition('sent', 'revise', { role: 'rep' }, context);
		expect(result).toMatchObject({ ok: true, to: 'superseded', startsNewRevision: true });
	});
	it('the record time is a copy of now', () => {
		const now = new Date(NOW.getTime());
		const result = transition('draft', 'submit', { role: 'rep' }, { ...context, now });
		now.setTime(0);
		expect(result.ok && result.record?.at.toISOString()).toBe('2026-03-10T15:00:00.000Z');
	});
});
