/**
 * Forms of the catalogue admin: truck models, batteries and handling equipment.
 *
 * The forms are flat (one form field per value, so a plain form post works) and every length and
 * mass is the text the admin typed ("43.3 in", "1100 mm", "2,900 lb"); a bare number takes the unit
 * system posted in `units`. Each form schema reads its fields into the nested record the engine
 * reads and validates that record with the engine API's own schemas (`truckSpecSchema`,
 * `batterySpecSchema` from ./evaluate) plus the cross-field rules a catalogue entry must also meet.
 * Errors come back on the flat field the admin typed into.
 *
 * Catalogue dimensions are kept to the whole millimetre and masses to 0.1 kg: a value shown in
 * inches (2 decimals) or pounds (1 decimal) reads back to the same stored figure, so saving an
 * unchanged form changes nothing.
 *
 * Shared by the server and the browser: imports only types from `$lib/server`.
 */
import { z } from 'zod';
import { formatMoney, parseMoney } from '../money';
import {
	KG_PER_LB,
	MM_PER_IN,
	formatInput,
	formatLength,
	formatMass,
	formatNumber,
	parseQuantity,
	type QuantityKind,
	type UnitSystem
} from '../units';
import {
	LIMITS,
	batterySpecSchema,
	chargingMethodSchema,
	chemistrySchema,
	sitePalletTruckSchema,
	siteRollerStandSchema,
	truckSpecSchema,
	unitSystemSchema,
	type BatterySpec,
	type TruckSpec
} from './evaluate';
import type { EquipmentKind, EquipmentSpecs } from '../server/rules/types';

// ---------------------------------------------------------------------------------------------
// Reading typed values

/** Largest price or cost the catalogue takes, cents ($100 000 000). */
export const MAX_CATALOGUE_CENTS = 10_000_000_000;
/** Largest truck rated capacity, kg. */
export const MAX_TRUCK_CAPACITY_KG = 25_000;

const UUID_SHAPE = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** What a form field holds. */
export type FieldKind = 'length' | 'mass' | 'number' | 'integer';

export interface FieldInfo {
	/** form field name */
	name: string;
	kind: FieldKind;
	/** noun phrase for messages: "the compartment length" */
	noun: string;
	/** short label above the input */
	label: string;
	/** one line under the label */
	hint?: string;
	/** unit shown beside a plain number input ("V", "Ah", "°") */
	unit?: string;
}

function cap(s: string): string {
	return s.charAt(0).toUpperCase() + s.slice(1);
}

/** Rounds a parsed length to whole millimetres and a mass to 0.1 kg (see the module comment). */
function roundStored(kind: FieldKind, value: number): number {
	if (kind === 'length') return Math.round(value);
	if (kind === 'mass') return Math.round(value * 10) / 10;
	return value;
}

type Read = { ok: true; value: number } | { ok: false; message: string };

const PLAIN_NUMBER = /^(?:\d+(?:\.\d*)?|\.\d+)$/;
const GROUPED_NUMBER = /^\d{1,3}(?:,\d{3})+(?:\.\d+)?$/;

/**
 * Reads a plain number (volts, ampere-hours, degrees, a count). A comma only groups thousands;
 * the field's own unit may follow ("48 V", "125°").
 */
export function readPlainNumber(
	text: string,
	field: Pick<FieldInfo, 'noun' | 'unit' | 'kind'>
): Read {
	let s = text.trim().replace(/\s+/g, ' ');
	if (field.unit) {
		const unit = field.unit.toLowerCase();
		const lower = s.toLowerCase();
		if (lower.endsWith(unit)) s = s.slice(0, s.length - unit.length).trim();
		else if (unit === '°' && lower.endsWith('deg')) s = s.slice(0, -3).trim();
	}
	if (s.startsWith('-')) return { ok: false, message: `${cap(field.noun)} cannot be negative.` };
	let value: number;
	if (PLAIN_NUMBER.test(s)) value = Number(s);
	else if (GROUPED_NUMBER.test(s)) value = Number(s.replace(/,/g, ''));
	else if (/^\d+,\d{1,2}$/.test(s)) {
		return {
			ok: false,
			message: `Use a point for decimals (${s.replace(',', '.')}); a comma only separates thousands.`
		};
	} else {
		return {
			ok: false,
			message: `Enter ${field.noun} as a number${field.unit ? ` of ${field.unit}` : ''}.`
		};
	}
	if (field.kind === 'integer' && !Number.isInteger(value)) {
		return { ok: false, message: `${cap(field.noun)} must be a whole number.` };
	}
	return { ok: true, value };
}

/** Reads one typed field; lengths and masses through the unit parser, in the given system. */
export function readField(field: FieldInfo, text: string, system: UnitSystem): Read {
	if (text.trim() === '') return { ok: false, message: `Enter ${field.noun}.` };
	if (field.kind === 'length' || field.kind === 'mass') {
		const r = parseQuantity(field.kind as QuantityKind, text, system);
		return r.ok ? { ok: true, value: roundStored(field.kind, r.value) } : r;
	}
	return readPlainNumber(text, field);
}

/** The text a stored value shows in its form field, in the user's system. */
export function fieldText(
	field: Pick<FieldInfo, 'kind'>,
	value: number | null | undefined,
	system: UnitSystem
): string {
	if (value === null || value === undefined || !Number.isFinite(value)) return '';
	if (field.kind === 'length') return formatInput('length', value, system);
	if (field.kind === 'mass') return formatInput('mass', value, system);
	return String(value);
}

/** Cents as the text of a price field: 2480000 → "24,800.00" (no float involved). */
export function moneyText(cents: number): string {
	return formatMoney(cents, 'USD', 'en-US').replace(/^\$/, '');
}

