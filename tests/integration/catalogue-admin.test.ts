import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { DEMO, client, signIn, type Client } from '../helpers/http';
import { sequelize } from '$lib/server/db';
import { Battery, Equipment, TruckModel, TruckModelBattery } from '$lib/server/db/models';
import {
	findBattery,
	findTruckModel,
	listBatteries,
	listTruckModels
} from '$lib/server/repositories/catalogue';

// Catalogue administration (issue 4, item 9) through the real form actions, as a browser without
// JavaScript posts them (flat fields, typed units), against the running app and PostgreSQL.

const run = `${Date.now().toString(36)}`.toUpperCase();
const code = (name: string) => `IT-${name}-${run}`;

let admin: Client;
let rep: Client;
let battery775: { id: string; code: string };

beforeAll(async () => {
	admin = await signIn(DEMO.admin);
	rep = await signIn(DEMO.rep);
	// seed-data/catalogue.json: a 48 V, 1 250 kg lead-acid battery
	const b = await findBattery('TW-B48-775-LA');
	if (!b) throw new Error('demo battery TW-B48-775-LA missing; run the seed');
	battery775 = { id: b.id, code: b.code };
});

afterAll(async () => {
	await sequelize.close();
});

/** Every field the engine reads, typed the way an admin might: mixed units, grouped digits. */
function truckFields(c: string, overrides: Record<string, string | string[]> = {}) {
	return {
		units: 'metric',
		code: c,
		name: 'Integration 2.5 t',
		family: 'Integration family',
		capacity: '5,512 lb', // 2 500.2 kg → 2 500 kg (1 lb = 0.45359237 kg)
		price: '$34,600.00',
		cost: '26,150.5',
		voltage: '48 V',
		compartmentLength: '41.34 in', // 1 050.04 mm → 1 050 mm (1 in = 25.4 mm)
		compartmentWidth: '860',
		compartmentHeight: '64 cm',
		compartmentHeightWithRollerBed: '610 mm',
		rollerBedTop: '215 mm',
		serviceForkMaxLength: '905 mm',
		serviceForkMaxWidth: '545 mm',
		latchForkMinLength: '1120 mm',
		latchForkMaxLength: '3 ft 10 in', // 46 in = 1 168.4 mm → 1 168 mm
		latchForkMaxWidth: '545 mm',
		doorSwing: '125',
		wideDoorSwing: '180°',
		batteryWeightMin: '1,000 kg',
		batteryWeightMax: '1450',
		batteryIds: [battery775.id],
		...overrides
	};
}

/** The design's evaluate example (DESIGN.md §4) with catalogue references. */
function evaluateBody(truckRef: string, batteryRef: string) {
	return {
		truck: { modelId: truckRef },
		battery: { modelId: batteryRef },
		fleet: { trucks: 6 },
		operation: {
			shiftsPerDay: 3,
			hoursPerShift: 8,
			daysPerWeek: 5,
			energyKwhPerHour: 3.5,
			charging: 'conventional'
		},
		site: {
			palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }],
			rollerStands: [
				{ rollerTopMm: 215, adjustRangeMm: null, capacityKg: 1800, driveAlongside: true }
			],
			crane: { ratedLoadKg: 2000, beamWeightKg: 90 },
			chargingArea: { floorAreaM2: 40, ventilationM3h: 150 }
		}
	};
}

async function createTruck(c: string, overrides: Record<string, string | string[]> = {}) {
	const res = await admin.action('/admin/catalogue/trucks/new?/create', truckFields(c, overrides));
	expect(
		res.status,
		await res
			.clone()
			.text()
			.then((t) => t.slice(0, 300))
	).toBe(303);
	const row = await findTruckModel(c);
	expect(row).not.toBeNull();
	return row!;
}

