import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import { DEMO, signIn, type Client } from '../helpers/http';
import { sequelize } from '$lib/server/db';

let customerId: string;
let siteId: string;
let truckId: string;
let batteryId: string;
let rep: Client;

beforeAll(async () => {
	const [c] = await sequelize.query<{ id: string; site_id: string }>(
		`SELECT c.id, s.id AS site_id FROM customers c JOIN sites s ON s.customer_id = c.id WHERE c.name = 'Marlow Crossing Cold Store' LIMIT 1`,
		{ type: QueryTypes.SELECT }
	);
	customerId = c.id;
	siteId = c.site_id;
	const [t] = await sequelize.query<{ id: string }>(`SELECT id FROM truck_models WHERE code = 'TW-B4-25'`, { type: QueryTypes.SELECT });
	const [b] = await sequelize.query<{ id: string }>(`SELECT id FROM batteries WHERE code = 'TW-B48-775-LA'`, { type: QueryTypes.SELECT });
	truckId = t.id;
	batteryId = b.id;
	rep = await signIn(DEMO.rep);
});

afterAll(async () => {
	await sequelize.close();
});

async function startSurvey(client: Client, token = randomUUID()): Promise<string> {
	const res = await client.action('/surveys?/start', { customerId, siteId, clientToken: token });
	expect(res.status).toBe(303);
	const m = /\/surveys\/([0-9a-f-]{36})\/site$/.exec(res.headers.get('location') ?? '');
	expect(m).not.toBeNull();
	return m![1];
}

/** A three-shift site with a drive-alongside changer (the product design's example, by catalogue ids). */
const steps = () => ({
	fleet: { truckModelId: truckId, trucks: 6, batterySource: 'catalogue', batteryId },
	operation: { shiftsPerDay: 3, hoursPerShift: 8, daysPerWeek: 5, duty: 'medium', energyKwhPerHour: 3.5, charging: 'conventional' },
	equipment: {
		palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }],
		rollerStands: [{ kind: 'changer', rollerTopMm: 215, adjustable: false, adjustMinMm: null, adjustMaxMm: null, capacityKg: 1800, driveAlongside: true }],
		hasCrane: true,
		craneRatedLoadKg: 2000,
		hasBeam: true,
		beamWeightKg: 90
	},
	charging: { hasArea: true, floorAreaM2: 40, ventilationM3h: 150, eyewash: true, neutraliser: true }
});

