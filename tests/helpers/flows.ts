/**
 * The demo scenario as HTTP flows, without vitest: a survey with a chosen setup, a quote built from
 * it, its lines saved, and the quote sent. Shared by the load test and `npm run bench` (which runs
 * under tsx, so this file uses relative imports only and throws plain errors).
 */
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { sequelize } from '../../src/lib/server/db';
import { allPriceItems, getActivePriceBook } from '../../src/lib/server/repositories/pricing';
import type { Client } from './http';
import { demoSurveySteps, type DemoIds } from './survey-steps';

export { demoSurveySteps, type DemoIds };


/** Ids of the demo scenario: Marlow Crossing Cold Store's freezer halls, Basalt 4 · 2.5 t, 775 Ah battery. */
export async function demoScenarioIds(): Promise<DemoIds> {
	const [c] = await sequelize.query<{ id: string; site_id: string }>(
		`SELECT c.id, s.id AS site_id FROM customers c JOIN sites s ON s.customer_id = c.id
		 WHERE c.name = 'Marlow Crossing Cold Store' AND s.name = 'Freezer halls'`,
		{ type: QueryTypes.SELECT }
	);
	const [t] = await sequelize.query<{ id: string }>(
		`SELECT id FROM truck_models WHERE code = 'TW-B4-25'`,
		{
			type: QueryTypes.SELECT
		}
	);
	const [b] = await sequelize.query<{ id: string }>(
		`SELECT id FROM batteries WHERE code = 'TW-B48-775-LA'`,
		{
			type: QueryTypes.SELECT
		}
	);
	if (!c || !t || !b)
		throw new Error('the demo customer, truck or battery is missing: run the seed first');
	return { customerId: c.id, siteId: c.site_id, truckId: t.id, batteryId: b.id };
}


function expectStatus(res: Response, status: number, what: string): void {
	if (res.status !== status) throw new Error(`${what}: expected HTTP ${status}, got ${res.status}`);
}

/** Starts a survey for the demo site through the "new survey" action; returns its id. */
export async function startSurvey(rep: Client): Promise<string> {
	const ids = await demoScenarioIds();
	const start = await rep.action('/surveys?/start', {
		customerId: ids.customerId,
		siteId: ids.siteId,
		clientToken: randomUUID()
	});
	expectStatus(start, 303, 'start a survey');
	const id = /\/surveys\/([0-9a-f-]{36})\//.exec(start.headers.get('location') ?? '')?.[1];
	if (!id) throw new Error('start a survey: no survey id in the redirect');
	return id;
}

/** A complete survey of the demo scenario with the hoist-exchange setup chosen; returns its id. */
export async function demoChosenSurvey(
	rep: Client,
	opts: { trucks?: number; contactEmail?: string } = {}
): Promise<string> {
	const id = await startSurvey(rep);
	for (const [step, values] of Object.entries(demoSurveySteps(await demoScenarioIds(), opts))) {
		expectStatus(
			await rep.post(`/api/v1/surveys/${id}`, { step, values }, { method: 'PATCH' }),
			200,
			`save step ${step}`
		);
	}
	expectStatus(
		await rep.action(`/surveys/${id}/recommendation?/choose`, { setup: 'overhead-hoist' }),
		303,
		'choose a setup'
	);
	return id;
}

/** Builds a quote from a chosen survey through the recommendation screen's action; returns its id. */
export async function demoQuote(rep: Client, surveyId: string): Promise<string> {
	const res = await rep.action(`/surveys/${surveyId}/recommendation?/quote`, {
		clientToken: randomUUID()
	});
	expectStatus(res, 303, 'build a quote');
	const id = /\/quotes\/([0-9a-f-]{36})$/.exec(res.headers.get('location') ?? '')?.[1];
	if (!id) throw new Error('build a quote: no quote id in the redirect');
	return id;
}

export interface DraftLine {
	sku: string;
	quantity: number;
	discountPercent: number;
}

/** The latest revision's lines as the draft editor sends them back (no discount). */
export async function currentLines(quoteId: string): Promise<DraftLine[]> {
	const rows = await sequelize.query<{ sku: string; quantity: number }>(
		`SELECT l.sku, l.quantity FROM quote_lines l JOIN quote_revisions r ON r.id = l.revision_id
		 WHERE r.quote_id = :id AND r.revision = (SELECT max(revision) FROM quote_revisions WHERE quote_id = :id)
		 ORDER BY l.position`,
		{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
	);
	return rows.map((r) => ({ sku: r.sku, quantity: Number(r.quantity), discountPercent: 0 }));
}

/** `n` lines, one of each SKU of the active price book in turn, quantity 1, no discount. */
export async function priceBookLines(n: number): Promise<DraftLine[]> {
	const active = await getActivePriceBook();
	const items = active ? await allPriceItems(active.id) : [];
	if (items.length === 0) throw new Error('no active price book with items: run the seed first');
	return Array.from({ length: n }, (_, i) => ({
		sku: items[i % items.length].sku,
		quantity: 1,
		discountPercent: 0
	}));
}

/** Saves the draft with these lines and a customer contact; no discount, so no approval is needed. */
export async function saveDraft(
	rep: Client,
	quoteId: string,
	lines: DraftLine[],
	contactEmail: string
): Promise<void> {
	const payload = {
		lines,
		overallDiscountPercent: 0,
		taxRegion: 'WA',
		notes: '',
		contactName: 'Dana Quillfeather',
		contactEmail
	};
	expectStatus(
		await rep.action(`/quotes/${quoteId}?/save`, { payload: JSON.stringify(payload) }),
		200,
		'save the draft'
	);
}

/** Marks a draft that needs no approval ready and sends it to the customer. */
export async function sendQuote(rep: Client, quoteId: string): Promise<void> {
	for (const action of ['mark-ready', 'send']) {
		expectStatus(
			await rep.post(`/api/v1/quotes/${quoteId}/actions`, { action }),
			200,
			`quote action ${action}`
		);
	}
}