describe('truck models', () => {
	it('an admin adds a model with every field through the form, and the engine evaluates it by { modelId }', async () => {
		const c = code('T1');
		const res = await admin.action('/admin/catalogue/trucks/new?/create', truckFields(c));
		expect(res.status).toBe(303);
		const row = await findTruckModel(c);
		expect(res.headers.get('location')).toBe(`/admin/catalogue/trucks/${row!.id}?created=1`);
		expect(row).toMatchObject({
			code: c,
			name: 'Integration 2.5 t',
			family: 'Integration family',
			capacityKg: 2500,
			priceCents: 3_460_000,
			costCents: 2_615_050,
			retired: false,
			batteryIds: [battery775.id]
		});
		expect(row!.spec).toMatchObject({
			voltage: 48,
			compartment: { lengthMm: 1050, widthMm: 860, heightMm: 640, heightWithRollerBedMm: 610 },
			rollerBedTopMm: 215,
			forkFit: {
				serviceTrolley: { maxLengthMm: 905, maxOverallWidthMm: 545 },
				latchTrolley: { minLengthMm: 1120, maxLengthMm: 1168, maxOverallWidthMm: 545 }
			},
			doorSwingDeg: 125,
			wideDoorSwingDeg: 180,
			batteryWeightKg: { min: 1000, max: 1450 }
		});

		for (const ref of [row!.id, c]) {
			const ev = await rep.post('/api/v1/evaluate', evaluateBody(ref, battery775.id));
			expect(ev.status).toBe(200);
			const body = await ev.json();
			const inTruck = body.setups.find((s: { id: string }) => s.id === 'in-truck');
			const fork = inTruck.checks.find((k: { code: string }) => k.code === 'fork-length');
			// the limit is the service-trolley fork length typed above, not the demo model's 940 mm
			expect(fork).toMatchObject({ result: 'fail', measured: 1150, limit: 905, unit: 'mm' });
			const weight = inTruck.checks.find((k: { code: string }) => k.code === 'battery-weight');
			expect(weight.result).toBe('pass'); // 1 250 kg within 1 000–1 450 kg
		}
	});

	it('edits a model and its compatible batteries in one save, and answers with the stored values', async () => {
		const row = await createTruck(code('T2'), { batteryIds: [] });
		const other = await findBattery('TW-B48-620-LI');
		const res = await admin.action(`/admin/catalogue/trucks/${row.id}?/save`, {
			...truckFields(row.code),
			units: 'imperial',
			compartmentWidth: '33.86', // a bare number in the posted system: 860.04 mm → 860 mm
			batteryWeightMax: '3,300 lb', // 1 496.9 kg
			batteryIds: [battery775.id, other!.id]
		});
		expect(res.status).toBe(200);
		expect(await res.text()).toContain(`Saved ${row.code}.`);
		const after = await findTruckModel(row.id);
		expect(after!.spec.compartment.widthMm).toBe(860);
		expect(after!.spec.batteryWeightKg.max).toBe(1496.9);
		expect([...after!.batteryIds].sort()).toEqual([battery775.id, other!.id].sort());
	});

	const refusals: [string, Record<string, string>, string, string][] = [
		[
			'a roller-bed height above the compartment height',
			{ compartmentHeight: '600 mm', compartmentHeightWithRollerBed: '620 mm' },
			'compartmentHeightWithRollerBed',
			'The height with roller bed must not be above the compartment height'
		],
		[
			'a longest latching fork below the shortest',
			{ latchForkMinLength: '1200 mm', latchForkMaxLength: '1100 mm' },
			'latchForkMaxLength',
			'The longest fork length must not be below the shortest.'
		],
		[
			'a battery weight minimum above the maximum',
			{ batteryWeightMin: '1500 kg', batteryWeightMax: '1400 kg' },
			'batteryWeightMax',
			'The maximum battery weight must not be below the minimum.'
		],
		[
			'a length with a mass unit',
			{ compartmentLength: '1050 kg' },
			'compartmentLength',
			'is a unit of mass'
		],
		[
			'an empty height',
			{ compartmentHeight: '' },
			'compartmentHeight',
			'Enter the compartment height.'
		]
	];

	for (const [what, overrides, field, message] of refusals) {
		it(`refuses ${what} with a field message and stores nothing`, async () => {
			const c = code('BAD');
			const before = await TruckModel.count();
			const res = await admin.action(
				'/admin/catalogue/trucks/new?/create',
				truckFields(c, overrides)
			);
			expect(res.status).toBe(400);
			const html = await res.text();
			expect(html).toContain(message);
			// the message sits under the field it is about
			expect(html).toMatch(
				new RegExp(`id="truck-${field}-error"[^>]*>[^<]*${message.slice(0, 20)}`)
			);
			expect(await TruckModel.count()).toBe(before);
			expect(await findTruckModel(c)).toBeNull();
		});
	}

	it('refuses an edit that breaks the spec, and keeps the stored model and links as they were', async () => {
		const row = await createTruck(code('T3'));
		const res = await admin.action(`/admin/catalogue/trucks/${row.id}?/save`, {
			...truckFields(row.code, { compartmentHeightWithRollerBed: '700 mm', batteryIds: [] })
		});
		expect(res.status).toBe(400);
		const after = await findTruckModel(row.id);
		expect(after!.spec).toEqual(row.spec);
		expect(after!.batteryIds).toEqual([battery775.id]);
	});

	it('keeps a save whole: a battery of another voltage refuses the save, spec and links stay', async () => {
		const row = await createTruck(code('T4'));
		const odd = await Battery.create({
			code: code('B24'),
			name: '24 V test battery',
			spec: {
				voltage: 24,
				capacityAh: 500,
				lengthMm: 800,
				widthMm: 500,
				heightMm: 600,
				weightKg: 400,
				chemistry: 'lead-acid'
			}
		});
		const res = await admin.action(`/admin/catalogue/trucks/${row.id}?/save`, {
			...truckFields(row.code, { name: 'Renamed', batteryIds: [odd.id] })
		});
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('has a different voltage from this truck');
		const after = await findTruckModel(row.id);
		expect(after!.name).toBe(row.name);
		expect(after!.batteryIds).toEqual([battery775.id]);

		// an id that is no battery at all: refused the same way
		const ghost = await admin.action(`/admin/catalogue/trucks/${row.id}?/save`, {
			...truckFields(row.code, {
				name: 'Renamed',
				batteryIds: ['00000000-0000-4000-8000-000000000000']
			})
		});
		expect(ghost.status).toBe(400);
		expect((await findTruckModel(row.id))!.name).toBe(row.name);
	});

	it('refuses a duplicate code, also in other letter case, and stores nothing', async () => {
		const row = await createTruck(code('DUP'));
		const before = await TruckModel.count();
		for (const c of [row.code, row.code.toLowerCase()]) {
			const res = await admin.action('/admin/catalogue/trucks/new?/create', truckFields(c));
			expect(res.status).toBe(400);
			expect(await res.text()).toContain(`Another truck model already has the code “${c}”.`);
		}
		expect(await TruckModel.count()).toBe(before);
		// renaming another model to a taken code is refused too
		const second = await createTruck(code('DUP2'));
		const res = await admin.action(
			`/admin/catalogue/trucks/${second.id}?/save`,
			truckFields(row.code)
		);
		expect(res.status).toBe(400);
		expect((await findTruckModel(second.id))!.code).toBe(second.code);
	});

	it('retire hides a model from listTruckModels() and the look-up route; findTruckModel() and evaluate still find it', async () => {
		const row = await createTruck(code('RET'));
		const retire = await admin.action(`/admin/catalogue/trucks/${row.id}?/retire`, {});
		expect(retire.status).toBe(200);
		expect((await listTruckModels()).some((t) => t.id === row.id)).toBe(false);
		expect((await listTruckModels({ includeRetired: true })).some((t) => t.id === row.id)).toBe(
			true
		);
		expect((await findTruckModel(row.id))?.retired).toBe(true);
		const api = await (await rep.get('/api/v1/catalogue/trucks')).json();
		expect(api.trucks.some((t: { id: string }) => t.id === row.id)).toBe(false);
		// an old survey's evaluation still resolves it
		expect((await rep.post('/api/v1/evaluate', evaluateBody(row.id, battery775.id))).status).toBe(
			200
		);
		const restore = await admin.action(`/admin/catalogue/trucks/${row.id}?/restore`, {});
		expect(restore.status).toBe(200);
		expect((await listTruckModels()).some((t) => t.id === row.id)).toBe(true);
	});

	it('deletes a model no survey uses, with its compatibility links', async () => {
		const row = await createTruck(code('DEL'));
		const res = await admin.action(`/admin/catalogue/trucks/${row.id}?/delete`, {});
		expect(res.status).toBe(303);
		expect(res.headers.get('location')).toBe(
			`/admin/catalogue/trucks?deleted=${encodeURIComponent(row.code)}`
		);
		expect(await findTruckModel(row.id)).toBeNull();
		expect(await TruckModelBattery.count({ where: { truckModelId: row.id } })).toBe(0);
		expect((await admin.get(`/admin/catalogue/trucks/${row.id}`)).status).toBe(404);
	});

	it('refuses to delete a model or battery a survey refers to, suggesting Retire', async () => {
		const truck = await createTruck(code('USED'));
		const battery = await Battery.create({
			code: code('BUSED'),
			name: 'Used battery',
			spec: {
				voltage: 48,
				capacityAh: 500,
				lengthMm: 800,
				widthMm: 500,
				heightMm: 600,
				weightKg: 1100,
				chemistry: 'lead-acid'
			}
		});
		// a real draft survey of the demo rep that names the model and the battery
		const [owner] = (await sequelize.query(
			`SELECT u.id AS user_id, c.id AS customer_id FROM users u, customers c
			 WHERE u.email = 'rep@demo.traywise.test' AND c.name = 'Marlow Crossing Cold Store'`
		)) as [{ user_id: string; customer_id: string }[], unknown];
		const [inserted] = (await sequelize.query(
			`INSERT INTO surveys (customer_id, owner_id, data) VALUES (:customerId, :ownerId, :data::jsonb) RETURNING id`,
			{
				replacements: {
					customerId: owner[0].customer_id,
					ownerId: owner[0].user_id,
					data: JSON.stringify({
						fleet: { truckModelId: truck.id, batteryId: battery.id, trucks: 2 }
					})
				}
			}
		)) as [{ id: string }[], unknown];
		try {
			const res = await admin.action(`/admin/catalogue/trucks/${truck.id}?/delete`, {});
			expect(res.status).toBe(409);
			expect(await res.text()).toContain(
				`${truck.code} is used by 1 survey, so it cannot be deleted. Retire it instead`
			);
			expect(await findTruckModel(truck.id)).not.toBeNull();
			const b = await admin.action(`/admin/catalogue/batteries/${battery.id}?/delete`, {});
			expect(b.status).toBe(409);
			expect(await findBattery(battery.id)).not.toBeNull();
			// retiring is what it suggests, and works
			expect((await admin.action(`/admin/catalogue/trucks/${truck.id}?/retire`, {})).status).toBe(
				200
			);
			expect((await findTruckModel(truck.id))!.retired).toBe(true);
		} finally {
			await sequelize.query(`DELETE FROM surveys WHERE id = :id`, {
				replacements: { id: inserted[0].id }
			});
		}
		// with no survey left, it can go
		expect((await admin.action(`/admin/catalogue/trucks/${truck.id}?/delete`, {})).status).toBe(
			303
		);
	});
});

