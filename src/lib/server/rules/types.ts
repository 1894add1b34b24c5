/**
 * Plain types of the rules engine: its input (one truck, one battery, the fleet, the operation and
 * the site, all resolved: no catalogue references left), the catalogue it reads equipment from, and
 * its output, which is the public `POST /api/v1/evaluate` response (shared/DESIGN.md §4).
 *
 * Units are in the field names: millimetres, kilograms, kWh, m³/h, m², degrees, hours; money is
 * integer cents.
 */
import { SETUP_LABELS } from '../../labels';

import type { UnitSystem } from '../../units';

export type Chemistry = 'lead-acid' | 'lithium-ion';
export type ChargingMethod = 'conventional' | 'opportunity' | 'fast';
export type SetupId = 'in-truck' | 'roller-bed' | 'trolley-stand' | 'overhead-hoist';
export type Verdict = 'fits' | 'fits-with-changes' | 'does-not-fit';
export type CheckResult = 'pass' | 'warn' | 'fail';
export type CheckCode =
	| 'voltage'
	| 'battery-weight'
	| 'compartment-fit'
	| 'fork-length'
	| 'fork-width'
	| 'roller-height'
	| 'door-swing'
	| 'handling-capacity'
	| 'floor-space'
	| 'ventilation'
	| 'duty';

export const SETUP_IDS: readonly SetupId[] = [
	'in-truck',
	'roller-bed',
	'trolley-stand',
	'overhead-hoist'
];

/** UI names of the setups (one list for the engine and the pages: src/lib/labels.ts). */
export const SETUP_NAMES = SETUP_LABELS as Readonly<Record<SetupId, string>>;

export interface RangeMm {
	minMm: number;
	maxMm: number;
}

// ---------------------------------------------------------------------------------------------
// Input

export interface TruckSpec {
	/** nominal system voltage, V */
	voltage: number;
	/** battery compartment; `heightWithRollerBedMm` is the usable height once a roller bed is fitted */
	compartment: {
		lengthMm: number;
		widthMm: number;
		heightMm: number;
		heightWithRollerBedMm: number;
	};
	/** height of the roller bed's roller tops above the floor, mm */
	rollerBedTopMm: number;
	forkFit: {
		/** 2-roller service trolley: forks must stay short of the far frame and narrow enough to enter */
		serviceTrolley: { maxLengthMm: number; maxOverallWidthMm: number };
		/** latching 4-roller trolley: the latch adapter fits forks within this length range */
		latchTrolley: { minLengthMm: number; maxLengthMm: number; maxOverallWidthMm: number };
	};
	/** standard side door's opening angle, degrees */
	doorSwingDeg: number;
	/** wide-swing door option's opening angle, degrees */
	wideDoorSwingDeg: number;
	/** battery weight window from the nameplate; the battery is part of the counterweight */
	batteryWeightKg: { min: number; max: number };
	/** catalogue code, when resolved from the catalogue */
	code?: string;
	name?: string;
}

export interface BatterySpec {
	/** nominal voltage, V */
	voltage: number;
	/** rated capacity, Ah (6-hour rate in the US, C5 in Europe) */
	capacityAh: number;
	lengthMm: number;
	widthMm: number;
	heightMm: number;
	weightKg: number;
	chemistry: Chemistry;
	/** catalogue SKU (battery code) when resolved from the catalogue; prices extra batteries */
	sku?: string;
	name?: string;
}

export interface FleetInput {
	trucks: number;
}

export interface OperationInput {
	shiftsPerDay: number;
	hoursPerShift: number;
	daysPerWeek: number;
	/** average energy drawn per working hour, kWh */
	energyKwhPerHour: number;
	charging: ChargingMethod;
	/** years for the cost comparison; default from RuleParams.years */
	years?: number;
}

export interface SitePalletTruck {
	forkLengthMm: number;
	overallWidthMm: number;
	capacityKg: number;
}

export interface SiteRollerStand {
	/** roller tops above the floor, mm */
	rollerTopMm: number;
	/** null for a fixed-height stand */
	adjustRangeMm: RangeMm | null;
	capacityKg: number;
	/** the stand or changer drives (or is pushed) alongside the truck */
	driveAlongside: boolean;
	/** a roller stand or a battery changer (wording only) */
	kind?: 'stand' | 'changer';
}

export interface SiteCrane {
	ratedLoadKg: number;
	/** weight of the site's lifting beam; null or absent when the site has none */
	beamWeightKg?: number | null;
}

export interface SiteChargingArea {
	floorAreaM2: number;
	/** mechanical ventilation air flow, m³/h */
	ventilationM3h: number;
	eyewash?: boolean;
	neutraliser?: boolean;
}

export interface SiteInput {
	palletTrucks: SitePalletTruck[];
	rollerStands: SiteRollerStand[];
	crane: SiteCrane | null;
	chargingArea: SiteChargingArea | null;
	/** change-out labour rate, cents per hour; default RuleParams.labourRatePerHourCents */
	labourRatePerHourCents?: number;
}

/** Engine input: every catalogue reference already resolved to a spec. */
export interface ResolvedInput {
	truck: TruckSpec;
	battery: BatterySpec;
	fleet: FleetInput;
	operation: OperationInput;
	site: SiteInput;
	/** system shown first in messages; both are always shown */
	units?: UnitSystem;
}

// ---------------------------------------------------------------------------------------------
// Catalogue

export type EquipmentKind =
	| 'side-door'
	| 'wide-door'
	| 'side-cover'
	| 'service-trolley'
	| 'latch-trolley'
	| 'retrofit-kit'
	| 'roller-bed'
	| 'exchange-stand'
	| 'charging-stand'
	| 'roller-stand'
	| 'latch-adapter'
	| 'pallet-truck'
	| 'lifting-beam'
	| 'watering-kit'
	| 'charger'
	| 'battery';

