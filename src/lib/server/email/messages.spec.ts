import { describe, expect, it } from 'vitest';
import {
	acceptanceReceipt,
	approvalDecision,
	approvalRequest,
	depositReceipt,
	passwordReset,
	quoteToCustomer,
	type QuoteToCustomerInput
} from './messages';
import { formatMoney } from './format';

const SCRIPT = '<script>alert("x")</script>';
const RLO = '\u202E'; // RIGHT-TO-LEFT OVERRIDE
const ISOLATE = '\u2067'; // RIGHT-TO-LEFT ISOLATE
const hostile = `Quay ${SCRIPT} ${RLO}fdp.exe${ISOLATE} & Co`;

const quote: QuoteToCustomerInput = {
	dealerName: 'Northgate Lift Service',
	quoteNumber: 'Q-2026-0042',
	revision: 1,
	customerName: hostile,
	contactName: 'Dana Example',
	repName: 'Robin Rep',
	repEmail: 'rep@demo.traywise.test',
	totalCents: 1_234_567,
	depositCents: 123_457,
	currency: 'EUR',
	validUntil: '2026-03-31',
	link: 'https://quotes.example.test/q/abc123',
	pdf: { filename: 'Q-2026-0042.pdf', content: Buffer.from('%PDF-1.7 test') }
};

function expectNoBidiOverride(...parts: string[]) {
	for (const part of parts) expect(part).not.toMatch(/[\u202A-\u202E\u2066-\u2069]/);
}

describe('quoteToCustomer', () => {
	const message = quoteToCustomer(quote);

	it('escapes a <script> in the customer name in HTML and keeps it as text in the text part', () => {
		expect(message.html).not.toContain('<script');
		expect(message.html).toContain('&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt;');
		expect(message.html).toContain('&amp; Co');
		expect(message.text).toContain(SCRIPT);
	});

	it('removes right-to-left override and isolate marks and isolates user values in <bdi>', () => {
		expectNoBidiOverride(message.subject, message.text, message.html);
		expect(message.html).toContain('<bdi>Quay &lt;script&gt;');
		expect(message.text).toContain('fdp.exe & Co');
	});

	it('keeps right-to-left letters themselves (a Hebrew name stays readable)', () => {
		const m = quoteToCustomer({ ...quote, contactName: 'דנה כהן' });
		expect(m.text).toContain('Hello דנה כהן,');
		expect(m.html).toContain('<bdi>דנה כהן</bdi>');
	});

	it('formats integer cents with Intl.NumberFormat: 1 234 567 cents → €12,345.67', () => {
		expect(message.text).toContain('€12,345.67');
		expect(message.text).toContain('€1,234.57');
		expect(message.html).toContain('€12,345.67');
	});

	it('carries the private link and the PDF attachment', () => {
		expect(message.text).toContain('https://quotes.example.test/q/abc123');
		expect(message.html).toContain('href="https://quotes.example.test/q/abc123"');
		expect(message.attachments).toHaveLength(1);
		expect(message.attachments[0]).toMatchObject({ filename: 'Q-2026-0042.pdf', contentType: 'application/pdf' });
		expect(message.attachments[0].content.toString()).toBe('%PDF-1.7 test');
		expect(message.text).toContain('March 31, 2026');
	});

	it('names the revision after the first', () => {
		expect(quoteToCustomer({ ...quote, revision: 3 }).subject).toBe(
			'Your quote Q-2026-0042 (revision 3) from Northgate Lift Service'
		);
	});

	it('keeps line breaks out of the subject (no header injection through a name)', () => {
		const m = quoteToCustomer({ ...quote, dealerName: 'Evil\r\nBcc: victim@example.test' });
		expect(m.subject).not.toMatch(/[\r\n]/);
		expect(m.subject).toBe('Your quote Q-2026-0042 from Evil Bcc: victim@example.test');
	});

	it('refuses a link that is not http(s)', () => {
		expect(() => quoteToCustomer({ ...quote, link: 'javascript:alert(1)' })).toThrow(/javascript:/);
	});
});

describe('approvalRequest', () => {
	it('lists the reasons, escaped', () => {
		const m = approvalRequest({
			quoteNumber: 'Q-1',
			customerName: 'Harbour Cold Store',
			repName: 'Robin Rep',
			managerName: 'Morgan Manager',
			totalCents: 5_000_00,
			currency: 'USD',
			reasons: ['Discount 18 % exceeds the rep authority of 10 %', `Note ${SCRIPT}`],
			link: 'http://127.0.0.1:3000/quotes/1'
		});
		expect(m.subject).toBe('Approval needed: quote Q-1 for Harbour Cold Store');
		expect(m.text).toContain('- Discount 18 % exceeds the rep authority of 10 %');
		expect(m.text).toContain('total $5,000.00');
		expect(m.html).not.toContain('<script');
		expect(m.html).toContain('<li style="margin:0 0 4px"><bdi>Note &lt;script&gt;');
	});
});

