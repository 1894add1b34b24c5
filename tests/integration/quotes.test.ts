import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { DEMO, client, signIn, type Client } from '../helpers/http';
import { buildQuote, chosenSurvey, enhancedAction, quoteLines, quoteState, saveWithDiscount, siteIds } from '../helpers/scenario';
import { sequelize } from '$lib/server/db';
import { allPriceItems, createDraftVersion, getActivePriceBook, publishVersion } from '$lib/server/repositories/pricing';
import { getQuote } from '$lib/server/repositories/quotes';
import { buildQuotePdf } from '$lib/server/pdf/quote-pdf';
import { pdfSettings } from '$lib/server/quotes/workflow';

const ARTIFACTS = process.env.ARTIFACTS_DIR ?? 'artifacts';
let rep: Client;
let manager: Client;

beforeAll(async () => {
	rep = await signIn(DEMO.rep);
	manager = await signIn(DEMO.manager);
});
afterAll(async () => {
	await sequelize.close();
});

function pdfText(pdf: Buffer, name: string): string {
	mkdirSync(path.join(ARTIFACTS, 'pdf'), { recursive: true });
	const file = path.join(ARTIFACTS, 'pdf', `${name}.pdf`);
	writeFileSync(file, pdf);
	return execFileSync('pdftotext', ['-layout', file, '-'], { encoding: 'utf8' });
}

describe('building and pricing a quote', () => {
	it('builds revision 1 from the chosen setup, priced on the active price book', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const lines = await quoteLines(quoteId);
		expect(lines[0]).toMatchObject({ sku: 'TW-B4-25', quantity: 6 });
		expect(lines[1]).toMatchObject({ sku: 'TW-B48-775-LA', quantity: 6 });
		// hoist exchange: 3 batteries per truck → 6 × 2 extra batteries (common practice, "8-8-8")
		expect(lines.find((l) => l.sku === 'TW-B48-775-LA' && l.quantity === 12)).toBeDefined();
		expect(lines.some((l) => l.sku === 'TW-FREIGHT')).toBe(true);
		expect(await quoteState(quoteId)).toBe('draft');
	});

	it('keeps the price-book version it was priced on after a new version is published', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const before = await quoteLines(quoteId);
		const active = (await getActivePriceBook())!;
		const items = (await allPriceItems(active.id)).map((i) => (i.sku === 'TW-B4-25' ? { ...i, listCents: i.listCents + 123_45 } : i));
		const draft = await createDraftVersion({ label: `Test raise ${Date.now()}`, effectiveDate: '2026-12-01', createdBy: null, items });
		expect((await publishVersion(draft, null)).ok).toBe(true);

		// the existing quote, even re-saved, keeps its prices; a new quote takes the new ones
		expect((await saveWithDiscount(rep, quoteId, 0)).status).toBe(200);
		const after = await quoteLines(quoteId);
		expect(after.find((l) => l.sku === 'TW-B4-25')!.unit_list_cents).toBe(before.find((l) => l.sku === 'TW-B4-25')!.unit_list_cents);
		const fresh = await quoteLines(await buildQuote(rep, await chosenSurvey(rep)));
		expect(Number(fresh.find((l) => l.sku === 'TW-B4-25')!.unit_list_cents)).toBe(Number(before.find((l) => l.sku === 'TW-B4-25')!.unit_list_cents) + 123_45);
	});

	it('a double tap on "Build the quote" makes one quote', async () => {
		const surveyId = await chosenSurvey(rep);
		const token = crypto.randomUUID();
		const [a, b] = await Promise.all([buildQuote(rep, surveyId, token), buildQuote(rep, surveyId, token)]);
		expect(a).toBe(b);
	});

	it('refuses a price from the browser: only SKUs of the quote’s price book', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const res = await rep.action(`/quotes/${quoteId}?/save`, {
			payload: JSON.stringify({ lines: [{ sku: 'NOT-A-SKU', quantity: 1, discountPercent: 0 }], overallDiscountPercent: 0, taxRegion: null, notes: '', contactName: '', contactEmail: '' })
		});
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('NOT-A-SKU');
		const bad = await rep.action(`/quotes/${quoteId}?/save`, { payload: '{"lines": "all of them"}' });
		expect(bad.status).toBe(400);
	});
});

