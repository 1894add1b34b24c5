/**
 * What one evaluation shares between its parts: the input, parameters, the indexed catalogue, the
 * battery plan and the message formatters (every figure in a message shows both unit systems).
 */

import { formatArea, formatAirFlow, formatLength, formatMass, formatNumber } from '../../units';
import type { UnitSystem } from '../../units';
import type { PreparedCatalogue } from './catalogue';
import { exchangePoints, planDuty, type DutyPlan } from './fleet';
import type { RuleParams } from './params';
import type { BatterySpec, ResolvedInput, SiteInput, TruckSpec } from './types';

// Formatting is pure, and a survey re-evaluated as the rep types repeats most figures: keep the
// recent strings (bounded; cleared when full).
const MEMO_LIMIT = 2048;
const LENGTH_METRIC = new Map<number, string>();
const LENGTH_IMPERIAL = new Map<number, string>();
const MASS_METRIC = new Map<number, string>();
const MASS_IMPERIAL = new Map<number, string>();

function memo(
	cache: Map<number, string>,
	value: number,
	format: (v: number, units: UnitSystem) => string,
	units: UnitSystem
): string {
	let s = cache.get(value);
	if (s === undefined) {
		if (cache.size >= MEMO_LIMIT) cache.clear();
		s = format(value, units);
		cache.set(value, s);
	}
	return s;
}

/** One evaluation's shared state; message formatters are methods (no per-call closures). */
export class Ctx {
	readonly truck: TruckSpec;
	readonly battery: BatterySpec;
	readonly site: SiteInput;
	readonly units: UnitSystem;
	readonly eps: number;
	readonly duty: DutyPlan;
	readonly trucks: number;
	/** exchange points: one pallet truck, latch adapter and empty stand each */
	readonly points: number;
	readonly years: number;
	readonly workingDaysPerYear: number;
	readonly labourRatePerHourCents: number;

	constructor(
		readonly input: ResolvedInput,
		readonly p: Readonly<RuleParams>,
		readonly pc: PreparedCatalogue
	) {
		const op = input.operation;
		this.truck = input.truck;
		this.battery = input.battery;
		this.site = input.site;
		this.units = input.units === 'imperial' ? 'imperial' : 'metric';
		this.eps = p.comparisonEpsilon;
		this.duty = planDuty(input.battery, op, p);
		this.trucks = input.fleet.trucks;
		this.points = exchangePoints(input.fleet.trucks, p.trucksPerExchangePoint);
		this.years = op.years ?? p.years;
		this.workingDaysPerYear = op.daysPerWeek * p.weeksPerYear;
		this.labourRatePerHourCents = input.site.labourRatePerHourCents ?? p.labourRatePerHourCents;
	}

	/** length, mm → "1 100 mm (43.3 in)" */
	L(mm: number): string {
		return memo(
			this.units === 'imperial' ? LENGTH_IMPERIAL : LENGTH_METRIC,
			mm,
			formatLength,
			this.units
		);
	}
	/** mass, kg → "1 250 kg (2,756 lb)" */
	M(kg: number): string {
		return memo(
			this.units === 'imperial' ? MASS_IMPERIAL : MASS_METRIC,
			kg,
			formatMass,
			this.units
		);
	}
	/** air flow, m³/h */
	F(m3h: number): string {
		return formatAirFlow(m3h, this.units);
	}
	/** area, m² */
	A(m2: number): string {
		return formatArea(m2, this.units);
	}
}

export function makeContext(
	input: ResolvedInput,
	p: Readonly<RuleParams>,
	pc: PreparedCatalogue
): Ctx {
	return new Ctx(input, p, pc);
}

/** "$1,234" or "$1,234.56" from integer cents. */
export function money(cents: number): string {
	const neg = cents < 0;
	const abs = Math.abs(cents);
	const text = formatNumber(abs / 100, abs % 100 === 0 ? 0 : 2, ',');
	return `${neg ? '-' : ''}$${text}`;
}

/** "3 batteries", "1 battery". */
export function count(n: number, one: string, many: string): string {
	return `${formatNumber(n, 0, ',')} ${n === 1 ? one : many}`;
}

/** Number with up to `decimals` places, trailing zeros dropped: 2.5, 8, 2.82. */
export function num(n: number, decimals = 2): string {
	const f = decimals === 0 ? 1 : decimals === 1 ? 10 : decimals === 2 ? 100 : 10 ** decimals;
	return String(Math.round(n * f) / f);
}
