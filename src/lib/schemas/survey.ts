import { z } from 'zod';

/**
 * The site survey, one schema per wizard step. Values are stored in SI units (mm, kg, m³/h, m²)
 * whatever the rep typed; the inputs convert. Each step has a strict schema (for "Next") and the
 * autosave route accepts the same shapes with every field optional, so a half-filled step is kept.
 */

export const SURVEY_STEPS = ['site', 'fleet', 'operation', 'equipment', 'charging', 'notes', 'review'] as const;
export type SurveyStep = (typeof SURVEY_STEPS)[number];
export const STEP_TITLES: Record<SurveyStep, string> = {
	site: 'Site and contact',
	fleet: 'Trucks and battery',
	operation: 'Operation',
	equipment: 'Existing equipment',
	charging: 'Charging area',
	notes: 'Photos and notes',
	review: 'Review'
};

const mm = (label: string, max = 5_000) =>
	z.number({ error: `Enter the ${label}.` }).positive(`The ${label} must be above zero.`).max(max, `The ${label} looks too large.`);
const kg = (label: string, max = 20_000) =>
	z.number({ error: `Enter the ${label}.` }).positive(`The ${label} must be above zero.`).max(max, `The ${label} looks too large.`);
// Control characters never belong in survey text (PostgreSQL cannot even store NUL); notes keep
// tabs and line breaks.
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
const text = (max: number) =>
	z
		.string()
		.trim()
		.max(max, `Keep it under ${max} characters.`)
		.refine((v) => !CONTROL.test(v), 'Use plain text, without control characters.');

export const siteStepSchema = z.object({
	customerId: z.uuid({ error: 'Choose the customer.' }),
	siteId: z.uuid({ error: 'Choose the site.' }),
	contactName: text(120).min(1, 'Enter who showed you the site.'),
	contactEmail: z.union([z.literal(''), z.email('Enter a valid e-mail address.')]).default(''),
	contactPhone: text(40).default(''),
	surveyDate: z.iso.date({ error: 'Enter the survey date.' })
});

export const measuredBatterySchema = z.object({
	voltage: z.number({ error: 'Enter the voltage.' }).int().min(12).max(120),
	capacityAh: z.number({ error: 'Enter the capacity.' }).positive().max(3_000),
	lengthMm: mm('battery length', 3_000),
	widthMm: mm('battery width', 3_000),
	heightMm: mm('battery height', 3_000),
	weightKg: kg('battery weight', 5_000),
	chemistry: z.enum(['lead-acid', 'lithium-ion'])
});

export const fleetStepSchema = z
	.object({
		truckModelId: z.uuid({ error: 'Choose a truck model.' }),
		trucks: z.number({ error: 'Enter how many trucks.' }).int('Trucks are counted in whole numbers.').min(1, 'At least one truck.').max(200, 'Up to 200 trucks per survey.'),
		batterySource: z.enum(['catalogue', 'measured']),
		batteryId: z.uuid().nullable().default(null),
		measured: measuredBatterySchema.nullable().default(null)
	})
	.superRefine((v, ctx) => {
		if (v.batterySource === 'catalogue' && !v.batteryId)
			ctx.addIssue({ code: 'custom', path: ['batteryId'], message: 'Choose a battery.' });
		if (v.batterySource === 'measured' && !v.measured)
			ctx.addIssue({ code: 'custom', path: ['measured'], message: 'Enter the measured battery.' });
	});

/** Energy drawn per working hour for the duty presets, kWh/h — common practice for 48 V counterbalance trucks (from memory). */
export const DUTY_PRESETS = { light: 2.5, medium: 3.5, heavy: 5 } as const;

export const operationStepSchema = z.object({
	shiftsPerDay: z.number({ error: 'Enter shifts a day.' }).int().min(1, 'At least one shift.').max(4, 'At most four shifts.'),
	hoursPerShift: z.number({ error: 'Enter hours per shift.' }).positive().max(12, 'A shift is at most 12 hours.'),
	daysPerWeek: z.number({ error: 'Enter days a week.' }).int().min(1).max(7),
	duty: z.enum(['light', 'medium', 'heavy', 'measured']),
	energyKwhPerHour: z.number({ error: 'Enter the energy per hour.' }).positive('Energy per hour must be above zero.').max(20, 'Energy per hour looks too large.'),
	charging: z.enum(['conventional', 'opportunity', 'fast'])
});

export const palletTruckSchema = z.object({
	forkLengthMm: mm('fork length', 3_000),
	overallWidthMm: mm('width over the forks', 1_500),
	capacityKg: kg('pallet truck capacity', 10_000)
});

export const rollerStandSchema = z
	.object({
		kind: z.enum(['stand', 'changer']),
		rollerTopMm: mm('roller height', 2_000),
		adjustable: z.boolean().default(false),
		adjustMinMm: z.number().positive().max(2_000).nullable().default(null),
		adjustMaxMm: z.number().positive().max(2_000).nullable().default(null),
		capacityKg: kg('stand capacity', 10_000),
		driveAlongside: z.boolean().default(false)
	})
	.superRefine((v, ctx) => {
		if (!v.adjustable) return;
		if (v.adjustMinMm == null) ctx.addIssue({ code: 'custom', path: ['adjustMinMm'], message: 'Enter the lowest roller height.' });
		if (v.adjustMaxMm == null) ctx.addIssue({ code: 'custom', path: ['adjustMaxMm'], message: 'Enter the highest roller height.' });
		if (v.adjustMinMm != null && v.adjustMaxMm != null && v.adjustMinMm > v.adjustMaxMm)
			ctx.addIssue({ code: 'custom', path: ['adjustMaxMm'], message: 'The highest must be above the lowest.' });
	});

