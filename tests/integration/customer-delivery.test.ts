import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { simpleParser } from 'mailparser';
import { BASE, DEMO, client, signIn, type Client } from '../helpers/http';
import { buildQuote, chosenSurvey, quoteState, saveWithDiscount } from '../helpers/scenario';
import { sequelize } from '$lib/server/db';

let rep: Client;
const q = <T extends object>(sql: string, replacements: Record<string, unknown> = {}) =>
	sequelize.query<T>(sql, { replacements, type: QueryTypes.SELECT });

beforeAll(async () => {
	rep = await signIn(DEMO.rep);
});
afterAll(async () => {
	await sequelize.close();
});

async function waitFor<T>(fn: () => Promise<T | null | undefined>, what: string, ms = 20_000): Promise<T> {
	const deadline = Date.now() + ms;
	while (Date.now() < deadline) {
		const v = await fn();
		if (v) return v;
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`timed out waiting for ${what}`);
}

/** A sent quote for a unique contact address; returns the quote id, the link token and the caught mail id. */
async function sentQuote(): Promise<{ quoteId: string; token: string; mailId: string; email: string }> {
	const email = `buyer-${Date.now()}-${Math.random().toString(36).slice(2, 7)}@marlow-crossing.example`;
	const quoteId = await buildQuote(rep, await chosenSurvey(rep, { contactEmail: email }));
	expect((await saveWithDiscount(rep, quoteId, 5, { contactEmail: email })).status).toBe(200);
	for (const action of ['mark-ready', 'send']) {
		const res = await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action });
		expect(res.status, action).toBe(200);
	}
	const mail = await waitFor(
		async () => (await q<{ id: string; text: string }>(`SELECT id, text FROM caught_mail WHERE to_address ILIKE :email ORDER BY received_at`, { email: `%${email}%` }))[0],
		'the quote e-mail in the catcher'
	);
	const token = /\/q\/([A-Za-z0-9_-]{43})/.exec(mail.text)![1];
	return { quoteId, token, mailId: mail.id, email };
}

describe('the quote e-mail', () => {
	it('reaches the SMTP catcher with the private link and the PDF, which is the stored one', async () => {
		const { quoteId, mailId } = await sentQuote();
		const [raw] = await q<{ raw: Buffer }>(`SELECT raw FROM caught_mail WHERE id = :id`, { id: mailId });
		const parsed = await simpleParser(raw.raw);
		expect(parsed.text).toMatch(new RegExp(`${BASE.replace(/[.]/g, '\\.')}/q/[A-Za-z0-9_-]{43}`));
		const pdf = parsed.attachments.find((a) => a.contentType === 'application/pdf');
		expect(pdf).toBeDefined();
		const [rev] = await q<{ pdf_sha256: string }>(`SELECT pdf_sha256 FROM quote_revisions WHERE quote_id = :id`, { id: quoteId });
		expect(createHash('sha256').update(pdf!.content).digest('hex')).toBe(rev.pdf_sha256);
		// only the hash of the token is stored
		const token = /\/q\/([A-Za-z0-9_-]{43})/.exec(parsed.text!)![1];
		const [link] = await q<{ token_hash: string }>(`SELECT token_hash FROM quote_links WHERE quote_id = :id`, { id: quoteId });
		expect(link.token_hash).toBe(createHash('sha256').update(token).digest('hex'));
		expect(Buffer.from(token, 'base64url').length).toBeGreaterThanOrEqual(16); // at least 128 bits
	});
});