describe('approval and sending', () => {
	it('a rep over their authority cannot approve or send; a manager approves; then the rep sends and the PDF is stored', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		// 15 % off every line is above the demo rep authority of 10 % (company settings)
		expect((await saveWithDiscount(rep, quoteId, 15)).status).toBe(200);
		const [rev] = await sequelize.query<{ approval_required: boolean }>(
			`SELECT approval_required FROM quote_revisions WHERE quote_id = :id`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		);
		expect(rev.approval_required).toBe(true);

		const tryAction = (c: Client, action: string, comment?: string) => c.post(`/api/v1/quotes/${quoteId}/actions`, { action, comment });
		expect((await tryAction(rep, 'mark-ready')).status).toBe(409);
		const send = await tryAction(rep, 'send');
		expect(send.status).toBe(409);
		expect((await send.json()).message).toMatch(/approv/i);
		expect((await tryAction(rep, 'submit')).status).toBe(200);
		expect((await tryAction(rep, 'approve')).status).toBe(403);
		expect(await quoteState(quoteId)).toBe('awaiting-approval');
		// the manager sends it back with a comment, the rep resubmits, the manager approves
		expect((await tryAction(manager, 'request-changes')).status).toBe(409); // a comment is required
		expect((await tryAction(manager, 'request-changes', 'Hold the discount on the trucks at 12 %.')).status).toBe(200);
		expect(await quoteState(quoteId)).toBe('changes-requested');
		expect((await tryAction(rep, 'submit')).status).toBe(200);
		expect((await tryAction(manager, 'approve')).status).toBe(200);
		expect((await tryAction(rep, 'send')).status).toBe(200);
		expect(await quoteState(quoteId)).toBe('sent');

		const [stored] = await sequelize.query<{ pdf_sha256: string; number: string }>(
			`SELECT pdf_sha256, number FROM quote_revisions WHERE quote_id = :id`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		);
		const first = Buffer.from(await (await rep.get(`/quotes/${quoteId}/pdf`)).arrayBuffer());
		const second = Buffer.from(await (await manager.get(`/quotes/${quoteId}/pdf`)).arrayBuffer());
		expect(first.equals(second)).toBe(true);
		expect(createHash('sha256').update(first).digest('hex')).toBe(stored.pdf_sha256);

		// every transition is recorded with who and when
		const events = await sequelize.query<{ action: string; actor_role: string }>(
			`SELECT action, actor_role FROM quote_events WHERE quote_id = :id ORDER BY id`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		);
		expect(events.map((e) => `${e.action}:${e.actor_role}`)).toEqual([
			'create:rep', 'submit:rep', 'request-changes:manager', 'submit:rep', 'approve:manager', 'send:rep'
		]);

		// the PDF carries the number, the totals, the checks' numbers in both systems and the cautions
		const text = pdfText(first, stored.number);
		expect(text).toContain(stored.number);
		const view = await getQuote(quoteId, null);
		if (!view.ok) throw new Error('quote missing');
		const totals = view.value.revision.totals;
		const usd = new Intl.NumberFormat('en-US', { style: 'currency', currency: 'USD' });
		expect(text).toContain(usd.format(totals.totalCents / 100));
		expect(text).toContain(usd.format(totals.depositCents / 100));
		expect(text).toMatch(/1 150 mm \(45\.3 in\)/); // the forks measured: 1 150 mm = 45.28 in (1 in = 25.4 mm)
		expect(text).toMatch(/Local codes/);
		expect(text).toMatch(/Page 1 of \d/);
		mkdirSync(path.join(ARTIFACTS, 'pdf'), { recursive: true });
		execFileSync('pdftoppm', ['-png', '-r', '70', '-f', '1', '-l', '2', path.join(ARTIFACTS, 'pdf', `${stored.number}.pdf`), path.join(ARTIFACTS, 'pdf', `${stored.number}-page`)]);

		// a sent quote is edited through a new revision; the old one is superseded
		expect((await saveWithDiscount(rep, quoteId, 5)).status).toBe(409);
		expect((await tryAction(rep, 'revise')).status).toBe(200);
		const revs = await sequelize.query<{ revision: number; state: string; number: string }>(
			`SELECT revision, state, number FROM quote_revisions WHERE quote_id = :id ORDER BY revision`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		);
		expect(revs.map((r) => [r.revision, r.state])).toEqual([[1, 'superseded'], [2, 'draft']]);
		expect(revs[1].number).toBe(`${revs[0].number}-R2`);
	});

	it('a quote within authority is marked ready without a manager', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		expect((await saveWithDiscount(rep, quoteId, 5)).status).toBe(200);
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' })).status).toBe(200);
		expect(await quoteState(quoteId)).toBe('approved');
	});

	it('a rep of another team cannot see the quote', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const other = await signIn(DEMO.rep2);
		expect((await other.get(`/quotes/${quoteId}`)).status).toBe(403);
		expect((await other.get(`/api/v1/quotes/${quoteId}/actions`)).status).toBe(403);
		expect((await other.get(`/quotes/${quoteId}/pdf`)).status).toBe(403);
		expect(await (await other.get('/quotes')).text()).not.toContain(quoteId);
		expect((await manager.get(`/quotes/${quoteId}`)).status).toBe(200);
	});
});