function readMoney(
	text: string,
	noun: string
): { ok: true; cents: number } | { ok: false; message: string } {
	if (text.trim() === '') return { ok: false, message: `Enter ${noun}, like 1,234.56.` };
	const r = parseMoney(text);
	if (!r.ok) return r;
	if (r.cents > MAX_CATALOGUE_CENTS) {
		return {
			ok: false,
			message: `${cap(noun)} must be at most ${formatMoney(MAX_CATALOGUE_CENTS)}.`
		};
	}
	return r;
}

/** A field's message for a zod issue, with units for limits on lengths and masses. */
function issueMessage(
	field: FieldInfo | undefined,
	issue: z.core.$ZodIssue,
	system: UnitSystem
): string {
	if (field && issue.code === 'too_big' && typeof issue.maximum === 'number') {
		const max = issue.maximum;
		if (field.kind === 'length')
			return `${cap(field.noun)} must be at most ${formatLength(max, system)}.`;
		if (field.kind === 'mass')
			return `${cap(field.noun)} must be at most ${formatMass(max, system)}.`;
	}
	return issue.message;
}

type Errors = Record<string, string[]>;
function addError(errors: Errors, name: string, message: string) {
	const list = (errors[name] ??= []);
	if (!list.includes(message)) list.push(message);
}

function setPath(target: Record<string, unknown>, path: readonly string[], value: unknown) {
	let node = target;
	for (const key of path.slice(0, -1)) node = (node[key] ??= {}) as Record<string, unknown>;
	node[path[path.length - 1]] = value;
}

/** Field names by nested path, for putting an issue back on the field the admin typed into. */
function pathIndex(
	fields: readonly (FieldInfo & { path: readonly string[] })[]
): Map<string, FieldInfo> {
	return new Map(fields.map((f) => [f.path.join('.'), f]));
}

/** Adds every error of a read to a zod refinement context, on its flat field. */
function report(ctx: z.RefinementCtx, errors: Errors) {
	for (const [name, messages] of Object.entries(errors)) {
		for (const message of messages) ctx.addIssue({ code: 'custom', path: [name], message });
	}
}

/** A stand-in for a value that could not be read, so the spec schema can still check the rest. */
const UNREAD = 1;

/**
 * Checks a spec built from the form with the given schema and puts each issue on its flat field.
 * `unread` names the fields whose text could not be read (their spec value is a stand-in): their
 * issues are dropped, and so are cross-field issues, which would compare against a stand-in.
 */
function checkSpec<T>(
	schema: z.ZodType<T>,
	spec: Record<string, unknown>,
	unread: ReadonlySet<string>,
	nameFor: (path: string) => string,
	infoFor: (name: string) => FieldInfo | undefined,
	errors: Errors,
	system: UnitSystem
): T | null {
	const r = schema.safeParse(spec);
	if (r.success) return unread.size === 0 ? r.data : null;
	for (const issue of r.error.issues) {
		const name = nameFor(issue.path.map(String).join('.'));
		if (unread.has(name) || (issue.code === 'custom' && unread.size > 0)) continue;
		addError(errors, name, issueMessage(infoFor(name), issue, system));
	}
	return null;
}

export type ReadResult<T> = { ok: true; value: T } | { ok: false; errors: Errors };

type PathField = FieldInfo & { path: readonly string[] };

/**
 * Reads each typed spec field into its place in `spec`. A field that cannot be read gets its
 * message and a stand-in value, and is named in `unread` (see `checkSpec`).
 */
function readSpecFields<F extends PathField>(
	fields: readonly F[],
	form: Record<F['name'], string>,
	system: UnitSystem,
	spec: Record<string, unknown>,
	errors: Errors,
	unread: Set<string>
) {
	for (const field of fields) {
		const r = readField(field, form[field.name as F['name']], system);
		setPath(spec, field.path, r.ok ? r.value : UNREAD);
		if (!r.ok) {
			addError(errors, field.name, r.message);
			unread.add(field.name);
		}
	}
}

/** The text of each spec field, from its place in a stored spec. */
function specFieldTexts(
	fields: readonly PathField[],
	spec: unknown,
	system: UnitSystem
): Record<string, string> {
	const texts: Record<string, string> = {};
	for (const field of fields) {
		let node: unknown = spec;
		for (const key of field.path) node = (node as Record<string, unknown> | undefined)?.[key];
		texts[field.name] = fieldText(field, typeof node === 'number' ? node : null, system);
	}
	return texts;
}

/** Reads the list price and the cost into cents; null (with the messages in `errors`) if not. */
function readPrices(
	form: { price: string; cost: string },
	errors: Errors
): { priceCents: number; costCents: number } | null {
	const price = readMoney(form.price, 'the list price');
	if (!price.ok) addError(errors, 'price', price.message);
	const cost = readMoney(form.cost, 'the cost');
	if (!cost.ok) addError(errors, 'cost', cost.message);
	return price.ok && cost.ok ? { priceCents: price.cents, costCents: cost.cents } : null;
}

/** A form schema whose refinement reads the whole form and puts each error on its flat field. */
function readingSchema<S extends z.ZodObject>(
	base: S,
	read: (form: z.infer<S>) => ReadResult<unknown>
): S {
	return base.superRefine((form, ctx) => {
		const r = read(form);
		if (!r.ok) report(ctx, r.errors);
	});
}

// ---------------------------------------------------------------------------------------------
// Shared fields

