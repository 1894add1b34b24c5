import { z } from 'zod';
import { checkHoursPerDay } from './evaluate';
import { formatLength, formatMass } from '../units';
import { STEP_LABELS, SURVEY_STEPS } from '../labels';

/**
 * The site survey, one schema per wizard step. Values are stored in SI units (mm, kg, m³/h, m²)
 * whatever the rep typed; the inputs convert. Each step has a strict schema (for "Next") and the
 * autosave route accepts the same shapes with every field optional, so a half-filled step is kept.
 */

export { SURVEY_STEPS };
export type SurveyStep = (typeof SURVEY_STEPS)[number];
export const STEP_TITLES = STEP_LABELS as Record<SurveyStep, string>;

// Range messages state the range, so the rep knows what to type instead.
const mm = (label: string, max = 5_000) =>
	z
		.number({ error: `Enter the ${label}.` })
		.positive(`The ${label} must be more than 0.`)
		.max(max, `The ${label} can be at most ${formatLength(max)}.`);
const kg = (label: string, max = 20_000) =>
	z
		.number({ error: `Enter the ${label}.` })
		.positive(`The ${label} must be more than 0.`)
		.max(max, `The ${label} can be at most ${formatMass(max)}.`);
/** An optional quantity of a draft row: empty or in range. */
const optionalMm = (label: string, max: number) => mm(label, max).nullable().default(null);
const optionalKg = (label: string, max: number) => kg(label, max).nullable().default(null);
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
	contactEmail: z.union([z.literal(''), z.email('Enter a valid e-mail address, like name@example.com (or leave it empty).')]).default(''),
	contactPhone: text(40).default(''),
	surveyDate: z.iso.date({ error: 'Enter the survey date.' })
});

