/**
 * The four handling setups (shared/DESIGN.md §2): their checks, bill of materials for the whole
 * fleet, fleet counts, ventilation and cost. Ranking and reasons come after, in rank.ts.
 */

import { Bom, costOverYears, labourHoursPerYear } from './bom';
import { findCharger, firstOfKind } from './catalogue';
import {
	catalogueStandCheck,
	compartmentChecks,
	dutyCheck,
	floorCheck,
	hoistAssessment,
	palletTruckAssessment,
	standAssessment,
	ventilationCheck,
	verdictOf,
	voltageCheck,
	weightCheck
} from './checks';
import { count, type Ctx } from './context';
import { batteryGas } from './ventilation';
import type { ChargingMethod, Check, SetupId, SetupResult } from './types';
import { SETUP_NAMES } from './types';

/** A setup before ranking, with what the ranking rules need to know. */
export interface SetupDraft {
	result: SetupResult;
	/** the site's own gear favours this setup (issue 3 ranking rules) */
	siteFavours: boolean;
}

const LATCH_ADAPTER_REASON =
	'One per pallet truck used for exchanges: it latches battery and trolley to the forks; without it they sit loose on the forks while being moved.';

function chargerFor(ctx: Ctx, method: ChargingMethod) {
	return findCharger(ctx.pc, ctx.battery.chemistry, method, ctx.battery.voltage);
}

function ventilationFor(ctx: Ctx, method: ChargingMethod, chargingAtOnce: number): number {
	const charger = chargerFor(ctx, method);
	const profile = charger?.spec.profile ?? ctx.p.defaultChargerProfile;
	const gas = batteryGas(ctx.battery, profile, ctx.p);
	return Math.round(gas.perBatteryM3h * chargingAtOnce * 100) / 100;
}

function finish(
	ctx: Ctx,
	id: SetupId,
	checks: Check[],
	bom: Bom,
	options: Bom | null,
	fleet: SetupResult['fleet'],
	batteriesPerTruck: number,
	changesPerTruckPerDay: number,
	requiredM3h: number
): SetupResult {
	return {
		id,
		name: SETUP_NAMES[id],
		verdict: verdictOf(checks),
		rank: 0,
		reasons: [],
		checks,
		bom: bom.lines,
		options: options ? options.lines : [],
		costOverYears: costOverYears(ctx, bom.lines, fleet.labourHoursPerYear),
		batteriesPerTruck,
		changesPerTruckPerDay,
		fleet,
		ventilation: { requiredM3h, chargingAtOnce: fleet.batteriesChargingAtOnce }
	};
}

/** Fleet counts shared by the exchange setups. */
function exchangeCounts(ctx: Ctx) {
	const d = ctx.duty;
	const bpt = d.batteriesPerTruck;
	const batteries = ctx.trucks * bpt;
	const extra = batteries - ctx.trucks;
	// every battery out of a truck stands somewhere, plus one empty stand per exchange point
	const stands = extra + ctx.points;
	const chargers = ctx.trucks * d.chargingAtOncePerTruck;
	return {
		bpt,
		batteries,
		extra,
		stands,
		chargers,
		changes: d.changesPerTruckPerDay,
		method: d.basis
	};
}

export function inTruck(ctx: Ctx): SetupDraft {
	const checks: Check[] = [voltageCheck(ctx), weightCheck(ctx), ...compartmentChecks(ctx, false)];
	const pt = palletTruckAssessment(ctx, 'service');
	checks.push(...pt.checks, dutyCheck(ctx));
	const method = ctx.input.operation.charging;
	const required = ventilationFor(ctx, method, ctx.trucks);
	checks.push(ventilationCheck(ctx, required, ctx.trucks));

	const bom = new Bom(ctx);
	bom.add(
		'side-door',
		ctx.trucks,
		'One per truck: opens the compartment sideways for watering and inspection.'
	);
	bom.add(
		'service-trolley',
		ctx.trucks,
		'One per truck: the battery rides on it so a pallet truck can draw it partly out for service.'
	);
	bom.add(
		'pallet-truck',
		pt.order ? ctx.points : 0,
		"The site's pallet trucks do not fit the service trolley's fork channels.",
		pt.order
	);
	bom.addWatering(ctx.trucks);
	bom.add(
		'charger',
		ctx.trucks,
		`One per truck for ${method} charging in the truck.`,
		chargerFor(ctx, method)
	);
	const options = new Bom(ctx);
	options.add(
		'retrofit-kit',
		ctx.trucks,
		'Later, if the fleet moves to trolley or hoist exchange: converts each 2-roller service trolley to a latching trolley.'
	);

	const fleet = {
		batteries: ctx.trucks,
		extraBatteries: 0,
		changesPerDay: 0,
		chargers: ctx.trucks,
		trolleys: ctx.trucks,
		stands: 0,
		adapters: 0,
		palletTrucks: pt.order ? ctx.points : 0,
		labourHoursPerYear: 0,
		batteriesChargingAtOnce: ctx.trucks
	};
	return {
		result: finish(ctx, 'in-truck', checks, bom, options, fleet, 1, 0, required),
		siteFavours: false
	};
}

