import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { priceQuote, type QuoteInput, type QuoteLineInput } from './pricing';

function line(overrides: Partial<QuoteLineInput>): QuoteLineInput {
	return {
		sku: 'TEST-1',
		description: 'Test line',
		quantity: 1,
		unitListCents: 0,
		unitCostCents: 0,
		lineDiscountBp: 0,
		kind: 'accessory',
		...overrides
	};
}

describe('priceQuote: a worked example, computed by hand', () => {
	// Five lines for a six-truck fleet. Every figure below was worked out on paper; the rule is
	// "round half away from zero, once per line, then once each for the overall discount, the tax
	// and the deposit".
	const input: QuoteInput = {
		lines: [
			// 2 trucks × $12,345.66 at 12.5 % off
			line({
				sku: 'TRK-48-A',
				description: '48 V counterbalance truck',
				kind: 'truck',
				quantity: 2,
				unitListCents: 1_234_566,
				unitCostCents: 1_010_101,
				lineDiscountBp: 1250
			}),
			// 6 roller-bed options × $333.33 at 5 % off
			line({
				sku: 'OPT-RB',
				description: 'Roller bed in the compartment',
				kind: 'setup',
				quantity: 6,
				unitListCents: 33_333,
				unitCostCents: 21_111,
				lineDiscountBp: 500
			}),
			// 5 latch adapters × $18.01 at 10 % off
			line({
				sku: 'ACC-LATCH',
				description: 'Latch adapter for the pallet truck',
				kind: 'accessory',
				quantity: 5,
				unitListCents: 1801,
				unitCostCents: 1000,
				lineDiscountBp: 1000
			}),
			// freight at list
			line({
				sku: 'FRT',
				description: 'Freight to site',
				kind: 'freight',
				quantity: 1,
				unitListCents: 84_986,
				unitCostCents: 80_000,
				lineDiscountBp: 0
			}),
			// 6 service trolleys included at no charge; the 20 % typed on it must be ignored
			line({
				sku: 'OPT-TROLLEY',
				description: 'Service trolley',
				kind: 'setup',
				quantity: 6,
				unitListCents: 12_000,
				unitCostCents: 4500,
				lineDiscountBp: 2000,
				noCharge: true
			})
		],
		overallDiscountBp: 250,
		taxRateBp: 825,
		depositShareBp: 2500
	};
	const priced = priceQuote(input);
	const [trucks, rollerBeds, adapters, freight, trolleys] = priced.lines;

	it('prices each line once, rounding its net half away from zero', () => {
		// trucks: list 2 × 1 234 566 = 2 469 132 ¢
		//   net 2 469 132 × 8 750 / 10 000 = 2 469 132 × 7/8 = 2 160 490.5 → 2 160 491 (the half goes up)
		//   discount 2 469 132 − 2 160 491 = 308 641; cost 2 × 1 010 101 = 2 020 202
		//   margin 2 160 491 − 2 020 202 = 140 289; 140 289 × 10 000 / 2 160 491 = 649.34 → 649 bp
		expect(trucks).toMatchObject({
			listCents: 2_469_132,
			netCents: 2_160_491,
			discountCents: 308_641,
			costCents: 2_020_202,
			marginCents: 140_289,
			marginBp: 649
		});
		// roller beds: list 6 × 33 333 = 199 998; net 199 998 × 0.95 = 189 998.1 → 189 998
		//   discount 10 000; cost 6 × 21 111 = 126 666; margin 63 332
		//   63 332 × 10 000 / 189 998 = 3 333.30 → 3 333 bp
		expect(rollerBeds).toMatchObject({
			listCents: 199_998,
			netCents: 189_998,
			discountCents: 10_000,
			costCents: 126_666,
			marginCents: 63_332,
			marginBp: 3333
		});
		// adapters: list 5 × 1 801 = 9 005; net 9 005 × 0.9 = 8 104.5 → 8 105; discount 900
		//   cost 5 000; margin 3 105; 3 105 × 10 000 / 8 105 = 3 830.97 → 3 831 bp
		expect(adapters).toMatchObject({
			listCents: 9005,
			netCents: 8105,
			discountCents: 900,
			costCents: 5000,
			marginCents: 3105,
			marginBp: 3831
		});
		// freight: net = list = 84 986; margin 4 986; 4 986 × 10 000 / 84 986 = 586.69 → 587 bp
		expect(freight).toMatchObject({
			listCents: 84_986,
			netCents: 84_986,
			discountCents: 0,
			marginCents: 4986,
			marginBp: 587
		});
	});

	it('shows a no-charge line at zero and still counts its cost', () => {
		// list, discount and net all 0; cost 6 × 4 500 = 27 000; margin −27 000; no margin % on 0 ¢
		expect(trolleys).toMatchObject({
			noCharge: true,
			lineDiscountBp: 0,
			listCents: 0,
			discountCents: 0,
			netCents: 0,
			costCents: 27_000,
			marginCents: -27_000,
			marginBp: null
		});
	});

	it('applies the overall discount, tax and deposit each once, on the totals', () => {
		const t = priced.totals;
		// subtotal = 2 160 491 + 189 998 + 8 105 + 84 986 + 0 = 2 443 580
		expect(t.subtotalCents).toBe(2_443_580);
		// list = 2 469 132 + 199 998 + 9 005 + 84 986 + 0 = 2 763 121; line discounts 319 541
		expect(t.listCents).toBe(2_763_121);
		expect(t.lineDiscountCents).toBe(319_541);
		// 2.5 % overall: 2 443 580 × 9 750 / 10 000 = 2 382 490.5 → 2 382 491; discount 61 089
		expect(t.netBeforeTaxCents).toBe(2_382_491);
		expect(t.overallDiscountCents).toBe(61_089);
		// tax 8.25 %: 2 382 491 × 825 / 10 000 = 196 555.5075 → 196 556 (not truncated to …555)
		expect(t.taxCents).toBe(196_556);
		// total 2 382 491 + 196 556 = 2 579 047
		expect(t.totalCents).toBe(2_579_047);
		// deposit 25 %: 2 579 047 / 4 = 644 761.75 → 644 762; balance 1 934 285
		expect(t.depositCents).toBe(644_762);
		expect(t.balanceCents).toBe(1_934_285);
		// cost 2 020 202 + 126 666 + 5 000 + 80 000 + 27 000 = 2 258 868
		expect(t.costCents).toBe(2_258_868);
		// margin 2 382 491 − 2 258 868 = 123 623; 123 623 × 10 000 / 2 382 491 = 518.88 → 519 bp
		expect(t.marginCents).toBe(123_623);
		expect(t.marginBp).toBe(519);
		// effective discount: (2 763 121 − 2 382 491) = 380 630 off list;
		//   380 630 × 10 000 / 2 763 121 = 1 377.54 → 1 378 bp
		expect(t.effectiveDiscountBp).toBe(1378);
		// largest line discount on a charged line: 1 250 (the no-charge line's 2 000 is ignored)
		expect(t.maxLineDiscountBp).toBe(1250);
		expect(t.overallDiscountBp).toBe(250);
		expect(t.taxRateBp).toBe(825);
		expect(t.depositShareBp).toBe(2500);
	});
});