/** A catalogue code or SKU: letters, digits, dots, dashes, underscores and slashes; unique. */
export const codeSchema = (what: string) =>
	z
		.string()
		.trim()
		.min(1, `Enter the ${what}.`)
		.max(40, `Keep the ${what} to 40 characters.`)
		.regex(
			/^[A-Za-z0-9][A-Za-z0-9._/-]*$/,
			`Use letters, digits, dots, dashes, underscores or slashes in the ${what}, starting with a letter or digit; no spaces.`
		)
		.refine(
			(s) => !UUID_SHAPE.test(s),
			`The ${what} must not look like an id; choose a shorter one.`
		);

/** One line of plain text, up to `max` characters. */
const lineSchema = (what: string, max: number) =>
	z
		.string()
		.trim()
		.min(1, `Enter the ${what}.`)
		.max(max, `Keep the ${what} to ${max} characters.`)
		// one line of text: the database layer would store a NUL as the two characters "\0"
		// eslint-disable-next-line no-control-regex
		.refine((s) => !/[\u0000-\u001f\u007f]/.test(s), `The ${what} must be one line of plain text.`);

const nameSchema = (what: string) => lineSchema(what, 120);

/** a typed value; read and checked by the form's refinement */
const typed = z.string().max(60, 'This is too long to be a value.').default('');

/** A typed value for each spec field. */
const typedFields = <N extends string>(fields: readonly { name: N }[]) =>
	Object.fromEntries(fields.map((f) => [f.name, typed])) as Record<N, typeof typed>;

const money = { price: typed, cost: typed };

// ---------------------------------------------------------------------------------------------
// Truck models

/** Every field of a truck model's spec, in form order, with the spec path it fills. */
export const TRUCK_SPEC_FIELDS = [
	{
		name: 'voltage',
		path: ['voltage'],
		kind: 'number',
		noun: 'the truck voltage',
		label: 'Voltage',
		unit: 'V',
		hint: 'Nominal system voltage.'
	},
	{
		name: 'compartmentLength',
		path: ['compartment', 'lengthMm'],
		kind: 'length',
		noun: 'the compartment length',
		label: 'Length',
		hint: 'Along the truck.'
	},
	{
		name: 'compartmentWidth',
		path: ['compartment', 'widthMm'],
		kind: 'length',
		noun: 'the compartment width',
		label: 'Width',
		hint: 'Across the truck, door to far side.'
	},
	{
		name: 'compartmentHeight',
		path: ['compartment', 'heightMm'],
		kind: 'length',
		noun: 'the compartment height',
		label: 'Height',
		hint: 'Usable height without a roller bed.'
	},
	{
		name: 'compartmentHeightWithRollerBed',
		path: ['compartment', 'heightWithRollerBedMm'],
		kind: 'length',
		noun: 'the height with roller bed',
		label: 'Height with roller bed',
		hint: 'Usable height once a roller bed is fitted.'
	},
	{
		name: 'rollerBedTop',
		path: ['rollerBedTopMm'],
		kind: 'length',
		noun: 'the roller bed height',
		label: 'Roller-bed top',
		hint: 'Roller tops above the floor.'
	},
	{
		name: 'serviceForkMaxLength',
		path: ['forkFit', 'serviceTrolley', 'maxLengthMm'],
		kind: 'length',
		noun: 'the longest fork length for the service trolley',
		label: 'Longest forks',
		hint: 'Longer forks hit the far side of the frame.'
	},
	{
		name: 'serviceForkMaxWidth',
		path: ['forkFit', 'serviceTrolley', 'maxOverallWidthMm'],
		kind: 'length',
		noun: 'the widest width over the forks for the service trolley',
		label: 'Widest over the forks',
		hint: 'Outside width of both forks.'
	},
	{
		name: 'latchForkMinLength',
		path: ['forkFit', 'latchTrolley', 'minLengthMm'],
		kind: 'length',
		noun: 'the shortest fork length for the latching trolley',
		label: 'Shortest forks',
		hint: 'Shortest forks the latch adapter fits.'
	},
	{
		name: 'latchForkMaxLength',
		path: ['forkFit', 'latchTrolley', 'maxLengthMm'],
		kind: 'length',
		noun: 'the longest fork length for the latching trolley',
		label: 'Longest forks',
		hint: 'Longest forks the latch adapter fits.'
	},
	{
		name: 'latchForkMaxWidth',
		path: ['forkFit', 'latchTrolley', 'maxOverallWidthMm'],
		kind: 'length',
		noun: 'the widest width over the forks for the latching trolley',
		label: 'Widest over the forks',
		hint: 'Outside width of both forks.'
	},
	{
		name: 'doorSwing',
		path: ['doorSwingDeg'],
		kind: 'number',
		noun: 'the standard door swing',
		label: 'Standard door swing',
		unit: '°',
		hint: 'Opening angle of the side door.'
	},
	{
		name: 'wideDoorSwing',
		path: ['wideDoorSwingDeg'],
		kind: 'number',
		noun: 'the wide door swing',
		label: 'Wide-swing door',
		unit: '°',
		hint: 'Opening angle of the wide-swing door option.'
	},
	{
		name: 'batteryWeightMin',
		path: ['batteryWeightKg', 'min'],
		kind: 'mass',
		noun: 'the minimum battery weight',
		label: 'Lightest battery',
		hint: 'Part of the counterweight: never quote below it.'
	},
	{
		name: 'batteryWeightMax',
		path: ['batteryWeightKg', 'max'],
		kind: 'mass',
		noun: 'the maximum battery weight',
		label: 'Heaviest battery',
		hint: 'From the nameplate.'
	}
] as const satisfies readonly PathField[];

export type TruckSpecFieldName = (typeof TRUCK_SPEC_FIELDS)[number]['name'];
const TRUCK_BY_PATH = pathIndex(TRUCK_SPEC_FIELDS);

export const CAPACITY_FIELD: FieldInfo & { name: 'capacity' } = {
	name: 'capacity',
	kind: 'mass',
	noun: 'the rated capacity',
	label: 'Rated capacity',
	hint: 'Load the truck lifts.'
};

