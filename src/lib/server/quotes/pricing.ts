/**
 * Quote pricing: lines and totals in integer cents, rates in whole basis points (1 % = 100 bp).
 * Pure: no framework, database or SDK imports.
 *
 * Rounding rule (the only places a quote is rounded; each is half away from zero, see money.ts):
 * 1. per line, once: net = round(quantity × unit list × (10 000 − line discount bp) / 10 000);
 *    the line's discount is what is left, list − net (so at an exact half cent the net rounds up and
 *    the discount is half a cent smaller);
 * 2. overall discount, once, on the sum of the line nets (the subtotal):
 *    net before tax = round(subtotal × (10 000 − overall bp) / 10 000), overall discount = the rest;
 * 3. tax, once, on the discounted subtotal: tax = round(net before tax × tax bp / 10 000);
 * 4. deposit, once, on the total: deposit = round(total × deposit share bp / 10 000).
 * Costs are never rounded: quantity × unit cost is exact.
 * Ratios (margin, effective discount) are reported in whole bp, rounded the same way, so the figure
 * a person sees (two decimals of a percent) is the figure the approval rule compares.
 */
import { BP_PER_UNIT, applyDiscount, assertWhole, percentOf, ratioBp } from '../../money';

/** What a quote line is; the same kinds name price-book items. */
export const LINE_KINDS = [
	'truck',
	'setup',
	'accessory',
	'freight',
	'installation',
	'battery',
	'charger'
] as const;
export type LineKind = (typeof LINE_KINDS)[number];

export interface QuoteLineInput {
	sku: string;
	description: string;
	/** whole units, ≥ 0 */
	quantity: number;
	/** list price of one unit, cents, ≥ 0 (from the quote's price-book version) */
	unitListCents: number;
	/** dealer's cost of one unit, cents, ≥ 0 */
	unitCostCents: number;
	/** discount on this line, basis points, 0 … 10 000 */
	lineDiscountBp: number;
	kind: LineKind;
	/**
	 * Included at no charge (a setup option that comes with the truck): the line is shown at zero,
	 * adds nothing to list, discount or net, and its cost still counts against the margin.
	 */
	noCharge?: boolean;
}

export interface QuoteInput {
	lines: readonly QuoteLineInput[];
	/** discount on the sum of the line nets, basis points, 0 … 10 000 */
	overallDiscountBp: number;
	/** sales tax rate of the site's region, basis points (8.25 % = 825 bp), 0 … 10 000 */
	taxRateBp: number;
	/** share of the total asked as a deposit, basis points, 0 … 10 000 */
	depositShareBp: number;
}

export interface PricedLine {
	sku: string;
	description: string;
	kind: LineKind;
	quantity: number;
	noCharge: boolean;
	/** cents, as given */
	unitListCents: number;
	/** cents, as given */
	unitCostCents: number;
	/** discount applied to this line, bp (0 on a no-charge line) */
	lineDiscountBp: number;
	/** quantity × unit list, cents (0 on a no-charge line) */
	listCents: number;
	/** list − net, cents */
	discountCents: number;
	/** round(list × (10 000 − bp) / 10 000), cents */
	netCents: number;
	/** quantity × unit cost, cents */
	costCents: number;
	/** net − cost, cents */
	marginCents: number;
	/** (net − cost) / net in bp, rounded half away from zero; null when the net is 0 */
	marginBp: number | null;
}

export interface QuoteTotals {
	/** Σ line list, cents */
	listCents: number;
	/** Σ line discounts, cents */
	lineDiscountCents: number;
	/** Σ line nets, cents */
	subtotalCents: number;
	/** the overall discount as given, bp */
	overallDiscountBp: number;
	/** subtotal − net before tax, cents */
	overallDiscountCents: number;
	/** round(subtotal × (10 000 − overall bp) / 10 000), cents: the revenue the margin is taken on */
	netBeforeTaxCents: number;
	/** the tax rate as given, bp */
	taxRateBp: number;
	/** round(net before tax × tax bp / 10 000), cents */
	taxCents: number;
	/** net before tax + tax, cents */
	totalCents: number;
	/** the deposit share as given, bp */
	depositShareBp: number;
	/** round(total × deposit share bp / 10 000), cents */
	depositCents: number;
	/** total − deposit, cents: due on delivery */
	balanceCents: number;
	/** Σ line cost, cents */
	costCents: number;
	/** net before tax − cost, cents */
	marginCents: number;
	/** margin / net before tax, bp, rounded half away from zero; null when the net is 0 */
	marginBp: number | null;
	/** (list − net before tax) / list, bp, rounded half away from zero; 0 when the list is 0 */
	effectiveDiscountBp: number;
	/** the largest line discount on a charged line with a quantity, bp; 0 when there is none */
	maxLineDiscountBp: number;
}