describe('the quote page', () => {
	it('runs the same number of SQL statements for 5 lines and for 50', async () => {
		const items = (await allPriceItems((await getActivePriceBook())!.id)).filter((i) => i.listCents > 0);
		const counts: number[] = [];
		for (const n of [5, 50]) {
			const quoteId = await buildQuote(rep, await chosenSurvey(rep));
			const lines = Array.from({ length: n }, (_, i) => ({ sku: items[i % items.length].sku, quantity: 1, discountPercent: 0 }));
			const saved = await rep.action(`/quotes/${quoteId}?/save`, {
				payload: JSON.stringify({ lines, overallDiscountPercent: 0, taxRegion: 'WA', notes: '', contactName: '', contactEmail: '' })
			});
			expect(saved.status).toBe(200);
			expect(await quoteLines(quoteId)).toHaveLength(n);
			const page = await rep.get(`/quotes/${quoteId}`);
			expect(page.status).toBe(200);
			counts.push(Number(page.headers.get('x-sql-queries')));
		}
		expect(counts[0]).toBeGreaterThan(0);
		expect(counts[1]).toBe(counts[0]);
	});
});

describe('hostile text in the PDF', () => {
	it('prints markup and right-to-left marks as visible text', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const view = await getQuote(quoteId, null);
		if (!view.ok) throw new Error('quote missing');
		const hostile = { ...view.value, customerName: '<script>alert(1)</script> \u202Egnp.exe' };
		const text = pdfText(await buildQuotePdf(hostile, await pdfSettings()), 'hostile');
		expect(text).toContain('<script>alert(1)</script>');
		expect(text).toContain('[U+202E]gnp.exe');
	});
});

/** The private link's token from the quote e-mail the SMTP catcher stored for `email`. */
async function mailedToken(email: string): Promise<string> {
	for (let i = 0; i < 100; i++) {
		const rows = await sequelize.query<{ text: string }>(`SELECT text FROM caught_mail WHERE to_address ILIKE :email ORDER BY received_at`, {
			replacements: { email: `%${email}%` },
			type: QueryTypes.SELECT
		});
		const m = rows[0] && /\/q\/([A-Za-z0-9_-]{43})/.exec(rows[0].text);
		if (m) return m[1];
		await new Promise((r) => setTimeout(r, 200));
	}
	throw new Error(`no quote e-mail reached ${email}`);
}