/**
 * A truck spec as a catalogue entry must have it: the engine API's schema plus the rules of a
 * well-formed model that the API does not need to enforce on a one-off request.
 */
export const catalogueTruckSpecSchema = truckSpecSchema
	.refine((s) => s.compartment.heightWithRollerBedMm <= s.compartment.heightMm, {
		message:
			'The height with roller bed must not be above the compartment height: the roller bed takes height away.',
		path: ['compartment', 'heightWithRollerBedMm']
	})
	.refine((s) => s.wideDoorSwingDeg >= s.doorSwingDeg, {
		message: 'The wide-swing door must open at least as far as the standard door.',
		path: ['wideDoorSwingDeg']
	});

/** What a valid truck model form gives the repository. */
export interface TruckModelInput {
	code: string;
	name: string;
	family: string;
	/** rated capacity, whole kg */
	capacityKg: number;
	priceCents: number;
	costCents: number;
	spec: TruckSpec;
	batteryIds: string[];
}

const truckFormBase = z.object({
	units: unitSystemSchema.default('metric'),
	code: codeSchema('model code'),
	name: nameSchema('model name'),
	family: lineSchema('family', 60),
	capacity: typed,
	...money,
	...typedFields(TRUCK_SPEC_FIELDS),
	batteryIds: z.array(z.string().max(60)).max(200, 'Choose at most 200 batteries.').default([])
});
export type TruckForm = z.infer<typeof truckFormBase>;

/** Reads a truck model form into the repository's input, or errors keyed by form field. */
export function readTruckForm(form: TruckForm): ReadResult<TruckModelInput> {
	const system = form.units;
	const errors: Errors = {};
	const spec: Record<string, unknown> = {};
	const unread = new Set<string>();
	readSpecFields(TRUCK_SPEC_FIELDS, form, system, spec, errors, unread);
	let capacityKg = 0;
	const cap = readField(CAPACITY_FIELD, form.capacity, system);
	if (!cap.ok) addError(errors, 'capacity', cap.message);
	else {
		capacityKg = Math.round(cap.value);
		if (capacityKg < 1) addError(errors, 'capacity', 'The rated capacity must be more than zero.');
		else if (capacityKg > MAX_TRUCK_CAPACITY_KG) {
			addError(
				errors,
				'capacity',
				`The rated capacity must be at most ${formatMass(MAX_TRUCK_CAPACITY_KG, system)}.`
			);
		}
	}
	const prices = readPrices(form, errors);
	if (form.batteryIds.some((id) => !UUID_SHAPE.test(id))) {
		addError(errors, 'batteryIds', 'Choose batteries from the list.');
	}

	const parsedSpec = checkSpec(
		catalogueTruckSpecSchema,
		spec,
		unread,
		(path) => TRUCK_BY_PATH.get(path)?.name ?? 'voltage',
		(name) => TRUCK_SPEC_FIELDS.find((f) => f.name === name),
		errors,
		system
	);
	if (Object.keys(errors).length > 0 || !parsedSpec || !prices) return { ok: false, errors };
	return {
		ok: true,
		value: {
			code: form.code.trim(),
			name: form.name.trim(),
			family: form.family.trim(),
			capacityKg,
			...prices,
			spec: parsedSpec,
			batteryIds: [...new Set(form.batteryIds)]
		}
	};
}

/** The truck model form: flat fields, checked with the engine's truck schema. */
export const truckFormSchema = readingSchema(truckFormBase, readTruckForm);

/** A stored truck model as the text of its form, in the user's unit system. */
export function truckFormValues(
	row: {
		code: string;
		name: string;
		family: string;
		capacityKg: number;
		priceCents: number;
		costCents: number;
		spec: TruckSpec;
		batteryIds: string[];
	},
	system: UnitSystem
): TruckForm {
	return {
		units: system,
		code: row.code,
		name: row.name,
		family: row.family,
		capacity: fieldText(CAPACITY_FIELD, row.capacityKg, system),
		price: moneyText(row.priceCents),
		cost: moneyText(row.costCents),
		batteryIds: [...row.batteryIds],
		...specFieldTexts(TRUCK_SPEC_FIELDS, row.spec, system)
	} as TruckForm;
}

// ---------------------------------------------------------------------------------------------
// Batteries

export const BATTERY_SPEC_FIELDS = [
	{
		name: 'voltage',
		path: ['voltage'],
		kind: 'number',
		noun: 'the battery voltage',
		label: 'Voltage',
		unit: 'V'
	},
	{
		name: 'capacityAh',
		path: ['capacityAh'],
		kind: 'number',
		noun: 'the capacity',
		label: 'Capacity',
		unit: 'Ah',
		hint: 'Rated capacity at the 5- or 6-hour rate.'
	},
	{
		name: 'length',
		path: ['lengthMm'],
		kind: 'length',
		noun: 'the battery length',
		label: 'Length'
	},
	{ name: 'width', path: ['widthMm'], kind: 'length', noun: 'the battery width', label: 'Width' },
	{
		name: 'height',
		path: ['heightMm'],
		kind: 'length',
		noun: 'the battery height',
		label: 'Height',
		hint: 'Including cell connectors.'
	},
	{
		name: 'weight',
		path: ['weightKg'],
		kind: 'mass',
		noun: 'the battery weight',
		label: 'Weight',
		hint: 'Service weight, with tray and ballast.'
	}
] as const satisfies readonly PathField[];

export type BatterySpecFieldName = (typeof BATTERY_SPEC_FIELDS)[number]['name'];
const BATTERY_BY_PATH = pathIndex(BATTERY_SPEC_FIELDS);