export interface EquipmentSpecs {
	'side-door': { swingDeg?: number };
	'wide-door': { swingDeg?: number };
	'side-cover': Record<string, unknown>;
	'service-trolley': { rollers?: number; weightKg?: number };
	'latch-trolley': { rollers?: number; weightKg?: number };
	'retrofit-kit': Record<string, unknown>;
	'roller-bed': Record<string, unknown>;
	/** holds a battery on its latching trolley */
	'exchange-stand': { capacityKg: number };
	/** holds a bare battery set down by the hoist */
	'charging-stand': { capacityKg: number };
	'roller-stand': {
		rollerTopMm: number;
		adjustRangeMm: RangeMm | null;
		capacityKg: number;
		driveAlongside: boolean;
		kind?: 'stand' | 'changer';
	};
	'latch-adapter': Record<string, unknown>;
	'pallet-truck': { forkLengthMm: number; overallWidthMm: number; capacityKg: number };
	'lifting-beam': { weightKg: number; ratedLoadKg: number };
	'watering-kit': Record<string, unknown>;
	charger: {
		chemistry: Chemistry;
		kind: ChargingMethod;
		voltage?: number;
		profile?: ChargerProfile;
	};
	battery: Omit<BatterySpec, 'sku' | 'name'>;
}

/** Charging characteristic, which sets the gas current factor (EN IEC 62485-3). */
export type ChargerProfile = 'IU' | 'IUI' | 'W';

/** One catalogue row as the engine reads it; the app builds these from database rows. */
export type EquipmentItem<K extends EquipmentKind = EquipmentKind> = K extends EquipmentKind
	? { sku: string; kind: K; name: string; priceCents: number; spec: EquipmentSpecs[K] }
	: never;

/**
 * The catalogue the engine picks standard items from, by kind, in list order (put the preferred
 * item of a kind first). Batteries may be listed as items of kind 'battery' (sku = battery code).
 */
export interface EngineCatalogue {
	items: readonly EquipmentItem[];
}

// ---------------------------------------------------------------------------------------------
// Output

export interface Check {
	code: CheckCode;
	result: CheckResult;
	measured: number | null;
	limit: number | null;
	unit: string;
	/** plain English sentence with the numbers in it */
	message: string;
	/** what to order or change; null when nothing can be done */
	remedy: string | null;
	/** false when no order from the catalogue and no site change can resolve a failure */
	fixable: boolean;
	/** which part the check is about, e.g. 'height', 'pallet-truck', 'hoist' */
	subject?: string;
}

export interface BomLine {
	/** catalogue SKU; null when the catalogue lacks the item (priced at 0, on request) */
	sku: string | null;
	kind: EquipmentKind;
	description: string;
	quantity: number;
	reason: string;
	unitPriceCents: number;
	lineTotalCents: number;
}

export interface CostOverYears {
	years: number;
	/** equipment at catalogue price, cents */
	equipment: number;
	/** change-out labour over the years, cents */
	labour: number;
	/** extra batteries beyond one per truck, cents */
	batteries: number;
	total: number;
	currency: 'USD';
}

export interface SetupFleet {
	batteries: number;
	extraBatteries: number;
	changesPerDay: number;
	chargers: number;
	trolleys: number;
	stands: number;
	adapters: number;
	palletTrucks: number;
	labourHoursPerYear: number;
	batteriesChargingAtOnce: number;
}

export interface SetupResult {
	id: SetupId;
	name: string;
	verdict: Verdict;
	rank: number;
	reasons: string[];
	checks: Check[];
	bom: BomLine[];
	/** later upgrades, not in the cost (e.g. the retrofit kit) */
	options: BomLine[];
	costOverYears: CostOverYears;
	batteriesPerTruck: number;
	changesPerTruckPerDay: number;
	fleet: SetupFleet;
	ventilation: { requiredM3h: number; chargingAtOnce: number };
}

export interface FleetFigures {
	trucks: number;
	hoursPerDay: number;
	dailyEnergyKwh: number;
	batteryEnergyKwh: number;
	usableEnergyKwh: number;
	/** hours one charged battery lasts at the stated draw */
	runtimeHours: number;
	batteriesPerTruck: number;
	totalBatteries: number;
	extraBatteries: number;
	changesPerTruckPerDay: number;
	changesPerDay: number;
	/** chargers for an exchange setup; a charger per truck for in-truck */
	chargers: number;
	batteriesChargingAtOnce: number;
	exchangePoints: number;
	workingDaysPerYear: number;
	/** charging method the battery count rests on (after any fall-back to exchange) */
	chargingBasis: ChargingMethod;
	/** plain sentence explaining the battery count */
	note: string;
}

export interface VentilationResult {
	/** the setup these figures are for (the recommended one, else the first) */
	setupId: SetupId;
	requiredM3h: number;
	basis: string;
	perBatteryM3h: number;
	chargingAtOnce: number;
	cells: number;
	gasCurrentA: number;
	/** NFPA 1 figure (1 cfm per ft² of floor) when the charging area's floor is given */
	nfpaFloorM3h: number | null;
	/** free area of each of the inlet and outlet openings for natural ventilation, cm² */
	naturalOpeningCm2: number;
	siteM3h: number | null;
}

export interface EvaluateResult {
	apiVersion: 'v1';
	recommended: SetupId | null;
	batteriesPerTruck: number;
	ebu: number;
	changesPerTruckPerDay: number;
	fleet: FleetFigures;
	setups: SetupResult[];
	ventilation: VentilationResult;
	cautions: string[];
}
