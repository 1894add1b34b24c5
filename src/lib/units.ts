/**
 * Units: exact conversion factors, parsing of what a user types, and display in both systems.
 *
 * Traywise stores and computes in SI-derived units: lengths in millimetres, masses in kilograms,
 * air flow in m³/h, floor area in m². Users pick `metric` or `imperial`; every input accepts either
 * system and every figure on screen shows both.
 *
 * Number syntax accepted by the parsers (decided here, tested in units.spec.ts):
 * - a point is the decimal separator: `43.3 in`, `.5 m`;
 * - a comma is only a thousands separator and must group exactly three digits: `2,900 lb` = 2 900 lb;
 *   a decimal comma such as `1,5` is refused with a message asking for `1.5`, because `1,500` would
 *   otherwise be ambiguous;
 * - digit groups may also be separated by spaces (`1 100 mm`), as our own formatted output shows;
 * - inches may carry a fraction: `35 1/2 in`, `1/2"`;
 * - feet and inches: `3 ft 7 in`, `3' 7"`, `3ft7`, `4 ft`;
 * - a bare number takes the user's system's default unit (mm or in, kg or lb, m³/h or cfm, m² or ft²).
 * Negative values are refused; zero is accepted (schemas decide what range is valid).
 */

export type UnitSystem = 'metric' | 'imperial';

/** Result of parsing a typed quantity: the value in the base unit, or a message to show the user. */
export type ParseResult = { ok: true; value: number } | { ok: false; message: string };

/** Millimetres per inch: 1 in = 25.4 mm exactly (international yard and pound, 1959; NIST SP 811 App. B). */
export const MM_PER_IN = 25.4;
/** Millimetres per foot: 12 in. */
export const MM_PER_FT = 304.8;
/** Kilograms per pound: 1 lb = 0.45359237 kg exactly (same agreement; NIST SP 811 App. B). */
export const KG_PER_LB = 0.45359237;
/** Square metres per square foot: 0.3048² = 0.09290304 exactly. */
export const M2_PER_FT2 = 0.09290304;
/** m³/h per ft³/min: 0.3048³ × 60 = 1.69901079552 (exact, from 1 ft = 0.3048 m). */
export const M3H_PER_CFM = 0.3048 * 0.3048 * 0.3048 * 60;
/** m³/h per litre per second. */
export const M3H_PER_LPS = 3.6;

export const inToMm = (inches: number): number => inches * MM_PER_IN;
export const mmToIn = (mm: number): number => mm / MM_PER_IN;
export const lbToKg = (lb: number): number => lb * KG_PER_LB;
export const kgToLb = (kg: number): number => kg / KG_PER_LB;
export const cfmToM3h = (cfm: number): number => cfm * M3H_PER_CFM;
export const m3hToCfm = (m3h: number): number => m3h / M3H_PER_CFM;
export const ft2ToM2 = (ft2: number): number => ft2 * M2_PER_FT2;
export const m2ToFt2 = (m2: number): number => m2 / M2_PER_FT2;

export type QuantityKind = 'length' | 'mass' | 'airFlow' | 'area';

interface KindInfo {
	/** what to call the quantity in messages */
	noun: string;
	/** unit token (lower case, no spaces) → factor to the base unit */
	units: Record<string, number>;
	defaultUnit: Record<UnitSystem, string>;
	example: string;
}

const LENGTH_UNITS: Record<string, number> = {
	mm: 1,
	millimetre: 1,
	millimetres: 1,
	millimeter: 1,
	millimeters: 1,
	cm: 10,
	centimetre: 10,
	centimetres: 10,
	centimeter: 10,
	centimeters: 10,
	m: 1000,
	metre: 1000,
	metres: 1000,
	meter: 1000,
	meters: 1000,
	in: MM_PER_IN,
	inch: MM_PER_IN,
	inches: MM_PER_IN,
	'"': MM_PER_IN,
	"''": MM_PER_IN,
	ft: MM_PER_FT,
	foot: MM_PER_FT,
	feet: MM_PER_FT,
	"'": MM_PER_FT
};

