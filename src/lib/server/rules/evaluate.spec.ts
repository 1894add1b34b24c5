import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import catalogueFile from '../../../../seed-data/catalogue.json';
import { parseLength, parseMass } from '../../units';
import { fromCatalogueFile, type CatalogueFile } from './catalogue';
import { GOVERNING_NOTE } from './cautions';
import { evaluate } from './evaluate';
import { designExample } from './fixtures';
import { DEFAULT_PARAMS } from './params';
import { inputArb, plausibleInputArb } from './testing';
import type { EngineCatalogue, EvaluateResult, ResolvedInput, SetupId, SetupResult } from './types';

const { catalogue } = fromCatalogueFile(catalogueFile as CatalogueFile);

function setup(r: EvaluateResult, id: SetupId): SetupResult {
	return r.setups.find((s) => s.id === id)!;
}
function qty(s: SetupResult, kind: string): number {
	return s.bom.filter((l) => l.kind === kind).reduce((n, l) => n + l.quantity, 0);
}

describe('the DESIGN.md §4 example', () => {
	const r = evaluate(designExample(), catalogue);

	it('answers as the example response', () => {
		expect(r.recommended).toBe('overhead-hoist');
		// 8-8-8 (common practice): three 8-hour shifts on a battery lasting a shift → 3
		expect(r.batteriesPerTruck).toBe(3);
		// 84 kWh ÷ 29.76 kWh = 2.82 (by hand, fleet.spec.ts)
		expect(r.ebu).toBe(2.82);
		expect(r.changesPerTruckPerDay).toBe(2);
		expect(r.apiVersion).toBe('v1');
	});

	it('lists all four setups in the fixed order with UI names and distinct ranks', () => {
		expect(r.setups.map((s) => s.id)).toEqual([
			'in-truck',
			'roller-bed',
			'trolley-stand',
			'overhead-hoist'
		]);
		expect(r.setups.map((s) => s.name)).toEqual([
			'Service in truck',
			'Side transfer',
			'Trolley exchange',
			'Hoist exchange'
		]);
		expect(r.setups.map((s) => s.rank).sort()).toEqual([1, 2, 3, 4]);
	});

	it('in-truck does not fit: fork length 1 150 vs 940, and one battery cannot cover three shifts', () => {
		const s = setup(r, 'in-truck');
		expect(s.verdict).toBe('does-not-fit');
		expect(s.rank).toBe(4);
		const fork = s.checks.find((c) => c.code === 'fork-length')!;
		expect(fork).toMatchObject({ result: 'fail', measured: 1150, limit: 940, unit: 'mm' });
		expect(fork.message).toMatch(/1 150 mm/);
		expect(fork.remedy).toMatch(/pallet truck/);
		const duty = s.checks.find((c) => c.code === 'duty')!;
		expect(duty.result).toBe('fail');
		expect(duty.fixable).toBe(false);
	});

	it('hoist and trolley exchange fit; side transfer needs the wide door', () => {
		expect(setup(r, 'overhead-hoist').verdict).toBe('fits');
		expect(setup(r, 'trolley-stand').verdict).toBe('fits');
		const bed = setup(r, 'roller-bed');
		expect(bed.verdict).toBe('fits-with-changes');
		// DESIGN.md: 125° door, drive-alongside stand → wide-swing door per truck
		expect(qty(bed, 'wide-door')).toBe(6);
	});

	it('every check is a sentence with a unit, and failures carry remedies', () => {
		for (const s of r.setups) {
			for (const c of s.checks) {
				expect(c.message).toMatch(/^[A-Z].*\.$/);
				expect(c.unit.length).toBeGreaterThan(0);
				if (c.result === 'fail' && c.fixable) expect(c.remedy).toBeTruthy();
			}
			expect(s.reasons.length).toBeGreaterThanOrEqual(3);
		}
		expect(setup(r, 'overhead-hoist').reasons[0]).toMatch(/^Ranked first: .*overhead hoist/);
	});

	it('counts the fleet as issue 3 says', () => {
		// 6 trucks × 3 batteries = 18; 12 of them out of the trucks
		const t = setup(r, 'trolley-stand');
		expect(qty(t, 'latch-trolley')).toBe(18);
		// 12 batteries out of the trucks + 1 empty stand at the one exchange point
		expect(qty(t, 'exchange-stand')).toBe(13);
		expect(qty(t, 'latch-adapter')).toBe(1);
		expect(qty(t, 'battery')).toBe(12);
		// one battery per truck on its 8 h charge at a time (8-8-8): 6 chargers
		expect(qty(t, 'charger')).toBe(6);
		const h = setup(r, 'overhead-hoist');
		expect(qty(h, 'latch-trolley')).toBe(6);
		expect(qty(h, 'lifting-beam')).toBe(0);
		expect(qty(h, 'charging-stand')).toBe(13);
		expect(qty(h, 'battery')).toBe(12);
		expect(r.fleet).toMatchObject({
			trucks: 6,
			batteriesPerTruck: 3,
			extraBatteries: 12,
			changesPerDay: 12
		});
		const inTruck = setup(r, 'in-truck');
		expect(qty(inTruck, 'side-door')).toBe(6);
		expect(qty(inTruck, 'service-trolley')).toBe(6);
		// the site's 1 150 mm forks do not fit the service trolley: one fitting pallet truck
		expect(qty(inTruck, 'pallet-truck')).toBe(1);
		expect(qty(inTruck, 'charger')).toBe(6);
	});

	it('costs labour as changes × minutes × working days × rate', () => {
		const h = setup(r, 'overhead-hoist');
		// 6 trucks × 2 changes × 11 min (hoist 10–12 min, REFERENCES; common practice) = 132 min a
		// day = 2.2 h × 250 days (5 a week × 50 weeks) = 550 h a year, by hand
		expect(h.fleet.labourHoursPerYear).toBeCloseTo(550, 9);
		// × USD 30/h (default rate) × 5 years = USD 82 500
		expect(h.costOverYears.labour).toBe(8_250_000);
		expect(h.costOverYears.years).toBe(5);
		expect(h.costOverYears.currency).toBe('USD');
		expect(h.costOverYears.total).toBe(
			h.costOverYears.equipment + h.costOverYears.labour + h.costOverYears.batteries
		);
		// in-truck changes no batteries
		expect(setup(r, 'in-truck').costOverYears.labour).toBe(0);
	});

	it('ends the cautions with the governing note and includes the OSHA handling items', () => {
		expect(r.cautions[r.cautions.length - 1]).toBe(GOVERNING_NOTE);
		expect(GOVERNING_NOTE).toMatch(
			/Local codes, the truck's nameplate and licensed practice govern/
		);
		const text = r.cautions.join('\n');
		for (const item of [
			'(g)(1)',
			'(g)(2)',
			'(g)(4)',
			'(g)(5)',
			'(g)(7)',
			'(g)(8)',
			'(g)(10)',
			'(g)(11)',
			'(g)(12)'
		]) {
			expect(text).toContain(item);
		}
		expect(text).toMatch(/acid into water/);
		expect(text).toMatch(/eyewash/);
	});

	it('shows imperial first for an imperial user', () => {
		const input = designExample();
		input.units = 'imperial';
		const fork = setup(evaluate(input, catalogue), 'in-truck').checks.find(
			(c) => c.code === 'fork-length'
		)!;
		// 1 150 mm ÷ 25.4 = 45.3 in
		expect(fork.message).toMatch(/45\.3 in \(1 150 mm\)/);
	});
});

