/**
 * Request schema of `POST /api/v1/evaluate` (shared/DESIGN.md §4), also used by the survey wizard and
 * the catalogue admin. Lengths mm, masses kg, energy kWh, air flow m³/h, areas m², angles degrees;
 * field names carry the unit. Maxima are generous trade bounds so that absurd values get a field
 * error instead of reaching the engine.
 */
import { z } from 'zod';
import type * as Engine from '../server/rules/types';
import type { UnresolvedInput } from '../server/rules/resolve';

const positive = (max: number, what: string) =>
	z
		.number({ error: `Enter ${what} as a number.` })
		.positive(`${cap(what)} must be more than zero.`)
		.max(max, `${cap(what)} must be at most ${max.toLocaleString('en-US')}.`);

const nonNegative = (max: number, what: string) =>
	z
		.number({ error: `Enter ${what} as a number.` })
		.nonnegative(`${cap(what)} cannot be negative.`)
		.max(max, `${cap(what)} must be at most ${max.toLocaleString('en-US')}.`);

const integer = (min: number, max: number, what: string) =>
	z
		.number({ error: `Enter ${what} as a whole number.` })
		.int(`${cap(what)} must be a whole number.`)
		.min(min, `${cap(what)} must be at least ${min}.`)
		.max(max, `${cap(what)} must be at most ${max.toLocaleString('en-US')}.`);

function cap(s: string): string {
	return s.charAt(0).toUpperCase() + s.slice(1);
}

/** Upper bounds, in the fields' units. */
export const LIMITS = {
	voltage: 120,
	lengthMm: 5000,
	heightMm: 3000,
	rollerTopMm: 1500,
	forkLengthMm: 3000,
	widthMm: 3000,
	batteryKg: 10_000,
	capacityAh: 3000,
	doorDeg: 270,
	trucks: 500,
	shiftsPerDay: 4,
	hoursPerDay: 24,
	energyKwhPerHour: 50,
	years: 20,
	handlingKg: 20_000,
	craneKg: 100_000,
	beamKg: 5000,
	floorAreaM2: 100_000,
	ventilationM3h: 1_000_000,
	labourRatePerHourCents: 100_000,
	listLength: 20
} as const;

export const chemistrySchema = z.enum(['lead-acid', 'lithium-ion']);
export const chargingMethodSchema = z.enum(['conventional', 'opportunity', 'fast']);
export const unitSystemSchema = z.enum(['metric', 'imperial']);

export const rangeMmSchema = z
	.object({
		minMm: positive(LIMITS.rollerTopMm, 'the lowest setting'),
		maxMm: positive(LIMITS.rollerTopMm, 'the highest setting')
	})
	.refine((r) => r.minMm <= r.maxMm, {
		message: 'The highest setting must not be below the lowest.',
		path: ['maxMm']
	});

/** A truck model's battery-handling spec; the catalogue admin reuses it. */
export const truckSpecSchema = z.object({
	voltage: positive(LIMITS.voltage, 'the truck voltage'),
	compartment: z.object({
		lengthMm: positive(LIMITS.lengthMm, 'the compartment length'),
		widthMm: positive(LIMITS.widthMm, 'the compartment width'),
		heightMm: positive(LIMITS.heightMm, 'the compartment height'),
		heightWithRollerBedMm: positive(LIMITS.heightMm, 'the compartment height with roller bed')
	}),
	rollerBedTopMm: positive(LIMITS.rollerTopMm, 'the roller bed height'),
	forkFit: z.object({
		serviceTrolley: z.object({
			maxLengthMm: positive(LIMITS.forkLengthMm, 'the longest fork length'),
			maxOverallWidthMm: positive(LIMITS.widthMm, 'the widest width over the forks')
		}),
		latchTrolley: z
			.object({
				minLengthMm: positive(LIMITS.forkLengthMm, 'the shortest fork length'),
				maxLengthMm: positive(LIMITS.forkLengthMm, 'the longest fork length'),
				maxOverallWidthMm: positive(LIMITS.widthMm, 'the widest width over the forks')
			})
			.refine((f) => f.minLengthMm <= f.maxLengthMm, {
				message: 'The longest fork length must not be below the shortest.',
				path: ['maxLengthMm']
			})
	}),
	doorSwingDeg: positive(LIMITS.doorDeg, 'the door swing'),
	wideDoorSwingDeg: positive(LIMITS.doorDeg, 'the wide door swing'),
	batteryWeightKg: z
		.object({
			min: positive(LIMITS.batteryKg, 'the minimum battery weight'),
			max: positive(LIMITS.batteryKg, 'the maximum battery weight')
		})
		.refine((w) => w.min <= w.max, {
			message: 'The maximum battery weight must not be below the minimum.',
			path: ['max']
		})
});

