/**
 * Money: integer minor units (cents) end to end, shared by the server and the browser.
 *
 * - Amounts are JavaScript integers in cents (`number`, always `Number.isSafeInteger`). A float never
 *   holds a price: typed text is parsed digit by digit, and products are computed with `bigint`.
 * - Rates (discounts, tax, deposit share, margin) are whole basis points: 1 % = 100 bp,
 *   100 % = 10 000 bp, so every rate is an integer too.
 * - Rounding rule, used everywhere money or a ratio is rounded: **to the nearest whole unit, half away
 *   from zero** (12.5 → 13, −12.5 → −13). We chose it over banker's rounding because it is the rule a
 *   customer checking a quote with a calculator or on paper applies, and a quote rounds only a handful
 *   of times (once per line, then on the total), so the small upward bias of halves does not add up.
 */

/** Basis points in one whole: 10 000 bp = 100 %. */
export const BP_PER_UNIT = 10_000;

/** Largest amount in cents the helpers accept (Number.MAX_SAFE_INTEGER, about 90 trillion dollars). */
export const MAX_CENTS = Number.MAX_SAFE_INTEGER;

/**
 * Divide two integers and round the quotient to the nearest integer, half away from zero.
 * Exact for any size: works on `bigint`. `denominator` must not be zero.
 */
export function divideRounded(numerator: bigint, denominator: bigint): bigint {
	if (denominator === 0n) throw new RangeError('Cannot divide by zero.');
	const negative = numerator < 0n !== denominator < 0n;
	const n = numerator < 0n ? -numerator : numerator;
	const d = denominator < 0n ? -denominator : denominator;
	// floor((2n + d) / 2d) = floor(n/d + 1/2): rounds a remainder of exactly one half upwards
	const q = (2n * n + d) / (2n * d);
	return negative ? -q : q;
}

/** Throws a RangeError unless `value` is a safe integer (a whole number of cents or basis points). */
export function assertWhole(value: number, what: string): void {
	if (!Number.isSafeInteger(value)) {
		throw new RangeError(`${what} must be a whole number, got ${String(value)}.`);
	}
}

function toSafeNumber(value: bigint, what: string): number {
	if (value > BigInt(MAX_CENTS) || value < -BigInt(MAX_CENTS)) {
		throw new RangeError(`${what} is too large to handle exactly.`);
	}
	return Number(value);
}

/**
 * `basisPoints` of `cents`, in cents: round(cents × bp / 10 000), half away from zero.
 * Example: 8.25 % (825 bp) of $10.00 (1 000 ¢) = 82.5 ¢ → 83 ¢; of −1 000 ¢ → −83 ¢.
 * Both arguments must be whole numbers; either may be negative or (for bp) above 10 000.
 */
export function percentOf(cents: number, basisPoints: number): number {
	assertWhole(cents, 'An amount in cents');
	assertWhole(basisPoints, 'A rate in basis points');
	return toSafeNumber(
		divideRounded(BigInt(cents) * BigInt(basisPoints), BigInt(BP_PER_UNIT)),
		'The result'
	);
}

/**
 * `cents` after a discount of `discountBp` basis points, in cents:
 * round(cents × (10 000 − bp) / 10 000), half away from zero. The net is what gets rounded, so at an
 * exact half cent the customer pays the half cent up and the discount is half a cent smaller:
 * 10 % off 1 005 ¢ = 904.5 ¢ → 905 ¢ (discount 100 ¢).
 */
export function applyDiscount(cents: number, discountBp: number): number {
	assertWhole(cents, 'An amount in cents');
	assertWhole(discountBp, 'A discount in basis points');
	return toSafeNumber(
		divideRounded(BigInt(cents) * BigInt(BP_PER_UNIT - discountBp), BigInt(BP_PER_UNIT)),
		'The result'
	);
}

/**
 * `part` as a share of `whole`, in whole basis points: round(part × 10 000 / whole), half away from
 * zero. Returns `null` when `whole` is 0 (no share can be stated). Inputs are cents.
 * Example: 123 ¢ of 1 000 ¢ = 1 230 bp; 1 ¢ of 3 ¢ = 3 333.33… → 3 333 bp.
 */
export function ratioBp(part: number, whole: number): number | null {
	assertWhole(part, 'An amount in cents');
	assertWhole(whole, 'An amount in cents');
	if (whole === 0) return null;
	return toSafeNumber(divideRounded(BigInt(part) * BigInt(BP_PER_UNIT), BigInt(whole)), 'A ratio');
}