/** The visible text of a page: no scripts (the page's data), no tags, entities decoded. */
function visibleText(html: string): string {
	return html
		.replace(/<script[\s\S]*?<\/script>/g, ' ')
		.replace(/<[^>]+>/g, ' ')
		.replace(/&amp;/g, '&')
		.replace(/&quot;/g, '"')
		.replace(/&#39;/g, "'")
		.replace(/&lt;/g, '<')
		.replace(/&gt;/g, '>')
		.replace(/\s+/g, ' ');
}

const payloadOf = (lines: { sku: string; quantity: unknown; discountPercent: unknown }[], extra: Record<string, unknown> = {}) =>
	JSON.stringify({ lines, overallDiscountPercent: 0, taxRegion: 'WA', notes: '', contactName: 'Dana Quillfeather', contactEmail: 'dana.q@marlow-crossing.example', ...extra });

describe('a refused save', () => {
	it('names the line, the field and the range, keeps the stored draft as it was, and sends the field errors', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const before = await quoteLines(quoteId);
		// the reviewer's edit: a quantity up, an overall discount, a note, and 150 % off the second line
		const lines = before.map((l, i) => ({ sku: l.sku, quantity: i === 0 ? l.quantity + 2 : l.quantity, discountPercent: i === 1 ? 150 : 0 }));
		const res = await enhancedAction(rep, `/quotes/${quoteId}?/save`, { payload: payloadOf(lines, { overallDiscountPercent: 3, notes: 'Two deliveries.' }) });
		expect(res.type).toBe('failure');
		expect(res.status).toBe(400);
		expect(res.data!.error).toBe(`Line 2 (${before[1].sku}), discount: A discount cannot exceed 100 %: enter 0 to 100 %.`);
		expect(res.data!.errors).toEqual({ 'lines.1.discountPercent': ['A discount cannot exceed 100 %: enter 0 to 100 %.'] });
		// nothing of the refused edit was stored
		expect(await quoteLines(quoteId)).toEqual(before);
		const [rev] = await sequelize.query<{ notes: string; overall_discount_bp: number }>(
			`SELECT notes, overall_discount_bp FROM quote_revisions WHERE quote_id = :id`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		);
		expect(rev).toEqual({ notes: '', overall_discount_bp: 0 });
	});

	it('answers every odd edit with a 400 that says which field, never a 500', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const base = (await quoteLines(quoteId)).map((l) => ({ sku: l.sku, quantity: l.quantity, discountPercent: 0 }));
		const withLine = (i: number, change: Record<string, unknown>) => base.map((l, j) => (j === i ? { ...l, ...change } : l));
		const cases: [string, string, string][] = [
			['negative quantity', payloadOf(withLine(0, { quantity: -1 })), 'lines.0.quantity'],
			['fractional quantity', payloadOf(withLine(2, { quantity: 2.5 })), 'lines.2.quantity'],
			['empty quantity', payloadOf(withLine(1, { quantity: null })), 'lines.1.quantity'],
			['text quantity', payloadOf(withLine(1, { quantity: 'twelve' })), 'lines.1.quantity'],
			['huge quantity', payloadOf(withLine(0, { quantity: 1e12 })), 'lines.0.quantity'],
			['negative discount', payloadOf(withLine(3, { discountPercent: -5 })), 'lines.3.discountPercent'],
			['empty discount', payloadOf(withLine(3, { discountPercent: null })), 'lines.3.discountPercent'],
			['overall over 100', payloadOf(base, { overallDiscountPercent: 101 }), 'overallDiscountPercent'],
			['bad e-mail', payloadOf(base, { contactEmail: 'dana at marlow' }), 'contactEmail'],
			['region without a rate', payloadOf(base, { taxRegion: 'ZZ-NONE' }), 'taxRegion'],
			['unknown SKU', payloadOf(withLine(4, { sku: 'NOT-A-SKU' })), 'lines.4.sku'],
			['lines not a list', payloadOf([], { lines: 'all of them' }), 'lines'],
			['no lines', payloadOf([]), 'lines']
		];
		for (const [what, payload, field] of cases) {
			const res = await enhancedAction(rep, `/quotes/${quoteId}?/save`, { payload });
			expect(res.type, what).toBe('failure');
			expect(res.status, what).toBe(400);
			expect(Object.keys(res.data!.errors as object), what).toContain(field);
			expect(String(res.data!.error), what).toMatch(field.startsWith('lines.') ? /^Line \d+/ : /\w/);
		}
		for (const payload of ['not json', '', 'null', '[]', '{"lines": [{"sku": {}, "quantity": 1, "discountPercent": 0}]}']) {
			const res = await rep.action(`/quotes/${quoteId}?/save`, { payload });
			expect(res.status, payload).toBe(400);
		}
		// the live totals answer the same way
		const totals = await rep.post(`/api/v1/quotes/${quoteId}/totals`, JSON.parse(payloadOf(withLine(1, { discountPercent: 150 }))));
		expect(totals.status).toBe(400);
		const body = await totals.json();
		expect(body.errors).toHaveProperty(['lines.1.discountPercent']);
		expect(body.message).toMatch(/^Line 2 /);
	});
});