describe('approvalDecision', () => {
	const base = {
		quoteNumber: 'Q-7',
		customerName: 'Harbour Cold Store',
		repName: 'Robin Rep',
		managerName: 'Morgan Manager',
		link: 'http://127.0.0.1:3000/quotes/7'
	};
	it('tells the rep an approval', () => {
		const m = approvalDecision({ ...base, decision: 'approved' });
		expect(m.subject).toBe('Quote Q-7 approved');
		expect(m.text).toContain('approved it; you can now send it to the customer.');
	});
	it('carries the manager comment on changes requested, escaped and without bidi overrides', () => {
		const m = approvalDecision({ ...base, decision: 'changes-requested', comment: `Lower the hoist ${SCRIPT}${RLO}` });
		expect(m.subject).toBe('Quote Q-7: changes requested');
		expect(m.text).toContain(`Lower the hoist ${SCRIPT}`);
		expect(m.html).toContain('Lower the hoist &lt;script&gt;');
		expectNoBidiOverride(m.text, m.html);
	});
});

describe('receipts', () => {
	const acceptance = {
		dealerName: 'Northgate Lift Service',
		quoteNumber: 'Q-9',
		customerName: 'Harbour Cold Store',
		recipientName: 'Dana Example',
		acceptedByName: `Dana ${SCRIPT}`,
		acceptedAt: '2026-02-01T09:30:00Z',
		totalCents: 1_000_000,
		depositCents: 100_000,
		currency: 'EUR',
		link: 'https://quotes.example.test/q/tok',
		repName: 'Robin Rep'
	};
	it('acceptance: the customer is pointed at the deposit, the rep is told it is unpaid', () => {
		const customer = acceptanceReceipt({ ...acceptance, audience: 'customer' });
		const rep = acceptanceReceipt({ ...acceptance, audience: 'rep', recipientName: 'Robin Rep' });
		expect(customer.subject).toBe('We have your acceptance of quote Q-9');
		expect(customer.text).toContain('Pay the deposit:\nhttps://quotes.example.test/q/tok');
		expect(customer.text).toContain('€1,000.00');
		expect(customer.text).toContain('February 1, 2026 at 9:30 AM UTC');
		expect(rep.subject).toBe('Harbour Cold Store accepted quote Q-9');
		expect(rep.text).toContain('The deposit is not paid yet.');
		for (const m of [customer, rep]) expect(m.html).not.toContain('<script');
	});

	it('deposit: the amount to the cent and the provider reference', () => {
		const m = depositReceipt({
			audience: 'customer',
			dealerName: 'Northgate Lift Service',
			quoteNumber: 'Q-9',
			customerName: 'Harbour Cold Store',
			recipientName: 'Dana Example',
			amountCents: 100_001,
			currency: 'EUR',
			paidAt: '2026-02-01T10:00:00Z',
			paymentReference: 'pi_test_123',
			link: 'https://quotes.example.test/q/tok',
			repName: 'Robin Rep'
		});
		expect(m.subject).toBe('Deposit received for quote Q-9');
		expect(m.text).toContain('We received your deposit of €1,000.01 for quote Q-9');
		expect(m.text).toContain('pi_test_123');
		const rep = depositReceipt({
			audience: 'rep',
			dealerName: 'Northgate Lift Service',
			quoteNumber: 'Q-9',
			customerName: `Harbour ${RLO}`,
			recipientName: 'Robin Rep',
			amountCents: 100_001,
			currency: 'EUR',
			paidAt: '2026-02-01T10:00:00Z',
			paymentReference: 'pi_test_123',
			link: 'http://127.0.0.1:3000/quotes/9',
			repName: 'Robin Rep'
		});
		expect(rep.subject).toBe('Deposit paid: Harbour , quote Q-9');
		expectNoBidiOverride(rep.subject, rep.text, rep.html);
	});
});

describe('passwordReset', () => {
	it('carries the link and its lifetime', () => {
		const m = passwordReset({ userName: SCRIPT, link: 'http://127.0.0.1:3000/reset/abc', expiresInMinutes: 30 });
		expect(m.subject).toBe('Choose a new Traywise password');
		expect(m.text).toContain('http://127.0.0.1:3000/reset/abc');
		expect(m.text).toContain('the next 30 minutes');
		expect(m.html).not.toContain('<script');
	});
});

describe('formatMoney', () => {
	it('uses the currency minor unit: 1500 yen minor units are ¥1,500 (ISO 4217: JPY has 0 decimals)', () => {
		expect(formatMoney(1500, 'JPY')).toBe('¥1,500');
	});
	it('refuses fractional cents', () => {
		expect(() => formatMoney(10.5, 'EUR')).toThrow(/integer/);
	});
});
