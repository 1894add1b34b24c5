import { describe, it, expect } from 'vitest';
import catalogueFile from '../../../../seed-data/catalogue.json';
import { fromCatalogueFile, type CatalogueFile } from './catalogue';
import { evaluate } from './evaluate';
import { designExample } from './fixtures';
import { DEFAULT_PARAMS } from './params';
import {
	batteryGas,
	cellsOf,
	gasCurrentA,
	naturalOpeningCm2,
	nfpaFloorM3h,
	stationaryAirFlowM3h,
	tractionAirFlowM3h
} from './ventilation';
import { M3H_PER_CFM, ft2ToM2 } from '../../units';

const { catalogue } = fromCatalogueFile(catalogueFile as CatalogueFile);

describe('EN IEC 62485-3 traction battery air flow', () => {
	it('worked example: 24 cells, 775 Ah, IU charger → 20.46 m³/h', () => {
		// I_gas = f · C / 100 = 2 × 775 / 100 = 15.5 A, f = 2 for IU (EN IEC 62485-3:2014 §6.2.2)
		expect(gasCurrentA(2, 775)).toBeCloseTo(15.5, 12);
		// Q = 0.055 · n · I_gas = 0.055 × 24 × 15.5 = 20.46 m³/h (EN IEC 62485-3:2014 §6.2.2)
		expect(tractionAirFlowM3h(24, 15.5)).toBeCloseTo(20.46, 10);
	});

	it('natural ventilation openings A = 28 · Q: 20.46 m³/h → 572.9 cm²', () => {
		// EN IEC 62485-2/-3: 28 × 20.46 = 572.88 cm²
		expect(naturalOpeningCm2(20.46)).toBeCloseTo(572.88, 10);
	});

	it('a 48 V lead-acid battery has 24 cells', () => {
		// 2.0 V a cell (IEC 60254-1; common practice): 48 / 2 = 24
		expect(cellsOf(designExample().battery, DEFAULT_PARAMS)).toBe(24);
	});

	it('the gas factor follows the charger profile', () => {
		const b = designExample().battery;
		// IU: f = 2 → 20.46 m³/h (EN IEC 62485-3 worked example above)
		expect(batteryGas(b, 'IU', DEFAULT_PARAMS).perBatteryM3h).toBeCloseTo(20.46, 10);
		// IUI: f = 6 (EN IEC 62485-3 table): 0.055 × 24 × 6 × 775 / 100 = 61.38 m³/h, by hand
		expect(batteryGas(b, 'IUI', DEFAULT_PARAMS).perBatteryM3h).toBeCloseTo(61.38, 10);
		// lithium-ion does not gas in normal charging
		expect(batteryGas({ ...b, chemistry: 'lithium-ion' }, 'IU', DEFAULT_PARAMS).perBatteryM3h).toBe(
			0
		);
	});
});

describe('EN IEC 62485-2 stationary battery air flow', () => {
	it('worked example: 108 cells, 50 Ah, I_gas 1 mA/Ah → 0.27 m³/h and 7.56 cm²', () => {
		// Q = 0.05 · n · I_gas · C · 10⁻³ = 0.05 × 108 × 1 × 50 × 10⁻³ = 0.27 m³/h (EN 50272-2 §8.2)
		const q = stationaryAirFlowM3h(108, 1, 50);
		expect(q).toBeCloseTo(0.27, 12);
		// A = 28 × 0.27 = 7.56 cm² (same worked example)
		expect(naturalOpeningCm2(q)).toBeCloseTo(7.56, 10);
	});
});

describe('NFPA 1 §52.3.6 floor-area ventilation', () => {
	it('is 1 cfm per ft² of floor', () => {
		// 1 ft² of floor → 1 cfm = 1.6990108 m³/h (NFPA 1 §52.3.6; 1 ft = 0.3048 m exactly)
		expect(nfpaFloorM3h(ft2ToM2(1))).toBeCloseTo(1.6990108, 7);
		expect(nfpaFloorM3h(ft2ToM2(430))).toBeCloseTo(430 * M3H_PER_CFM, 9);
		// ≈ 5.08 L/s per m² (REFERENCES): 18.288 m³/h ÷ 3.6 = 5.08 L/s
		expect(nfpaFloorM3h(1) / 3.6).toBeCloseTo(5.08, 10);
	});
});

describe('ventilation in the evaluation', () => {
	it('DESIGN.md example: 6 batteries on charge at once, NFPA figure for 40 m² beside it', () => {
		const r = evaluate(designExample(), catalogue);
		// 20.46 m³/h per battery (EN IEC 62485-3 worked example) × 6 trucks, one battery each on its
		// 8 h charge at any time of a three-shift day (8-8-8, common practice) = 122.76 m³/h
		expect(r.ventilation.perBatteryM3h).toBeCloseTo(20.46, 10);
		expect(r.ventilation.chargingAtOnce).toBe(6);
		expect(r.ventilation.requiredM3h).toBeCloseTo(122.76, 10);
		// 40 m² × 18.288 m³/h per m² (NFPA 1: 1 cfm/ft²) = 731.52 m³/h, by hand
		expect(r.ventilation.nfpaFloorM3h).toBeCloseTo(731.52, 10);
		// 28 × 122.76 = 3 437.28 cm² (EN IEC 62485-3)
		expect(r.ventilation.naturalOpeningCm2).toBeCloseTo(3437.3, 1);
		expect(r.ventilation.basis).toMatch(/EN IEC 62485-3/);
		// NFPA 1 §52.3.6: either ≤ 1 % hydrogen by design or 1 cfm/ft² — an alternative, not an extra demand
		expect(r.ventilation.basis).toMatch(/NFPA 1 .*either .*1 % .* or a flat 1 cfm per ft² of floor: 731\.52 m³\/h/);
		const hoist = r.setups.find((s) => s.id === 'overhead-hoist')!;
		const v = hoist.checks.find((c) => c.code === 'ventilation')!;
		// the site's 150 m³/h covers 122.76 m³/h
		expect(v.result).toBe('pass');
		expect(v.message).toMatch(/150 m³\/h/);
	});

	it('a short air flow fails, fixable by the site: fits with changes', () => {
		const input = designExample();
		input.site.chargingArea = { floorAreaM2: 40, ventilationM3h: 100 };
		const r = evaluate(input, catalogue);
		const trolley = r.setups.find((s) => s.id === 'trolley-stand')!;
		const v = trolley.checks.find((c) => c.code === 'ventilation')!;
		// 100 m³/h < 122.76 m³/h required (above)
		expect(v.result).toBe('fail');
		expect(v.fixable).toBe(true);
		expect(v.remedy).toMatch(/ventilation/);
		expect(trolley.verdict).toBe('fits-with-changes');
	});

	it('no NFPA figure without a floor area', () => {
		const input = designExample();
		input.site.chargingArea = null;
		const r = evaluate(input, catalogue);
		expect(r.ventilation.nfpaFloorM3h).toBeNull();
		const v = r.setups[2].checks.find((c) => c.code === 'ventilation')!;
		expect(v.result).toBe('warn');
	});
});