export const CHEMISTRY_LABELS: Readonly<Record<z.infer<typeof chemistrySchema>, string>> = {
	'lead-acid': 'Lead-acid',
	'lithium-ion': 'Lithium-ion'
};

/** A battery spec as stored in the catalogue (the engine's, without the code and name). */
export type CatalogueBatterySpec = Omit<BatterySpec, 'sku' | 'name'>;

export interface BatteryInput {
	code: string;
	name: string;
	priceCents: number;
	costCents: number;
	spec: CatalogueBatterySpec;
}

const batteryFormBase = z.object({
	units: unitSystemSchema.default('metric'),
	code: codeSchema('battery code'),
	name: nameSchema('battery name'),
	chemistry: z.string().max(40).default('lead-acid'),
	...money,
	...typedFields(BATTERY_SPEC_FIELDS)
});
export type BatteryForm = z.infer<typeof batteryFormBase>;

export function readBatteryForm(form: BatteryForm): ReadResult<BatteryInput> {
	const system = form.units;
	const errors: Errors = {};
	const spec: Record<string, unknown> = { chemistry: form.chemistry };
	const unread = new Set<string>();
	readSpecFields(BATTERY_SPEC_FIELDS, form, system, spec, errors, unread);
	if (!chemistrySchema.safeParse(form.chemistry).success) {
		addError(errors, 'chemistry', 'Choose lead-acid or lithium-ion.');
		// said here in plain words; the schema's own message is dropped
		unread.add('chemistry');
	}
	const prices = readPrices(form, errors);
	const parsedSpec = checkSpec(
		batterySpecSchema,
		spec,
		unread,
		(path) => (path === 'chemistry' ? 'chemistry' : (BATTERY_BY_PATH.get(path)?.name ?? 'voltage')),
		(name) => BATTERY_SPEC_FIELDS.find((f) => f.name === name),
		errors,
		system
	);
	if (Object.keys(errors).length > 0 || !parsedSpec || !prices) return { ok: false, errors };
	return {
		ok: true,
		value: { code: form.code.trim(), name: form.name.trim(), ...prices, spec: parsedSpec }
	};
}

/** The battery form: flat fields, checked with the engine's battery schema. */
export const batteryFormSchema = readingSchema(batteryFormBase, readBatteryForm);

export function batteryFormValues(
	row: {
		code: string;
		name: string;
		priceCents: number;
		costCents: number;
		spec: CatalogueBatterySpec;
	},
	system: UnitSystem
): BatteryForm {
	return {
		units: system,
		code: row.code,
		name: row.name,
		chemistry: row.spec.chemistry,
		price: moneyText(row.priceCents),
		cost: moneyText(row.costCents),
		...specFieldTexts(BATTERY_SPEC_FIELDS, row.spec, system)
	} as BatteryForm;
}

// ---------------------------------------------------------------------------------------------
// Handling equipment

/** Equipment kinds edited on the equipment tab (batteries have their own tab). */
export type EditableEquipmentKind = Exclude<EquipmentKind, 'battery'>;

const positive = (max: number, noun: string) =>
	z
		.number({ error: `Enter ${noun} as a number.` })
		.positive(`${cap(noun)} must be more than zero.`)
		.max(max, `${cap(noun)} must be at most ${max.toLocaleString('en-US')}.`);

const swingSpec = z.object({ swingDeg: positive(LIMITS.doorDeg, 'the door swing').optional() });
const trolleySpec = z.object({
	rollers: z
		.number()
		.int('The number of rollers must be a whole number.')
		.min(1, 'A trolley has at least one roller.')
		.max(16, 'The number of rollers must be at most 16.')
		.optional(),
	weightKg: positive(LIMITS.beamKg, 'the trolley weight').optional()
});
const standSpec = z.object({ capacityKg: positive(LIMITS.handlingKg, 'the stand capacity') });
const noSpec = z.object({});

export const chargerProfileSchema = z.enum(['IU', 'IUI', 'W']);

/**
 * The spec of each kind of equipment, as the engine reads it (rules/types.ts `EquipmentSpecs`).
 * Roller stands and pallet trucks use the engine API's own site schemas: they describe the same
 * things.
 */
export const equipmentSpecSchemas = {
	'side-door': swingSpec,
	'wide-door': swingSpec,
	'side-cover': noSpec,
	'service-trolley': trolleySpec,
	'latch-trolley': trolleySpec,
	'retrofit-kit': noSpec,
	'roller-bed': noSpec,
	'exchange-stand': standSpec,
	'charging-stand': standSpec,
	'roller-stand': siteRollerStandSchema,
	'latch-adapter': noSpec,
	'pallet-truck': sitePalletTruckSchema,
	'lifting-beam': z.object({
		weightKg: positive(LIMITS.beamKg, 'the beam weight'),
		ratedLoadKg: positive(LIMITS.craneKg, 'the rated load')
	}),
	'watering-kit': noSpec,
	charger: z.object({
		chemistry: chemistrySchema,
		kind: chargingMethodSchema,
		voltage: positive(LIMITS.voltage, 'the charger voltage').optional(),
		profile: chargerProfileSchema.optional()
	})
} as const;

/** Fails to compile if a kind's schema gives something the engine does not read. */
type Assert<T extends true> = T;
export type EquipmentSchemasMatchEngine = Assert<
	{
		[K in EditableEquipmentKind]: z.infer<
			(typeof equipmentSpecSchemas)[K]
		> extends EquipmentSpecs[K]
			? true
			: false;
	}[EditableEquipmentKind]
>;

