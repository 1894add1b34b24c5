/**
 * Facts of the trade (issue 3), each marked with its source; most are common practice.
 * Lengths are typed in inches, the way a US survey records them, and converted with the exact
 * factor (1 in = 25.4 mm, NIST SP 811 App. B).
 */
import { describe, it, expect } from 'vitest';
import catalogueFile from '../../../../seed-data/catalogue.json';
import { parseLength } from '../../units';
import { fromCatalogueFile, type CatalogueFile } from './catalogue';
import { evaluate } from './evaluate';
import { designExample } from './fixtures';
import type { Check, EvaluateResult, ResolvedInput, SetupId, SetupResult } from './types';

const { catalogue } = fromCatalogueFile(catalogueFile as CatalogueFile);

function inch(text: string): number {
	const r = parseLength(`${text} in`);
	if (!r.ok) throw new Error(r.message);
	return r.value;
}
function setup(r: EvaluateResult, id: SetupId): SetupResult {
	return r.setups.find((s) => s.id === id)!;
}
function check(s: SetupResult, code: Check['code'], subject?: string): Check {
	const c = s.checks.find(
		(x) => x.code === code && (subject === undefined || x.subject === subject)
	);
	if (!c) throw new Error(`no ${code} check on ${s.id}`);
	return c;
}

/** A truck whose fork channels are given in inches; the rest from the DESIGN.md example. */
function inchTruck(): ResolvedInput {
	const input = designExample();
	input.truck.forkFit = {
		// common practice: service trolley channels take forks up to 35.5 in, 20.5 in over the forks
		serviceTrolley: { maxLengthMm: inch('35.5'), maxOverallWidthMm: inch('20.5') },
		// a latch adapter built round the common 43.3 in (1 100 mm) fork
		latchTrolley: {
			minLengthMm: inch('42.5'),
			maxLengthMm: inch('44'),
			maxOverallWidthMm: inch('21.5')
		}
	};
	// common practice: 43.3 in (1 100 mm) forks, 20.5 in over the forks
	input.site.palletTrucks = [
		{ forkLengthMm: inch('43.3'), overallWidthMm: inch('20.5'), capacityKg: 2000 }
	];
	return input;
}

describe('fork fit (common practice)', () => {
	it('a service-trolley compartment taking forks up to 35.5 in flags 43.3 in forks as hitting the far frame', () => {
		const r = evaluate(inchTruck(), catalogue);
		const c = check(setup(r, 'in-truck'), 'fork-length');
		expect(c.result).toBe('fail');
		// 43.3 in = 1 099.82 mm; 35.5 in = 901.7 mm (1 in = 25.4 mm, NIST SP 811)
		expect(c.measured).toBeCloseTo(1099.82, 9);
		expect(c.limit).toBeCloseTo(901.7, 9);
		expect(c.message).toMatch(/43\.3 in/);
		expect(c.message).toMatch(/35\.5 in/);
		expect(c.message).toMatch(/far side of the frame/);
		// 20.5 in over the forks enters the 20.5 in channels
		expect(check(setup(r, 'in-truck'), 'fork-width').result).toBe('pass');
		// a shorter pallet truck from the catalogue is the remedy, and a BOM line
		expect(c.fixable).toBe(true);
		expect(c.remedy).toMatch(/at most 902 mm \(35\.5 in\)/);
		expect(setup(r, 'in-truck').bom.some((l) => l.kind === 'pallet-truck')).toBe(true);
	});

	it('latching-trolley exchange uses 43.3 in forks, 20.5 in over the forks', () => {
		const r = evaluate(inchTruck(), catalogue);
		for (const id of ['trolley-stand', 'overhead-hoist'] as const) {
			const s = setup(r, id);
			expect(check(s, 'fork-length').result).toBe('pass');
			expect(check(s, 'fork-width').result).toBe('pass');
			expect(s.bom.some((l) => l.kind === 'pallet-truck')).toBe(false);
		}
	});
});

