import { describe, expect, it } from 'vitest';
import catalogueFile from '../../../seed-data/catalogue.json';
import { EQUIPMENT_KINDS } from '../server/rules/catalogue';
import type { CatalogueFile } from '../server/rules/catalogue';
import {
	EDITABLE_EQUIPMENT_KINDS,
	batteryFormSchema,
	batteryFormValues,
	equipmentFormSchema,
	equipmentFormValues,
	readBatteryForm,
	readEquipmentForm,
	readTruckForm,
	truckFormSchema,
	truckFormValues,
	type BatteryForm,
	type EquipmentForm,
	type TruckForm
} from './catalogue';
import { truckSpecSchema } from './evaluate';

const file = catalogueFile as CatalogueFile;
const seedTruck = file.trucks.find((t) => t.code === 'TW-B4-25') ?? file.trucks[0];
const seedBattery = file.batteries[0];

function truckForm(system: 'metric' | 'imperial' = 'metric'): TruckForm {
	return truckFormValues(
		{
			code: seedTruck.code,
			name: seedTruck.name,
			family: seedTruck.family,
			capacityKg: seedTruck.capacityKg,
			priceCents: seedTruck.priceCents ?? 0,
			costCents: seedTruck.costCents ?? 0,
			spec: seedTruck.spec,
			batteryIds: []
		},
		system
	);
}

function truckErrors(form: TruckForm): Record<string, string[]> {
	const r = readTruckForm(form);
	if (r.ok) throw new Error('expected the form to be refused');
	return r.errors;
}