describe('rounding happens per line, not on the total', () => {
	it('two lines that each round a half up add two half cents', () => {
		// each: 5 ¢ × 0.9 = 4.5 → 5 ¢; subtotal 10 ¢. Rounding on the total would give 9 ¢.
		const t = priceQuote({
			lines: [
				line({ unitListCents: 5, lineDiscountBp: 1000 }),
				line({ sku: 'TEST-2', unitListCents: 5, lineDiscountBp: 1000 })
			],
			overallDiscountBp: 0,
			taxRateBp: 0,
			depositShareBp: 0
		}).totals;
		expect(t.subtotalCents).toBe(10);
		expect(t.lineDiscountCents).toBe(0);
	});
	it('a quantity multiplies the unit price before the line is rounded', () => {
		// 3 × 15 ¢ = 45 ¢; 45 × 0.9 = 40.5 → 41 ¢. Rounding the unit first (13.5 → 14) would give 42.
		const [l] = priceQuote({
			lines: [line({ quantity: 3, unitListCents: 15, lineDiscountBp: 1000 })],
			overallDiscountBp: 0,
			taxRateBp: 0,
			depositShareBp: 0
		}).lines;
		expect(l.netCents).toBe(41);
		expect(l.discountCents).toBe(4);
	});
});

describe('each total-level step at its .5 boundary', () => {
	const base = { overallDiscountBp: 0, taxRateBp: 0, depositShareBp: 0 };
	it('overall discount: the net rounds the half up', () => {
		// 1 005 × 0.9 = 904.5 → 905; discount 100
		const t = priceQuote({
			...base,
			lines: [line({ unitListCents: 1005 })],
			overallDiscountBp: 1000
		}).totals;
		expect(t.netBeforeTaxCents).toBe(905);
		expect(t.overallDiscountCents).toBe(100);
	});
	it('tax: half a cent of tax rounds up; just under it rounds down', () => {
		// 1 000 × 825 / 10 000 = 82.5 → 83
		const up = priceQuote({ ...base, lines: [line({ unitListCents: 1000 })], taxRateBp: 825 });
		expect(up.totals.taxCents).toBe(83);
		expect(up.totals.totalCents).toBe(1083);
		// 999 × 825 / 10 000 = 82.4175 → 82
		const down = priceQuote({ ...base, lines: [line({ unitListCents: 999 })], taxRateBp: 825 });
		expect(down.totals.taxCents).toBe(82);
	});
	it('tax is on the discounted subtotal, not on list', () => {
		// list 10 000, 10 % overall → 9 000; 5 % tax → 450 (on list it would be 500)
		const t = priceQuote({
			...base,
			lines: [line({ unitListCents: 10_000 })],
			overallDiscountBp: 1000,
			taxRateBp: 500
		}).totals;
		expect(t.taxCents).toBe(450);
		expect(t.totalCents).toBe(9450);
	});
	it('deposit: half a cent rounds up, on the total including tax', () => {
		// total 1 001 (no tax); 50 % = 500.5 → 501; balance 500
		const t = priceQuote({
			...base,
			lines: [line({ unitListCents: 1001 })],
			depositShareBp: 5000
		}).totals;
		expect(t.depositCents).toBe(501);
		expect(t.balanceCents).toBe(500);
		// 2 000 + 10 % tax = 2 200; 30 % deposit = 660
		const withTax = priceQuote({
			...base,
			lines: [line({ unitListCents: 2000 })],
			taxRateBp: 1000,
			depositShareBp: 3000
		}).totals;
		expect(withTax.depositCents).toBe(660);
	});
});

