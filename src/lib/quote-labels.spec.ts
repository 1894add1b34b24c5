import { describe, expect, it } from 'vitest';
import { historyStateLabels, quoteStateLabel } from './quote-labels';

describe('quote state labels', () => {
	it('calls an approved quote "Approved" only when a manager approved it', () => {
		expect(quoteStateLabel('approved', { approvalRequired: true })).toBe('Approved');
		expect(quoteStateLabel('approved', { approvalRequired: false })).toBe('Ready to send');
		expect(quoteStateLabel('approved')).toBe('Approved or ready to send');
		expect(quoteStateLabel('awaiting-approval')).toBe('Awaiting approval');
	});

	it('writes history with the badge words, never the stored state names', () => {
		const labels = historyStateLabels([
			{ action: 'create', fromState: null, toState: 'draft', revision: 1 },
			{ action: 'mark-ready', fromState: 'draft', toState: 'approved', revision: 1 },
			{ action: 'send', fromState: 'approved', toState: 'sent', revision: 1 },
			{ action: 'revise', fromState: 'sent', toState: 'superseded', revision: 1 },
			{ action: 'create', fromState: null, toState: 'draft', revision: 2 },
			{ action: 'submit', fromState: 'draft', toState: 'awaiting-approval', revision: 2 },
			{ action: 'approve', fromState: 'awaiting-approval', toState: 'approved', revision: 2 },
			{ action: 'send', fromState: 'approved', toState: 'sent', revision: 2 }
		]);
		expect(labels.map((l) => `${l.from ?? ''}>${l.to}`)).toEqual([
			'>Draft',
			'Draft>Ready to send',
			'Ready to send>Sent',
			'Sent>Superseded',
			'>Draft',
			'Draft>Awaiting approval',
			'Awaiting approval>Approved',
			'Approved>Sent'
		]);
		expect(labels.every((l) => !/-/.test(`${l.from} ${l.to}`))).toBe(true);
		expect(labels[1].action).toMatch(/Marked ready/);
	});
});