export function rollerBed(ctx: Ctx): SetupDraft {
	const x = exchangeCounts(ctx);
	const checks: Check[] = [voltageCheck(ctx), weightCheck(ctx), ...compartmentChecks(ctx, true)];
	const st = standAssessment(ctx, x.stands);
	checks.push(...st.checks, floorCheck(ctx, x.stands));
	const required = ventilationFor(ctx, x.method, x.chargers);
	checks.push(ventilationCheck(ctx, required, x.chargers));

	const bom = new Bom(ctx);
	bom.add(
		'roller-bed',
		ctx.trucks,
		'One per truck: the battery rolls out sideways onto the stands or changer.'
	);
	if (st.doorOrder) {
		bom.add(
			st.doorOrder.kind,
			ctx.trucks,
			'One per truck: gear that drives alongside needs the door folded clear or removed.',
			st.doorOrder
		);
	}
	bom.add(
		'roller-stand',
		st.order ? x.stands : 0,
		`The site's stands do not meet the roller bed: ${count(x.extra, 'battery', 'batteries')} out of the trucks plus one empty place per exchange point.`,
		st.order
	);
	bom.addBatteries(
		x.extra,
		`${count(x.bpt, 'battery', 'batteries')} per truck for the shift pattern: ${count(x.bpt - 1, 'extra battery', 'extra batteries')} for each of ${count(ctx.trucks, 'truck', 'trucks')}.`
	);
	bom.add(
		'charger',
		x.chargers,
		`For the ${count(x.chargers, 'battery', 'batteries')} on charge at once.`,
		chargerFor(ctx, x.method)
	);
	bom.addWatering(x.batteries);

	const labour = labourHoursPerYear(ctx, x.changes, ctx.p.minutesPerChange['roller-bed']);
	const fleet = {
		batteries: x.batteries,
		extraBatteries: x.extra,
		changesPerDay: x.changes * ctx.trucks,
		chargers: x.chargers,
		trolleys: 0,
		stands: x.stands,
		adapters: 0,
		palletTrucks: 0,
		labourHoursPerYear: labour,
		batteriesChargingAtOnce: x.chargers
	};
	return {
		result: finish(ctx, 'roller-bed', checks, bom, null, fleet, x.bpt, x.changes, required),
		siteFavours: st.siteMatches
	};
}

