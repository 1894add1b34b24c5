/**
 * The demo scenario's survey answers, step by step: six trucks on three shifts at the freezer
 * halls, a site hoist and lifting beam, a 40 m² charging area. No imports, so the HTTP flows, the
 * vitest scenarios, the bench and the Playwright specs all use this one copy.
 */

export interface DemoIds {
	customerId: string;
	siteId: string;
	truckId: string;
	batteryId: string;
}

/** The wizard's data steps for the demo scenario: six trucks on three shifts, a site hoist and beam. */
export function demoSurveySteps(
	ids: DemoIds,
	opts: { trucks?: number; contactEmail?: string; contactName?: string } = {}
) {
	return {
		site: {
			contactName: opts.contactName ?? 'Dana Quillfeather',
			contactEmail: opts.contactEmail ?? 'dana.q@marlow-crossing.example'
		},
		fleet: {
			truckModelId: ids.truckId,
			trucks: opts.trucks ?? 6,
			batterySource: 'catalogue',
			batteryId: ids.batteryId
		},
		operation: {
			shiftsPerDay: 3,
			hoursPerShift: 8,
			daysPerWeek: 5,
			duty: 'medium',
			energyKwhPerHour: 3.5,
			charging: 'conventional'
		},
		equipment: {
			palletTrucks: [{ forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 }],
			rollerStands: [],
			hasCrane: true,
			craneRatedLoadKg: 2000,
			hasBeam: true,
			beamWeightKg: 90
		},
		charging: {
			hasArea: true,
			floorAreaM2: 40,
			ventilationM3h: 150,
			eyewash: true,
			neutraliser: true
		}
	} as const;
}