/** A battery's spec; the catalogue admin reuses it. */
export const batterySpecSchema = z.object({
	voltage: positive(LIMITS.voltage, 'the battery voltage'),
	capacityAh: positive(LIMITS.capacityAh, 'the capacity'),
	lengthMm: positive(LIMITS.lengthMm, 'the battery length'),
	widthMm: positive(LIMITS.widthMm, 'the battery width'),
	heightMm: positive(LIMITS.heightMm, 'the battery height'),
	weightKg: positive(LIMITS.batteryKg, 'the battery weight'),
	chemistry: chemistrySchema
});

export const modelRefSchema = z.object({
	modelId: z.string().trim().min(1, 'Choose a model.').max(100)
});

export const fleetSchema = z.object({
	trucks: integer(1, LIMITS.trucks, 'the number of trucks')
});

/**
 * Shifts × hours per shift must fit in a day. Shared by this schema and the survey's operation
 * step, so "Next" refuses exactly what the engine would. The issue is on `hoursPerShift`.
 */
export function hoursPerDayProblem(shiftsPerDay: unknown, hoursPerShift: unknown): string | null {
	if (typeof shiftsPerDay !== 'number' || typeof hoursPerShift !== 'number') return null;
	if (!(shiftsPerDay > 0) || !(hoursPerShift > 0)) return null;
	const total = shiftsPerDay * hoursPerShift;
	if (total <= LIMITS.hoursPerDay) return null;
	const most = Math.floor((LIMITS.hoursPerDay / shiftsPerDay) * 2) / 2;
	const shifts = `${shiftsPerDay} shift${shiftsPerDay === 1 ? '' : 's'}`;
	return `${shifts} × ${hoursPerShift} h makes ${+total.toFixed(2)} hours a day; a day has ${LIMITS.hoursPerDay} hours. With ${shifts}, enter at most ${most} h per shift.`;
}

/** The refinement form of {@link hoursPerDayProblem}, for `.superRefine`. */
export function checkHoursPerDay(o: { shiftsPerDay?: unknown; hoursPerShift?: unknown }, ctx: z.RefinementCtx): void {
	const message = hoursPerDayProblem(o.shiftsPerDay, o.hoursPerShift);
	if (message) ctx.addIssue({ code: 'custom', path: ['hoursPerShift'], message });
}

export const operationSchema = z
	.object({
		shiftsPerDay: integer(1, LIMITS.shiftsPerDay, 'shifts per day'),
		hoursPerShift: positive(LIMITS.hoursPerDay, 'hours per shift'),
		daysPerWeek: integer(1, 7, 'days a week'),
		energyKwhPerHour: positive(LIMITS.energyKwhPerHour, 'energy per hour'),
		charging: chargingMethodSchema,
		years: integer(1, LIMITS.years, 'years for the cost comparison').default(5)
	})
	.superRefine(checkHoursPerDay);

export const sitePalletTruckSchema = z.object({
	forkLengthMm: positive(LIMITS.forkLengthMm, 'the fork length'),
	overallWidthMm: positive(LIMITS.widthMm, 'the width over the forks'),
	capacityKg: positive(LIMITS.handlingKg, 'the pallet truck capacity')
});

export const siteRollerStandSchema = z.object({
	rollerTopMm: positive(LIMITS.rollerTopMm, 'the roller height'),
	adjustRangeMm: rangeMmSchema.nullable(),
	capacityKg: positive(LIMITS.handlingKg, 'the stand capacity'),
	driveAlongside: z.boolean(),
	kind: z.enum(['stand', 'changer']).optional()
});

export const siteCraneSchema = z.object({
	ratedLoadKg: positive(LIMITS.craneKg, 'the hoist rated load'),
	/** null or absent: the site has no lifting beam */
	beamWeightKg: positive(LIMITS.beamKg, 'the lifting beam weight').nullable().optional()
});

