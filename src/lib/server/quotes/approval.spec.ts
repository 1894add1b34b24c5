import { describe, expect, it } from 'vitest';
import { needsApproval, type ApprovalFigures } from './approval';
import { priceQuote } from './pricing';

// A policy like a dealer's settings page would hold: reps may give up to 15 %, margin floor 12 %.
const policy = { repDiscountAuthorityBp: 1500, marginFloorBp: 1200 };
const within: ApprovalFigures = {
	maxLineDiscountBp: 1000,
	effectiveDiscountBp: 1000,
	marginBp: 2000
};

describe('needsApproval at its boundaries', () => {
	it('needs nothing when everything is within the rep authority and above the floor', () => {
		expect(needsApproval(within, policy)).toEqual({ required: false, reasons: [] });
	});

	it('a line discount equal to the authority is allowed; one basis point over is not', () => {
		expect(needsApproval({ ...within, maxLineDiscountBp: 1500 }, policy).required).toBe(false);
		expect(needsApproval({ ...within, maxLineDiscountBp: 1501 }, policy)).toEqual({
			required: true,
			reasons: ["A line discount of 15.01% is above the rep's discount authority of 15%."]
		});
	});

	it('a whole-quote discount equal to the authority is allowed; one basis point over is not', () => {
		expect(needsApproval({ ...within, effectiveDiscountBp: 1500 }, policy).required).toBe(false);
		expect(needsApproval({ ...within, effectiveDiscountBp: 1501 }, policy)).toEqual({
			required: true,
			reasons: [
				"The discount off list for the whole quote, 15.01%, is above the rep's discount authority of 15%."
			]
		});
	});

	it('a margin exactly at the floor is allowed; one basis point under is not', () => {
		expect(needsApproval({ ...within, marginBp: 1200 }, policy).required).toBe(false);
		expect(needsApproval({ ...within, marginBp: 1199 }, policy)).toEqual({
			required: true,
			reasons: ['The margin of 11.99% is below the company floor of 12%.']
		});
	});

	it('a negative margin is below any floor, even a zero one', () => {
		const decision = needsApproval(
			{ ...within, marginBp: -250 },
			{ repDiscountAuthorityBp: 1500, marginFloorBp: 0 }
		);
		expect(decision.reasons).toEqual(['The margin of -2.5% is below the company floor of 0%.']);
	});

	it('a quote with no net price cannot show a margin and goes to a manager', () => {
		const decision = needsApproval({ ...within, marginBp: null }, policy);
		expect(decision.required).toBe(true);
		expect(decision.reasons[0]).toMatch(/no net price/);
	});

	it('lists every reason, in a fixed order', () => {
		const decision = needsApproval(
			{ maxLineDiscountBp: 2000, effectiveDiscountBp: 1800, marginBp: 500 },
			policy
		);
		expect(decision.required).toBe(true);
		expect(decision.reasons).toHaveLength(3);
		expect(decision.reasons[0]).toMatch(/^A line discount of 20%/);
		expect(decision.reasons[1]).toMatch(/whole quote, 18%/);
		expect(decision.reasons[2]).toMatch(/margin of 5%/);
	});

	it('a rep with no discount authority needs approval for any discount at all', () => {
		const none = { repDiscountAuthorityBp: 0, marginFloorBp: 0 };
		expect(
			needsApproval({ maxLineDiscountBp: 0, effectiveDiscountBp: 0, marginBp: 100 }, none).required
		).toBe(false);
		expect(
			needsApproval({ maxLineDiscountBp: 1, effectiveDiscountBp: 1, marginBp: 100 }, none).required
		).toBe(true);
	});
});

describe('needsApproval on a priced quote', () => {
	it('reads the totals of priceQuote directly', () => {
		// 10 % on the line then 5 % overall: 10 000 → 9 000 → 8 550, effective 1 450 bp (≤ 1 500);
		// cost 7 600: margin 950 / 8 550 = 1 111.1 bp → 1 111, under the 1 200 floor
		const { totals } = priceQuote({
			lines: [
				{
					sku: 'TRK',
					description: 'Truck',
					kind: 'truck',
					quantity: 1,
					unitListCents: 10_000,
					unitCostCents: 7600,
					lineDiscountBp: 1000
				}
			],
			overallDiscountBp: 500,
			taxRateBp: 0,
			depositShareBp: 0
		});
		expect(totals.effectiveDiscountBp).toBe(1450);
		expect(totals.marginBp).toBe(1111);
		expect(needsApproval(totals, policy)).toEqual({
			required: true,
			reasons: ['The margin of 11.11% is below the company floor of 12%.']
		});
	});
});
