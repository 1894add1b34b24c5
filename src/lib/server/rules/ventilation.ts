/**
 * Charging-area ventilation.
 *
 * Traction batteries (EN IEC 62485-3:2014 §6.2.2): Q = 0.055 · n · I_gas  [m³/h], with n cells and
 * I_gas = f · C / 100  [A], f the gas current factor of the charger profile (IU 2 for vented
 * lead-acid) and C the rated capacity in Ah. Natural ventilation: inlet and outlet each A = 28 · Q
 * [cm²]. Stationary batteries (EN IEC 62485-2): Q = 0.05 · n · I_gas[mA/Ah] · C · 10⁻³.
 * US alternative (NFPA 1 §52.3.6): 1 cfm per ft² of floor = 18.288 m³/h per m².
 */

import type { BatterySpec, ChargerProfile } from './types';
import type { RuleParams } from './params';

/** Gas current, A = f · C / 100 (EN IEC 62485-3). */
export function gasCurrentA(gasFactor: number, capacityAh: number): number {
	return (gasFactor * capacityAh) / 100;
}

/** Traction battery air flow, m³/h = coefficient (0.055) · cells · gas current A (EN IEC 62485-3 §6.2.2). */
export function tractionAirFlowM3h(cells: number, gasCurrent: number, coefficient = 0.055): number {
	return coefficient * cells * gasCurrent;
}

/** Stationary battery air flow, m³/h = 0.05 · n · I_gas[mA/Ah] · C[Ah] · 10⁻³ (EN IEC 62485-2). */
export function stationaryAirFlowM3h(
	cells: number,
	gasCurrentMaPerAh: number,
	capacityAh: number
): number {
	return 0.05 * cells * gasCurrentMaPerAh * capacityAh * 1e-3;
}

/** Free area of each of the inlet and outlet for natural ventilation, cm² = 28 · Q (EN IEC 62485-2/-3). */
export function naturalOpeningCm2(airFlowM3h: number, perM3h = 28): number {
	return perM3h * airFlowM3h;
}

/** NFPA 1 §52.3.6 continuous ventilation for the floor area, m³/h (1 cfm per ft² = 18.288 m³/h per m²). */
export function nfpaFloorM3h(floorAreaM2: number, perM2 = 18.288): number {
	return floorAreaM2 * perM2;
}

/** Cells of a battery: lead-acid V ÷ 2 V a cell (IEC 60254-1; common practice). */
export function cellsOf(battery: BatterySpec, p: Readonly<RuleParams>): number {
	return Math.max(1, Math.round(battery.voltage / p.leadAcidCellVoltage));
}

export interface BatteryGas {
	cells: number;
	gasFactor: number;
	gasCurrentA: number;
	/** air flow for one battery on charge, m³/h (0 for lithium-ion, which does not gas) */
	perBatteryM3h: number;
}

/** Gas and air flow of one battery on charge with the given charger profile. */
export function batteryGas(
	battery: BatterySpec,
	profile: ChargerProfile,
	p: Readonly<RuleParams>
): BatteryGas {
	const cells = cellsOf(battery, p);
	if (battery.chemistry !== 'lead-acid') {
		return { cells, gasFactor: 0, gasCurrentA: 0, perBatteryM3h: 0 };
	}
	const f = p.gasFactor[profile];
	const i = gasCurrentA(f, battery.capacityAh);
	return {
		cells,
		gasFactor: f,
		gasCurrentA: i,
		perBatteryM3h: tractionAirFlowM3h(cells, i, p.ventilationCoefficient)
	};
}
