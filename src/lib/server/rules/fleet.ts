/**
 * Batteries per truck, equivalent battery usage (EBU) and battery changes.
 *
 * The model (also in the README):
 * - Daily hours H = shifts × hours per shift; daily energy = H × energy per hour (kWh).
 * - Usable energy of one battery = V × Ah × usable share ÷ 1000 (kWh); the usable share is a named
 *   parameter per chemistry (lead-acid 0.8). Runtime T = usable energy ÷ energy per hour (h).
 * - EBU = daily energy ÷ usable energy of one battery (dealer power-study guidance).
 * - Opportunity charging carries one lead-acid battery up to EBU `opportunityEbuLimit` (1.5), fast
 *   charging up to `fastChargeEbuLimit` (2.0); lithium-ion with opportunity or fast charging stays
 *   at one battery up to `lithiumOneBatteryEbuLimit`. Beyond its limit the plan falls back to
 *   battery exchange with conventional charging, and says so.
 * - Conventional charging (and every fall-back): the truck works its shifts back to back from the
 *   start of the day. A battery that lasts a shift or more is changed at a shift end, after a work
 *   period of one or more whole shifts (of the whole numbers it lasts, the one needing the fewest
 *   batteries); one that does not last a shift is changed at even intervals of at most T hours
 *   within the shift. After each work period a battery is on charge for `chargeHours` and then
 *   rests for `coolHours` (8 h + 8 h for lead-acid, "8-8-8") before it can go back in. The pattern
 *   repeats every 24 h; batteries per truck is the most batteries in use, on charge or cooling at
 *   any start of a work period. Three 8-hour shifts → 3, two → 2, one → 1 with a battery that
 *   lasts a shift. Chargers per truck: the most batteries of one truck on charge at once.
 * - Changes per truck per day are the changes between the day's work periods (periods − 1, at
 *   least 1 when the truck has more than one battery); three shifts → 2.
 */

import type { BatterySpec, ChargingMethod, OperationInput } from './types';
import type { RuleParams } from './params';

/** Battery energy, kWh = V × Ah ÷ 1000 (arithmetic). */
export function batteryEnergyKwh(voltage: number, capacityAh: number): number {
	return (voltage * capacityAh) / 1000;
}

/** Usable share of a rating: e.g. 935 Ah × 0.8 = 748 Ah. Works for Ah or kWh alike. */
export function usableOf(rated: number, usableShare: number): number {
	return rated * usableShare;
}

/** EBU = daily draw ÷ usable amount of one battery (same unit, Ah or kWh). */
export function equivalentBatteryUsage(dailyDraw: number, usablePerBattery: number): number {
	return dailyDraw / usablePerBattery;
}

/** Rounds half away from zero to `decimals` places. */
export function round(value: number, decimals = 2): number {
	const f = 10 ** decimals;
	return Math.round((value + Number.EPSILON * Math.sign(value)) * f) / f;
}

export interface Rotation {
	/** hours a battery works before it is changed */
	periodHours: number;
	/** work periods in a day */
	periodsPerDay: number;
	batteriesPerTruck: number;
	/** the most batteries of one truck on charge at the same time */
	chargingAtOncePerTruck: number;
}

const TOL = 1e-9;
/** Guard for absurd inputs (a battery lasting seconds): bounds the work done, not a trade rule. */
const MAX_PERIODS_PER_DAY = 5000;

/**
 * The conventional rotation of one truck (see the module comment). Hours: `hoursPerShift`,
 * `runtimeHours` (one battery's runtime), `chargeHours`, `coolHours`.
 */
export function rotation(
	shiftsPerDay: number,
	hoursPerShift: number,
	runtimeHours: number,
	chargeHours: number,
	coolHours: number
): Rotation {
	const hoursPerDay = shiftsPerDay * hoursPerShift;
	if (runtimeHours + TOL < hoursPerShift) {
		// Changed within the shift, at even intervals no longer than the runtime.
		const perShift = Math.min(
			Math.ceil(hoursPerShift / runtimeHours - TOL),
			Math.ceil(MAX_PERIODS_PER_DAY / shiftsPerDay)
		);
		return rotationFor(hoursPerShift / perShift, hoursPerDay, chargeHours, coolHours);
	}
	// A battery lasting several shifts may still be changed earlier, at any shift end; take the
	// whole number of shifts that needs the fewest batteries (then the fewest changes).
	const most = Math.min(Math.floor(runtimeHours / hoursPerShift + TOL), shiftsPerDay);
	let best = rotationFor(most * hoursPerShift, hoursPerDay, chargeHours, coolHours);
	for (let j = most - 1; j >= 1 && best.batteriesPerTruck > 1; j--) {
		const r = rotationFor(j * hoursPerShift, hoursPerDay, chargeHours, coolHours);
		if (r.batteriesPerTruck < best.batteriesPerTruck) best = r;
	}
	return best;
}

