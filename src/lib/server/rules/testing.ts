/**
 * Test helpers: fast-check arbitraries of engine inputs within the request schema's bounds
 * (src/lib/schemas/evaluate.ts LIMITS). Used by the spec files only; the app never imports this.
 */

import fc from 'fast-check';
import type {
	BatterySpec,
	ChargingMethod,
	Chemistry,
	OperationInput,
	ResolvedInput,
	SiteInput,
	TruckSpec
} from './types';

const d = (min: number, max: number) =>
	fc.double({ min, max, noNaN: true, noDefaultInfinity: true });

export const voltageArb = fc.oneof(fc.constantFrom(24, 36, 48, 72, 80), d(1, 120));

export const truckArb: fc.Arbitrary<TruckSpec> = fc
	.record({
		voltage: voltageArb,
		length: d(300, 2000),
		width: d(300, 1500),
		height: d(300, 1000),
		bedDrop: d(0, 100),
		rollerBedTopMm: d(50, 400),
		svcLen: d(400, 1300),
		svcW: d(350, 800),
		latchMin: d(700, 1300),
		latchSpan: d(0, 300),
		latchW: d(350, 800),
		doorSwingDeg: d(60, 200),
		wideDoorSwingDeg: d(60, 200),
		wMin: d(100, 3000),
		wSpan: d(0, 1500)
	})
	.map((t) => ({
		voltage: t.voltage,
		compartment: {
			lengthMm: t.length,
			widthMm: t.width,
			heightMm: t.height,
			heightWithRollerBedMm: Math.max(1, t.height - t.bedDrop)
		},
		rollerBedTopMm: t.rollerBedTopMm,
		forkFit: {
			serviceTrolley: { maxLengthMm: t.svcLen, maxOverallWidthMm: t.svcW },
			latchTrolley: {
				minLengthMm: t.latchMin,
				maxLengthMm: t.latchMin + t.latchSpan,
				maxOverallWidthMm: t.latchW
			}
		},
		doorSwingDeg: t.doorSwingDeg,
		wideDoorSwingDeg: t.wideDoorSwingDeg,
		batteryWeightKg: { min: t.wMin, max: t.wMin + t.wSpan }
	}));

export const batteryArb: fc.Arbitrary<BatterySpec> = fc.record({
	voltage: voltageArb,
	capacityAh: fc.oneof(d(1, 3000), d(200, 1200)),
	lengthMm: d(200, 2000),
	widthMm: d(200, 1500),
	heightMm: d(200, 1000),
	weightKg: d(50, 4000),
	chemistry: fc.constantFrom<Chemistry>('lead-acid', 'lithium-ion')
});

export const operationArb: fc.Arbitrary<OperationInput> = fc
	.record({
		shiftsPerDay: fc.integer({ min: 1, max: 4 }),
		share: d(0.01, 1),
		daysPerWeek: fc.integer({ min: 1, max: 7 }),
		energyKwhPerHour: fc.oneof(d(0.01, 50), d(1, 8)),
		charging: fc.constantFrom<ChargingMethod>('conventional', 'opportunity', 'fast'),
		years: fc.integer({ min: 1, max: 20 })
	})
	.map((o) => ({
		shiftsPerDay: o.shiftsPerDay,
		hoursPerShift: (24 / o.shiftsPerDay) * o.share,
		daysPerWeek: o.daysPerWeek,
		energyKwhPerHour: o.energyKwhPerHour,
		charging: o.charging,
		years: o.years
	}));

export const siteArb: fc.Arbitrary<SiteInput> = fc.record({
	palletTrucks: fc.array(
		fc.record({
			forkLengthMm: d(400, 2000),
			overallWidthMm: d(300, 900),
			capacityKg: d(200, 5000)
		}),
		{ maxLength: 3 }
	),
	rollerStands: fc.array(
		fc.record({
			rollerTopMm: d(50, 400),
			adjustRangeMm: fc.option(
				fc
					.record({ minMm: d(50, 300), span: d(0, 200) })
					.map((r) => ({ minMm: r.minMm, maxMm: r.minMm + r.span })),
				{ nil: null }
			),
			capacityKg: d(200, 5000),
			driveAlongside: fc.boolean(),
			kind: fc.constantFrom<'stand' | 'changer' | undefined>('stand', 'changer', undefined)
		}),
		{ maxLength: 3 }
	),
	crane: fc.option(
		fc.record({ ratedLoadKg: d(100, 6000), beamWeightKg: fc.option(d(10, 300), { nil: null }) }),
		{ nil: null }
	),
	chargingArea: fc.option(
		fc.record({
			floorAreaM2: d(1, 1000),
			ventilationM3h: d(0, 3000),
			eyewash: fc.constantFrom<boolean | undefined>(true, false, undefined),
			neutraliser: fc.constantFrom<boolean | undefined>(true, false, undefined)
		}),
		{ nil: null }
	),
	labourRatePerHourCents: fc.option(fc.integer({ min: 0, max: 100_000 }), { nil: undefined })
});

export const inputArb: fc.Arbitrary<ResolvedInput> = fc.record({
	truck: truckArb,
	battery: batteryArb,
	fleet: fc.record({ trucks: fc.integer({ min: 1, max: 500 }) }),
	operation: operationArb,
	site: siteArb,
	units: fc.constantFrom<'metric' | 'imperial' | undefined>('metric', 'imperial', undefined)
});

/** Inputs near the trade's usual values, where verdicts vary most. */
export const plausibleInputArb: fc.Arbitrary<ResolvedInput> = fc
	.record({
		base: inputArb,
		shifts: fc.integer({ min: 1, max: 3 }),
		energy: d(1, 8),
		capacityAh: d(400, 1000),
		batteryWeight: d(700, 1600)
	})
	.map(({ base, shifts, energy, capacityAh, batteryWeight }) => ({
		...base,
		truck: { ...base.truck, voltage: 48 },
		battery: { ...base.battery, voltage: 48, capacityAh, weightKg: batteryWeight },
		operation: {
			...base.operation,
			shiftsPerDay: shifts,
			hoursPerShift: 8,
			energyKwhPerHour: energy
		}
	}));
