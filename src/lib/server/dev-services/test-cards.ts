/**
 * How the local payment fake treats a card, following the payment provider's documented test card
 * numbers: 4242 4242 4242 4242 succeeds; 4000 0000 0000 0002 is declined (generic decline);
 * 4000 0000 0000 9995 is declined for insufficient funds. Pure, so the rules are unit-tested.
 */
export interface CardInput {
	number: string;
	/** "MM / YY", "MM/YY" or "MMYY" */
	expiry: string;
	cvc: string;
}

export type CardOutcome =
	| { ok: true; last4: string }
	| {
			ok: false;
			/** which field to fix, when the problem is the input rather than the card */
			field: 'number' | 'expiry' | 'cvc' | null;
			code: 'incorrect_number' | 'invalid_expiry' | 'expired_card' | 'invalid_cvc' | 'card_declined';
			declineCode?: 'generic_decline' | 'insufficient_funds';
			message: string;
	  };

export const TEST_CARDS = [
	{ number: '4242424242424242', outcome: 'succeeds' },
	{ number: '4000000000000002', outcome: 'is declined' },
	{ number: '4000000000009995', outcome: 'is declined: insufficient funds' }
] as const;

/** The Luhn check digit test used by card numbers (ISO/IEC 7812-1). */
export function luhnValid(digits: string): boolean {
	if (!/^\d{12,19}$/.test(digits)) return false;
	let sum = 0;
	for (let i = 0; i < digits.length; i++) {
		let d = Number(digits[digits.length - 1 - i]);
		if (i % 2 === 1) {
			d *= 2;
			if (d > 9) d -= 9;
		}
		sum += d;
	}
	return sum % 10 === 0;
}

/** Groups of four, as printed on a card. */
export function groupCardNumber(digits: string): string {
	return digits.replace(/(\d{4})(?=\d)/g, '$1 ');
}

/** Decides the outcome of paying with `card` at `now`. */
export function chargeTestCard(card: CardInput, now: Date = new Date()): CardOutcome {
	const number = card.number.replace(/[\s-]/g, '');
	if (!luhnValid(number)) {
		return { ok: false, field: 'number', code: 'incorrect_number', message: 'That card number is not valid. Check the digits and try again.' };
	}
	const expiry = /^\s*(\d{1,2})\s*\/?\s*(\d{2}|\d{4})\s*$/.exec(card.expiry);
	const month = expiry ? Number(expiry[1]) : 0;
	if (!expiry || month < 1 || month > 12) {
		return { ok: false, field: 'expiry', code: 'invalid_expiry', message: 'Enter the expiry date as MM / YY, for example 12 / 30.' };
	}
	const year = expiry[2].length === 2 ? 2000 + Number(expiry[2]) : Number(expiry[2]);
	// a card is valid to the end of its expiry month
	if (Date.UTC(year, month, 1) <= now.getTime()) {
		return { ok: false, field: 'expiry', code: 'expired_card', message: 'This card has expired. Use a card with a later expiry date.' };
	}
	if (!/^\d{3,4}$/.test(card.cvc.trim())) {
		return { ok: false, field: 'cvc', code: 'invalid_cvc', message: 'Enter the 3 or 4 digit security code (CVC) from the card.' };
	}
	const last4 = number.slice(-4);
	switch (number) {
		case '4242424242424242':
			return { ok: true, last4 };
		case '4000000000000002':
			return {
				ok: false,
				field: null,
				code: 'card_declined',
				declineCode: 'generic_decline',
				message: 'The card was declined. No money was taken. Try another card, or go back without paying.'
			};
		case '4000000000009995':
			return {
				ok: false,
				field: null,
				code: 'card_declined',
				declineCode: 'insufficient_funds',
				message: 'The card was declined because it does not have enough funds. No money was taken. Try another card.'
			};
		default:
			return {
				ok: false,
				field: 'number',
				code: 'card_declined',
				declineCode: 'generic_decline',
				message: 'This test checkout accepts only the test card numbers listed on this page.'
			};
	}
}
