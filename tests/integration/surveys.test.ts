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