export const chargingAreaSchema = z.object({
	floorAreaM2: positive(LIMITS.floorAreaM2, 'the floor area'),
	ventilationM3h: nonNegative(LIMITS.ventilationM3h, 'the air flow'),
	eyewash: z.boolean().optional(),
	neutraliser: z.boolean().optional()
});

export const siteSchema = z.object({
	palletTrucks: z.array(sitePalletTruckSchema).max(LIMITS.listLength).default([]),
	rollerStands: z.array(siteRollerStandSchema).max(LIMITS.listLength).default([]),
	crane: siteCraneSchema.nullable().default(null),
	chargingArea: chargingAreaSchema.nullable().default(null),
	labourRatePerHourCents: integer(0, LIMITS.labourRatePerHourCents, 'the labour rate').optional()
});

/** Body of POST /api/v1/evaluate. Truck and battery: a full spec or `{ modelId }` from the catalogue. */
export const evaluateRequestSchema = z.object({
	truck: z.union([modelRefSchema.strict(), truckSpecSchema]),
	battery: z.union([modelRefSchema.strict(), batterySpecSchema]),
	fleet: fleetSchema,
	operation: operationSchema,
	site: siteSchema,
	units: unitSystemSchema.optional()
});

export type TruckSpec = z.infer<typeof truckSpecSchema>;
export type BatterySpec = z.infer<typeof batterySpecSchema>;
export type ModelRef = z.infer<typeof modelRefSchema>;
export type FleetInput = z.infer<typeof fleetSchema>;
export type OperationInput = z.infer<typeof operationSchema>;
export type SiteInput = z.infer<typeof siteSchema>;
export type SitePalletTruck = z.infer<typeof sitePalletTruckSchema>;
export type SiteRollerStand = z.infer<typeof siteRollerStandSchema>;
/** The parsed body (defaults applied). */
export type EvaluateRequest = z.infer<typeof evaluateRequestSchema>;
/** The body as a client may send it (defaults optional). */
export type EvaluateRequestInput = z.input<typeof evaluateRequestSchema>;
/** The parsed body once catalogue references are resolved: the engine's input. */
export type ResolvedEvaluateRequest = Omit<EvaluateRequest, 'truck' | 'battery'> & {
	truck: TruckSpec;
	battery: BatterySpec;
};

/**
 * Field errors keyed by dotted path ("site.palletTrucks.0.forkLengthMm"), for a 400 answer. For a
 * truck or battery that matches neither a spec nor `{ modelId }`, the errors of the alternative the
 * client evidently meant are given (the one that does not complain of unknown keys).
 */
export function evaluateFieldErrors(error: z.ZodError): Record<string, string[]> {
	// no prototype: a field named "__proto__" is a field like any other
	const out: Record<string, string[]> = Object.create(null);
	const add = (path: readonly PropertyKey[], message: string) => {
		const key = path.map(String).join('.') || '(body)';
		(out[key] ??= []).push(message);
	};
	const walk = (issues: readonly z.core.$ZodIssue[], base: readonly PropertyKey[]) => {
		for (const issue of issues) {
			const path = [...base, ...issue.path];
			if (issue.code === 'invalid_union' && issue.errors.length > 0) {
				// An alternative that complains of unknown keys was not the one the client meant.
				const meant = issue.errors.filter(
					(alt) => !alt.some((i) => i.code === 'unrecognized_keys' && i.path.length === 0)
				);
				const pool = meant.length > 0 ? meant : issue.errors;
				let best = pool[0];
				for (const alt of pool) if (alt.length < best.length) best = alt;
				walk(best, path);
			} else {
				add(path, issue.message);
			}
		}
	};
	walk(error.issues, []);
	return out;
}

// ---------------------------------------------------------------------------------------------
// Compile-time check: what the schema gives is what the engine takes.

type Extends<A, B> = [A] extends [B] ? true : false;
type Assert<T extends true> = T;

/** Fails to compile if the schema's types drift from the engine's plain types. */
export type SchemaMatchesEngine = [
	Assert<Extends<TruckSpec, Engine.TruckSpec>>,
	Assert<Extends<BatterySpec, Engine.BatterySpec>>,
	Assert<Extends<FleetInput, Engine.FleetInput>>,
	Assert<Extends<OperationInput, Engine.OperationInput>>,
	Assert<Extends<SiteInput, Engine.SiteInput>>,
	Assert<Extends<ResolvedEvaluateRequest, Engine.ResolvedInput>>,
	Assert<Extends<EvaluateRequest, UnresolvedInput>>
];