export const equipmentStepSchema = z
	.object({
		palletTrucks: z.array(palletTruckSchema).max(20),
		rollerStands: z.array(rollerStandSchema).max(40),
		hasCrane: z.boolean().default(false),
		craneRatedLoadKg: z.number().positive().max(50_000).nullable().default(null),
		hasBeam: z.boolean().default(false),
		beamWeightKg: z.number().positive().max(2_000).nullable().default(null)
	})
	.superRefine((v, ctx) => {
		if (v.hasCrane && v.craneRatedLoadKg == null)
			ctx.addIssue({ code: 'custom', path: ['craneRatedLoadKg'], message: 'Enter the hoist’s rated load.' });
		if (v.hasCrane && v.hasBeam && v.beamWeightKg == null)
			ctx.addIssue({ code: 'custom', path: ['beamWeightKg'], message: 'Enter the lifting beam’s weight.' });
	});

export const chargingStepSchema = z
	.object({
		hasArea: z.boolean().default(true),
		floorAreaM2: z.number().positive().max(10_000).nullable().default(null),
		ventilationM3h: z.number().min(0).max(100_000).nullable().default(null),
		eyewash: z.boolean().default(false),
		neutraliser: z.boolean().default(false)
	})
	.superRefine((v, ctx) => {
		if (v.hasArea && v.floorAreaM2 == null)
			ctx.addIssue({ code: 'custom', path: ['floorAreaM2'], message: 'Enter the floor area.' });
		if (v.hasArea && v.ventilationM3h == null)
			ctx.addIssue({ code: 'custom', path: ['ventilationM3h'], message: 'Enter the air flow (0 when there is none).' });
	});

export const notesStepSchema = z.object({
	notes: text(5_000).default('')
});

export const STEP_SCHEMAS = {
	site: siteStepSchema,
	fleet: fleetStepSchema,
	operation: operationStepSchema,
	equipment: equipmentStepSchema,
	charging: chargingStepSchema,
	notes: notesStepSchema
} as const;
export type DataStep = keyof typeof STEP_SCHEMAS;
export const DATA_STEPS = Object.keys(STEP_SCHEMAS) as DataStep[];

export type SiteStep = z.infer<typeof siteStepSchema>;
export type FleetStep = z.infer<typeof fleetStepSchema>;
export type OperationStep = z.infer<typeof operationStepSchema>;
export type EquipmentStep = z.infer<typeof equipmentStepSchema>;
export type ChargingStep = z.infer<typeof chargingStepSchema>;
export type NotesStep = z.infer<typeof notesStepSchema>;

/** Everything a survey holds; a draft may have any step missing or half-filled. */
export interface SurveyData {
	site?: Partial<SiteStep>;
	fleet?: Partial<FleetStep>;
	operation?: Partial<OperationStep>;
	equipment?: Partial<EquipmentStep>;
	charging?: Partial<ChargingStep>;
	notes?: Partial<NotesStep>;
}

/**
 * Autosave body: one step's values, any of them missing. Values are type-checked (a number stays
 * a number) but completeness is not — that is what "Next" checks.
 */
export const autosaveSchema = z.object({
	step: z.enum(['site', 'fleet', 'operation', 'equipment', 'charging', 'notes']),
	values: z.record(z.string(), z.unknown()),
	/** the version the browser last saw; a stale save is still applied (last write wins) */
	version: z.number().int().min(0).optional()
});

function isObjectField(v: z.ZodType): boolean {
	let def = (v as unknown as { _zod: { def: { type: string; innerType?: z.ZodType } } })._zod.def;
	while ((def.type === 'nullable' || def.type === 'default' || def.type === 'optional') && def.innerType) {
		def = (def.innerType as unknown as { _zod: { def: typeof def } })._zod.def;
	}
	return def.type === 'object';
}

/** Checks one step's draft values loosely: each present field must have the right type. */
export function draftStepSchema(step: DataStep) {
	const base = STEP_SCHEMAS[step];
	// superRefine'd objects expose their shape through `in` / `def`
	const shape = ('shape' in base ? base.shape : (base as unknown as { def: { in: { shape: z.ZodRawShape } } }).def.in.shape) as z.ZodRawShape;
	const partial: Record<string, z.ZodType> = {};
	for (const [k, v] of Object.entries(shape)) {
		// rows of a list (pallet trucks, stands) may be half-filled while drafting
		partial[k] =
			isObjectField(v as z.ZodType)
				? z.record(z.string(), z.union([z.number(), z.boolean(), z.string(), z.null()]))
						.nullable()
						.optional()
				: v instanceof z.ZodArray
				? z.array(z.record(z.string(), z.union([z.number(), z.boolean(), z.string(), z.null()]))).max(40).nullable().optional()
				: withoutDefault(v as z.ZodType).nullable().optional();
	}
	return z.object(partial).strict();
}

/** The field without its `.default()`: a draft must not invent answers the rep never gave. */
function withoutDefault(v: z.ZodType): z.ZodType {
	const def = (v as unknown as { _zod: { def: { type: string; innerType?: z.ZodType } } })._zod.def;
	return def.type === 'default' && def.innerType ? def.innerType : v;
}

export const newSurveySchema = z.object({
	customerId: z.uuid({ error: 'Choose the customer.' }),
	siteId: z.uuid({ error: 'Choose the site.' }).optional()
});

export const chooseSetupSchema = z.object({
	setup: z.enum(['in-truck', 'roller-bed', 'trolley-stand', 'overhead-hoist'])
});