describe('verdict rules', () => {
	it('a wrong voltage fits nowhere', () => {
		const input = designExample();
		input.battery.voltage = 36;
		const r = evaluate(input, catalogue);
		for (const s of r.setups) expect(s.verdict).toBe('does-not-fit');
		expect(r.recommended).toBeNull();
	});

	it('a battery below the minimum weight fits nowhere (it is part of the counterweight)', () => {
		const input = designExample();
		input.battery.weightKg = 950;
		for (const s of evaluate(input, catalogue).setups) {
			expect(s.verdict).toBe('does-not-fit');
			expect(s.checks.find((c) => c.code === 'battery-weight')!.limit).toBe(1000);
		}
	});

	it('a battery too long for the compartment fits nowhere', () => {
		const input = designExample();
		input.battery.lengthMm = 1060;
		for (const s of evaluate(input, catalogue).setups) expect(s.verdict).toBe('does-not-fit');
	});

	it('no overhead hoist, or one rated below battery + beam, rules out hoist exchange', () => {
		const none = designExample();
		none.site.crane = null;
		expect(setup(evaluate(none, catalogue), 'overhead-hoist').verdict).toBe('does-not-fit');
		const weak = designExample();
		// ASME B30.20: everything below the hook counts: 1 250 + 90 = 1 340 kg > 1 300 kg
		weak.site.crane = { ratedLoadKg: 1300, beamWeightKg: 90 };
		const s = setup(evaluate(weak, catalogue), 'overhead-hoist');
		expect(s.verdict).toBe('does-not-fit');
		const c = s.checks.find((x) => x.subject === 'hoist')!;
		expect(c).toMatchObject({ result: 'fail', measured: 1300, limit: 1340 });
	});

	it('a hoist without a lifting beam fits with changes: the beam is ordered', () => {
		const input = designExample();
		input.site.crane = { ratedLoadKg: 2000, beamWeightKg: null };
		const s = setup(evaluate(input, catalogue), 'overhead-hoist');
		expect(s.verdict).toBe('fits-with-changes');
		expect(qty(s, 'lifting-beam')).toBe(1);
	});

	it('fixable failures alone give fits-with-changes, and each order is a BOM line', () => {
		const input = designExample();
		input.site.palletTrucks = [];
		input.site.rollerStands = [];
		const r = evaluate(input, catalogue);
		const t = setup(r, 'trolley-stand');
		expect(t.verdict).toBe('fits-with-changes');
		expect(qty(t, 'pallet-truck')).toBe(1);
		const bed = setup(r, 'roller-bed');
		expect(bed.verdict).toBe('fits-with-changes');
		// 12 batteries out of the trucks + 1 empty place
		expect(qty(bed, 'roller-stand')).toBe(13);
	});
});