describe('batteries', () => {
	it('adds and edits a battery through the form; "2,900 lb" is stored as 1 315.4 kg', async () => {
		const c = code('BAT');
		const fields = {
			units: 'imperial',
			code: c,
			name: 'Integration battery',
			chemistry: 'lead-acid',
			voltage: '48',
			capacityAh: '775 Ah',
			length: '39.37', // bare number in the posted system, inches: 999.998 mm → 1 000 mm
			width: '820 mm',
			height: '580 mm',
			weight: '2,750 lb', // 1 247.4 kg
			price: '9,300',
			cost: '6,100.00'
		};
		const res = await admin.action('/admin/catalogue/batteries/new?/create', fields);
		expect(res.status).toBe(303);
		const row = await findBattery(c);
		expect(row!.spec).toMatchObject({
			voltage: 48,
			capacityAh: 775,
			lengthMm: 1000,
			widthMm: 820,
			heightMm: 580,
			weightKg: 1247.4,
			chemistry: 'lead-acid'
		});
		expect(row!.priceCents).toBe(930_000);

		const edit = await admin.action(`/admin/catalogue/batteries/${row!.id}?/save`, {
			...fields,
			units: 'metric',
			weight: '2,900 lb'
		});
		expect(edit.status).toBe(200);
		// 2 900 × 0.45359237 = 1 315.42 kg, kept to 0.1 kg
		expect((await findBattery(row!.id))!.spec.weightKg).toBe(1315.4);
	});

	it('refuses a bad battery with field messages, and a duplicate code, storing nothing', async () => {
		const before = await Battery.count();
		const bad = await admin.action('/admin/catalogue/batteries/new?/create', {
			units: 'metric',
			code: code('BBAD'),
			name: 'Bad',
			chemistry: 'salt-water',
			voltage: '0',
			capacityAh: '12,5',
			length: '1000 mm',
			width: '820 mm',
			height: '580 mm',
			weight: '99 t',
			price: '1',
			cost: '1'
		});
		expect(bad.status).toBe(400);
		const html = await bad.text();
		expect(html).toContain('Choose lead-acid or lithium-ion.');
		expect(html).toContain('Use a point for decimals (12.5)');
		expect(html).toContain('The battery weight must be at most 10 000 kg (22,046 lb).');
		const dup = await admin.action('/admin/catalogue/batteries/new?/create', {
			units: 'metric',
			code: battery775.code,
			name: 'Copy',
			chemistry: 'lead-acid',
			voltage: '48',
			capacityAh: '775',
			length: '1000',
			width: '820',
			height: '580',
			weight: '1250',
			price: '1',
			cost: '1'
		});
		expect(dup.status).toBe(400);
		expect(await dup.text()).toContain(
			`Another battery already has the code “${battery775.code}”.`
		);
		expect(await Battery.count()).toBe(before);
	});

	it('retire hides a battery from listBatteries() and the look-up route; findBattery() still finds it', async () => {
		const truck = await createTruck(code('TB'));
		const res = await admin.action(`/admin/catalogue/batteries/${battery775.id}?/retire`, {});
		expect(res.status).toBe(200);
		try {
			expect((await listBatteries()).some((b) => b.id === battery775.id)).toBe(false);
			expect((await findBattery(battery775.id))?.retired).toBe(true);
			const api = await (await rep.get(`/api/v1/catalogue/batteries?truck=${truck.id}`)).json();
			expect(api.batteries).toEqual([]);
		} finally {
			expect(
				(await admin.action(`/admin/catalogue/batteries/${battery775.id}?/restore`, {})).status
			).toBe(200);
		}
		const api = await (await rep.get(`/api/v1/catalogue/batteries?truck=${truck.code}`)).json();
		expect(api.batteries.map((b: { id: string }) => b.id)).toEqual([battery775.id]);
	});
});