describe('margin and effective discount', () => {
	const base = { overallDiscountBp: 0, taxRateBp: 0, depositShareBp: 0 };
	it('margin is (net − cost) / net, after the overall discount and before tax', () => {
		// list 10 000, cost 7 000, 10 % overall → net 9 000; margin 2 000 = 2 222.2 bp → 2 222
		const t = priceQuote({
			...base,
			lines: [line({ unitListCents: 10_000, unitCostCents: 7000 })],
			overallDiscountBp: 1000,
			taxRateBp: 700
		}).totals;
		expect(t.marginCents).toBe(2000);
		expect(t.marginBp).toBe(2222);
	});
	it('a loss shows as a negative margin', () => {
		// net 1 000, cost 1 200 → −200 = −2 000 bp
		const t = priceQuote({
			...base,
			lines: [line({ unitListCents: 1000, unitCostCents: 1200 })]
		}).totals;
		expect(t.marginCents).toBe(-200);
		expect(t.marginBp).toBe(-2000);
	});
	it('line and overall discounts compound into the effective discount', () => {
		// 10 % then 5 %: 10 000 → 9 000 → 8 550; 1 450 off list = 1 450 bp (not 1 500)
		const t = priceQuote({
			...base,
			lines: [line({ unitListCents: 10_000, lineDiscountBp: 1000 })],
			overallDiscountBp: 500
		}).totals;
		expect(t.netBeforeTaxCents).toBe(8550);
		expect(t.effectiveDiscountBp).toBe(1450);
		expect(t.maxLineDiscountBp).toBe(1000);
	});
	it('a line with no quantity does not set the largest line discount', () => {
		const t = priceQuote({
			...base,
			lines: [
				line({ unitListCents: 10_000, lineDiscountBp: 500 }),
				line({ sku: 'TEST-2', quantity: 0, unitListCents: 10_000, lineDiscountBp: 4000 })
			]
		}).totals;
		expect(t.maxLineDiscountBp).toBe(500);
		expect(t.listCents).toBe(10_000);
	});
	it('a 100 % line discount leaves a zero net with no margin percentage', () => {
		const [l] = priceQuote({
			...base,
			lines: [line({ unitListCents: 5000, unitCostCents: 3000, lineDiscountBp: 10_000 })]
		}).lines;
		expect(l.netCents).toBe(0);
		expect(l.discountCents).toBe(5000);
		expect(l.marginCents).toBe(-3000);
		expect(l.marginBp).toBeNull();
	});
	it('an empty quote is all zeros', () => {
		const t = priceQuote({ ...base, lines: [], taxRateBp: 825, depositShareBp: 3000 }).totals;
		expect(t).toMatchObject({
			listCents: 0,
			subtotalCents: 0,
			netBeforeTaxCents: 0,
			taxCents: 0,
			totalCents: 0,
			depositCents: 0,
			costCents: 0,
			marginCents: 0,
			marginBp: null,
			effectiveDiscountBp: 0,
			maxLineDiscountBp: 0
		});
	});
});

