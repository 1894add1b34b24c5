/**
 * Every limit, tolerance and default of the rules engine, named, with units and sources.
 * "Common practice" marks trade practice without a published source; "assumption" marks a figure we
 * chose for the demo that a dealer should set for its market.
 */

import type { ChargerProfile, Chemistry, SetupId } from './types';

export interface RuleParams {
	/**
	 * Share of rated capacity that may be drawn before recharging, by chemistry.
	 * Lead-acid 0.8: discharge beyond 80 % is a deep discharge (battery makers' operating
	 * instructions; common practice). Lithium-ion 0.9 (from memory; common practice for LFP traction
	 * packs, whose makers allow deeper cycling).
	 */
	usableShare: Record<Chemistry, number>;
	/** hours to recharge a discharged battery on a conventional charger, by chemistry. Lead-acid 8 h
	 * ("8-8-8", common practice); lithium-ion 3 h (common practice for ~0.3 C charging). */
	chargeHours: Record<Chemistry, number>;
	/** hours a battery rests after charging before reuse. Lead-acid 8 h ("8-8-8", common practice);
	 * lithium-ion needs no cooling rest (0 h). */
	coolHours: Record<Chemistry, number>;
	/** highest EBU at which opportunity charging carries one lead-acid battery per truck (dealer
	 * power-study guidance; common practice) */
	opportunityEbuLimit: number;
	/** highest EBU at which fast charging carries one lead-acid battery per truck (common practice) */
	fastChargeEbuLimit: number;
	/** highest EBU at which opportunity or fast charging carries one lithium-ion battery per truck
	 * (assumption: charging at about 1 C in breaks and at shift changes; common practice) */
	lithiumOneBatteryEbuLimit: number;
	/** roller tops of stands or changers must be within this of the roller bed's, mm (common practice) */
	rollerHeightToleranceMm: number;
	/** horizontal play in the compartment above which spacers are needed, mm; 13 mm = ½ in
	 * (OSHA 29 CFR 1910.178(g)(5) asks that batteries be secured; 13 mm is common practice) */
	maxHorizontalPlayMm: number;
	/** door opening angle that clears gear driving alongside the truck, degrees (common practice: the
	 * door folds back close to flat against the body) */
	minDoorSwingAlongsideDeg: number;
	/** minutes per battery change, by setup (REFERENCES.md, equipment makers' figures; common
	 * practice): hoist 10–12 → 11; pallet truck carrying the trolley, manual 5–8 → 6.5; sideways
	 * transfer onto roller stands or a changer, powered carriage 3–5 → 4; in-truck has no changes */
	minutesPerChange: Record<SetupId, number>;
	/** change-out labour rate, cents per hour (assumption: loaded warehouse labour, USD 30/h) */
	labourRatePerHourCents: number;
	/** years of the cost comparison (issue 3: default 5) */
	years: number;
	/** working weeks a year (assumption: 50, allowing holidays) */
	weeksPerYear: number;
	/** gas current factor f, amperes per 100 Ah of rated capacity, by charger profile, for vented
	 * lead-acid batteries (EN IEC 62485-3:2014, table of gas currents): IU 2, IUI up to 6, W 5–7 → 7 */
	gasFactor: Record<ChargerProfile, number>;
	/** profile assumed when the catalogue's charger does not say (IU, EN IEC 62485-3) */
	defaultChargerProfile: ChargerProfile;
	/** nominal cell voltage of lead-acid cells, V: cells = V / 2 (IEC 60254-1; common practice) */
	leadAcidCellVoltage: number;
	/** air flow per cell per ampere of gas current, m³/h (EN IEC 62485-3:2014 §6.2.2: 0.055) */
	ventilationCoefficient: number;
	/** inlet and outlet opening area per m³/h for natural ventilation, cm² (EN IEC 62485-2/-3: 28) */
	naturalOpeningCm2PerM3h: number;
	/** NFPA 1 §52.3.6: 1 cfm per ft² of floor = 0.3048 m/min × 60 = 18.288 m³/h per m² */
	nfpaM3hPerM2: number;
	/** clearance around a battery on a stand, added to each side of its footprint, mm (common practice) */
	standMarginMm: number;
	/** aisle in front of a row of stands for the pallet truck, mm; half is charged to each of the two
	 * rows that share it (common practice: a pallet truck with 1 150 mm forks turning) */
	aisleWidthMm: number;
	/** trucks served by one exchange point (one pallet truck, one adapter, one empty stand)
	 * (assumption) */
	trucksPerExchangePoint: number;
	/** price of an extra battery when the catalogue has no matching one, cents per kWh
	 * (assumption: order of magnitude of list prices) */
	batteryPriceCentsPerKwh: Record<Chemistry, number>;
	/** numerical tolerance for comparisons of converted measurements, mm or kg; far below any
	 * measuring precision, it only absorbs floating-point rounding of unit conversions */
	comparisonEpsilon: number;
}

export const DEFAULT_PARAMS: Readonly<RuleParams> = deepFreeze<RuleParams>({
	usableShare: { 'lead-acid': 0.8, 'lithium-ion': 0.9 },
	chargeHours: { 'lead-acid': 8, 'lithium-ion': 3 },
	coolHours: { 'lead-acid': 8, 'lithium-ion': 0 },
	opportunityEbuLimit: 1.5,
	fastChargeEbuLimit: 2.0,
	lithiumOneBatteryEbuLimit: 3.0,
	rollerHeightToleranceMm: 5,
	maxHorizontalPlayMm: 13,
	minDoorSwingAlongsideDeg: 170,
	minutesPerChange: { 'in-truck': 0, 'roller-bed': 4, 'trolley-stand': 6.5, 'overhead-hoist': 11 },
	labourRatePerHourCents: 3000,
	years: 5,
	weeksPerYear: 50,
	gasFactor: { IU: 2, IUI: 6, W: 7 },
	defaultChargerProfile: 'IU',
	leadAcidCellVoltage: 2.0,
	ventilationCoefficient: 0.055,
	naturalOpeningCm2PerM3h: 28,
	nfpaM3hPerM2: 18.288,
	standMarginMm: 100,
	aisleWidthMm: 2000,
	trucksPerExchangePoint: 10,
	batteryPriceCentsPerKwh: { 'lead-acid': 25_000, 'lithium-ion': 60_000 },
	comparisonEpsilon: 1e-6
});

function deepFreeze<T extends object>(o: T): Readonly<T> {
	for (const v of Object.values(o)) if (v && typeof v === 'object') deepFreeze(v);
	return Object.freeze(o);
}

/** Defaults overlaid with the given parameters (a shallow merge: nested records replace whole). */
export function resolveParams(params?: Partial<RuleParams>): Readonly<RuleParams> {
	if (!params) return DEFAULT_PARAMS;
	return { ...DEFAULT_PARAMS, ...params };
}