const numberFormats = new Map<string, Intl.NumberFormat>();
function currencyFormat(currency: string, locale: string): Intl.NumberFormat {
	const key = `${locale}|${currency}`;
	let format = numberFormats.get(key);
	if (!format) {
		format = new Intl.NumberFormat(locale, { style: 'currency', currency });
		numberFormats.set(key, format);
	}
	return format;
}

/**
 * Display an amount held in minor units with `Intl.NumberFormat`, e.g. 123456 → "$1,234.56".
 * The minor-unit exponent comes from the currency itself (2 for USD, 0 for a currency without
 * cents), and the amount is handed to `Intl` as an exact decimal string, so no float is involved.
 * @param cents amount in the currency's minor units; a safe integer, may be negative
 * @param currency ISO 4217 code, default `USD`
 * @param locale BCP 47 locale, default `en-US`
 */
export function formatMoney(cents: number, currency = 'USD', locale = 'en-US'): string {
	assertWhole(cents, 'An amount in cents');
	const format = currencyFormat(currency, locale);
	const digits = format.resolvedOptions().maximumFractionDigits ?? 2;
	const sign = cents < 0 ? '-' : '';
	const text = String(Math.abs(cents)).padStart(digits + 1, '0');
	const whole = text.slice(0, text.length - digits);
	const minor = text.slice(text.length - digits);
	const decimal = digits > 0 ? `${sign}${whole}.${minor}` : `${sign}${whole}`;
	return format.format(decimal as Intl.StringNumericLiteral);
}

/**
 * Display a rate held in basis points as a percentage with up to two decimals:
 * 1 500 → "15%", 1 525 → "15.25%", 5 → "0.05%".
 */
export function formatBp(basisPoints: number, locale = 'en-US'): string {
	assertWhole(basisPoints, 'A rate in basis points');
	return new Intl.NumberFormat(locale, {
		style: 'percent',
		minimumFractionDigits: 0,
		maximumFractionDigits: 2
		// 1 bp = 1E-4 of a whole; an exact decimal string, so no float division
	}).format(`${basisPoints}E-4` as Intl.StringNumericLiteral);
}

/** Result of parsing a typed amount: cents, or a sentence to show the user. */
export type MoneyParseResult = { ok: true; cents: number } | { ok: false; message: string };

// an optional dollar sign, then either digits grouped by commas in threes or plain digits, then
// at most two decimals after a point; the digits before the point may be omitted (".50")
const AMOUNT = /^\$?\s*((?:\d{1,3}(?:,\d{3})+)|\d*)(?:\.(\d{1,2}))?$/;

/**
 * Parse an amount of dollars and cents typed by a person into cents, exactly (digit by digit, never
 * through a float). Accepted: `1234`, `1234.5`, `1,234.56`, `$1,234.56`, `.50`, surrounding spaces.
 * Refused with a message: empty text, negative amounts, more than two decimals (no silent
 * rounding), a decimal comma (`12,50`: a comma only separates thousands, in groups of three), and
 * anything else that is not an amount.
 */
export function parseMoney(text: string): MoneyParseResult {
	const typed = text.trim();
	if (typed === '') return { ok: false, message: 'Enter an amount, like 1,234.56.' };
	if (/^-|^\$\s*-/.test(typed)) {
		return { ok: false, message: `Enter an amount of zero or more; "${typed}" is negative.` };
	}
	const match = AMOUNT.exec(typed);
	if (!match || (match[1] === '' && match[2] === undefined)) {
		if (/^\$?[\d,]*\.\d{3,}$/.test(typed)) {
			return {
				ok: false,
				message: `"${typed}" has more than two decimals; amounts are in whole cents, like 1,234.56.`
			};
		}
		if (/^\$?\d+,\d{1,2}$/.test(typed)) {
			return {
				ok: false,
				message: `"${typed}" uses a comma for cents; write cents after a point, like ${typed.replace(',', '.')}.`
			};
		}
		return { ok: false, message: `"${typed}" is not an amount like 1,234.56.` };
	}
	const dollars = (match[1] ?? '').replace(/,/g, '') || '0';
	const cents = BigInt(dollars) * 100n + BigInt((match[2] ?? '').padEnd(2, '0'));
	if (cents > BigInt(MAX_CENTS)) return { ok: false, message: `"${typed}" is too large.` };
	return { ok: true, cents: Number(cents) };
}