describe('what a quote needs before it leaves the rep', () => {
	it('refuses submit and mark-ready without a contact name or a valid e-mail, and the page says so first', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep, { contactEmail: '' }));
		const tryAction = (action: string) => rep.post(`/api/v1/quotes/${quoteId}/actions`, { action });
		expect((await saveWithDiscount(rep, quoteId, 0, { contactName: '', contactEmail: '' })).status).toBe(200);
		const ready = await tryAction('mark-ready');
		expect(ready.status).toBe(409);
		const message = (await ready.json()).message;
		expect(message).toMatch(/^Before this quote can be marked ready to send: /);
		expect(message).toMatch(/contact's name/);
		expect(message).toMatch(/e-mail address/);
		// the page lists the same before the rep taps, and the button is not live
		const page = await (await rep.get(`/quotes/${quoteId}`)).text();
		expect(page).toContain('data-testid="readiness"');
		expect(visibleText(page)).toContain("Add the customer contact's e-mail address");
		expect(page).toMatch(/<button[^>]*disabled[^>]*>Mark ready to send<\/button>/);

		// over authority, submit is refused the same way
		expect((await saveWithDiscount(rep, quoteId, 15, { contactName: 'Dana Quillfeather', contactEmail: 'not-an-address' })).status).toBe(400);
		expect((await saveWithDiscount(rep, quoteId, 15, { contactName: 'Dana Quillfeather', contactEmail: '' })).status).toBe(200);
		const submit = await tryAction('submit');
		expect(submit.status).toBe(409);
		expect((await submit.json()).message).toMatch(/^Before this quote can be submitted for approval: .*e-mail address/);
		expect(await quoteState(quoteId)).toBe('draft');

		expect((await saveWithDiscount(rep, quoteId, 15)).status).toBe(200);
		expect((await tryAction('submit')).status).toBe(200);
		expect(await quoteState(quoteId)).toBe('awaiting-approval');
	});

	it('a site region without a tax rate is undecided until the rep picks a rate or "No tax / exempt"; the customer then sees no tax line', async () => {
		// Pellham Freight Yard's site is in region EU-DE, which the demo tax table lacks (seed-data/customers.json, seed.ts)
		const site = await siteIds('Pellham Freight Yard', 'Yard and cross-dock');
		const email = `tax-${Date.now()}@pellham.example`;
		const quoteId = await buildQuote(rep, await chosenSurvey(rep, { site, contactEmail: email }));
		const [rev] = await sequelize.query<{ tax_region: string; tax_label: string | null; tax_rate_bp: number }>(
			`SELECT tax_region, tax_label, tax_rate_bp FROM quote_revisions WHERE quote_id = :id`,
			{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
		);
		expect(rev).toEqual({ tax_region: 'EU-DE', tax_label: null, tax_rate_bp: 0 });
		const draft = await (await rep.get(`/quotes/${quoteId}`)).text();
		expect(draft).toContain('data-testid="tax-undecided"');
		expect(visibleText(draft)).toContain('The site\'s region “EU-DE” has no tax rate in the settings');
		const ready = await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' });
		expect(ready.status).toBe(409);
		expect((await ready.json()).message).toMatch(/“EU-DE” has no tax rate/);
		// saving other edits keeps the region undecided rather than refusing the save
		const lines = (await quoteLines(quoteId)).map((l) => ({ sku: l.sku, quantity: l.quantity, discountPercent: 0 }));
		const keep = { contactName: 'Dana Quillfeather', contactEmail: email, notes: 'Yard delivery.' };
		expect((await rep.action(`/quotes/${quoteId}?/save`, { payload: payloadOf(lines, { ...keep, taxRegion: 'EU-DE' }) })).status).toBe(200);
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' })).status).toBe(409);

		// the rep decides: no tax
		expect((await rep.action(`/quotes/${quoteId}?/save`, { payload: payloadOf(lines, { ...keep, taxRegion: null }) })).status).toBe(200);
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'mark-ready' })).status).toBe(200);
		const review = visibleText(await (await manager.get(`/quotes/${quoteId}`)).text());
		expect(review).toContain('No tax / exempt, chosen by the rep (the site\'s region “EU-DE” has no tax rate in the settings)');
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'send' })).status).toBe(200);

		// the customer's page and the PDF print no tax line, as the settings page says
		const settings = visibleText(await (await (await signIn(DEMO.admin)).get('/admin/settings')).text());
		expect(settings).toMatch(/gets no tax line/);
		const token = await mailedToken(email);
		const customer = visibleText(await (await client().get(`/q/${token}`)).text());
		expect(customer).toContain('Total');
		expect(customer).not.toMatch(/\bTax\b/);
		const pdf = pdfText(Buffer.from(await (await rep.get(`/quotes/${quoteId}/pdf`)).arrayBuffer()), 'no-tax');
		expect(pdf).toContain('Total');
		expect(pdf).not.toMatch(/\bTax\b/);
	});
});