describe('ranking', () => {
	it('matching roller stands put side transfer first when there is no hoist', () => {
		const input = designExample();
		input.site.crane = null;
		const r = evaluate(input, catalogue);
		expect(r.recommended).toBe('roller-bed');
		expect(setup(r, 'roller-bed').reasons[0]).toMatch(/meet the roller bed/);
	});

	it('otherwise trolley exchange', () => {
		const input = designExample();
		input.site.crane = null;
		input.site.rollerStands = [
			{ rollerTopMm: 260, adjustRangeMm: null, capacityKg: 1800, driveAlongside: false }
		];
		expect(evaluate(input, catalogue).recommended).toBe('trolley-stand');
	});

	it('one battery per truck puts in-truck first when it fits', () => {
		const input = designExample();
		input.operation.shiftsPerDay = 1;
		input.site.palletTrucks = [{ forkLengthMm: 900, overallWidthMm: 520, capacityKg: 2000 }];
		const r = evaluate(input, catalogue);
		expect(r.batteriesPerTruck).toBe(1);
		expect(setup(r, 'in-truck').verdict).toBe('fits');
		expect(r.recommended).toBe('in-truck');
		expect(setup(r, 'in-truck').reasons[0]).toMatch(/one battery per truck covers the day/);
	});

	it('ties go to the lower cost over the years, with the difference in the reasons', () => {
		// one shift, so no exchange is favoured; in-truck ruled out by a catalogue with no short forks
		const input = designExample();
		input.operation.shiftsPerDay = 1;
		input.site.rollerStands = [];
		const noShortForks: EngineCatalogue = {
			items: catalogue.items.filter(
				(i) => !(i.kind === 'pallet-truck' && i.spec.forkLengthMm < 1000)
			)
		};
		const r = evaluate(input, noShortForks);
		expect(setup(r, 'in-truck').verdict).toBe('does-not-fit');
		const ranked = [...r.setups]
			.sort((a, b) => a.rank - b.rank)
			.filter((s) => s.verdict === 'fits');
		expect(ranked.length).toBeGreaterThanOrEqual(2);
		expect(ranked[0].costOverYears.total).toBeLessThanOrEqual(ranked[1].costOverYears.total);
		expect(ranked[1].reasons[0]).toMatch(/more over 5 years than/);
	});
});