describe('equipment', () => {
	it('adds a roller stand with its spec, refuses a duplicate SKU, and deletes an unused item', async () => {
		const sku = code('RS');
		const fields = {
			units: 'metric',
			sku,
			kind: 'roller-stand',
			name: 'Integration roller stand',
			price: '2,300',
			cost: '1,490',
			standKind: 'changer',
			rollerTop: '8.5 in', // 215.9 mm → 216 mm
			adjustable: 'on',
			adjustMin: '180 mm',
			adjustMax: '260 mm',
			capacity: '2 t',
			driveAlongside: 'on'
		};
		const res = await admin.action('/admin/catalogue/equipment/new?/create', fields);
		expect(res.status).toBe(303);
		const row = await Equipment.findOne({ where: { sku } });
		expect(row!.kind).toBe('roller-stand');
		expect(row!.spec).toEqual({
			rollerTopMm: 216,
			adjustRangeMm: { minMm: 180, maxMm: 260 },
			capacityKg: 2000,
			driveAlongside: true,
			kind: 'changer'
		});

		const dup = await admin.action('/admin/catalogue/equipment/new?/create', {
			...fields,
			sku: sku.toLowerCase()
		});
		expect(dup.status).toBe(400);
		expect(await dup.text()).toContain('Another equipment item already has the SKU');

		const upside = await admin.action(`/admin/catalogue/equipment/${row!.id}?/save`, {
			...fields,
			adjustMin: '300 mm'
		});
		expect(upside.status).toBe(400);
		expect(await upside.text()).toContain('The highest setting must not be below the lowest.');

		const del = await admin.action(`/admin/catalogue/equipment/${row!.id}?/delete`, {});
		expect(del.status).toBe(303);
		expect(await Equipment.findByPk(row!.id)).toBeNull();
	});

	it('refuses a kind the engine does not know', async () => {
		const res = await admin.action('/admin/catalogue/equipment/new?/create', {
			units: 'metric',
			sku: code('X'),
			kind: 'teleporter',
			name: 'Nothing',
			price: '1',
			cost: '1'
		});
		expect(res.status).toBe(400);
		expect(await res.text()).toContain('Choose a kind of equipment from the list.');
	});
});