describe('one battery on two lines', () => {
	it('reads as the batteries in the trucks and the extra ones, on the quote, after a save, on the customer page and in the PDF; counts and totals unchanged', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const lines = await quoteLines(quoteId);
		const batteries = lines.filter((l) => l.sku === 'TW-B48-775-LA');
		expect(batteries).toHaveLength(2);
		expect(batteries[0].description).not.toBe(batteries[1].description);
		expect(batteries[0].description).toMatch(/one fitted in each truck$/);
		expect(batteries[1].description).toMatch(/extra batteries for the exchange rotation$/);
		// 6 trucks × 3 batteries per truck on the demo's three shifts (the engine's rotation, common practice)
		expect(batteries.map((b) => b.quantity)).toEqual([6, 12]);

		// a save keeps each line's own words (the SKU is the same on both)
		expect((await saveWithDiscount(rep, quoteId, 5)).status).toBe(200);
		const saved = await quoteLines(quoteId);
		expect(saved.filter((l) => l.sku === 'TW-B48-775-LA').map((l) => l.description)).toEqual(batteries.map((b) => b.description));
		const view = await getQuote(quoteId, null);
		if (!view.ok) throw new Error('quote missing');
		const t = view.value.revision.totals;
		expect(t.listCents).toBe(saved.reduce((sum, l) => sum + l.quantity * Number(l.unit_list_cents), 0));

		const text = pdfText(await buildQuotePdf(view.value, await pdfSettings()), 'battery-lines');
		// (a long description wraps inside its column)
		expect(text).toContain('one fitted in each truck');
		expect(text).toMatch(/extra batteries for the\s[\s\S]*exchange rotation/);
	});
});

describe('what the manager and the rep see', () => {
	it('the manager reviews contact, e-mail, notes and tax read-only, and whose authority it is; the rep sees the comment at the top; history uses the badge words', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		expect((await saveWithDiscount(rep, quoteId, 15, { notes: 'Deliver to dock 4.' })).status).toBe(200);
		const repPage = visibleText(await (await rep.get(`/quotes/${quoteId}`)).text());
		expect(repPage).toContain('Your discount authority as a rep: 10%');
		expect((await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'submit' })).status).toBe(200);

		const review = await (await manager.get(`/quotes/${quoteId}`)).text();
		const words = visibleText(review);
		expect(review).toContain('data-testid="quote-details"');
		for (const shown of ['Dana Quillfeather', 'dana.q@marlow-crossing.example', 'Deliver to dock 4.', 'Washington sites']) expect(words).toContain(shown);
		expect(words).toContain("A rep's discount authority: 10%");
		expect(words).not.toContain('Your authority');
		expect(words).not.toMatch(/Your discount authority/);

		const comment = 'Hold the truck discount at 12 %.';
		expect((await manager.post(`/api/v1/quotes/${quoteId}/actions`, { action: 'request-changes', comment })).status).toBe(200);
		const back = await (await rep.get(`/quotes/${quoteId}`)).text();
		const banner = back.indexOf('data-testid="change-request"');
		expect(banner).toBeGreaterThan(0);
		expect(banner).toBeLessThan(back.indexOf('id="lines-h"'));
		expect(visibleText(back.slice(banner, back.indexOf('id="lines-h"')))).toContain(`“${comment}”`);
		const history = visibleText(back.slice(back.indexOf('data-testid="history"')));
		expect(history).toContain('Draft → Awaiting approval');
		expect(history).toContain('Awaiting approval → Changes requested');
		expect(history).not.toMatch(/awaiting-approval|changes-requested|draft →/);
	});

	it('a quote marked ready within authority is "Ready to send", one a manager approved is "Approved"', async () => {
		const ready = await buildQuote(rep, await chosenSurvey(rep));
		expect((await saveWithDiscount(rep, ready, 5)).status).toBe(200);
		expect((await rep.post(`/api/v1/quotes/${ready}/actions`, { action: 'mark-ready' })).status).toBe(200);
		const readyPage = await (await rep.get(`/quotes/${ready}`)).text();
		expect(readyPage).toMatch(/data-testid="quote-state" data-state="approved"[^>]*>Ready to send</);
		expect(visibleText(readyPage)).toContain('Draft → Ready to send');

		const approved = await buildQuote(rep, await chosenSurvey(rep));
		expect((await saveWithDiscount(rep, approved, 15)).status).toBe(200);
		expect((await rep.post(`/api/v1/quotes/${approved}/actions`, { action: 'submit' })).status).toBe(200);
		const queue = visibleText(await (await manager.get('/approvals')).text());
		// why it needs approval and how long it has waited
		expect(queue).toMatch(/above the rep's discount authority of 10%/);
		expect(queue).toMatch(/Waiting (less than a minute|\d+ min)/);
		expect((await manager.post(`/api/v1/quotes/${approved}/actions`, { action: 'approve' })).status).toBe(200);
		expect(await (await rep.get(`/quotes/${approved}`)).text()).toMatch(/data-state="approved"[^>]*>Approved</);
	});
});