export interface PricedQuote {
	lines: PricedLine[];
	totals: QuoteTotals;
}

function checkCents(value: number, what: string): void {
	assertWhole(value, what);
	if (value < 0) throw new RangeError(`${what} must not be negative, got ${value}.`);
}

function checkBp(value: number, what: string): void {
	assertWhole(value, what);
	if (value < 0 || value > BP_PER_UNIT) {
		throw new RangeError(
			`${what} must be between 0 and ${BP_PER_UNIT} basis points, got ${value}.`
		);
	}
}

function safeProduct(a: number, b: number, what: string): number {
	const product = BigInt(a) * BigInt(b);
	if (product > BigInt(Number.MAX_SAFE_INTEGER)) {
		throw new RangeError(`${what} is too large to handle exactly.`);
	}
	return Number(product);
}

function safeSum(values: readonly number[], what: string): number {
	const sum = values.reduce((acc, value) => acc + value, 0);
	if (!Number.isSafeInteger(sum)) throw new RangeError(`${what} is too large to handle exactly.`);
	return sum;
}

/** Price one line by the per-line rule (see the module comment). */
export function priceLine(line: QuoteLineInput): PricedLine {
	const where = `Line "${line.sku}"`;
	if (!(LINE_KINDS as readonly string[]).includes(line.kind)) {
		throw new RangeError(`${where}: unknown kind "${line.kind}".`);
	}
	checkCents(line.quantity, `${where}: quantity`);
	checkCents(line.unitListCents, `${where}: unit list price`);
	checkCents(line.unitCostCents, `${where}: unit cost`);
	checkBp(line.lineDiscountBp, `${where}: discount`);

	const noCharge = line.noCharge === true;
	const listCents = noCharge ? 0 : safeProduct(line.quantity, line.unitListCents, `${where}: list`);
	const lineDiscountBp = noCharge ? 0 : line.lineDiscountBp;
	const netCents = applyDiscount(listCents, lineDiscountBp);
	const costCents = safeProduct(line.quantity, line.unitCostCents, `${where}: cost`);
	const marginCents = netCents - costCents;
	return {
		sku: line.sku,
		description: line.description,
		kind: line.kind,
		quantity: line.quantity,
		noCharge,
		unitListCents: line.unitListCents,
		unitCostCents: line.unitCostCents,
		lineDiscountBp,
		listCents,
		discountCents: listCents - netCents,
		netCents,
		costCents,
		marginCents,
		marginBp: ratioBp(marginCents, netCents)
	};
}

/**
 * Price a quote: every line by the per-line rule, then the overall discount, tax and deposit, each
 * rounded once (the rule is in this module's comment). All amounts are cents, all rates bp.
 * Throws a RangeError naming the line for input no form should let through (a negative or
 * fractional quantity or amount, a rate outside 0 … 10 000 bp, an unknown kind).
 */
export function priceQuote(input: QuoteInput): PricedQuote {
	checkBp(input.overallDiscountBp, 'Overall discount');
	checkBp(input.taxRateBp, 'Tax rate');
	checkBp(input.depositShareBp, 'Deposit share');

	const lines = input.lines.map(priceLine);
	const listCents = safeSum(
		lines.map((l) => l.listCents),
		'The list total'
	);
	const subtotalCents = safeSum(
		lines.map((l) => l.netCents),
		'The subtotal'
	);
	const costCents = safeSum(
		lines.map((l) => l.costCents),
		'The cost total'
	);
	const netBeforeTaxCents = applyDiscount(subtotalCents, input.overallDiscountBp);
	const taxCents = percentOf(netBeforeTaxCents, input.taxRateBp);
	const totalCents = netBeforeTaxCents + taxCents;
	const depositCents = percentOf(totalCents, input.depositShareBp);
	const marginCents = netBeforeTaxCents - costCents;

	const charged = lines.filter((l) => !l.noCharge && l.quantity > 0);
	return {
		lines,
		totals: {
			listCents,
			lineDiscountCents: listCents - subtotalCents,
			subtotalCents,
			overallDiscountBp: input.overallDiscountBp,
			overallDiscountCents: subtotalCents - netBeforeTaxCents,
			netBeforeTaxCents,
			taxRateBp: input.taxRateBp,
			taxCents,
			totalCents,
			depositShareBp: input.depositShareBp,
			depositCents,
			balanceCents: totalCents - depositCents,
			costCents,
			marginCents,
			marginBp: ratioBp(marginCents, netBeforeTaxCents),
			effectiveDiscountBp: ratioBp(listCents - netBeforeTaxCents, listCents) ?? 0,
			maxLineDiscountBp: charged.reduce((max, l) => Math.max(max, l.lineDiscountBp), 0)
		}
	};
}