describe('roller height (common practice)', () => {
	function withBed(
		bedIn: string,
		stand: { top?: string; range?: [string, string] }
	): ResolvedInput {
		const input = designExample();
		input.truck.rollerBedTopMm = inch(bedIn);
		input.site.rollerStands = [
			{
				rollerTopMm: inch(stand.top ?? stand.range![0]),
				adjustRangeMm: stand.range
					? { minMm: inch(stand.range[0]), maxMm: inch(stand.range[1]) }
					: null,
				capacityKg: 1800,
				driveAlongside: false
			}
		];
		return input;
	}

	it('a roller bed 8 in above the floor matches 8 in stands', () => {
		const c = check(
			setup(evaluate(withBed('8', { top: '8' }), catalogue), 'roller-bed'),
			'roller-height'
		);
		expect(c.result).toBe('pass');
		// 8 in = 203.2 mm
		expect(c.limit).toBeCloseTo(203.2, 9);
	});

	it('and flags fixed stands an inch off, either way', () => {
		for (const top of ['9', '7']) {
			const r = evaluate(withBed('8', { top }), catalogue);
			const c = check(setup(r, 'roller-bed'), 'roller-height');
			expect(c.result).toBe('fail');
			// 1 in = 25.4 mm apart
			expect(c.message).toMatch(/25 mm \(1\.0 in\)/);
			// adjustable stands from the catalogue fix it: fits with changes, stands on the BOM
			expect(c.fixable).toBe(true);
			expect(setup(r, 'roller-bed').bom.some((l) => l.kind === 'roller-stand')).toBe(true);
		}
	});

	it('adjustable stands whose range spans the roller bed match', () => {
		const c = check(
			setup(evaluate(withBed('8', { range: ['7', '9'] }), catalogue), 'roller-bed'),
			'roller-height'
		);
		expect(c.result).toBe('pass');
	});
});

describe('roller bed lowers the compartment (common practice)', () => {
	it('a roller bed that lowers the compartment to 23.4 in rejects a taller battery the plain compartment takes', () => {
		const input = designExample();
		input.truck.compartment.heightMm = inch('25');
		input.truck.compartment.heightWithRollerBedMm = inch('23.4');
		input.battery.heightMm = inch('24');
		const r = evaluate(input, catalogue);
		expect(check(setup(r, 'in-truck'), 'compartment-fit', 'height').result).toBe('pass');
		expect(check(setup(r, 'trolley-stand'), 'compartment-fit', 'height').result).toBe('pass');
		const bed = check(setup(r, 'roller-bed'), 'compartment-fit', 'height');
		expect(bed.result).toBe('fail');
		// 23.4 in = 594.36 mm; 24 in = 609.6 mm
		expect(bed.limit).toBeCloseTo(594.36, 9);
		expect(bed.measured).toBeCloseTo(609.6, 9);
		expect(bed.message).toMatch(/roller bed lowers/);
		expect(setup(r, 'roller-bed').verdict).toBe('does-not-fit');
	});
});

