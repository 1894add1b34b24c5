/**
 * The engine's entry: which battery setups fit one truck and battery at a site, why, and what the
 * fleet needs. Pure: no I/O, no framework; the same input always gives the same output.
 */

import { prepareCatalogue } from './catalogue';
import { cautionsFor } from './cautions';
import { makeContext, count, num, type Ctx } from './context';
import { round } from './fleet';
import { resolveParams, type RuleParams } from './params';
import { rankSetups } from './rank';
import { inTruck, overheadHoist, rollerBed, trolleyStand } from './setups';
import { batteryGas, nfpaFloorM3h, naturalOpeningCm2 } from './ventilation';
import { findCharger } from './catalogue';
import type {
	EngineCatalogue,
	EvaluateResult,
	FleetFigures,
	ResolvedInput,
	SetupResult,
	VentilationResult
} from './types';

/**
 * Evaluates the four handling setups for one truck model and battery across the fleet.
 * Lengths mm, masses kg, energy kWh, air flow m³/h, money integer cents (USD).
 */
export function evaluate(
	input: ResolvedInput,
	catalogue: EngineCatalogue,
	params?: Partial<RuleParams>
): EvaluateResult {
	const p = resolveParams(params);
	const ctx = makeContext(input, p, prepareCatalogue(catalogue));
	const drafts = [inTruck(ctx), rollerBed(ctx), trolleyStand(ctx), overheadHoist(ctx)];
	const recommended = rankSetups(ctx, drafts);
	const setups = [drafts[0].result, drafts[1].result, drafts[2].result, drafts[3].result];
	const d = ctx.duty;
	let ventFor = setups[0];
	for (const s of setups) if (s.rank === 1) ventFor = s;
	return {
		apiVersion: 'v1',
		recommended,
		batteriesPerTruck: d.batteriesPerTruck,
		ebu: round(d.ebu, 2),
		changesPerTruckPerDay: d.changesPerTruckPerDay,
		fleet: fleetFigures(ctx, setups),
		setups,
		ventilation: ventilationResult(ctx, ventFor),
		cautions: cautionsFor(ctx)
	};
}

function fleetFigures(ctx: Ctx, setups: readonly SetupResult[]): FleetFigures {
	const d = ctx.duty;
	const exchange = setups[2];
	let note: string;
	const energy = `${num(d.hoursPerDay)} h a day at ${num(ctx.input.operation.energyKwhPerHour)} kWh an hour draw ${num(d.dailyEnergyKwh, 1)} kWh; one battery gives ${num(d.usableEnergyKwh)} kWh usable (EBU ${num(d.ebu)}) and lasts ${num(d.runtimeHours, 1)} h`;
	if (d.oneBatteryEbuLimit !== null && !d.fellBack) {
		note = `${energy}. ${d.charging === 'opportunity' ? 'Opportunity' : 'Fast'} charging carries one battery per truck up to EBU ${num(d.oneBatteryEbuLimit)}.`;
	} else if (d.fellBack) {
		note = `${energy}. That is beyond the EBU ${num(d.oneBatteryEbuLimit ?? 0)} that ${d.charging} charging carries on one battery, so the fleet falls back to exchange with conventional charging: ${count(d.batteriesPerTruck, 'battery', 'batteries')} per truck.`;
	} else {
		note = `${energy}. With ${num(d.chargeHours)} h charging${d.coolHours > 0 ? ` and ${num(d.coolHours)} h cooling` : ''} before reuse, ${count(d.periodsPerDay, 'work period', 'work periods')} of ${num(d.periodHours, 2)} h a day need ${count(d.batteriesPerTruck, 'battery', 'batteries')} per truck.`;
	}
	return {
		trucks: ctx.trucks,
		hoursPerDay: d.hoursPerDay,
		dailyEnergyKwh: round(d.dailyEnergyKwh, 2),
		batteryEnergyKwh: round(d.batteryEnergyKwh, 2),
		usableEnergyKwh: round(d.usableEnergyKwh, 2),
		runtimeHours: round(d.runtimeHours, 2),
		batteriesPerTruck: d.batteriesPerTruck,
		totalBatteries: ctx.trucks * d.batteriesPerTruck,
		extraBatteries: ctx.trucks * (d.batteriesPerTruck - 1),
		changesPerTruckPerDay: d.changesPerTruckPerDay,
		changesPerDay: ctx.trucks * d.changesPerTruckPerDay,
		chargers: exchange.fleet.chargers,
		batteriesChargingAtOnce: exchange.fleet.batteriesChargingAtOnce,
		exchangePoints: ctx.points,
		workingDaysPerYear: ctx.workingDaysPerYear,
		chargingBasis: d.basis,
		note
	};
}

function ventilationResult(ctx: Ctx, setup: SetupResult): VentilationResult {
	const method = setup.id === 'in-truck' ? ctx.input.operation.charging : ctx.duty.basis;
	const charger = findCharger(ctx.pc, ctx.battery.chemistry, method, ctx.battery.voltage);
	const profile = charger?.spec.profile ?? ctx.p.defaultChargerProfile;
	const gas = batteryGas(ctx.battery, profile, ctx.p);
	const n = setup.ventilation.chargingAtOnce;
	const required = setup.ventilation.requiredM3h;
	const area = ctx.site.chargingArea;
	const nfpa = area ? round(nfpaFloorM3h(area.floorAreaM2, ctx.p.nfpaM3hPerM2), 2) : null;
	let basis: string;
	if (ctx.battery.chemistry !== 'lead-acid') {
		basis =
			"Lithium-ion batteries give off no gas in normal charging, so EN IEC 62485-3's gas formula does not apply; ventilate as the battery maker asks.";
	} else {
		basis = `EN IEC 62485-3: Q = ${ctx.p.ventilationCoefficient} × ${gas.cells} cells × ${num(gas.gasCurrentA)} A gas current (f = ${num(gas.gasFactor)} for an ${profile} charger × ${num(ctx.battery.capacityAh)} Ah ÷ 100) = ${num(gas.perBatteryM3h)} m³/h per battery on charge, × ${n} charging at once (${setup.name}) = ${num(required)} m³/h.`;
		if (nfpa !== null) {
			// NFPA 1 §52.3.6 gives two routes: a design keeping hydrogen at or under 1 % of the room, or a
			// flat 1 cfm per ft² of floor. The flow above is the first kind; the local authority picks.
			basis += ` Where NFPA 1 is the fire code it accepts either a design that keeps hydrogen at or under 1 % of the room (what this flow is for) or a flat 1 cfm per ft² of floor: ${num(nfpa)} m³/h for ${num(area!.floorAreaM2, 1)} m²; the authority having jurisdiction decides which.`;
		}
	}
	return {
		setupId: setup.id,
		requiredM3h: required,
		basis,
		perBatteryM3h: round(gas.perBatteryM3h, 2),
		chargingAtOnce: n,
		cells: gas.cells,
		gasCurrentA: round(gas.gasCurrentA, 3),
		nfpaFloorM3h: nfpa,
		naturalOpeningCm2: round(naturalOpeningCm2(required, ctx.p.naturalOpeningCm2PerM3h), 1),
		siteM3h: area ? area.ventilationM3h : null
	};
}