const MASS_UNITS: Record<string, number> = {
	kg: 1,
	kgs: 1,
	kilogram: 1,
	kilograms: 1,
	t: 1000,
	tonne: 1000,
	tonnes: 1000,
	lb: KG_PER_LB,
	lbs: KG_PER_LB,
	pound: KG_PER_LB,
	pounds: KG_PER_LB
};

const AIR_FLOW_UNITS: Record<string, number> = {
	'm3/h': 1,
	'm3/hr': 1,
	'm3/hour': 1,
	'm^3/h': 1,
	'm^3/hr': 1,
	cmh: 1,
	cfm: M3H_PER_CFM,
	'ft3/min': M3H_PER_CFM,
	'ft^3/min': M3H_PER_CFM,
	'cuft/min': M3H_PER_CFM,
	'l/s': M3H_PER_LPS
};

const AREA_UNITS: Record<string, number> = {
	m2: 1,
	'm^2': 1,
	sqm: 1,
	squaremetre: 1,
	squaremetres: 1,
	squaremeter: 1,
	squaremeters: 1,
	ft2: M2_PER_FT2,
	'ft^2': M2_PER_FT2,
	sqft: M2_PER_FT2,
	squarefoot: M2_PER_FT2,
	squarefeet: M2_PER_FT2
};

const KINDS: Record<QuantityKind, KindInfo> = {
	length: {
		noun: 'length',
		units: LENGTH_UNITS,
		defaultUnit: { metric: 'mm', imperial: 'in' },
		example: '1100 mm, 43.3 in or 3 ft 7 in'
	},
	mass: {
		noun: 'mass',
		units: MASS_UNITS,
		defaultUnit: { metric: 'kg', imperial: 'lb' },
		example: '1315 kg or 2,900 lb'
	},
	airFlow: {
		noun: 'air flow',
		units: AIR_FLOW_UNITS,
		defaultUnit: { metric: 'm3/h', imperial: 'cfm' },
		example: '170 m³/h or 100 cfm'
	},
	area: {
		noun: 'floor area',
		units: AREA_UNITS,
		defaultUnit: { metric: 'm2', imperial: 'ft2' },
		example: '40 m² or 430 ft²'
	}
};