describe('the customer link', () => {
	it('a wrong token gets 404 and reveals nothing', async () => {
		const res = await client().get(`/q/${'A'.repeat(43)}`);
		expect(res.status).toBe(404);
		const html = await res.text();
		expect(html).not.toMatch(/TW-\d{4}-\d{6}/);
		expect((await client().get('/q/short')).status).toBe(404);
	});

	it('shows the quote without costs, marks it viewed once however often it is opened', async () => {
		const { quoteId, token } = await sentQuote();
		const page = await client().get(`/q/${token}`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Accept the quote');
		expect(html).not.toMatch(/unitCostCents|costCents|marginBp/);
		for (let i = 0; i < 3; i++) expect((await client().post(`/q/${token}/viewed`, '')).status).toBe(204);
		const views = await q<{ n: string }>(`SELECT count(*) AS n FROM quote_events WHERE quote_id = :id AND action = 'view'`, { id: quoteId });
		expect(Number(views[0].n)).toBe(1);
		expect(await quoteState(quoteId)).toBe('viewed');
		const pdf = await client().get(`/q/${token}/pdf`);
		expect(pdf.headers.get('content-type')).toBe('application/pdf');
	});

	it('names the same days on the page, in the PDF and in the e-mail: the dealer’s calendar, not the reader’s', async () => {
		// a zone whose calendar day differs from UTC's right now (UTC+14 or UTC−11: 25 hours apart)
		const utcDay = new Date().toISOString().slice(0, 10);
		const dayIn = (tz: string) => new Intl.DateTimeFormat('en-CA', { timeZone: tz }).format(new Date());
		const zone = ['Pacific/Kiritimati', 'Pacific/Pago_Pago'].find((tz) => dayIn(tz) !== utcDay)!;
		const [before] = await q<{ time_zone: string }>(`SELECT time_zone FROM company_settings WHERE id = 1`, {});
		await sequelize.query(`UPDATE company_settings SET time_zone = :zone WHERE id = 1`, { replacements: { zone } });
		try {
			const { token, mailId } = await sentQuote();
			const sentDay = new Intl.DateTimeFormat('en-US', { timeZone: zone, year: 'numeric', month: 'long', day: 'numeric' }).format(new Date());
			const html = await (await client().get(`/q/${token}`)).text();
			const pageValid = /Valid until ([A-Z][a-z]+ \d{1,2}, \d{4})/.exec(html)?.[1];
			expect(html).toContain(`sent ${sentDay}`);
			const file = path.join(tmpdir(), `tw-dates-${token.slice(0, 8)}.pdf`);
			writeFileSync(file, Buffer.from(await (await client().get(`/q/${token}/pdf`)).arrayBuffer()));
			const pdf = execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
			expect(pdf).toContain(`Sent ${sentDay}`);
			expect(pageValid).toBeTruthy();
			expect(pdf).toContain(`Valid until ${pageValid}`);
			const [mail] = await q<{ raw: Buffer }>(`SELECT raw FROM caught_mail WHERE id = :id`, { id: mailId });
			expect((await simpleParser(mail.raw)).text).toContain(pageValid);
		} finally {
			await sequelize.query(`UPDATE company_settings SET time_zone = :zone WHERE id = 1`, { replacements: { zone: before.time_zone } });
		}
	});

	it('an expired link gets 410', async () => {
		const { quoteId, token } = await sentQuote();
		await sequelize.query(`UPDATE quote_links SET expires_at = now() - interval '1 minute' WHERE quote_id = :id`, { replacements: { id: quoteId } });
		const res = await client().get(`/q/${token}`);
		expect(res.status).toBe(410);
		expect(await res.text()).not.toMatch(/\$\d/);
	});

	it('a superseded revision’s link gets 410, says a newer one exists, and sends a fresh link to the contact on request', async () => {
		const { quoteId, token, email } = await sentQuote();
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'revise' })).status).toBe(200);
		expect((await saveWithDiscount(rep, quoteId, 6, { contactEmail: email })).status).toBe(200);
		for (const action of ['mark-ready', 'send']) expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action })).status).toBe(200);
		const old = await client().get(`/q/${token}`);
		expect(old.status).toBe(410);
		expect(await old.text()).toContain('newer revision');
		const before = (await q<{ n: string }>(`SELECT count(*) AS n FROM mail_outbox WHERE to_address = :email`, { email }))[0].n;
		// the page's button posts the action as the enhanced form does (the page itself answers 410)
		const fresh = await fetch(`${BASE}/q/${token}?/fresh`, {
			method: 'POST',
			headers: { origin: BASE, 'x-sveltekit-action': 'true', 'content-type': 'application/x-www-form-urlencoded' },
			body: ''
		});
		expect(fresh.status).toBe(200);
		expect((await fresh.json()).type).toBe('success');
		const after = await waitFor(
			async () => {
				const n = (await q<{ n: string }>(`SELECT count(*) AS n FROM mail_outbox WHERE to_address = :email AND kind = 'fresh-link'`, { email }))[0].n;
				return Number(n) > 0 ? n : null;
			},
			'the fresh-link mail'
		);
		expect(Number(after)).toBe(1);
		expect(Number(before)).toBeGreaterThan(0);
	});
});