// ---------------------------------------------------------------------------------------------
// Properties

function quantities(r: EvaluateResult): Map<string, number> {
	const m = new Map<string, number>();
	for (const s of r.setups) {
		for (const l of s.bom)
			m.set(`${s.id}/${l.kind}/${l.sku}`, (m.get(`${s.id}/${l.kind}/${l.sku}`) ?? 0) + l.quantity);
		for (const [k, v] of Object.entries(s.fleet)) m.set(`${s.id}/fleet/${k}`, v);
	}
	return m;
}

describe('properties (fast-check)', () => {
	it('quantities never drop when trucks rise', () => {
		fc.assert(
			fc.property(plausibleInputArb, fc.integer({ min: 1, max: 40 }), (input, more) => {
				const a = quantities(evaluate(input, catalogue));
				const bigger = { ...input, fleet: { trucks: input.fleet.trucks + more } };
				const b = quantities(evaluate(bigger, catalogue));
				for (const [k, v] of a) expect(b.get(k) ?? 0, k).toBeGreaterThanOrEqual(v);
			}),
			{ numRuns: 300 }
		);
	}, 60_000);

	it('no setup fits when voltage or weight fails', () => {
		fc.assert(
			fc.property(
				inputArb,
				fc.constantFrom('voltage', 'light', 'heavy'),
				fc.double({ min: 0.01, max: 500, noNaN: true }),
				(input, what, off) => {
					const bad: ResolvedInput = structuredClone(input);
					if (what === 'voltage') bad.battery.voltage = bad.truck.voltage + Math.max(1, off);
					else if (what === 'light')
						bad.battery.weightKg = Math.max(0.5, bad.truck.batteryWeightKg.min - Math.max(1, off));
					else bad.battery.weightKg = bad.truck.batteryWeightKg.max + Math.max(1, off);
					if (what === 'light' && bad.battery.weightKg >= bad.truck.batteryWeightKg.min) return;
					for (const s of evaluate(bad, catalogue).setups) {
						expect(s.verdict).toBe('does-not-fit');
					}
				}
			),
			{ numRuns: 300 }
		);
	}, 60_000);

	it('the same site surveyed in inches and pounds, converted, gives the same verdicts', () => {
		// values in tenths of an inch and whole pounds; the metric twin is computed with the exact
		// factors (1 in = 25.4 mm, 1 lb = 0.45359237 kg, NIST SP 811), the imperial one parsed from
		// text. The truck's limits sit within a few tenths of the site's values, often exactly on them.
		const tenths = (min: number, max: number) => fc.integer({ min: min * 10, max: max * 10 });
		const near = fc.integer({ min: -2, max: 2 });
		const demoLike = fc.integer({ min: 1, max: 3 }).map((shifts) => {
			const input = designExample();
			input.operation.shiftsPerDay = shifts;
			return input;
		});
		const arb = fc.record({
			base: fc.oneof(demoLike, plausibleInputArb),
			forkLen: tenths(30, 50),
			forkW: tenths(18, 24),
			ptLb: fc.integer({ min: 1500, max: 6000 }),
			standTop: tenths(6, 11),
			standLb: fc.integer({ min: 1500, max: 6000 }),
			alongside: fc.boolean(),
			svcOff: near,
			latchMinOff: near,
			latchMaxOff: near,
			widthOff: near,
			bedOff: near
		});
		const mm = (tenth: number) => tenth * 2.54;
		fc.assert(
			fc.property(arb, (a) => {
				const metric: ResolvedInput = structuredClone(a.base);
				metric.truck.rollerBedTopMm = mm(a.standTop + a.bedOff);
				metric.truck.forkFit.serviceTrolley = {
					maxLengthMm: mm(a.forkLen + a.svcOff),
					maxOverallWidthMm: mm(a.forkW + a.widthOff)
				};
				metric.truck.forkFit.latchTrolley = {
					minLengthMm: mm(a.forkLen + a.latchMinOff - 2),
					maxLengthMm: mm(a.forkLen + a.latchMaxOff + 2),
					maxOverallWidthMm: mm(a.forkW + a.widthOff)
				};
				metric.site.palletTrucks = [
					{
						forkLengthMm: mm(a.forkLen),
						overallWidthMm: mm(a.forkW),
						capacityKg: a.ptLb * 0.45359237
					}
				];
				metric.site.rollerStands = [
					{
						rollerTopMm: mm(a.standTop),
						adjustRangeMm: null,
						capacityKg: a.standLb * 0.45359237,
						driveAlongside: a.alongside
					}
				];
				const imperial: ResolvedInput = structuredClone(metric);
				const L = (tenth: number) => {
					const r = parseLength(`${tenth / 10} in`, 'imperial');
					if (!r.ok) throw new Error(r.message);
					return r.value;
				};
				const M = (lb: number) => {
					const r = parseMass(`${lb.toLocaleString('en-US')} lb`, 'imperial');
					if (!r.ok) throw new Error(r.message);
					return r.value;
				};
				imperial.site.palletTrucks = [
					{ forkLengthMm: L(a.forkLen), overallWidthMm: L(a.forkW), capacityKg: M(a.ptLb) }
				];
				imperial.site.rollerStands = [
					{
						rollerTopMm: L(a.standTop),
						adjustRangeMm: null,
						capacityKg: M(a.standLb),
						driveAlongside: a.alongside
					}
				];
				imperial.units = 'imperial';
				const vm = evaluate(metric, catalogue).setups.map((s) => s.verdict);
				const vi = evaluate(imperial, catalogue).setups.map((s) => s.verdict);
				expect(vi).toEqual(vm);
			}),
			{ numRuns: 400 }
		);
	}, 60_000);

	it('the defaults are the documented ones', () => {
		// usable share 0.8 lead-acid (common practice), 8 h + 8 h (8-8-8), EBU 1.5 (power-study
		// guidance), 13 mm play (OSHA 1910.178(g)(5) + common practice), f = 2 (EN IEC 62485-3 IU)
		expect(DEFAULT_PARAMS.usableShare['lead-acid']).toBe(0.8);
		expect(DEFAULT_PARAMS.chargeHours['lead-acid'] + DEFAULT_PARAMS.coolHours['lead-acid']).toBe(
			16
		);
		expect(DEFAULT_PARAMS.opportunityEbuLimit).toBe(1.5);
		expect(DEFAULT_PARAMS.maxHorizontalPlayMm).toBe(13);
		expect(DEFAULT_PARAMS.gasFactor.IU).toBe(2);
		// NFPA 1: 1 cfm/ft² = 0.3048 m × 60 min/h = 18.288 m³/h per m²
		expect(DEFAULT_PARAMS.nfpaM3hPerM2).toBeCloseTo(0.3048 * 60, 12);
		expect(DEFAULT_PARAMS.years).toBe(5);
	});
});