describe('truck model form', () => {
	it('reads a stored model back to the same spec, in metric and in imperial', () => {
		for (const system of ['metric', 'imperial'] as const) {
			const form = truckForm(system);
			expect(truckFormSchema.safeParse(form).success, system).toBe(true);
			const r = readTruckForm(form);
			if (!r.ok) throw new Error(JSON.stringify(r.errors));
			// seed-data/catalogue.json: whole millimetres and kilograms survive 2-decimal inches
			expect(r.value.spec).toEqual(seedTruck.spec);
			expect(r.value.capacityKg).toBe(seedTruck.capacityKg);
			expect(r.value.priceCents).toBe(seedTruck.priceCents);
		}
	});

	it('reads mixed units: 41.34 in is 1 050 mm (1 in = 25.4 mm), 2,900 lb is 1 315.4 kg (1 lb = 0.45359237 kg)', () => {
		const form = {
			...truckForm(),
			compartmentLength: '41.34 in',
			batteryWeightMax: '3,200 lb',
			batteryWeightMin: '2,200 lb'
		};
		const r = readTruckForm(form);
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		expect(r.value.spec.compartment.lengthMm).toBe(1050); // 1 050.04 mm to the whole mm
		expect(r.value.spec.batteryWeightKg.max).toBe(1451.5); // 1 451.50 kg to 0.1 kg
		expect(r.value.spec.batteryWeightKg.min).toBe(997.9); // 997.90 kg
	});

	it('takes a bare number in the posted unit system', () => {
		const r = readTruckForm({ ...truckForm(), units: 'imperial', compartmentLength: '40' });
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		expect(r.value.spec.compartment.lengthMm).toBe(1016); // 40 × 25.4
	});

	it('refuses a roller-bed height above the compartment height, on that field', () => {
		const errors = truckErrors({
			...truckForm(),
			compartmentHeight: '600 mm',
			compartmentHeightWithRollerBed: '620 mm'
		});
		expect(Object.keys(errors)).toEqual(['compartmentHeightWithRollerBed']);
		expect(errors.compartmentHeightWithRollerBed[0]).toMatch(/not be above the compartment height/);
	});

	it('refuses a longest latching fork below the shortest, and a battery window upside down', () => {
		const errors = truckErrors({
			...truckForm(),
			latchForkMinLength: '1200 mm',
			latchForkMaxLength: '1100 mm',
			batteryWeightMin: '1500 kg',
			batteryWeightMax: '1000 kg'
		});
		expect(errors.latchForkMaxLength[0]).toMatch(
			/longest fork length must not be below the shortest/i
		);
		expect(errors.batteryWeightMax[0]).toMatch(
			/maximum battery weight must not be below the minimum/i
		);
	});

	it('refuses a wide door that opens less than the standard one', () => {
		const errors = truckErrors({ ...truckForm(), doorSwing: '130', wideDoorSwing: '120°' });
		expect(Object.keys(errors)).toEqual(['wideDoorSwing']);
	});

	it('states limits in both unit systems', () => {
		const errors = truckErrors({ ...truckForm(), units: 'imperial', compartmentLength: '300 in' });
		// LIMITS.lengthMm = 5 000 mm = 196.9 in
		expect(errors.compartmentLength[0]).toBe(
			'The compartment length must be at most 196.9 in (5 000 mm).'
		);
	});

	it('answers every field at once: empty text, bad units, decimal commas, bad money, unknown battery ids', () => {
		const errors = truckErrors({
			...truckForm(),
			compartmentWidth: '',
			compartmentHeight: '640 kg',
			doorSwing: '12,5',
			price: '12.345',
			batteryIds: ['not-an-id']
		});
		expect(errors.compartmentWidth).toEqual(['Enter the compartment width.']);
		expect(errors.compartmentHeight[0]).toMatch(/unit of mass/);
		expect(errors.doorSwing[0]).toMatch(/point for decimals/);
		expect(errors.price[0]).toMatch(/more than two decimals/);
		expect(errors.batteryIds).toEqual(['Choose batteries from the list.']);
	});

	it('still checks the other fields when one cannot be read, but skips cross-field rules then', () => {
		const errors = truckErrors({
			...truckForm(),
			compartmentWidth: 'wide',
			compartmentLength: '6000 mm',
			compartmentHeight: '',
			compartmentHeightWithRollerBed: '2000 mm'
		});
		expect(errors.compartmentWidth[0]).toMatch(/does not start with a number/);
		// LIMITS.lengthMm = 5 000 mm
		expect(errors.compartmentLength).toEqual([
			'The compartment length must be at most 5 000 mm (196.9 in).'
		]);
		// the height is unread, so "height with roller bed ≤ height" is not judged against a stand-in
		expect(errors.compartmentHeightWithRollerBed).toBeUndefined();
	});

	it('refuses codes with spaces or shaped like an id, through the form schema', () => {
		for (const code of ['TW 1', '', '0b9c4d8e-1111-4222-8333-944455556666']) {
			const r = truckFormSchema.safeParse({ ...truckForm(), code });
			expect(r.success, code).toBe(false);
			if (!r.success) expect(r.error.issues.some((i) => i.path[0] === 'code')).toBe(true);
		}
	});

	it('leaves the engine API schema as it was: a one-off request may still state any roller-bed height', () => {
		const spec = structuredClone(seedTruck.spec);
		spec.compartment.heightWithRollerBedMm = spec.compartment.heightMm + 10;
		expect(truckSpecSchema.safeParse(spec).success).toBe(true);
	});
});