describe('who may', () => {
	it('gives a rep 403 on every catalogue admin page and action, and changes nothing', async () => {
		const truck = await createTruck(code('REP'));
		const battery = (await findBattery(battery775.id))!;
		const item = (await Equipment.findOne())!;
		const pages = [
			'/admin/catalogue',
			'/admin/catalogue/trucks',
			'/admin/catalogue/trucks/new',
			`/admin/catalogue/trucks/${truck.id}`,
			'/admin/catalogue/batteries',
			'/admin/catalogue/batteries/new',
			`/admin/catalogue/batteries/${battery.id}`,
			'/admin/catalogue/equipment',
			'/admin/catalogue/equipment/new',
			`/admin/catalogue/equipment/${item.id}`
		];
		for (const path of pages) expect((await rep.get(path)).status, path).toBe(403);

		const counts = async () => [
			await TruckModel.count(),
			await Battery.count(),
			await Equipment.count()
		];
		const before = await counts();
		const actions: [string, Record<string, string | string[]>][] = [
			['/admin/catalogue/trucks/new?/create', truckFields(code('REPNEW'))],
			[
				`/admin/catalogue/trucks/${truck.id}?/save`,
				truckFields(truck.code, { name: 'Rep was here' })
			],
			[`/admin/catalogue/trucks/${truck.id}?/retire`, {}],
			[`/admin/catalogue/trucks/${truck.id}?/restore`, {}],
			[`/admin/catalogue/trucks/${truck.id}?/delete`, {}],
			['/admin/catalogue/batteries/new?/create', { code: code('REPB'), name: 'x' }],
			[
				`/admin/catalogue/batteries/${battery.id}?/save`,
				{ code: battery.code, name: 'Rep was here' }
			],
			[`/admin/catalogue/batteries/${battery.id}?/retire`, {}],
			[`/admin/catalogue/batteries/${battery.id}?/restore`, {}],
			[`/admin/catalogue/batteries/${battery.id}?/delete`, {}],
			[
				'/admin/catalogue/equipment/new?/create',
				{ sku: code('REPE'), kind: 'side-cover', name: 'x', price: '1', cost: '1' }
			],
			[
				`/admin/catalogue/equipment/${item.id}?/save`,
				{ sku: item.sku, kind: item.kind, name: 'Rep was here' }
			],
			[`/admin/catalogue/equipment/${item.id}?/retire`, {}],
			[`/admin/catalogue/equipment/${item.id}?/restore`, {}],
			[`/admin/catalogue/equipment/${item.id}?/delete`, {}]
		];
		for (const [path, fields] of actions)
			expect((await rep.action(path, fields)).status, path).toBe(403);
		expect(await counts()).toEqual(before);
		const t = (await findTruckModel(truck.id))!;
		expect([t.name, t.retired]).toEqual([truck.name, false]);
		expect((await findBattery(battery.id))!.retired).toBe(false);
		expect((await Equipment.findByPk(item.id))!.name).toBe(item.name);

		// a manager is no admin either
		const manager = await signIn(DEMO.manager);
		expect((await manager.get('/admin/catalogue/trucks')).status).toBe(403);
		expect((await manager.action(`/admin/catalogue/trucks/${truck.id}?/retire`, {})).status).toBe(
			403
		);
	});

	it('lets signed-in staff read the look-up routes, and answers a stranger 401', async () => {
		const trucks = await rep.get('/api/v1/catalogue/trucks');
		expect(trucks.status).toBe(200);
		const body = await trucks.json();
		const demo = body.trucks.find((t: { code: string }) => t.code === 'TW-B4-25');
		// seed-data/catalogue.json
		expect(demo.spec.forkFit.serviceTrolley.maxLengthMm).toBe(940);
		expect(demo.batteryIds.length).toBeGreaterThan(0);
		expect(JSON.stringify(body)).not.toContain('costCents');

		const batteries = await rep.get('/api/v1/catalogue/batteries?truck=TW-B4-25');
		expect(batteries.status).toBe(200);
		const b = await batteries.json();
		expect(b.truck.code).toBe('TW-B4-25');
		expect(b.batteries.map((x: { id: string }) => x.id).sort()).toEqual(
			[...demo.batteryIds].sort()
		);

		expect((await rep.get('/api/v1/catalogue/batteries?truck=NO-SUCH-MODEL')).status).toBe(404);
		expect((await rep.get('/api/v1/catalogue/batteries?truck=')).status).toBe(400);
		for (const path of ['/api/v1/catalogue/trucks', '/api/v1/catalogue/batteries']) {
			const res = await client().get(path, { headers: { accept: 'application/json' } });
			expect(res.status, path).toBe(401);
		}
	});
});

