import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import {
	batteryEnergyKwh,
	equivalentBatteryUsage,
	planDuty,
	rotation,
	round,
	usableOf
} from './fleet';
import { DEFAULT_PARAMS } from './params';
import type { BatterySpec, ChargingMethod, Chemistry, OperationInput } from './types';

/** 48 V 775 Ah lead-acid: 37.2 kWh, 29.76 kWh usable at 80 % (arithmetic; REFERENCES usable share). */
const B775: BatterySpec = {
	voltage: 48,
	capacityAh: 775,
	lengthMm: 1000,
	widthMm: 820,
	heightMm: 580,
	weightKg: 1250,
	chemistry: 'lead-acid'
};
/** 48 V 625 Ah: 30 kWh; 24 kWh usable lead-acid (80 %), 27 kWh lithium-ion (90 %). */
const B625: BatterySpec = { ...B775, capacityAh: 625 };

function op(
	shifts: number,
	energyKwhPerHour: number,
	charging: ChargingMethod = 'conventional',
	hours = 8
): OperationInput {
	return { shiftsPerDay: shifts, hoursPerShift: hours, daysPerWeek: 5, energyKwhPerHour, charging };
}

describe('energy and EBU (published and worked values)', () => {
	it('48 V × 600 Ah = 28.8 kWh', () => {
		// kWh = V × Ah / 1000 (REFERENCES, arithmetic)
		expect(batteryEnergyKwh(48, 600)).toBeCloseTo(28.8, 12);
	});

	it('EBU worked example: 935 Ah, 748 Ah usable, 1 380 Ah a day → 1.84', () => {
		// 80 % of 935 Ah = 748 Ah (usable share, battery makers' instructions; common practice)
		expect(usableOf(935, DEFAULT_PARAMS.usableShare['lead-acid'])).toBeCloseTo(748, 10);
		// 1 380 ÷ 748 = 1.845 → 1.84 (dealer power-study guidance; common practice)
		expect(round(equivalentBatteryUsage(1380, 748), 2)).toBe(1.84);
	});

	it('DESIGN.md example: 3 × 8 h at 3.5 kWh/h on 48 V 775 Ah → EBU 2.82', () => {
		const d = planDuty(B775, op(3, 3.5), DEFAULT_PARAMS);
		// 24 h × 3.5 kWh/h = 84 kWh; 48 × 775 × 0.8 / 1000 = 29.76 kWh; 84 / 29.76 = 2.8226 (by hand)
		expect(d.dailyEnergyKwh).toBeCloseTo(84, 10);
		expect(d.usableEnergyKwh).toBeCloseTo(29.76, 10);
		expect(round(d.ebu, 2)).toBe(2.82);
		// 29.76 / 3.5 = 8.503 h: the battery lasts a shift (by hand)
		expect(d.runtimeHours).toBeCloseTo(8.503, 3);
	});
});

describe('batteries per truck, conventional lead-acid ("8-8-8", common practice)', () => {
	// a battery that lasts a shift: 8.5 h at 3.5 kWh/h (above)
	it('three 8-hour shifts → 3 batteries, 2 changes a day', () => {
		const d = planDuty(B775, op(3, 3.5), DEFAULT_PARAMS);
		expect(d.batteriesPerTruck).toBe(3);
		expect(d.changesPerTruckPerDay).toBe(2);
	});
	it('two 8-hour shifts → 2', () => {
		expect(planDuty(B775, op(2, 3.5), DEFAULT_PARAMS).batteriesPerTruck).toBe(2);
	});
	it('one 8-hour shift → 1, no changes', () => {
		const d = planDuty(B775, op(1, 3.5), DEFAULT_PARAMS);
		expect(d.batteriesPerTruck).toBe(1);
		expect(d.changesPerTruckPerDay).toBe(0);
		expect(d.oneBatteryCovers).toBe(true);
	});
	it('a battery lasting half a shift is changed mid-shift: one shift needs 2', () => {
		// 29.76 kWh usable at 7.44 kWh/h lasts 4 h: changed at 4 h; battery A is back from charge
		// and cooling at 4 + 16 = 20 h, before the next day's start; B at 8 + 16 = 24 h (by hand)
		const d = planDuty(B775, op(1, 7.44), DEFAULT_PARAMS);
		expect(d.batteriesPerTruck).toBe(2);
		expect(d.changesPerTruckPerDay).toBe(1);
	});
	it('two shifts on a battery lasting both still need 2: 16 h of charge and cooling do not fit 8 h idle', () => {
		// 29.76 kWh at 1.8 kWh/h lasts 16.5 h ≥ 16 h; the truck stands 8 h a night (by hand)
		expect(planDuty(B775, op(2, 1.8), DEFAULT_PARAMS).batteriesPerTruck).toBe(2);
	});
	it('rotation model agrees for the 8-8-8 pattern with any battery lasting one shift', () => {
		for (const shifts of [1, 2, 3]) {
			// common practice: one battery per 8-hour work period
			expect(rotation(shifts, 8, 8, 8, 8).batteriesPerTruck).toBe(shifts);
		}
	});
});