/** Every spec field the equipment form can show; a kind shows only its own. */
export const EQUIPMENT_SPEC_FIELDS = {
	swingDeg: {
		name: 'swingDeg',
		kind: 'number',
		noun: 'the door swing',
		label: 'Door swing',
		unit: '°',
		hint: 'Opening angle; leave empty if not stated.'
	},
	rollers: {
		name: 'rollers',
		kind: 'integer',
		noun: 'the number of rollers',
		label: 'Rollers',
		hint: 'Leave empty if not stated.'
	},
	weight: { name: 'weight', kind: 'mass', noun: 'the weight', label: 'Weight' },
	capacity: { name: 'capacity', kind: 'mass', noun: 'the rated capacity', label: 'Rated capacity' },
	rollerTop: {
		name: 'rollerTop',
		kind: 'length',
		noun: 'the roller height',
		label: 'Roller height',
		hint: 'Roller tops above the floor.'
	},
	adjustMin: {
		name: 'adjustMin',
		kind: 'length',
		noun: 'the lowest roller setting',
		label: 'Lowest setting'
	},
	adjustMax: {
		name: 'adjustMax',
		kind: 'length',
		noun: 'the highest roller setting',
		label: 'Highest setting'
	},
	forkLength: { name: 'forkLength', kind: 'length', noun: 'the fork length', label: 'Fork length' },
	overallWidth: {
		name: 'overallWidth',
		kind: 'length',
		noun: 'the width over the forks',
		label: 'Width over the forks'
	},
	ratedLoad: { name: 'ratedLoad', kind: 'mass', noun: 'the rated load', label: 'Rated load' },
	voltage: {
		name: 'voltage',
		kind: 'number',
		noun: 'the charger voltage',
		label: 'Voltage',
		unit: 'V',
		hint: 'Leave empty for any voltage.'
	}
} as const satisfies Record<string, FieldInfo>;
export type EquipmentQuantityField = keyof typeof EQUIPMENT_SPEC_FIELDS;

/** What the form shows for each kind, in order: typed quantities and choices. */
export type EquipmentFormPart =
	| { field: EquipmentQuantityField; required: boolean }
	| {
			choice:
				'adjustable' | 'driveAlongside' | 'standKind' | 'chemistry' | 'chargingKind' | 'profile';
	  };

export const EQUIPMENT_FORM_PARTS: {
	readonly [K in EditableEquipmentKind]: readonly EquipmentFormPart[];
} = {
	'side-door': [{ field: 'swingDeg', required: false }],
	'wide-door': [{ field: 'swingDeg', required: false }],
	'side-cover': [],
	'service-trolley': [
		{ field: 'rollers', required: false },
		{ field: 'weight', required: false }
	],
	'latch-trolley': [
		{ field: 'rollers', required: false },
		{ field: 'weight', required: false }
	],
	'retrofit-kit': [],
	'roller-bed': [],
	'exchange-stand': [{ field: 'capacity', required: true }],
	'charging-stand': [{ field: 'capacity', required: true }],
	'roller-stand': [
		{ choice: 'standKind' },
		{ field: 'rollerTop', required: true },
		{ choice: 'adjustable' },
		{ field: 'adjustMin', required: true },
		{ field: 'adjustMax', required: true },
		{ field: 'capacity', required: true },
		{ choice: 'driveAlongside' }
	],
	'latch-adapter': [],
	'pallet-truck': [
		{ field: 'forkLength', required: true },
		{ field: 'overallWidth', required: true },
		{ field: 'capacity', required: true }
	],
	'lifting-beam': [
		{ field: 'weight', required: true },
		{ field: 'ratedLoad', required: true }
	],
	'watering-kit': [],
	charger: [
		{ choice: 'chemistry' },
		{ choice: 'chargingKind' },
		{ field: 'voltage', required: false },
		{ choice: 'profile' }
	]
};

/** The editable kinds, in the engine's order (rules/catalogue.ts EQUIPMENT_KINDS without 'battery'). */
export const EDITABLE_EQUIPMENT_KINDS = Object.keys(
	EQUIPMENT_FORM_PARTS
) as EditableEquipmentKind[];

/** Where each spec value comes from in the form (the path of a spec issue → the form field). */
const EQUIPMENT_PATH_FIELD: Record<string, string> = {
	swingDeg: 'swingDeg',
	rollers: 'rollers',
	weightKg: 'weight',
	capacityKg: 'capacity',
	rollerTopMm: 'rollerTop',
	adjustRangeMm: 'adjustMax',
	'adjustRangeMm.minMm': 'adjustMin',
	'adjustRangeMm.maxMm': 'adjustMax',
	driveAlongside: 'driveAlongside',
	forkLengthMm: 'forkLength',
	overallWidthMm: 'overallWidth',
	ratedLoadKg: 'ratedLoad',
	chemistry: 'chemistry',
	voltage: 'voltage',
	profile: 'profile'
};

export const CHARGING_LABELS: Readonly<Record<z.infer<typeof chargingMethodSchema>, string>> = {
	conventional: 'Conventional',
	opportunity: 'Opportunity',
	fast: 'Fast'
};
export const STAND_KIND_LABELS = { stand: 'Roller stand', changer: 'Battery changer' } as const;

export interface EquipmentInput {
	sku: string;
	kind: EditableEquipmentKind;
	name: string;
	priceCents: number;
	costCents: number;
	spec: EquipmentSpecs[EditableEquipmentKind];
}