describe('refuses input a form should never let through', () => {
	const base = { overallDiscountBp: 0, taxRateBp: 0, depositShareBp: 0 };
	it.each([
		[{ quantity: -1 }, /Line "TEST-1": quantity must not be negative/],
		[{ quantity: 1.5 }, /Line "TEST-1": quantity must be a whole number/],
		[{ unitListCents: 12.34 }, /unit list price must be a whole number/],
		[{ unitCostCents: -5 }, /unit cost must not be negative/],
		[{ lineDiscountBp: 10_001 }, /discount must be between 0 and 10000/],
		[{ lineDiscountBp: -1 }, /discount must be between 0 and 10000/],
		[{ kind: 'gift' as never }, /unknown kind "gift"/]
	])('line %o', (overrides, messagePattern) => {
		expect(() => priceQuote({ ...base, lines: [line(overrides)] })).toThrow(messagePattern);
	});
	it('rates outside 0 … 10 000 bp', () => {
		expect(() => priceQuote({ ...base, lines: [], overallDiscountBp: 10_001 })).toThrow(
			/Overall discount/
		);
		expect(() => priceQuote({ ...base, lines: [], taxRateBp: -1 })).toThrow(/Tax rate/);
		expect(() => priceQuote({ ...base, lines: [], depositShareBp: 0.5 })).toThrow(/Deposit share/);
	});
	it('amounts too large to keep exact', () => {
		expect(() =>
			priceQuote({ ...base, lines: [line({ quantity: 10_000, unitListCents: 2 ** 50 })] })
		).toThrow(/too large/);
	});
});

describe('totals always add up (property)', () => {
	const lineArb = fc.record({
		sku: fc.constant('P'),
		description: fc.constant('P'),
		quantity: fc.integer({ min: 0, max: 50 }),
		unitListCents: fc.integer({ min: 0, max: 10_000_000 }),
		unitCostCents: fc.integer({ min: 0, max: 10_000_000 }),
		lineDiscountBp: fc.integer({ min: 0, max: 10_000 }),
		kind: fc.constantFrom('truck' as const, 'setup' as const, 'accessory' as const),
		noCharge: fc.boolean()
	});
	it('list − discounts = net; net + tax = total; deposit + balance = total', () => {
		fc.assert(
			fc.property(
				fc.array(lineArb, { maxLength: 12 }),
				fc.integer({ min: 0, max: 10_000 }),
				fc.integer({ min: 0, max: 2000 }),
				fc.integer({ min: 0, max: 10_000 }),
				(lines, overallDiscountBp, taxRateBp, depositShareBp) => {
					const { lines: priced, totals: t } = priceQuote({
						lines,
						overallDiscountBp,
						taxRateBp,
						depositShareBp
					});
					for (const l of priced) {
						expect(l.listCents - l.discountCents).toBe(l.netCents);
						// the rounded net is within half a cent of the exact one
						const exact = BigInt(l.listCents) * BigInt(10_000 - l.lineDiscountBp);
						const error = BigInt(l.netCents) * 10_000n - exact;
						expect(error >= -5000n && error <= 5000n).toBe(true);
					}
					expect(t.listCents - t.lineDiscountCents - t.overallDiscountCents).toBe(
						t.netBeforeTaxCents
					);
					expect(t.netBeforeTaxCents + t.taxCents).toBe(t.totalCents);
					expect(t.depositCents + t.balanceCents).toBe(t.totalCents);
					expect(t.netBeforeTaxCents - t.costCents).toBe(t.marginCents);
					expect(t.netBeforeTaxCents).toBeLessThanOrEqual(t.subtotalCents);
				}
			)
		);
	});
});