describe('opportunity, fast and lithium-ion rules', () => {
	// B625 lead-acid: 24 kWh usable; two 8-hour shifts: EBU = 16 h × e / 24 kWh (by hand)
	it('opportunity charging carries one lead-acid battery up to EBU 1.5', () => {
		// 2.1 kWh/h → 33.6 kWh a day → EBU 1.4 ≤ 1.5 (dealer power-study guidance; common practice)
		const at14 = planDuty(B625, op(2, 2.1, 'opportunity'), DEFAULT_PARAMS);
		expect(at14.ebu).toBeCloseTo(1.4, 10);
		expect(at14.batteriesPerTruck).toBe(1);
		expect(at14.changesPerTruckPerDay).toBe(0);
		// 2.25 kWh/h → EBU 1.5 exactly: still one battery
		expect(planDuty(B625, op(2, 2.25, 'opportunity'), DEFAULT_PARAMS).batteriesPerTruck).toBe(1);
	});
	it('beyond EBU 1.5 opportunity charging falls back to exchange', () => {
		// 2.4 kWh/h → EBU 1.6 > 1.5
		const d = planDuty(B625, op(2, 2.4, 'opportunity'), DEFAULT_PARAMS);
		expect(d.fellBack).toBe(true);
		expect(d.basis).toBe('conventional');
		// two 8-hour shifts, conventional: 2 (8-8-8 above)
		expect(d.batteriesPerTruck).toBe(2);
	});
	it('fast charging carries one lead-acid battery up to its limit of EBU 2.0, then falls back', () => {
		// 2.85 kWh/h → 45.6 kWh → EBU 1.9 ≤ 2.0 (fast-charge limit; common practice)
		expect(planDuty(B625, op(2, 2.85, 'fast'), DEFAULT_PARAMS).batteriesPerTruck).toBe(1);
		// 3.15 kWh/h → EBU 2.1 > 2.0
		const d = planDuty(B625, op(2, 3.15, 'fast'), DEFAULT_PARAMS);
		expect(d.fellBack).toBe(true);
		expect(d.batteriesPerTruck).toBeGreaterThan(1);
	});
	it('lithium-ion with opportunity or fast charging stays at one battery per truck', () => {
		const li: BatterySpec = { ...B625, chemistry: 'lithium-ion' };
		// three 8-h shifts at 2.8125 kWh/h = 67.5 kWh; 27 kWh usable (90 %) → EBU 2.5 (by hand)
		for (const charging of ['opportunity', 'fast'] as const) {
			const d = planDuty(li, op(3, 2.8125, charging), DEFAULT_PARAMS);
			expect(d.ebu).toBeCloseTo(2.5, 10);
			expect(d.batteriesPerTruck).toBe(1);
		}
		// the same day on lead-acid with conventional charging takes 3 (8-8-8, common practice)
		expect(planDuty(B625, op(3, 2.8125), DEFAULT_PARAMS).batteriesPerTruck).toBe(3);
	});
	it('conventional charging of lithium-ion needs no cooling rest', () => {
		const li: BatterySpec = { ...B625, chemistry: 'lithium-ion' };
		// 27 kWh at 3 kWh/h lasts 9 h; three shifts; a 3 h charge and no cooling: battery A is back
		// at 11 h, before the third shift starts at 16 h → 2 batteries (by hand)
		expect(planDuty(li, op(3, 3), DEFAULT_PARAMS).batteriesPerTruck).toBe(2);
	});
});

describe('properties', () => {
	const chemistry = fc.constantFrom<Chemistry>('lead-acid', 'lithium-ion');
	const charging = fc.constantFrom<ChargingMethod>('conventional', 'opportunity', 'fast');
	const battery = fc.record({
		capacityAh: fc.double({ min: 100, max: 1500, noNaN: true }),
		voltage: fc.constantFrom(24, 36, 48, 72, 80),
		chemistry
	});

	it('batteries per truck never drop when shifts rise', () => {
		fc.assert(
			fc.property(
				battery,
				charging,
				fc.double({ min: 1, max: 8, noNaN: true }),
				fc.double({ min: 0.2, max: 20, noNaN: true }),
				fc.integer({ min: 1, max: 2 }),
				(b, method, hours, energy, shifts) => {
					const spec = { ...B775, ...b };
					const a = planDuty(spec, op(shifts, energy, method, hours), DEFAULT_PARAMS);
					const more = planDuty(spec, op(shifts + 1, energy, method, hours), DEFAULT_PARAMS);
					expect(more.batteriesPerTruck).toBeGreaterThanOrEqual(a.batteriesPerTruck);
				}
			),
			{ numRuns: 500 }
		);
	}, 60_000);

	it('batteries per truck never drop when energy per hour rises', () => {
		fc.assert(
			fc.property(
				battery,
				charging,
				fc.integer({ min: 1, max: 3 }),
				fc.double({ min: 1, max: 8, noNaN: true }),
				fc.double({ min: 0.2, max: 20, noNaN: true }),
				fc.double({ min: 0, max: 20, noNaN: true }),
				(b, method, shifts, hours, energy, extra) => {
					const spec = { ...B775, ...b };
					const a = planDuty(spec, op(shifts, energy, method, hours), DEFAULT_PARAMS);
					const more = planDuty(spec, op(shifts, energy + extra, method, hours), DEFAULT_PARAMS);
					expect(more.batteriesPerTruck).toBeGreaterThanOrEqual(a.batteriesPerTruck);
				}
			),
			{ numRuns: 500 }
		);
	}, 60_000);
});