export const measuredBatterySchema = z.object({
	voltage: z.number({ error: 'Enter the voltage: a whole number from 12 to 120 V.' }).int().min(12).max(120),
	capacityAh: z.number({ error: 'Enter the capacity: more than 0, at most 3 000 Ah.' }).positive().max(3_000),
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

// One message per field, for a missing value and for one out of range alike: it says what fits.
export const operationStepSchema = z
	.object({
		shiftsPerDay: z.number({ error: 'Enter 1 to 4 shifts a day (whole shifts).' }).int().min(1).max(4),
		hoursPerShift: z.number({ error: 'Enter hours per shift: more than 0, at most 12.' }).positive().max(12),
		daysPerWeek: z.number({ error: 'Enter 1 to 7 days a week (whole days).' }).int().min(1).max(7),
		duty: z.enum(['light', 'medium', 'heavy', 'measured'], { error: 'Choose a duty.' }),
		energyKwhPerHour: z.number({ error: 'Enter the energy per working hour: more than 0, at most 20 kWh.' }).positive().max(20),
		charging: z.enum(['conventional', 'opportunity', 'fast'], { error: 'Choose how the batteries are charged.' })
	})
	// the same rule as the engine's request schema: shifts × hours fit in 24 hours; checked even
	// while another answer is missing, so the rep sees every problem of the step at once
	.superRefine(checkHoursPerDay, { when: () => true });

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
		adjustMinMm: optionalMm('lowest roller height', 2_000),
		adjustMaxMm: optionalMm('highest roller height', 2_000),
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
		craneRatedLoadKg: optionalKg('hoist’s rated load', 50_000),
		hasBeam: z.boolean().default(false),
		beamWeightKg: optionalKg('lifting beam’s weight', 2_000)
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
		floorAreaM2: z.number({ error: 'Enter the floor area: more than 0, at most 10 000 m² (107,639 ft²).' }).positive().max(10_000).nullable().default(null),
		ventilationM3h: z
			.number({ error: 'Enter the air flow: 0 (none) up to 100 000 m³/h (58,858 cfm).' })
			.min(0)
			.max(100_000)
			.nullable()
			.default(null),
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

type Def = { type: string; innerType?: z.ZodType; element?: z.ZodType; shape?: z.ZodRawShape };
const defOf = (v: z.ZodType) => (v as unknown as { _zod: { def: Def } })._zod.def;

/** The field without `.default()`, `.nullable()` or `.optional()`: a draft must not invent answers. */
function bare(v: z.ZodType): z.ZodType {
	let out = v;
	let def = defOf(out);
	while ((def.type === 'default' || def.type === 'nullable' || def.type === 'optional') && def.innerType) {
		out = def.innerType;
		def = defOf(out);
	}
	return out;
}

function stepShape(step: DataStep): z.ZodRawShape {
	return STEP_SCHEMAS[step].shape as z.ZodRawShape;
}

/** The `.max()` of a list field, read from its schema. */
function maxLength(list: z.ZodType): number {
	const checks = (defOf(list) as Def & { checks?: { _zod: { def: { check: string; maximum?: number } } }[] }).checks ?? [];
	for (const c of checks) if (c._zod.def.check === 'max_length' && typeof c._zod.def.maximum === 'number') return c._zod.def.maximum;
	return 20;
}

/** Fields whose empty text means "not answered yet" rather than a wrong answer. */
const TEXTUAL = new Set(['string', 'enum', 'union', 'literal']);

/** One step's draft values split into what may be stored and what is refused, field by field. */
export interface DraftParse {
	/** fields that passed, ready to merge into the stored step (no prototype) */
	values: Record<string, unknown>;
	/** refused fields by dotted path inside the step ("contactEmail", "palletTrucks.0.forkLengthMm") */
	errors: Record<string, string[]>;
}

const unknownField = (key: string) => [`“${key.slice(0, 40)}” is not an answer of this step; leave it out.`];
const messages = (error: z.ZodError) => [...new Set(error.issues.map((i) => i.message))];

/** Checks one present value against its field; empty means "not answered" and is kept as such. */
function checkValue(field: z.ZodType, value: unknown): { ok: true; value: unknown } | { ok: false; messages: string[] } {
	if (value === null) return { ok: true, value: null };
	const f = bare(field);
	if (value === '' && TEXTUAL.has(defOf(f).type)) return { ok: true, value: '' };
	const r = f.safeParse(value);
	return r.success ? { ok: true, value: r.data } : { ok: false, messages: messages(r.error) };
}

/** A row of a list, or a nested object such as the measured battery: each field on its own. */
function checkRow(shape: z.ZodRawShape, value: unknown, path: string, errors: Record<string, string[]>): Record<string, unknown> | null {
	if (typeof value !== 'object' || value === null || Array.isArray(value)) {
		errors[path] = ['Send this as an object of answers.'];
		return null;
	}
	const row: Record<string, unknown> = Object.create(null);
	for (const [k, v] of Object.entries(value)) {
		if (v === undefined) continue;
		if (!Object.hasOwn(shape, k)) {
			errors[`${path}.${k}`] = unknownField(k);
			continue;
		}
		const checked = checkValue(shape[k] as z.ZodType, v);
		if (checked.ok) row[k] = checked.value;
		else {
			// the row is kept (its other answers are good); the refused answer is left empty
			errors[`${path}.${k}`] = checked.messages;
			row[k] = null;
		}
	}
	return row;
}

/**
 * Checks one step's draft (autosave, or Next/Back with a step not complete yet) field by field:
 * each present answer must have the right type and be in range, but the step need not be complete.
 * A bad answer refuses only itself; every other answer is kept. Empty answers (null, or "" for a
 * text or a choice) clear the field. Cross-field rules are left to "Next".
 */
export function parseDraftStep(step: DataStep, input: Record<string, unknown>): DraftParse {
	const shape = stepShape(step);
	const values: Record<string, unknown> = Object.create(null);
	const errors: Record<string, string[]> = Object.create(null);
	for (const [key, value] of Object.entries(input)) {
		if (value === undefined) continue;
		if (!Object.hasOwn(shape, key)) {
			errors[key] = unknownField(key);
			continue;
		}
		const field = bare(shape[key] as z.ZodType);
		const def = defOf(field);
		if (value === null) values[key] = null;
		else if (def.type === 'object' && def.shape) {
			const row = checkRow(def.shape, value, key, errors);
			if (row) values[key] = row;
		} else if (def.type === 'array' && def.element) {
			const max = maxLength(field);
			if (!Array.isArray(value)) errors[key] = ['Send this as a list.'];
			else if (value.length > max) errors[key] = [`Up to ${max} of these per survey.`];
			else {
				const rowShape = defOf(bare(def.element)).shape ?? {};
				const rows = value.map((row, i) => checkRow(rowShape, row, `${key}.${i}`, errors));
				if (rows.every((r) => r !== null)) values[key] = rows;
			}
		} else {
			const checked = checkValue(field, value);
			if (checked.ok) values[key] = checked.value;
			else errors[key] = checked.messages;
		}
	}
	return { values, errors };
}

/** Labels of the step fields as the wizard shows them, for lists of what is still needed. */
export const FIELD_LABELS: { [S in DataStep]: Record<string, string> } = {
	site: {
		customerId: 'Customer',
		siteId: 'Site',
		contactName: 'Who showed you the site',
		contactEmail: 'Their e-mail',
		contactPhone: 'Their phone',
		surveyDate: 'Survey date'
	},
	fleet: { truckModelId: 'Truck model', trucks: 'How many trucks', batterySource: 'Battery', batteryId: 'Battery for this truck', measured: 'Measured battery' },
	operation: {
		shiftsPerDay: 'Shifts a day',
		hoursPerShift: 'Hours per shift',
		daysPerWeek: 'Days a week',
		duty: 'Duty',
		energyKwhPerHour: 'Energy per working hour',
		charging: 'Charging'
	},
	equipment: {
		palletTrucks: 'Pallet trucks',
		rollerStands: 'Roller stands and battery changers',
		hasCrane: 'Overhead hoist',
		craneRatedLoadKg: 'Rated load of the hoist',
		hasBeam: 'Lifting beam',
		beamWeightKg: 'Lifting beam weight'
	},
	charging: { hasArea: 'Charging area', floorAreaM2: 'Floor area', ventilationM3h: 'Mechanical air flow', eyewash: 'Eyewash station', neutraliser: 'Neutralising supplies' },
	notes: { notes: 'Notes' }
};

/**
 * Whether a step is complete: it has been saved at least once and its stored answers pass the
 * step's own schema (what "Next" checks). The step indicator and the review use this one rule.
 */
export function isStepComplete(step: DataStep, data: SurveyData): boolean {
	const values = data[step];
	return values != null && STEP_SCHEMAS[step].safeParse(values).success;
}

/** What a step still needs, as "Label: message" lines (one per field, messages as written). */
export function stepProblems(step: DataStep, data: SurveyData): string[] {
	const values = data[step];
	if (values == null) return ['Not filled in yet.'];
	const parsed = STEP_SCHEMAS[step].safeParse(values);
	if (parsed.success) return [];
	const seen = new Set<string>();
	const out: string[] = [];
	for (const issue of parsed.error.issues) {
		const key = String(issue.path[0] ?? '');
		if (seen.has(key)) continue;
		seen.add(key);
		out.push(issue.message);
	}
	return out;
}

export const newSurveySchema = z.object({
	customerId: z.uuid({ error: 'Choose the customer.' }),
	siteId: z.uuid({ error: 'Choose the site.' }).optional()
});

export const chooseSetupSchema = z.object({
	setup: z.enum(['in-truck', 'roller-bed', 'trolley-stand', 'overhead-hoist'])
});