const equipmentFormBase = z.object({
	units: unitSystemSchema.default('metric'),
	sku: codeSchema('SKU'),
	kind: z.string().max(40).default(''),
	name: nameSchema('name'),
	...money,
	swingDeg: typed,
	rollers: typed,
	weight: typed,
	capacity: typed,
	rollerTop: typed,
	adjustable: z.boolean().default(false),
	adjustMin: typed,
	adjustMax: typed,
	driveAlongside: z.boolean().default(false),
	standKind: z.string().max(20).default('stand'),
	forkLength: typed,
	overallWidth: typed,
	ratedLoad: typed,
	chemistry: z.string().max(20).default('lead-acid'),
	chargingKind: z.string().max(20).default('conventional'),
	voltage: typed,
	profile: z.string().max(10).default('')
});
export type EquipmentForm = z.infer<typeof equipmentFormBase>;

function isEditableKind(kind: string): kind is EditableEquipmentKind {
	return Object.prototype.hasOwnProperty.call(EQUIPMENT_FORM_PARTS, kind);
}

export function readEquipmentForm(form: EquipmentForm): ReadResult<EquipmentInput> {
	const system = form.units;
	const errors: Errors = {};
	const prices = readPrices(form, errors);
	if (!isEditableKind(form.kind)) {
		addError(errors, 'kind', 'Choose a kind of equipment from the list.');
		return { ok: false, errors };
	}
	const kind = form.kind;
	const values: Partial<Record<EquipmentQuantityField, number>> = {};
	const unread = new Set<string>();
	/** a choice that is not on the list: said in plain words, the schema's own message dropped */
	const refuse = (name: string, message: string) => {
		addError(errors, name, message);
		unread.add(name);
	};
	const adjustable = form.adjustable;
	for (const part of EQUIPMENT_FORM_PARTS[kind]) {
		if (!('field' in part)) continue;
		if (
			kind === 'roller-stand' &&
			!adjustable &&
			(part.field === 'adjustMin' || part.field === 'adjustMax')
		)
			continue;
		const info = EQUIPMENT_SPEC_FIELDS[part.field];
		const text = form[part.field];
		if (!part.required && text.trim() === '') continue;
		const r = readField(info, text, system);
		values[part.field] = r.ok ? r.value : UNREAD;
		if (!r.ok) {
			addError(errors, part.field, r.message);
			unread.add(part.field);
		}
	}

	let spec: Record<string, unknown>;
	switch (kind) {
		case 'side-door':
		case 'wide-door':
			spec = { swingDeg: values.swingDeg };
			break;
		case 'service-trolley':
		case 'latch-trolley':
			spec = { rollers: values.rollers, weightKg: values.weight };
			break;
		case 'exchange-stand':
		case 'charging-stand':
			spec = { capacityKg: values.capacity };
			break;
		case 'roller-stand':
			if (form.standKind !== 'stand' && form.standKind !== 'changer') {
				refuse('standKind', 'Choose a roller stand or a battery changer.');
			}
			spec = {
				rollerTopMm: values.rollerTop,
				adjustRangeMm: adjustable ? { minMm: values.adjustMin, maxMm: values.adjustMax } : null,
				capacityKg: values.capacity,
				driveAlongside: form.driveAlongside,
				kind: form.standKind
			};
			break;
		case 'pallet-truck':
			spec = {
				forkLengthMm: values.forkLength,
				overallWidthMm: values.overallWidth,
				capacityKg: values.capacity
			};
			break;
		case 'lifting-beam':
			spec = { weightKg: values.weight, ratedLoadKg: values.ratedLoad };
			break;
		case 'charger':
			if (!chemistrySchema.safeParse(form.chemistry).success)
				refuse('chemistry', 'Choose lead-acid or lithium-ion.');
			if (!chargingMethodSchema.safeParse(form.chargingKind).success) {
				refuse('chargingKind', 'Choose conventional, opportunity or fast charging.');
			}
			if (form.profile !== '' && !chargerProfileSchema.safeParse(form.profile).success) {
				refuse('profile', 'Choose a charging characteristic from the list.');
			}
			spec = {
				chemistry: form.chemistry,
				kind: form.chargingKind,
				voltage: values.voltage,
				profile: form.profile === '' ? undefined : form.profile
			};
			break;
		default:
			spec = {};
	}
	for (const key of Object.keys(spec)) if (spec[key] === undefined) delete spec[key];

	const parsedSpec = checkSpec(
		equipmentSpecSchemas[kind] as z.ZodType<EquipmentSpecs[EditableEquipmentKind]>,
		spec,
		unread,
		(path) =>
			path === 'kind'
				? kind === 'charger'
					? 'chargingKind'
					: 'standKind'
				: (EQUIPMENT_PATH_FIELD[path] ?? 'kind'),
		(name) => (EQUIPMENT_SPEC_FIELDS as Record<string, FieldInfo>)[name],
		errors,
		system
	);
	if (Object.keys(errors).length > 0 || !parsedSpec || !prices) return { ok: false, errors };
	return {
		ok: true,
		value: { sku: form.sku.trim(), kind, name: form.name.trim(), ...prices, spec: parsedSpec }
	};
}

/** The equipment form: flat fields; the kind's spec is checked with its schema above. */
export const equipmentFormSchema = readingSchema(equipmentFormBase, readEquipmentForm);

