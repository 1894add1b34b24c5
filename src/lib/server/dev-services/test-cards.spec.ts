import { describe, expect, it } from 'vitest';
import { chargeTestCard, groupCardNumber, luhnValid } from './test-cards';

const now = new Date('2026-06-15T12:00:00Z');
const card = (number: string, expiry = '12 / 30', cvc = '123') => chargeTestCard({ number, expiry, cvc }, now);

describe('chargeTestCard (the payment provider documented test cards)', () => {
	it('4242 4242 4242 4242 succeeds', () => {
		expect(card('4242 4242 4242 4242')).toEqual({ ok: true, last4: '4242' });
	});

	it('4000 0000 0000 0002 is a generic decline', () => {
		expect(card('4000 0000 0000 0002')).toMatchObject({ ok: false, code: 'card_declined', declineCode: 'generic_decline' });
	});

	it('4000 0000 0000 9995 is declined for insufficient funds', () => {
		const outcome = card('4000000000009995');
		expect(outcome).toMatchObject({ ok: false, code: 'card_declined', declineCode: 'insufficient_funds' });
		expect(!outcome.ok && outcome.message).toMatch(/not have enough funds/);
	});

	it('refuses a number that fails the Luhn check', () => {
		expect(card('4242 4242 4242 4241')).toMatchObject({ ok: false, field: 'number', code: 'incorrect_number' });
	});

	it('declines a valid number that is not a test card', () => {
		expect(card('5555 5555 5555 4444')).toMatchObject({ ok: false, field: 'number', code: 'card_declined' });
	});

	it('checks the expiry: this month still works, last month does not', () => {
		expect(card('4242424242424242', '06/26').ok).toBe(true);
		expect(card('4242424242424242', '05/26')).toMatchObject({ ok: false, code: 'expired_card' });
		expect(card('4242424242424242', '13/30')).toMatchObject({ ok: false, code: 'invalid_expiry' });
		expect(card('4242424242424242', '0630').ok).toBe(true);
		expect(card('4242424242424242', '06/2030').ok).toBe(true);
	});

	it('wants a 3 or 4 digit CVC', () => {
		expect(card('4242424242424242', '12/30', '12')).toMatchObject({ ok: false, field: 'cvc' });
		expect(card('4242424242424242', '12/30', '1234').ok).toBe(true);
	});
});

describe('luhnValid', () => {
	it('checks 79927398713, the usual worked example of the Luhn check (common practice), zero-padded to card length', () => {
		expect(luhnValid('79927398713')).toBe(false); // 11 digits: shorter than any card number
		expect(luhnValid('000079927398713')).toBe(true);
		expect(luhnValid('000079927398710')).toBe(false);
	});
});

describe('groupCardNumber', () => {
	it('prints groups of four', () => {
		expect(groupCardNumber('4000000000009995')).toBe('4000 0000 0000 9995');
	});
});