/** Normalises typographic variants so the grammar below stays small. */
function normalise(text: string): string {
	return text
		.trim()
		.toLowerCase()
		.replace(/[\u00a0\u2007\u2009\u202f]/g, ' ')
		.replace(/[\u2032\u2019\u00b4`]/g, "'")
		.replace(/[\u2033\u201c\u201d]/g, '"')
		.replace(/\u00b3/g, '3')
		.replace(/\u00b2/g, '2')
		.replace(/\s+/g, ' ');
}

const NUMBER_PART = /^[0-9][0-9 ,./]*|^\.[0-9][0-9 ,./]*/;
const THOUSANDS_COMMA = /^\d{1,3}(?:,\d{3})+(?:\.\d+)?$/;
const THOUSANDS_SPACE = /^\d{1,3}(?: \d{3})+(?:\.\d+)?$/;
const PLAIN = /^(?:\d+(?:\.\d*)?|\.\d+)$/;
const FRACTION = /^(\d+)\/(\d+)$/;
const MIXED = /^(\d+) (\d+)\/(\d+)$/;

type NumberResult = { ok: true; value: number } | { ok: false; message: string };

/** Reads the numeric part of an input (see the module comment for the accepted syntax). */
function readNumber(raw: string, original: string): NumberResult {
	const s = raw.trim();
	if (PLAIN.test(s)) return { ok: true, value: Number(s) };
	if (THOUSANDS_COMMA.test(s)) return { ok: true, value: Number(s.replace(/,/g, '')) };
	if (THOUSANDS_SPACE.test(s)) return { ok: true, value: Number(s.replace(/ /g, '')) };
	let m = MIXED.exec(s);
	if (m) {
		const den = Number(m[3]);
		if (den === 0)
			return { ok: false, message: `“${original}”: a fraction cannot divide by zero.` };
		return { ok: true, value: Number(m[1]) + Number(m[2]) / den };
	}
	m = FRACTION.exec(s);
	if (m) {
		const den = Number(m[2]);
		if (den === 0)
			return { ok: false, message: `“${original}”: a fraction cannot divide by zero.` };
		return { ok: true, value: Number(m[1]) / den };
	}
	if (/^\d+,\d+$/.test(s) || /,\d{1,2}$/.test(s) || /,\d{4,}/.test(s)) {
		const suggestion = s.replace(/,(?=\d*$)/, '.');
		return {
			ok: false,
			message: `“${original}”: use a point for decimals (${suggestion}). A comma is read only as a thousands separator, as in 2,900.`
		};
	}
	return { ok: false, message: `“${original}” is not a number Traywise can read.` };
}

function unitKind(token: string): QuantityKind | null {
	for (const k of Object.keys(KINDS) as QuantityKind[]) {
		if (token in KINDS[k].units) return k;
	}
	return null;
}

function unitToken(unit: string): string {
	return unit.replace(/\s+/g, '').replace(/\.$/, '');
}

const FEET_INCHES = /^(.+?) ?(?:ft|feet|foot|') ?(.+?) ?(?:in|inch|inches|"|'')?$/;

/** Parses a typed quantity of the given kind into its base unit (mm, kg, m³/h or m²). */
export function parseQuantity(
	kind: QuantityKind,
	text: string,
	system: UnitSystem = 'metric'
): ParseResult {
	const info = KINDS[kind];
	const original = text.trim();
	const s = normalise(text);
	if (s === '') return { ok: false, message: `Enter a ${info.noun}, e.g. ${info.example}.` };
	if (s.startsWith('-') || s.startsWith('\u2212')) {
		return { ok: false, message: `“${original}”: a ${info.noun} cannot be negative.` };
	}

	if (kind === 'length') {
		const fi = FEET_INCHES.exec(s);
		if (fi && !/(?:ft|feet|foot|')$/.test(s)) {
			const feet = readNumber(fi[1], original);
			const inches = readNumber(fi[2], original);
			if (feet.ok && inches.ok) {
				if (inches.value >= 12) {
					return {
						ok: false,
						message: `“${original}”: inches after feet should be under 12; write it as ${feet.value + Math.floor(inches.value / 12)} ft ${+(inches.value % 12).toFixed(3)} in.`
					};
				}
				return { ok: true, value: feet.value * MM_PER_FT + inches.value * MM_PER_IN };
			}
			if (!feet.ok) return feet;
			if (!inches.ok) return inches;
		}
	}

	const numMatch = NUMBER_PART.exec(s);
	if (!numMatch) {
		return {
			ok: false,
			message: `“${original}” does not start with a number; enter e.g. ${info.example}.`
		};
	}
	let numText = numMatch[0];
	let rest = s.slice(numText.length);
	// "1100 mm": the space before the unit belongs to neither part; a trailing "/" or "," is not number.
	const trailing = /[ ,./]+$/.exec(numText);
	if (trailing) {
		// keep a trailing "." only when it is part of a number like "5."
		const keep = trailing[0] === '.' ? '.' : '';
		rest = trailing[0].slice(keep.length) + rest;
		numText = numText.slice(0, numText.length - trailing[0].length) + keep;
	}
	const num = readNumber(numText, original);
	if (!num.ok) return num;

	const token = unitToken(rest);
	let factor: number | undefined;
	if (token === '') {
		factor = info.units[info.defaultUnit[system]];
	} else {
		factor = info.units[token];
		if (factor === undefined) {
			const other = unitKind(token);
			if (other) {
				return {
					ok: false,
					message: `“${original}”: ${rest.trim()} is a unit of ${KINDS[other].noun}; enter a ${info.noun}, e.g. ${info.example}.`
				};
			}
			return {
				ok: false,
				message: `“${original}”: unknown unit “${rest.trim()}”; enter a ${info.noun}, e.g. ${info.example}.`
			};
		}
	}
	const value = num.value * factor;
	if (!Number.isFinite(value)) return { ok: false, message: `“${original}” is too large.` };
	return { ok: true, value };
}

/** Parses a length ("43.3 in", "1100 mm", "3 ft 7 in", "3' 7\"", "1.1 m", "110 cm"); millimetres. */
export const parseLength = (text: string, system: UnitSystem = 'metric'): ParseResult =>
	parseQuantity('length', text, system);
/** Parses a mass ("2,900 lb", "1315 kg", "1.3 t"); kilograms. */
export const parseMass = (text: string, system: UnitSystem = 'metric'): ParseResult =>
	parseQuantity('mass', text, system);
/** Parses an air flow ("100 cfm", "170 m3/h", "170 m³/h", "47 l/s"); m³/h. */
export const parseAirFlow = (text: string, system: UnitSystem = 'metric'): ParseResult =>
	parseQuantity('airFlow', text, system);
/** Parses a floor area ("40 m²", "430 ft²", "430 sq ft"); m². */
export const parseArea = (text: string, system: UnitSystem = 'metric'): ParseResult =>
	parseQuantity('area', text, system);

// ---------------------------------------------------------------------------------------------
// Formatting

/**
 * Formats a number with a fixed count of decimals and grouped thousands. Metric figures group with
 * a space (SI style, "1 100"), imperial figures with a comma (US style, "2,900"); both read back
 * through the parsers above.
 */
export function formatNumber(value: number, decimals: number, group: ' ' | ',' = ' '): string {
	if (!Number.isFinite(value)) return String(value);
	const f = decimals === 0 ? 1 : decimals === 1 ? 10 : decimals === 2 ? 100 : 10 ** decimals;
	const scaled = Math.round(Math.abs(value) * f);
	if (scaled > Number.MAX_SAFE_INTEGER || decimals > 6) return value.toFixed(decimals);
	const int = Math.floor(scaled / f);
	let out = groupDigits(int, group);
	if (decimals > 0) {
		const frac = String(scaled - int * f);
		out += '.' + (frac.length < decimals ? '0'.repeat(decimals - frac.length) + frac : frac);
	}
	return value < 0 && scaled !== 0 ? '-' + out : out;
}

/** Integer digits in groups of three, e.g. 1234567 → "1 234 567". */
function groupDigits(int: number, group: string): string {
	const text = String(int);
	if (int < 1000) return text;
	const head = text.length % 3 || 3;
	let out = text.slice(0, head);
	for (let i = head; i < text.length; i += 3) out += group + text.slice(i, i + 3);
	return out;
}

const flowDecimals = (v: number): number => (Math.abs(v) < 10 ? 2 : Math.abs(v) < 100 ? 1 : 0);

interface FormatOptions {
	/** show the other system in brackets (default true) */
	both?: boolean;
}

function pair(metric: string, imperial: string, system: UnitSystem, opts?: FormatOptions): string {
	const both = opts?.both ?? true;
	if (system === 'imperial') return both ? `${imperial} (${metric})` : imperial;
	return both ? `${metric} (${imperial})` : metric;
}

/** "1 100 mm (43.3 in)"; imperial first when `system` is 'imperial'. Input in millimetres. */
export function formatLength(
	mm: number,
	system: UnitSystem = 'metric',
	opts?: FormatOptions
): string {
	return pair(
		`${formatNumber(mm, 0)} mm`,
		`${formatNumber(mm / MM_PER_IN, 1, ',')} in`,
		system,
		opts
	);
}

/** "1 315 kg (2,899 lb)"; input in kilograms. */
export function formatMass(
	kg: number,
	system: UnitSystem = 'metric',
	opts?: FormatOptions
): string {
	return pair(
		`${formatNumber(kg, 0)} kg`,
		`${formatNumber(kg / KG_PER_LB, 0, ',')} lb`,
		system,
		opts
	);
}

/** "170 m³/h (100 cfm)"; input in m³/h. */
export function formatAirFlow(
	m3h: number,
	system: UnitSystem = 'metric',
	opts?: FormatOptions
): string {
	const cfm = m3h / M3H_PER_CFM;
	return pair(
		`${formatNumber(m3h, flowDecimals(m3h))} m³/h`,
		`${formatNumber(cfm, flowDecimals(cfm), ',')} cfm`,
		system,
		opts
	);
}

/** "40.0 m² (431 ft²)"; input in m². */
/** 1 in² = 6.4516 cm² exactly (1 in = 2.54 cm) */
export const CM2_PER_IN2 = 6.4516;

/** A ventilation opening in cm² and in², the user's system first. */
export function formatOpening(cm2: number, system: UnitSystem = 'metric', opts?: FormatOptions): string {
	return pair(`${formatNumber(cm2, 0)} cm²`, `${formatNumber(cm2 / CM2_PER_IN2, 0, ',')} in²`, system, opts);
}

export function formatArea(
	m2: number,
	system: UnitSystem = 'metric',
	opts?: FormatOptions
): string {
	return pair(
		`${formatNumber(m2, 1)} m²`,
		`${formatNumber(m2 / M2_PER_FT2, 0, ',')} ft²`,
		system,
		opts
	);
}

/**
 * A value written back into an input field in the user's system, without grouping, e.g. "43.3 in"
 * or "1100 mm", so that parsing it again gives the stored value to display precision.
 */
export function formatInput(kind: QuantityKind, value: number, system: UnitSystem): string {
	return `${formatInputNumber(kind, value, system)} ${INPUT_UNIT[kind][system]}`;
}

/** The unit {@link formatInput} and {@link formatInputNumber} use: the user's system's default. */
export const INPUT_UNIT: Record<QuantityKind, Record<UnitSystem, string>> = {
	length: { metric: 'mm', imperial: 'in' },
	mass: { metric: 'kg', imperial: 'lb' },
	airFlow: { metric: 'm³/h', imperial: 'cfm' },
	area: { metric: 'm²', imperial: 'ft²' }
};

/**
 * Only the number of {@link formatInput} ("1099.8", "43.31"), for a field that shows its unit
 * beside it; a bare number is read back in that same unit.
 */
export function formatInputNumber(kind: QuantityKind, value: number, system: UnitSystem): string {
	switch (kind) {
		case 'length':
			return system === 'imperial' ? `${+(value / MM_PER_IN).toFixed(2)}` : `${+value.toFixed(1)}`;
		case 'mass':
			return system === 'imperial' ? `${+(value / KG_PER_LB).toFixed(1)}` : `${+value.toFixed(1)}`;
		case 'airFlow':
			return system === 'imperial' ? `${+(value / M3H_PER_CFM).toFixed(1)}` : `${+value.toFixed(1)}`;
		case 'area':
			return system === 'imperial' ? `${+(value / M2_PER_FT2).toFixed(1)}` : `${+value.toFixed(2)}`;
	}
}

/**
 * A range of masses with each end in both systems, the user's first: "640–820 kg (1,411–1,808 lb)"
 * or, imperial, "1,411–1,808 lb (640–820 kg)". Inputs in kilograms.
 */
export function formatMassRange(minKg: number, maxKg: number, system: UnitSystem = 'metric'): string {
	return pair(
		`${formatNumber(minKg, 0)}–${formatNumber(maxKg, 0)} kg`,
		`${formatNumber(minKg / KG_PER_LB, 0, ',')}–${formatNumber(maxKg / KG_PER_LB, 0, ',')} lb`,
		system
	);
}

/**
 * Length × width × height in both systems, the user's first: "1 000 × 820 × 580 mm
 * (39.4 × 32.3 × 22.8 in)". Inputs in millimetres.
 */
export function formatDimensions(mm: readonly number[], system: UnitSystem = 'metric'): string {
	return pair(
		`${mm.map((v) => formatNumber(v, 0)).join(' × ')} mm`,
		`${mm.map((v) => formatNumber(v / MM_PER_IN, 1, ',')).join(' × ')} in`,
		system
	);
}