/** The visible text of a page: no scripts (the page's data), no tags, entities decoded. */
function visibleText(html: string): string {
	return html
		.replace(/<script[\s\S]*?<\/script>/g, ' ')
		.replace(/<[^>]+>/g, ' ')
		.replace(/&amp;/g, '&')
		.replace(/&quot;/g, '"')
		.replace(/&#39;/g, "'")
		.replace(/\s+/g, ' ');
}

describe('what the customer reads', () => {
	it('why the setup fits their site, checks by name, no ranking or cost comparison, no zero discounts', async () => {
		const { token } = await sentQuote();
		const html = await (await client().get(`/q/${token}`)).text();
		const text = visibleText(html);
		expect(text).toContain('Why it fits your site');
		expect(text).toContain('Fit in the compartment');
		expect(text).toMatch(/Passes/);
		// internal words: the engine's check codes and results, its ranking and cost comparisons between setups
		expect(text).not.toMatch(/compartment-fit|battery-weight|handling-capacity|\b(pass|warn|fail)\b/);
		expect(html).not.toMatch(/Ranked (first|second|third|fourth)|would cost|less over \d+ years|more over \d+ years|costOverYears/);
		// the demo quote has line discounts only: no "−$0.00" for the overall one
		expect(text).not.toContain('−$0.00');
		// the two battery lines say which is which
		expect(text).toContain('one fitted in each truck');
		expect(text).toContain('extra batteries for the exchange rotation');
	});

	it('after accepting, lands at the deposit step; back from the payment page without paying, is told the deposit is still due', async () => {
		const { token } = await sentQuote();
		const c = client();
		const ok = await c.action(`/q/${token}?/accept`, { fullName: 'Dana Quillfeather', agree: 'on' });
		expect(ok.status).toBe(303);
		expect(ok.headers.get('location')).toBe(`/q/${token}?accepted=1#deposit`);
		const pay = await c.action(`/q/${token}?/pay`, {});
		expect(pay.status).toBe(303);
		const checkout = await (await fetch(pay.headers.get('location')!)).text();
		// the provider's "go back" link returns to the deposit step with a flag
		expect(checkout).toContain(`/q/${token}?payment=cancelled#deposit`);
		const back = visibleText(await (await c.get(`/q/${token}?payment=cancelled`)).text());
		expect(back).toMatch(/You came back without paying; nothing was charged\. The deposit of \$[\d,]+\.\d\d is still due/);
		expect(await quoteState((await q<{ quote_id: string }>(`SELECT quote_id FROM quote_links WHERE token_hash = encode(sha256(:t::bytea), 'hex')`, { t: token }))[0].quote_id)).toBe('accepted');
	});
});

describe('acceptance and the deposit', () => {
	it('accepting stores name, time, address and the PDF hash; the deposit is paid through the provider and the webhook marks it paid', async () => {
		const { quoteId, token } = await sentQuote();
		const c = client();
		const bad = await c.action(`/q/${token}?/accept`, { fullName: 'D' });
		expect(bad.status).toBe(400);
		expect(await quoteState(quoteId)).toBe('sent');
		const ok = await c.action(`/q/${token}?/accept`, { fullName: 'Dana Quillfeather', agree: 'on' });
		expect(ok.status).toBe(303);
		expect(await quoteState(quoteId)).toBe('accepted');
		const [acc] = await q<{ full_name: string; ip: string; pdf_sha256: string; accepted_at: Date }>(
			`SELECT full_name, ip, pdf_sha256, accepted_at FROM quote_acceptances WHERE quote_id = :id`,
			{ id: quoteId }
		);
		const [rev] = await q<{ pdf_sha256: string; deposit: string }>(
			`SELECT pdf_sha256, totals->>'depositCents' AS deposit FROM quote_revisions WHERE quote_id = :id`,
			{ id: quoteId }
		);
		expect(acc.full_name).toBe('Dana Quillfeather');
		expect(acc.ip).toMatch(/127\.0\.0\.1/);
		expect(acc.pdf_sha256).toBe(rev.pdf_sha256);

		// the pay action creates a hosted checkout through the provider's SDK (here the local fake)
		const pay = await c.action(`/q/${token}?/pay`, {});
		expect(pay.status).toBe(303);
		const checkoutUrl = pay.headers.get('location')!;
		expect(checkoutUrl).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/pay\/cs_test_/);
		const [payment] = await q<{ amount_cents: string; status: string }>(`SELECT amount_cents, status FROM payments WHERE quote_id = :id`, { id: quoteId });
		expect(Number(payment.amount_cents)).toBe(Number(rev.deposit)); // to the cent

		// a declined card leaves the quote accepted and unpaid, with a clear message
		const declined = await fetch(checkoutUrl, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({ card_number: '4000 0000 0000 0002', expiry: '12 / 30', cvc: '123' }),
			redirect: 'manual'
		});
		expect(await declined.text()).toMatch(/declined/i);
		await new Promise((r) => setTimeout(r, 500));
		expect(await quoteState(quoteId)).toBe('accepted');

		// the success card pays; the fake posts the signed event; the quote becomes "deposit paid"
		const paid = await fetch(checkoutUrl, {
			method: 'POST',
			headers: { 'content-type': 'application/x-www-form-urlencoded' },
			body: new URLSearchParams({ card_number: '4242 4242 4242 4242', expiry: '12 / 30', cvc: '123' }),
			redirect: 'manual'
		});
		expect(paid.status).toBe(303);
		expect(paid.headers.get('location')).toContain(`/q/${token}/paid`);
		await waitFor(async () => ((await quoteState(quoteId)) === 'deposit-paid' ? true : null), 'deposit paid');
		const payments = await q<{ amount_cents: string; status: string }>(`SELECT amount_cents, status FROM payments WHERE quote_id = :id`, { id: quoteId });
		expect(payments).toHaveLength(1);
		expect(payments[0]).toMatchObject({ status: 'paid' });
		expect(Number(payments[0].amount_cents)).toBe(Number(rev.deposit));
		const page = await (await client().get(`/q/${token}/paid`)).text();
		expect(page).toContain('Deposit received');
		// receipts to customer and rep are queued
		const receipts = await q<{ n: string }>(`SELECT count(*) AS n FROM mail_outbox WHERE related_id = :id AND kind = 'deposit-receipt'`, { id: quoteId });
		expect(Number(receipts[0].n)).toBe(2);
		// the rep's delivery trail shows every step with a time
		const staff = await (await rep.get(`/quotes/${quoteId}`)).text();
		for (const step of ['queued', 'e-mailed', 'accepted', 'paid']) expect(staff).toMatch(new RegExp(`data-step="${step}" data-done="yes"`));
	});

	it('cannot be marked ready, nor sent, without a contact e-mail address: no approved quote is left with nowhere to go', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep, { contactEmail: '' }));
		expect((await saveWithDiscount(rep, quoteId, 0, { contactEmail: '' })).status).toBe(200);
		// refused while the rep can still add the address, not once the quote is approved and read-only
		const ready = await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' });
		expect(ready.status).toBe(409);
		expect((await ready.json()).message).toMatch(/e-mail address/);
		expect(await quoteState(quoteId)).toBe('draft');
		// an approved revision without an address (stored before this rule) is still never sent
		await sequelize.query(`UPDATE quote_revisions SET state = 'approved' WHERE quote_id = :id`, { replacements: { id: quoteId } });
		const send = await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'send' });
		expect(send.status).toBe(409);
		expect((await send.json()).message).toMatch(/e-mail/);
		expect(await quoteState(quoteId)).toBe('approved');
	});
});
