import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { expect } from 'vitest';
import { sequelize } from '$lib/server/db';
import type { Client } from './http';
import { demoSurveySteps } from './survey-steps';

/** Ids of the demo scenario: Marlow Crossing Cold Store's freezer halls, Basalt 4 · 2.5 t, 775 Ah battery. */
export async function demoIds() {
	const [c] = await sequelize.query<{ id: string; site_id: string }>(
		`SELECT c.id, s.id AS site_id FROM customers c JOIN sites s ON s.customer_id = c.id
		 WHERE c.name = 'Marlow Crossing Cold Store' AND s.name = 'Freezer halls'`,
		{ type: QueryTypes.SELECT }
	);
	const [t] = await sequelize.query<{ id: string }>(`SELECT id FROM truck_models WHERE code = 'TW-B4-25'`, { type: QueryTypes.SELECT });
	const [b] = await sequelize.query<{ id: string }>(`SELECT id FROM batteries WHERE code = 'TW-B48-775-LA'`, { type: QueryTypes.SELECT });
	return { customerId: c.id, siteId: c.site_id, truckId: t.id, batteryId: b.id };
}

/** Ids of another demo customer's site (seed-data/customers.json), for a survey there. */
export async function siteIds(customer: string, site: string): Promise<{ customerId: string; siteId: string }> {
	const [c] = await sequelize.query<{ id: string; site_id: string }>(
		`SELECT c.id, s.id AS site_id FROM customers c JOIN sites s ON s.customer_id = c.id WHERE c.name = :customer AND s.name = :site`,
		{ replacements: { customer, site }, type: QueryTypes.SELECT }
	);
	return { customerId: c.id, siteId: c.site_id };
}

/**
 * A complete three-shift survey with the hoist-exchange setup chosen; returns its id. At the demo
 * customer's freezer halls unless `site` names another customer's site.
 */
export async function chosenSurvey(
	rep: Client,
	opts: { trucks?: number; contactEmail?: string; contactName?: string; site?: { customerId: string; siteId: string } } = {}
): Promise<string> {
	const ids = { ...(await demoIds()), ...opts.site };
	const start = await rep.action('/surveys?/start', { customerId: ids.customerId, siteId: ids.siteId, clientToken: randomUUID() });
	expect(start.status).toBe(303);
	const id = /\/surveys\/([0-9a-f-]{36})\//.exec(start.headers.get('location')!)![1];
	const steps = demoSurveySteps(ids, opts);
	for (const [step, values] of Object.entries(steps)) {
		const res = await rep.post(`/api/v1/surveys/${id}`, { step, values }, { method: 'PATCH' });
		expect(res.status, step).toBe(200);
	}
	const chosen = await rep.action(`/surveys/${id}/recommendation?/choose`, { setup: 'overhead-hoist' });
	expect(chosen.status).toBe(303);
	return id;
}

/** Builds a quote from a chosen survey through the recommendation screen's action; returns its id. */
export async function buildQuote(rep: Client, surveyId: string, token = randomUUID()): Promise<string> {
	const res = await rep.action(`/surveys/${surveyId}/recommendation?/quote`, { clientToken: token });
	expect(res.status).toBe(303);
	return /\/quotes\/([0-9a-f-]{36})$/.exec(res.headers.get('location')!)![1];
}

export interface SavedLine {
	sku: string;
	description: string;
	quantity: number;
	line_discount_bp: number;
	unit_list_cents: string;
}

export async function quoteLines(quoteId: string): Promise<SavedLine[]> {
	return sequelize.query<SavedLine>(
		`SELECT l.sku, l.description, l.quantity, l.line_discount_bp, l.unit_list_cents FROM quote_lines l
		 JOIN quote_revisions r ON r.id = l.revision_id
		 WHERE r.quote_id = :id AND r.revision = (SELECT max(revision) FROM quote_revisions WHERE quote_id = :id)
		 ORDER BY l.position`,
		{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
	);
}

/** Saves a draft with the same lines and the given line discount (percent) on every charged line. */
export async function saveWithDiscount(rep: Client, quoteId: string, percent: number, extra: Record<string, unknown> = {}) {
	const lines = await quoteLines(quoteId);
	const payload = {
		lines: lines.map((l) => ({ sku: l.sku, quantity: l.quantity, discountPercent: Number(l.unit_list_cents) === 0 ? 0 : percent })),
		overallDiscountPercent: 0,
		taxRegion: 'WA',
		notes: '',
		contactName: 'Dana Quillfeather',
		contactEmail: 'dana.q@marlow-crossing.example',
		...extra
	};
	return rep.action(`/quotes/${quoteId}?/save`, { payload: JSON.stringify(payload) });
}

/**
 * A form action as the page's enhanced form sends it: SvelteKit answers JSON whose `data` is
 * flattened by devalue; plain data (objects, arrays, strings, numbers) is rebuilt here.
 */
export async function enhancedAction(c: Client, path: string, fields: Record<string, string>): Promise<{ type: string; status?: number; data?: Record<string, unknown>; location?: string }> {
	const res = await c.get(path, {
		method: 'POST',
		headers: { 'x-sveltekit-action': 'true', accept: 'application/json', 'content-type': 'application/x-www-form-urlencoded' },
		body: new URLSearchParams(fields)
	});
	expect(res.status).toBeLessThan(500);
	const body = (await res.json()) as { type: string; status?: number; data?: string; location?: string };
	const flat = body.data ? (JSON.parse(body.data) as unknown[]) : null;
	const hydrate = (i: number): unknown => {
		if (!flat || i < 0) return undefined;
		const v = flat[i];
		if (Array.isArray(v)) return v.map((j) => hydrate(j as number));
		if (v && typeof v === 'object') return Object.fromEntries(Object.entries(v).map(([k, j]) => [k, hydrate(j as number)]));
		return v;
	};
	return { ...body, data: flat ? (hydrate(0) as Record<string, unknown>) : undefined };
}

export async function quoteState(quoteId: string): Promise<string> {
	const [r] = await sequelize.query<{ state: string }>(
		`SELECT state FROM quote_revisions WHERE quote_id = :id ORDER BY revision DESC LIMIT 1`,
		{ replacements: { id: quoteId }, type: QueryTypes.SELECT }
	);
	return r.state;
}