function rotationFor(
	period: number,
	hoursPerDay: number,
	chargeHours: number,
	coolHours: number
): Rotation {
	const periods = Math.max(1, Math.ceil(hoursPerDay / period - TOL));
	const block = chargeHours + coolHours;
	if (periods === 1 && hoursPerDay + block <= 24 + TOL) {
		return {
			periodHours: period,
			periodsPerDay: 1,
			batteriesPerTruck: 1,
			chargingAtOncePerTruck: 1
		};
	}
	// Work periods of the days that can still hold a battery at today's period starts.
	const days = Math.ceil((hoursPerDay + block) / 24) + 1;
	const n = periods * (days + 1);
	const starts = new Float64Array(n);
	const ends = new Float64Array(n);
	let idx = 0;
	for (let d = -days; d <= 0; d++) {
		const base = 24 * d;
		for (let i = 0; i < periods; i++) {
			starts[idx] = base + i * period;
			ends[idx] = base + Math.min((i + 1) * period, hoursPerDay);
			idx++;
		}
	}
	// A battery is held from its period's start until charge and cooling end; starts and ends are
	// both sorted, so a moving pointer finds the held batteries at each start of today.
	let held = 0;
	let p = 0;
	let charging = 0;
	let q = 0;
	for (let m = n - periods; m < n; m++) {
		const s = starts[m];
		while (p < m && ends[p] + block <= s + TOL) p++;
		if (m + 1 - p > held) held = m + 1 - p;
		const e = ends[m];
		while (q < m && ends[q] + chargeHours <= e + TOL) q++;
		if (m + 1 - q > charging) charging = m + 1 - q;
	}
	return {
		periodHours: period,
		periodsPerDay: periods,
		batteriesPerTruck: held,
		chargingAtOncePerTruck: Math.max(1, charging)
	};
}

export interface DutyPlan {
	hoursPerDay: number;
	dailyEnergyKwh: number;
	batteryEnergyKwh: number;
	usableEnergyKwh: number;
	runtimeHours: number;
	/** unrounded */
	ebu: number;
	/** the charging method asked for */
	charging: ChargingMethod;
	/** the charging method the count rests on ('conventional' after a fall-back) */
	basis: ChargingMethod;
	/** the EBU limit that applied to one battery with opportunity or fast charging, else null */
	oneBatteryEbuLimit: number | null;
	/** one battery per truck covers the day under the chosen method */
	oneBatteryCovers: boolean;
	/** opportunity or fast charging was beyond its limit */
	fellBack: boolean;
	batteriesPerTruck: number;
	periodsPerDay: number;
	periodHours: number;
	changesPerTruckPerDay: number;
	/** batteries of one truck on charge at once (chargers per truck for exchange) */
	chargingAtOncePerTruck: number;
	/** conventional hours a battery is away (charge + cool) */
	chargeHours: number;
	coolHours: number;
}

/** The battery plan for one truck under the operation's charging method (module comment). */
export function planDuty(
	battery: BatterySpec,
	op: OperationInput,
	p: Readonly<RuleParams>
): DutyPlan {
	const hoursPerDay = op.shiftsPerDay * op.hoursPerShift;
	const dailyEnergyKwh = hoursPerDay * op.energyKwhPerHour;
	const energy = batteryEnergyKwh(battery.voltage, battery.capacityAh);
	const usable = usableOf(energy, p.usableShare[battery.chemistry]);
	const runtimeHours = usable / op.energyKwhPerHour;
	const ebu = equivalentBatteryUsage(dailyEnergyKwh, usable);
	const chargeHours = p.chargeHours[battery.chemistry];
	const coolHours = p.coolHours[battery.chemistry];

	let limit: number | null = null;
	if (op.charging !== 'conventional') {
		if (battery.chemistry === 'lithium-ion') limit = p.lithiumOneBatteryEbuLimit;
		else limit = op.charging === 'opportunity' ? p.opportunityEbuLimit : p.fastChargeEbuLimit;
	}

	if (limit !== null && ebu <= limit + TOL) {
		return {
			hoursPerDay,
			dailyEnergyKwh,
			batteryEnergyKwh: energy,
			usableEnergyKwh: usable,
			runtimeHours,
			ebu,
			charging: op.charging,
			basis: op.charging,
			oneBatteryEbuLimit: limit,
			oneBatteryCovers: true,
			fellBack: false,
			batteriesPerTruck: 1,
			periodsPerDay: 1,
			periodHours: hoursPerDay,
			changesPerTruckPerDay: 0,
			chargingAtOncePerTruck: 1,
			chargeHours,
			coolHours
		};
	}
	const r = rotation(op.shiftsPerDay, op.hoursPerShift, runtimeHours, chargeHours, coolHours);
	return {
		hoursPerDay,
		dailyEnergyKwh,
		batteryEnergyKwh: energy,
		usableEnergyKwh: usable,
		runtimeHours,
		ebu,
		charging: op.charging,
		basis: 'conventional',
		oneBatteryEbuLimit: limit,
		oneBatteryCovers: r.batteriesPerTruck === 1,
		fellBack: limit !== null,
		batteriesPerTruck: r.batteriesPerTruck,
		periodsPerDay: r.periodsPerDay,
		periodHours: r.periodHours,
		changesPerTruckPerDay: r.batteriesPerTruck > 1 ? Math.max(1, r.periodsPerDay - 1) : 0,
		chargingAtOncePerTruck: r.chargingAtOncePerTruck,
		chargeHours,
		coolHours
	};
}

/** Exchange points (each: one pallet truck, one latch adapter, one empty stand) for the fleet. */
export function exchangePoints(trucks: number, trucksPerPoint: number): number {
	return Math.max(1, Math.ceil(trucks / trucksPerPoint));
}