describe('the PDF price table', () => {
	/** Word boxes of a PDF page (pdftotext -bbox): text, x and y in points. */
	function words(pdf: Buffer, name: string): { page: number; text: string; xMin: number; xMax: number; yMin: number }[] {
		mkdirSync(path.join(ARTIFACTS, 'pdf'), { recursive: true });
		const file = path.join(ARTIFACTS, 'pdf', `${name}.pdf`);
		writeFileSync(file, pdf);
		const html = execFileSync('pdftotext', ['-bbox', file, '-'], { encoding: 'utf8' });
		const out: { page: number; text: string; xMin: number; xMax: number; yMin: number }[] = [];
		let page = 0;
		for (const line of html.split('\n')) {
			if (line.includes('<page ')) page++;
			const m = /<word xMin="([\d.]+)" yMin="([\d.]+)" xMax="([\d.]+)" yMax="[\d.]+">([^<]*)<\/word>/.exec(line);
			if (m) out.push({ page, text: m[4], xMin: Number(m[1]), yMin: Number(m[2]), xMax: Number(m[3]) });
		}
		return out;
	}

	it('right-aligns each number column under its header and repeats the header on the next page', async () => {
		const quoteId = await buildQuote(rep, await chosenSurvey(rep));
		const view = await getQuote(quoteId, null);
		if (!view.ok) throw new Error('quote missing');
		// enough lines to run the table over a page break
		const many = { ...view.value, lines: Array.from({ length: 6 }, () => view.value.lines).flat() };
		const ws = words(await buildQuotePdf(many, await pdfSettings()), 'price-columns');
		const headers = ws.filter((w) => w.text === 'Qty');
		expect(headers.length).toBeGreaterThanOrEqual(2); // the first page of the table and its continuation
		expect(ws.some((w) => w.text === '(continued)')).toBe(true);
		for (const qty of headers) {
			const row = ws.filter((w) => w.page === qty.page && Math.abs(w.yMin - qty.yMin) < 1);
			const unit = row.find((w) => w.text === 'Unit')!;
			const amount = row.find((w) => w.text === 'Amount')!;
			expect(unit.xMin - qty.xMax).toBeGreaterThan(6); // "Qty" and "Unit price" apart
			// the numbers under each right-aligned header end where the header ends
			const below = ws.filter((w) => w.page === qty.page && w.yMin > qty.yMin + 5 && w.yMin < qty.yMin + 120);
			const quantities = below.filter((w) => /^\d+$/.test(w.text) && w.xMax < unit.xMin && w.xMin > qty.xMin - 30);
			const amounts = below.filter((w) => /^\$[\d,]+\.\d\d$/.test(w.text) && w.xMin > unit.xMax + 40);
			expect(quantities.length).toBeGreaterThan(2);
			expect(amounts.length).toBeGreaterThan(2);
			for (const q of quantities) expect(Math.abs(q.xMax - qty.xMax)).toBeLessThan(1.5);
			for (const a of amounts) expect(Math.abs(a.xMax - amount.xMax)).toBeLessThan(1.5);
		}
		// checks by name, results in words, no ranking or cost comparison
		const text = ws.map((w) => w.text).join(' ');
		expect(text).not.toMatch(/compartment-fit|battery-weight|\bPASS\b|Ranked|would cost|\(rank \d/);
		expect(text).toMatch(/Fit in the compartment/);
		execFileSync('pdftoppm', ['-png', '-r', '70', path.join(ARTIFACTS, 'pdf', 'price-columns.pdf'), path.join(ARTIFACTS, 'pdf', 'price-columns-page')]);
	});
});