describe('nothing a user sends is a 500', () => {
	it('answers odd ids, odd fields and odd kinds with 400 or 404', async () => {
		expect((await admin.get('/admin/catalogue/trucks/not-an-id')).status).toBe(404);
		expect(
			(await admin.get('/admin/catalogue/trucks/00000000-0000-4000-8000-000000000000')).status
		).toBe(404);
		expect(
			(
				await admin.action(
					'/admin/catalogue/trucks/00000000-0000-4000-8000-000000000000?/retire',
					{}
				)
			).status
		).toBe(404);
		expect(
			(
				await admin.action(
					'/admin/catalogue/batteries/00000000-0000-4000-8000-000000000000?/delete',
					{}
				)
			).status
		).toBe(404);
		const ghost = await admin.action(
			'/admin/catalogue/trucks/00000000-0000-4000-8000-000000000000?/save',
			truckFields(code('GHOST'))
		);
		expect(ghost.status).toBe(404);
		expect(await findTruckModel(code('GHOST'))).toBeNull();

		const weird: Record<string, string | string[]>[] = [
			{},
			{
				code: 'x'.repeat(5000),
				units: 'martian',
				capacity: ['1', '2'],
				voltage: 'NaN',
				batteryIds: 'nope'
			},
			{
				...truckFields(code('W1')),
				compartmentLength: '1e309 mm',
				price: '99999999999999999999',
				doorSwing: '-5'
			},
			{
				...truckFields(code('W2')),
				compartmentLength: '1/0 in',
				rollerBedTop: '∞',
				batteryIds: ['', ' ']
			}
		];
		const before = await TruckModel.count();
		for (const fields of weird) {
			const res = await admin.action('/admin/catalogue/trucks/new?/create', fields);
			expect(res.status, JSON.stringify(fields).slice(0, 80)).toBe(400);
		}
		expect(await TruckModel.count()).toBe(before);
		const eq = await admin.action('/admin/catalogue/equipment/new?/create', {
			kind: ['a', 'b'],
			adjustable: 'maybe',
			sku: '../../etc'
		});
		expect(eq.status).toBe(400);
	});
});