describe('survey autosave and resume', () => {
	it('a double tap on "Start survey" makes one survey', async () => {
		const token = randomUUID();
		const [a, b] = await Promise.all([startSurvey(rep, token), startSurvey(rep, token)]);
		expect(a).toBe(b);
		const [{ n }] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM surveys WHERE client_token = :token`, {
			replacements: { token },
			type: QueryTypes.SELECT
		});
		expect(Number(n)).toBe(1);
	});

	it('writes each step to PostgreSQL and gives it back to another device', async () => {
		const id = await startSurvey(rep);
		const save = await rep.post(`/api/v1/surveys/${id}`, { step: 'fleet', values: { truckModelId: truckId, trucks: 4 } }, { method: 'PATCH' });
		expect(save.status).toBe(200);
		const v1 = (await save.json()).version;
		// a half-filled step is kept; a later save merges into it
		const again = await rep.post(`/api/v1/surveys/${id}`, { step: 'fleet', values: { trucks: 6 } }, { method: 'PATCH' });
		expect((await again.json()).version).toBe(v1 + 1);

		// "another device": a fresh sign-in of the same rep
		const other = await signIn(DEMO.rep);
		const res = await other.get(`/api/v1/surveys/${id}`, { headers: { accept: 'application/json' } });
		expect(res.status).toBe(200);
		const body = await res.json();
		expect(body.data.fleet).toEqual({ truckModelId: truckId, trucks: 6 });
		expect(body.currentStep).toBe('fleet');
		// opening the survey resumes at the step it stopped at
		const open = await other.get(`/surveys/${id}`);
		expect(open.status).toBe(303);
		expect(open.headers.get('location')).toBe(`/surveys/${id}/fleet`);
		const [row] = await sequelize.query<{ trucks: number }>(`SELECT (data->'fleet'->>'trucks')::int AS trucks FROM surveys WHERE id = :id`, {
			replacements: { id },
			type: QueryTypes.SELECT
		});
		expect(row.trucks).toBe(6);
	});

	it('refuses values of the wrong kind with a field path, and changes nothing', async () => {
		const id = await startSurvey(rep);
		const res = await rep.post(`/api/v1/surveys/${id}`, { step: 'operation', values: { shiftsPerDay: 'three', bogus: 1 } }, { method: 'PATCH' });
		expect(res.status).toBe(400);
		const body = await res.json();
		expect(Object.keys(body.errors).some((k) => k.startsWith('values.'))).toBe(true);
		const [row] = await sequelize.query<{ op: unknown }>(`SELECT data->'operation' AS op FROM surveys WHERE id = :id`, {
			replacements: { id },
			type: QueryTypes.SELECT
		});
		expect(row.op).toBeNull();
		const notJson = await rep.post(`/api/v1/surveys/${id}`, 'not json', { method: 'PATCH' });
		expect(notJson.status).toBe(400);
	});

	it('lets a rep of another team neither read nor write it; a manager reads it; an admin reads but cannot edit', async () => {
		const id = await startSurvey(rep);
		const otherTeam = await signIn(DEMO.rep2);
		expect((await otherTeam.get(`/api/v1/surveys/${id}`)).status).toBe(403);
		expect((await otherTeam.post(`/api/v1/surveys/${id}`, { step: 'notes', values: { notes: 'x' } }, { method: 'PATCH' })).status).toBe(403);
		expect((await otherTeam.get(`/surveys/${id}/site`)).status).toBe(403);

		const manager = await signIn(DEMO.manager);
		expect((await manager.get(`/api/v1/surveys/${id}`)).status).toBe(200);
		const admin = await signIn(DEMO.admin);
		expect((await admin.get(`/api/v1/surveys/${id}`)).status).toBe(200);
		expect((await admin.post(`/api/v1/surveys/${id}`, { step: 'notes', values: { notes: 'x' } }, { method: 'PATCH' })).status).toBe(403);
		// the other team's list does not show it
		const list = await (await otherTeam.get('/surveys')).text();
		expect(list).not.toContain(id);
	});

	it('a complete survey gets the recommendation, and the chosen setup is stored with the engine’s answer', async () => {
		const id = await startSurvey(rep);
		for (const [step, values] of Object.entries(steps())) {
			const res = await rep.post(`/api/v1/surveys/${id}`, { step, values }, { method: 'PATCH' });
			expect(res.status, step).toBe(200);
		}
		const page = await rep.get(`/surveys/${id}/recommendation`);
		expect(page.status).toBe(200);
		const html = await page.text();
		expect(html).toContain('Hoist exchange');

		// a setup that does not fit cannot be chosen (in-truck fails: one battery cannot cover three shifts)
		const refused = await rep.action(`/surveys/${id}/recommendation?/choose`, { setup: 'in-truck' });
		expect(refused.status).toBe(400);
		const chosen = await rep.action(`/surveys/${id}/recommendation?/choose`, { setup: 'overhead-hoist' });
		expect(chosen.status).toBe(303);
		const [row] = await sequelize.query<{ chosen_setup: string; recommended: string; bpt: number }>(
			`SELECT chosen_setup, result->>'recommended' AS recommended, (result->>'batteriesPerTruck')::int AS bpt FROM surveys WHERE id = :id`,
			{ replacements: { id }, type: QueryTypes.SELECT }
		);
		expect(row).toEqual({ chosen_setup: 'overhead-hoist', recommended: 'overhead-hoist', bpt: 3 });
	});
});

async function stepData(id: string): Promise<{ data: Record<string, Record<string, unknown> | undefined>; site_id: string | null }> {
	const [row] = await sequelize.query<{ data: Record<string, Record<string, unknown> | undefined>; site_id: string | null }>(
		`SELECT data, site_id FROM surveys WHERE id = :id`,
		{ replacements: { id }, type: QueryTypes.SELECT }
	);
	return row;
}

describe('autosave stores the good answers of a step and refuses only the bad one', () => {
	it('a mistyped e-mail keeps the name and phone, and says how to write the e-mail', async () => {
		const id = await startSurvey(rep);
		const res = await rep.post(
			`/api/v1/surveys/${id}`,
			{ step: 'site', values: { contactName: 'Dale Prentice', contactPhone: '+1 555 0100 222', contactEmail: 'dale@pellham' } },
			{ method: 'PATCH' }
		);
		expect(res.status).toBe(400);
		const body = await res.json();
		expect(Object.keys(body.errors)).toEqual(['values.contactEmail']);
		expect(body.errors['values.contactEmail'][0]).toMatch(/name@example\.com/);
		expect(body.message).not.toMatch(/right kind/);
		expect(body.message).toMatch(/other answers of this step were saved/);
		// what was stored is answered, as a full save would
		expect(body.version).toBeGreaterThan(0);
		expect(typeof body.updatedAt).toBe('string');

		const { data } = await stepData(id);
		expect(data.site).toMatchObject({ contactName: 'Dale Prentice', contactPhone: '+1 555 0100 222' });
		expect(data.site).not.toHaveProperty('contactEmail');
		// what the survey was started with is still there
		expect(data.site).toMatchObject({ customerId, siteId });
	});

	it('an energy figure of 0 keeps the shifts, hours and days typed with it', async () => {
		const id = await startSurvey(rep);
		const res = await rep.post(
			`/api/v1/surveys/${id}`,
			{ step: 'operation', values: { shiftsPerDay: 2, hoursPerShift: 8, daysPerWeek: 5, duty: 'measured', energyKwhPerHour: 0 } },
			{ method: 'PATCH' }
		);
		expect(res.status).toBe(400);
		const body = await res.json();
		expect(Object.keys(body.errors)).toEqual(['values.energyKwhPerHour']);
		expect(body.errors['values.energyKwhPerHour'][0]).toMatch(/more than 0, at most 20 kWh/);
		const { data } = await stepData(id);
		expect(data.operation).toEqual({ shiftsPerDay: 2, hoursPerShift: 8, daysPerWeek: 5, duty: 'measured' });
	});

	it('a bad answer inside a list row empties only that answer', async () => {
		const id = await startSurvey(rep);
		const res = await rep.post(
			`/api/v1/surveys/${id}`,
			{ step: 'equipment', values: { palletTrucks: [{ forkLengthMm: 99_999, overallWidthMm: 540, capacityKg: 2000 }], hasCrane: false } },
			{ method: 'PATCH' }
		);
		expect(res.status).toBe(400);
		expect(Object.keys((await res.json()).errors)).toEqual(['values.palletTrucks.0.forkLengthMm']);
		const { data } = await stepData(id);
		expect(data.equipment).toEqual({ palletTrucks: [{ forkLengthMm: null, overallWidthMm: 540, capacityKg: 2000 }], hasCrane: false });
	});

	it('"Next" with a mistyped e-mail stays on the step but keeps the rest of what was typed', async () => {
		const id = await startSurvey(rep);
		const res = await rep.action(`/surveys/${id}/site?/next`, {
			contactName: 'Dale Prentice',
			contactPhone: '+1 555 0100 222',
			contactEmail: 'dale@pellham'
		});
		expect(res.status).toBe(400);
		const { data } = await stepData(id);
		expect(data.site).toMatchObject({ contactName: 'Dale Prentice', contactPhone: '+1 555 0100 222', customerId, siteId });
		expect(data.site).not.toHaveProperty('contactEmail');
	});
});

describe('the operation step refuses a day longer than 24 hours', () => {
	it('"Next" with 4 shifts × 12 h stays on the step and says at most 6 h', async () => {
		const id = await startSurvey(rep);
		const res = await rep.action(`/surveys/${id}/operation?/next`, {
			shiftsPerDay: '4',
			hoursPerShift: '12',
			daysPerWeek: '6',
			duty: 'heavy',
			energyKwhPerHour: '5',
			charging: 'fast'
		});
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('With 4 shifts, enter at most 6 h per shift.');
		const fine = await rep.action(`/surveys/${id}/operation?/next`, {
			shiftsPerDay: '4',
			hoursPerShift: '6',
			daysPerWeek: '6',
			duty: 'heavy',
			energyKwhPerHour: '5',
			charging: 'fast'
		});
		expect(fine.status).toBe(303);
		expect(fine.headers.get('location')).toBe(`/surveys/${id}/equipment`);
	});

	it('"Days a week" of 9 says the range', async () => {
		const id = await startSurvey(rep);
		const res = await rep.action(`/surveys/${id}/operation?/next`, { shiftsPerDay: '2', hoursPerShift: '8', daysPerWeek: '9', duty: 'light', energyKwhPerHour: '2.5', charging: 'conventional' });
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Enter 1 to 7 days a week (whole days).');
	});

	it('the review lists it in the wizard’s words', async () => {
		const id = await startSurvey(rep);
		const values = { ...steps().operation, shiftsPerDay: 4, hoursPerShift: 12 };
		expect((await rep.post(`/api/v1/surveys/${id}`, { step: 'operation', values }, { method: 'PATCH' })).status).toBe(200);
		const html = await (await rep.get(`/surveys/${id}/review`)).text();
		expect(html).toContain('4 shifts × 12 h makes 48 hours a day');
		expect(html).not.toContain('operation.hoursPerShift');
		expect(html).not.toContain('shift(s)');
	});
});

describe('a survey needs a site', () => {
	let bareCustomerId: string;
	beforeAll(async () => {
		const res = await rep.action('/customers/new', { name: `Siteless Depot ${randomUUID().slice(0, 8)}`, accountNumber: '', notes: '' });
		expect(res.status).toBe(303);
		bareCustomerId = /\/customers\/([0-9a-f-]{36})/.exec(res.headers.get('location') ?? '')![1];
	});

	it('refuses to start one for a customer without sites, and points to adding one', async () => {
		const res = await rep.action('/surveys?/start', { customerId: bareCustomerId, clientToken: randomUUID() });
		expect(res.status).toBe(400);
		const html = await res.text();
		expect(html).toContain('has no site yet');
		expect(html).toContain(`/customers/${bareCustomerId}/sites/new?return=`);
		const [{ n }] = await sequelize.query<{ n: string }>(`SELECT count(*) AS n FROM surveys WHERE customer_id = :id`, {
			replacements: { id: bareCustomerId },
			type: QueryTypes.SELECT
		});
		expect(Number(n)).toBe(0);
	});

	it('an older survey without a site links to adding one, which comes back to the survey', async () => {
		const [me] = await sequelize.query<{ id: string; team_id: string | null }>(`SELECT id, team_id FROM users WHERE email = :email`, {
			replacements: { email: DEMO.rep },
			type: QueryTypes.SELECT
		});
		const [{ id }] = await sequelize.query<{ id: string }>(
			`INSERT INTO surveys (customer_id, site_id, owner_id, team_id, data) VALUES (:c, NULL, :o, :t, :data::jsonb) RETURNING id`,
			{
				replacements: { c: bareCustomerId, o: me.id, t: me.team_id, data: JSON.stringify({ site: { customerId: bareCustomerId, surveyDate: '2026-12-02' } }) },
				type: QueryTypes.SELECT
			}
		);
		const back = `/surveys/${id}/site`;
		const html = await (await rep.get(back)).text();
		expect(html).toContain('has no sites yet');
		const link = `/customers/${bareCustomerId}/sites/new?return=${encodeURIComponent(back)}`;
		expect(html).toContain(link.replace(/&/g, '&amp;'));

		const saved = await rep.action(link, { name: 'Yard', addressLine1: '1 Quay Road', city: 'Orsenfeld', country: 'United States', regionCode: 'WA' });
		expect(saved.status).toBe(303);
		expect(saved.headers.get('location')).toBe(back);
		// an address elsewhere is not followed
		const elsewhere = await rep.action(`/customers/${bareCustomerId}/sites/new?return=${encodeURIComponent('https://example.com/x')}`, {
			name: 'Annex',
			addressLine1: '2 Quay Road',
			city: 'Orsenfeld',
			country: 'United States'
		});
		expect(elsewhere.headers.get('location')).toBe(`/customers/${bareCustomerId}#sites`);

		// choosing the new site on the site step makes it the survey's site
		const [site] = await sequelize.query<{ id: string }>(`SELECT id FROM sites WHERE customer_id = :c AND name = 'Yard'`, {
			replacements: { c: bareCustomerId },
			type: QueryTypes.SELECT
		});
		expect((await rep.post(`/api/v1/surveys/${id}`, { step: 'site', values: { siteId: site.id } }, { method: 'PATCH' })).status).toBe(200);
		expect((await stepData(id)).site_id).toBe(site.id);
		// a site of another customer is not
		expect((await rep.post(`/api/v1/surveys/${id}`, { step: 'site', values: { siteId } }, { method: 'PATCH' })).status).toBe(200);
		expect((await stepData(id)).site_id).toBe(site.id);
	});
});

describe('the surveys list is titled by what it lists', () => {
	it('a rep sees their team’s surveys; a manager sees every team’s', async () => {
		expect(await (await rep.get('/surveys')).text()).toContain('Your team’s surveys');
		const manager = await signIn(DEMO.manager);
		const html = await (await manager.get('/surveys')).text();
		expect(html).toContain('All surveys');
		expect(html).not.toContain('Your surveys');
	});
});

