import { describe, expect, it } from 'vitest';
import { parseFormBody } from './form-body';

describe('parseFormBody', () => {
	it('decodes the bracketed keys of a checkout creation', () => {
		const body = [
			'mode=payment',
			'line_items[0][quantity]=1',
			'line_items[0][price_data][currency]=eur',
			'line_items[0][price_data][unit_amount]=123457',
			'line_items[0][price_data][product_data][name]=Deposit%20for%20Q-1',
			'line_items[1][quantity]=2',
			'metadata[quote_id]=abc',
			'expand[]=payment_intent',
			'expand[]=line_items',
			'success_url=http%3A%2F%2F127.0.0.1%3A4173%2Fq%2Ft%2Fpaid%3Fs%3D%7BCHECKOUT_SESSION_ID%7D'
		].join('&');
		expect(parseFormBody(body)).toEqual({
			mode: 'payment',
			line_items: [
				{ quantity: '1', price_data: { currency: 'eur', unit_amount: '123457', product_data: { name: 'Deposit for Q-1' } } },
				{ quantity: '2' }
			],
			metadata: { quote_id: 'abc' },
			expand: ['payment_intent', 'line_items'],
			success_url: 'http://127.0.0.1:4173/q/t/paid?s={CHECKOUT_SESSION_ID}'
		});
	});

	it('ignores keys that would reach an object prototype', () => {
		const parsed = parseFormBody('__proto__[polluted]=1&metadata[__proto__][x]=1&a=1');
		expect(parsed).toEqual({ a: '1' });
		expect(({} as Record<string, unknown>).polluted).toBeUndefined();
	});
});