export function trolleyStand(ctx: Ctx): SetupDraft {
	const x = exchangeCounts(ctx);
	const checks: Check[] = [voltageCheck(ctx), weightCheck(ctx), ...compartmentChecks(ctx, false)];
	const pt = palletTruckAssessment(ctx, 'latch');
	checks.push(...pt.checks);
	const stand = firstOfKind(ctx.pc, 'exchange-stand');
	const sc = catalogueStandCheck(ctx, stand, pt.loadKg, 'battery and trolley');
	if (sc) checks.push(sc);
	checks.push(floorCheck(ctx, x.stands));
	const required = ventilationFor(ctx, x.method, x.chargers);
	checks.push(ventilationCheck(ctx, required, x.chargers));

	const bom = new Bom(ctx);
	bom.add(
		'latch-trolley',
		x.batteries,
		'One per battery: every battery rides on its own latching trolley.'
	);
	bom.add(
		'exchange-stand',
		x.stands,
		`One per battery out of the trucks (${x.extra}) plus one empty stand per exchange point (${ctx.points}).`,
		stand
	);
	bom.add('latch-adapter', ctx.points, LATCH_ADAPTER_REASON);
	bom.add(
		'pallet-truck',
		pt.order ? ctx.points : 0,
		"The site's pallet trucks do not fit the latch adapter.",
		pt.order
	);
	bom.addBatteries(
		x.extra,
		`${count(x.bpt, 'battery', 'batteries')} per truck for the shift pattern: ${count(x.bpt - 1, 'extra battery', 'extra batteries')} for each of ${count(ctx.trucks, 'truck', 'trucks')}.`
	);
	bom.add(
		'charger',
		x.chargers,
		`For the ${count(x.chargers, 'battery', 'batteries')} on charge at once.`,
		chargerFor(ctx, x.method)
	);
	bom.addWatering(x.batteries);

	const labour = labourHoursPerYear(ctx, x.changes, ctx.p.minutesPerChange['trolley-stand']);
	const fleet = {
		batteries: x.batteries,
		extraBatteries: x.extra,
		changesPerDay: x.changes * ctx.trucks,
		chargers: x.chargers,
		trolleys: x.batteries,
		stands: x.stands,
		adapters: ctx.points,
		palletTrucks: pt.order ? ctx.points : 0,
		labourHoursPerYear: labour,
		batteriesChargingAtOnce: x.chargers
	};
	return {
		result: finish(ctx, 'trolley-stand', checks, bom, null, fleet, x.bpt, x.changes, required),
		siteFavours: false
	};
}

export function overheadHoist(ctx: Ctx): SetupDraft {
	const x = exchangeCounts(ctx);
	const checks: Check[] = [voltageCheck(ctx), weightCheck(ctx), ...compartmentChecks(ctx, false)];
	const pt = palletTruckAssessment(ctx, 'latch');
	checks.push(...pt.checks);
	const h = hoistAssessment(ctx);
	checks.push(...h.checks);
	const stand = firstOfKind(ctx.pc, 'charging-stand');
	const sc = catalogueStandCheck(ctx, stand, ctx.battery.weightKg, 'battery');
	if (sc) checks.push(sc);
	checks.push(floorCheck(ctx, x.stands));
	const required = ventilationFor(ctx, x.method, x.chargers);
	checks.push(ventilationCheck(ctx, required, x.chargers));

	const bom = new Bom(ctx);
	bom.add(
		'latch-trolley',
		ctx.trucks,
		'One per truck: the latching trolley stays with the truck; the hoist lifts the battery off it, so extra batteries need no trolleys.'
	);
	bom.add('latch-adapter', ctx.points, LATCH_ADAPTER_REASON);
	bom.add(
		'pallet-truck',
		pt.order ? ctx.points : 0,
		"The site's pallet trucks do not fit the latch adapter.",
		pt.order
	);
	bom.add(
		'lifting-beam',
		h.beamOrder ? 1 : 0,
		"The site has no lifting beam: it gives the hoist a vertical pull on the battery's lifting eyes.",
		h.beamOrder
	);
	bom.add(
		'charging-stand',
		x.stands,
		`One per battery out of the trucks (${x.extra}) plus one empty place per exchange point (${ctx.points}) to set the discharged battery down.`,
		stand
	);
	bom.addBatteries(
		x.extra,
		`${count(x.bpt, 'battery', 'batteries')} per truck for the shift pattern: ${count(x.bpt - 1, 'extra battery', 'extra batteries')} for each of ${count(ctx.trucks, 'truck', 'trucks')}.`
	);
	bom.add(
		'charger',
		x.chargers,
		`For the ${count(x.chargers, 'battery', 'batteries')} on charge at once.`,
		chargerFor(ctx, x.method)
	);
	bom.addWatering(x.batteries);

	const labour = labourHoursPerYear(ctx, x.changes, ctx.p.minutesPerChange['overhead-hoist']);
	const fleet = {
		batteries: x.batteries,
		extraBatteries: x.extra,
		changesPerDay: x.changes * ctx.trucks,
		chargers: x.chargers,
		trolleys: ctx.trucks,
		stands: x.stands,
		adapters: ctx.points,
		palletTrucks: pt.order ? ctx.points : 0,
		labourHoursPerYear: labour,
		batteriesChargingAtOnce: x.chargers
	};
	return {
		result: finish(ctx, 'overhead-hoist', checks, bom, null, fleet, x.bpt, x.changes, required),
		siteFavours: h.hoistPasses
	};
}
