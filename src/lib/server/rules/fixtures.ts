/**
 * The example request of shared/DESIGN.md §4, for tests, the benchmark and the API docs. The demo
 * catalogue's TW-B4-25 truck and TW-B48-775-LA battery carry the same specs.
 */

import type { ResolvedInput } from './types';

export const DESIGN_EXAMPLE_REQUEST: ResolvedInput = {
	truck: {
		voltage: 48,
		compartment: { lengthMm: 1050, widthMm: 860, heightMm: 640, heightWithRollerBedMm: 610 },
		rollerBedTopMm: 215,
		forkFit: {
			serviceTrolley: { maxLengthMm: 940, maxOverallWidthMm: 545 },
			latchTrolley: { minLengthMm: 1120, maxLengthMm: 1170, maxOverallWidthMm: 545 }
		},
		doorSwingDeg: 125,
		wideDoorSwingDeg: 180,
		batteryWeightKg: { min: 1000, max: 1450 }
	},
	battery: {
		voltage: 48,
		capacityAh: 775,
		lengthMm: 1000,
		widthMm: 820,
		heightMm: 580,
		weightKg: 1250,
		chemistry: 'lead-acid'
	},
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

/** A deep copy of the DESIGN.md example, to change in a test. */
export function designExample(): ResolvedInput {
	return structuredClone(DESIGN_EXAMPLE_REQUEST);
}