describe('battery form', () => {
	const base = (system: 'metric' | 'imperial'): BatteryForm =>
		batteryFormValues(
			{
				code: seedBattery.code,
				name: seedBattery.name,
				priceCents: seedBattery.priceCents,
				costCents: seedBattery.costCents ?? 0,
				spec: seedBattery.spec
			},
			system
		);

	it('reads a stored battery back to the same spec in both systems', () => {
		for (const system of ['metric', 'imperial'] as const) {
			expect(batteryFormSchema.safeParse(base(system)).success).toBe(true);
			const r = readBatteryForm(base(system));
			if (!r.ok) throw new Error(JSON.stringify(r.errors));
			expect(r.value.spec).toEqual(seedBattery.spec);
		}
	});

	it('reads "2,900 lb" as 1 315.4 kg (2 900 × 0.45359237 = 1 315.42)', () => {
		const r = readBatteryForm({ ...base('metric'), weight: '2,900 lb' });
		if (!r.ok) throw new Error(JSON.stringify(r.errors));
		expect(r.value.spec.weightKg).toBe(1315.4);
	});

	it('reports a bound on one field while another cannot be read', () => {
		const r = readBatteryForm({ ...base('metric'), capacityAh: '12,5', weight: '99 t' });
		expect(r.ok).toBe(false);
		if (!r.ok) {
			expect(r.errors.capacityAh[0]).toMatch(/point for decimals \(12\.5\)/);
			// LIMITS.batteryKg = 10 000 kg = 22 046 lb
			expect(r.errors.weight).toEqual([
				'The battery weight must be at most 10 000 kg (22,046 lb).'
			]);
		}
	});

	it('refuses an unknown chemistry and a zero voltage at once', () => {
		const r = readBatteryForm({ ...base('metric'), chemistry: 'nickel', voltage: '0' });
		expect(r.ok).toBe(false);
		if (!r.ok) {
			expect(r.errors.chemistry).toEqual(['Choose lead-acid or lithium-ion.']);
			expect(r.errors.voltage).toEqual(['The battery voltage must be more than zero.']);
		}
	});
});

describe('equipment form', () => {
	it('edits every kind of the engine except batteries, in the engine order', () => {
		expect(EDITABLE_EQUIPMENT_KINDS).toEqual(EQUIPMENT_KINDS.filter((k) => k !== 'battery'));
	});

	it('reads every demo item back to its spec, in both systems', () => {
		for (const item of file.equipment) {
			for (const system of ['metric', 'imperial'] as const) {
				const form = equipmentFormValues(
					{
						...item,
						priceCents: Number(item.priceCents),
						costCents: item.costCents ?? 0,
						spec: (item.spec ?? {}) as Record<string, unknown>
					},
					system
				);
				expect(equipmentFormSchema.safeParse(form).success, `${item.sku} ${system}`).toBe(true);
				const r = readEquipmentForm(form);
				if (!r.ok) throw new Error(`${item.sku}: ${JSON.stringify(r.errors)}`);
				expect(r.value.spec, item.sku).toEqual(item.spec ?? {});
			}
		}
	});

	const blank = (kind: string): EquipmentForm =>
		equipmentFormValues(
			{ sku: 'X-1', kind, name: 'Thing', priceCents: 100, costCents: 50, spec: {} },
			'metric'
		);

	it('needs the spec values of its kind, and refuses an upside-down roller range', () => {
		const pallet = readEquipmentForm(blank('pallet-truck'));
		expect(!pallet.ok && Object.keys(pallet.errors).sort()).toEqual([
			'capacity',
			'forkLength',
			'overallWidth'
		]);
		const stand = readEquipmentForm({
			...blank('roller-stand'),
			rollerTop: '215 mm',
			capacity: '2000 kg',
			adjustable: true,
			adjustMin: '260 mm',
			adjustMax: '180 mm'
		});
		expect(!stand.ok && stand.errors.adjustMax[0]).toMatch(
			/highest setting must not be below the lowest/i
		);
		const fixed = readEquipmentForm({
			...blank('roller-stand'),
			rollerTop: '8.5 in',
			capacity: '4,400 lb',
			adjustMin: 'junk'
		});
		expect(fixed.ok && fixed.value.spec).toEqual({
			rollerTopMm: 216,
			adjustRangeMm: null,
			capacityKg: 1995.8,
			driveAlongside: false,
			kind: 'stand'
		});
	});

	it('refuses a kind the engine does not know, and batteries (they have their own tab)', () => {
		for (const kind of ['battery', 'spaceship', '']) {
			const r = readEquipmentForm(blank(kind));
			expect(!r.ok && r.errors.kind).toEqual(['Choose a kind of equipment from the list.']);
		}
	});

	it('keeps optional values optional and refuses a bad charger profile', () => {
		const door = readEquipmentForm(blank('wide-door'));
		expect(door.ok && door.value.spec).toEqual({});
		const charger = readEquipmentForm({ ...blank('charger'), chargingKind: 'fast', profile: 'ZZ' });
		expect(!charger.ok && charger.errors.profile).toBeTruthy();
	});
});