describe('door swing (common practice)', () => {
	function doors(standard: number, wide: number): EvaluateResult {
		const input = designExample();
		input.truck.doorSwingDeg = standard;
		input.truck.wideDoorSwingDeg = wide;
		// DESIGN.md example stand: rollers at the bed's 215 mm, drives alongside
		return evaluate(input, catalogue);
	}

	it('a standard door of about 135° with drive-alongside gear asks for the 175° door or the side cover', () => {
		const r = doors(135, 175);
		const s = setup(r, 'roller-bed');
		const c = check(s, 'door-swing');
		expect(c.result).toBe('fail');
		expect(c.measured).toBe(135);
		expect(c.remedy).toMatch(/wide-swing door \(175°/);
		expect(c.remedy).toMatch(/side cover/);
		expect(s.verdict).toBe('fits-with-changes');
		// the order is a BOM line, one per truck
		const line = s.bom.find((l) => l.kind === 'wide-door')!;
		expect(line.quantity).toBe(6);
	});

	it('a door that already folds back clears the gear', () => {
		expect(check(setup(doors(180, 180), 'roller-bed'), 'door-swing').result).toBe('pass');
	});

	it('gear that does not drive alongside needs no door change', () => {
		const input = designExample();
		input.site.rollerStands[0].driveAlongside = false;
		expect(check(setup(evaluate(input, catalogue), 'roller-bed'), 'door-swing').result).toBe(
			'pass'
		);
	});

	it('when the wide door does not open far enough, the side cover is ordered', () => {
		const s = setup(doors(135, 150), 'roller-bed');
		expect(check(s, 'door-swing').remedy).toMatch(/side cover/);
		expect(s.bom.some((l) => l.kind === 'side-cover')).toBe(true);
		expect(s.bom.some((l) => l.kind === 'wide-door')).toBe(false);
	});
});

describe('trolleys and stands per battery (common practice)', () => {
	function count(r: EvaluateResult, id: SetupId, kind: string): number {
		return setup(r, id).bom.find((l) => l.kind === kind)?.quantity ?? 0;
	}

	it('one more stand and latching trolley per additional battery for trolley exchange, none for hoist exchange', () => {
		const two = designExample();
		two.operation.shiftsPerDay = 2;
		const r2 = evaluate(two, catalogue);
		const r3 = evaluate(designExample(), catalogue);
		// 8-8-8 (common practice): two shifts → 2 batteries per truck, three → 3
		expect(r2.batteriesPerTruck).toBe(2);
		expect(r3.batteriesPerTruck).toBe(3);
		// one more battery for each of 6 trucks
		expect(
			count(r3, 'trolley-stand', 'latch-trolley') - count(r2, 'trolley-stand', 'latch-trolley')
		).toBe(6);
		expect(
			count(r3, 'trolley-stand', 'exchange-stand') - count(r2, 'trolley-stand', 'exchange-stand')
		).toBe(6);
		// the latching trolley stays with the truck under the hoist: one per truck either way
		expect(count(r2, 'overhead-hoist', 'latch-trolley')).toBe(6);
		expect(count(r3, 'overhead-hoist', 'latch-trolley')).toBe(6);
	});

	it('the latch adapter is on the BOM with its reason even with a hoist', () => {
		const r = evaluate(designExample(), catalogue);
		const line = setup(r, 'overhead-hoist').bom.find((l) => l.kind === 'latch-adapter')!;
		expect(line.quantity).toBe(1);
		expect(line.reason).toMatch(/sit loose on the forks/);
	});
});

describe('retrofit kit (common practice)', () => {
	it('a 2-roller service trolley can later be converted to a latching one with a retrofit kit', () => {
		const r = evaluate(designExample(), catalogue);
		const s = setup(r, 'in-truck');
		expect(s.bom.find((l) => l.kind === 'service-trolley')!.quantity).toBe(6);
		const kit = s.options.find((l) => l.kind === 'retrofit-kit')!;
		expect(kit.quantity).toBe(6);
		expect(kit.sku).not.toBeNull();
		expect(kit.reason).toMatch(/latching trolley/);
		// an option, not in the cost
		const bomTotal = s.bom.reduce((sum, l) => sum + l.lineTotalCents, 0);
		expect(s.costOverYears.equipment + s.costOverYears.batteries).toBe(bomTotal);
	});
});

describe('horizontal play (OSHA 1910.178(g)(5); 13 mm common practice)', () => {
	it('warns that spacers are needed beyond 13 mm and passes within it', () => {
		const input = designExample();
		// DESIGN.md example: 1 050 − 1 000 = 50 mm of play along the length
		const play = check(
			setup(evaluate(input, catalogue), 'trolley-stand'),
			'compartment-fit',
			'play'
		);
		expect(play.result).toBe('warn');
		expect(play.measured).toBe(50);
		expect(play.remedy).toMatch(/spacers/);
		input.battery.lengthMm = 1040;
		input.battery.widthMm = 850;
		// 10 mm either way ≤ 13 mm
		expect(
			check(setup(evaluate(input, catalogue), 'trolley-stand'), 'compartment-fit', 'play').result
		).toBe('pass');
	});
});