export function equipmentFormValues(
	row: {
		sku: string;
		kind: string;
		name: string;
		priceCents: number;
		costCents: number;
		spec: Record<string, unknown>;
	},
	system: UnitSystem
): EquipmentForm {
	const s = row.spec ?? {};
	const num = (key: string) => (typeof s[key] === 'number' ? (s[key] as number) : null);
	const range = (s.adjustRangeMm ?? null) as { minMm?: number; maxMm?: number } | null;
	const text = (field: EquipmentQuantityField, value: number | null | undefined) =>
		fieldText(EQUIPMENT_SPEC_FIELDS[field], value ?? null, system);
	return {
		units: system,
		sku: row.sku,
		kind: row.kind,
		name: row.name,
		price: moneyText(row.priceCents),
		cost: moneyText(row.costCents),
		swingDeg: text('swingDeg', num('swingDeg')),
		rollers: text('rollers', num('rollers')),
		weight: text('weight', num('weightKg')),
		capacity: text('capacity', num('capacityKg')),
		rollerTop: text('rollerTop', num('rollerTopMm')),
		adjustable: range !== null && typeof range === 'object',
		adjustMin: text('adjustMin', range?.minMm),
		adjustMax: text('adjustMax', range?.maxMm),
		driveAlongside: s.driveAlongside === true,
		standKind: s.kind === 'changer' ? 'changer' : 'stand',
		forkLength: text('forkLength', num('forkLengthMm')),
		overallWidth: text('overallWidth', num('overallWidthMm')),
		ratedLoad: text('ratedLoad', num('ratedLoadKg')),
		chemistry: typeof s.chemistry === 'string' ? s.chemistry : 'lead-acid',
		chargingKind: row.kind === 'charger' && typeof s.kind === 'string' ? s.kind : 'conventional',
		voltage: text('voltage', num('voltage')),
		profile: typeof s.profile === 'string' ? s.profile : ''
	};
}

/** One line describing an equipment item's spec, both unit systems, for lists. */
export function equipmentSpecSummary(
	kind: string,
	spec: Record<string, unknown>,
	system: UnitSystem
): string {
	const n = (k: string) => (typeof spec[k] === 'number' ? (spec[k] as number) : null);
	const parts: string[] = [];
	const len = (label: string, v: number | null) =>
		v !== null && parts.push(`${label} ${formatLength(v, system)}`);
	const mass = (label: string, v: number | null) =>
		v !== null && parts.push(`${label} ${formatMass(v, system)}`);
	switch (kind) {
		case 'side-door':
		case 'wide-door':
			if (n('swingDeg') !== null) parts.push(`opens ${n('swingDeg')}°`);
			break;
		case 'service-trolley':
		case 'latch-trolley':
			if (n('rollers') !== null) parts.push(`${n('rollers')} rollers`);
			mass('weighs', n('weightKg'));
			break;
		case 'exchange-stand':
		case 'charging-stand':
			mass('carries', n('capacityKg'));
			break;
		case 'roller-stand': {
			len('rollers at', n('rollerTopMm'));
			const r = spec.adjustRangeMm as { minMm: number; maxMm: number } | null;
			if (r) parts.push(`adjusts ${formatLengthRange(r.minMm, r.maxMm, system)}`);
			mass('carries', n('capacityKg'));
			if (spec.driveAlongside === true) parts.push('drives alongside');
			break;
		}
		case 'pallet-truck':
			len('forks', n('forkLengthMm'));
			len('over forks', n('overallWidthMm'));
			mass('carries', n('capacityKg'));
			break;
		case 'lifting-beam':
			mass('weighs', n('weightKg'));
			mass('rated', n('ratedLoadKg'));
			break;
		case 'charger':
			if (typeof spec.chemistry === 'string')
				parts.push(CHEMISTRY_LABELS[spec.chemistry as 'lead-acid'] ?? spec.chemistry);
			if (typeof spec.kind === 'string')
				parts.push(`${(CHARGING_LABELS[spec.kind as 'fast'] ?? spec.kind).toLowerCase()} charging`);
			if (n('voltage') !== null) parts.push(`${n('voltage')} V`);
			if (typeof spec.profile === 'string') parts.push(`${spec.profile} characteristic`);
			break;
	}
	return parts.join(' · ');
}

/**
 * Dimensions in the user's system and in the other one:
 * ["1 050 × 860 × 640 mm", "41.3 × 33.9 × 25.2 in"], imperial first for imperial users.
 */
export function dimensionParts(mm: readonly number[], system: UnitSystem): [string, string] {
	const metric = mm.map((v) => formatNumber(v, 0)).join(' × ') + ' mm';
	const imperial = mm.map((v) => formatNumber(v / MM_PER_IN, 1, ',')).join(' × ') + ' in';
	return system === 'imperial' ? [imperial, metric] : [metric, imperial];
}

/** "1 050 × 860 × 640 mm (41.3 × 33.9 × 25.2 in)"; imperial first for imperial users. */
export function formatDimensions(mm: readonly number[], system: UnitSystem): string {
	const [first, other] = dimensionParts(mm, system);
	return `${first} (${other})`;
}

/** A mass range in the user's system and the other: ["900–1 200 kg", "1,984–2,646 lb"]. */
export function massRangeParts(minKg: number, maxKg: number, system: UnitSystem): [string, string] {
	const metric = `${formatNumber(minKg, 0)}–${formatNumber(maxKg, 0)} kg`;
	const imperial = `${formatNumber(minKg / KG_PER_LB, 0, ',')}–${formatNumber(maxKg / KG_PER_LB, 0, ',')} lb`;
	return system === 'imperial' ? [imperial, metric] : [metric, imperial];
}

/** "900–1 200 kg (1,984–2,646 lb)"; imperial first for imperial users. */
export function formatMassRange(minKg: number, maxKg: number, system: UnitSystem): string {
	const [first, other] = massRangeParts(minKg, maxKg, system);
	return `${first} (${other})`;
}

/** "180–260 mm (7.1–10.2 in)"; imperial first for imperial users. */
export function formatLengthRange(minMm: number, maxMm: number, system: UnitSystem): string {
	const metric = `${formatNumber(minMm, 0)}–${formatNumber(maxMm, 0)} mm`;
	const imperial = `${formatNumber(minMm / MM_PER_IN, 1, ',')}–${formatNumber(maxMm / MM_PER_IN, 1, ',')} in`;
	return system === 'imperial' ? `${imperial} (${metric})` : `${metric} (${imperial})`;
}
