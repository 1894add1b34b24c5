import { execFileSync } from 'node:child_process';
import { createHash } from 'node:crypto';
import { mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { DEMO, signIn, type Client } from '../helpers/http';
import { buildQuote, chosenSurvey, quoteLines, quoteState, saveWithDiscount } from '../helpers/scenario';
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
