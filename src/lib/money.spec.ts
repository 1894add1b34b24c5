import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
	BP_PER_UNIT,
	MAX_CENTS,
	applyDiscount,
	divideRounded,
	formatBp,
	formatMoney,
	parseMoney,
	percentOf,
	ratioBp,
	type MoneyParseResult
} from './money';

function cents(r: MoneyParseResult): number {
	if (!r.ok) throw new Error(`expected an amount, got: ${r.message}`);
	return r.cents;
}
function message(r: MoneyParseResult): string {
	if (r.ok) throw new Error(`expected a refusal, got ${r.cents} ¢`);
	return r.message;
}

describe('divideRounded: nearest integer, half away from zero', () => {
	it('rounds exact halves away from zero in both directions', () => {
		// 5 / 2 = 2.5 → 3 (banker's rounding would give 2)
		expect(divideRounded(5n, 2n)).toBe(3n);
		// 7 / 2 = 3.5 → 4
		expect(divideRounded(7n, 2n)).toBe(4n);
		// −5 / 2 = −2.5 → −3, whichever operand carries the sign
		expect(divideRounded(-5n, 2n)).toBe(-3n);
		expect(divideRounded(5n, -2n)).toBe(-3n);
		expect(divideRounded(-5n, -2n)).toBe(3n);
	});
	it('rounds below and above a half to the nearest', () => {
		// 1/3 = 0.33 → 0; 2/3 = 0.67 → 1; 4/3 = 1.33 → 1; −2/3 → −1
		expect(divideRounded(1n, 3n)).toBe(0n);
		expect(divideRounded(2n, 3n)).toBe(1n);
		expect(divideRounded(4n, 3n)).toBe(1n);
		expect(divideRounded(-2n, 3n)).toBe(-1n);
		// 0 / 7 = 0
		expect(divideRounded(0n, 7n)).toBe(0n);
	});
	it('refuses a zero divisor', () => {
		expect(() => divideRounded(1n, 0n)).toThrow(RangeError);
	});
});

describe('percentOf: bp of an amount, rounded once, half away from zero', () => {
	it('rounds an exact half cent up, and down again for a negative amount', () => {
		expect(BP_PER_UNIT).toBe(10_000);
		// 8.25 % of $10.00: 1000 × 825 / 10000 = 82.5 ¢ → 83 ¢
		expect(percentOf(1000, 825)).toBe(83);
		// −1000 × 825 / 10000 = −82.5 ¢ → −83 ¢ (away from zero, not towards +∞)
		expect(percentOf(-1000, 825)).toBe(-83);
		// 10 % of 5 ¢ = 0.5 ¢ → 1 ¢; 10 % of 25 ¢ = 2.5 ¢ → 3 ¢ (banker's would give 0 and 2)
		expect(percentOf(5, 1000)).toBe(1);
		expect(percentOf(25, 1000)).toBe(3);
		// 50 % of 3 ¢ = 1.5 ¢ → 2 ¢
		expect(percentOf(3, 5000)).toBe(2);
	});
	it('rounds just either side of a half to the nearest cent', () => {
		// 999 × 825 / 10000 = 82.4175 → 82; 1001 × 825 / 10000 = 82.5825 → 83
		expect(percentOf(999, 825)).toBe(82);
		expect(percentOf(1001, 825)).toBe(83);
		// 1 ¢ × 4999 bp = 0.4999 ¢ → 0; 1 ¢ × 5001 bp = 0.5001 ¢ → 1
		expect(percentOf(1, 4999)).toBe(0);
		expect(percentOf(1, 5001)).toBe(1);
	});
	it('is exact where float arithmetic would drift', () => {
		// 9 007 199 254 740 991 × 1 bp / 10000 = 900 719 925 474.0991 → 900 719 925 474
		expect(percentOf(MAX_CENTS, 1)).toBe(900_719_925_474);
		// 100 % and 0 % are the amount and zero
		expect(percentOf(123_457, 10_000)).toBe(123_457);
		expect(percentOf(123_457, 0)).toBe(0);
	});
	it('refuses fractional cents or basis points', () => {
		expect(() => percentOf(10.5, 100)).toThrow(/whole number/);
		expect(() => percentOf(100, 12.5)).toThrow(/whole number/);
		expect(() => percentOf(Number.NaN, 100)).toThrow(RangeError);
	});
	it('never differs from the exact share by more than half a cent (property)', () => {
		fc.assert(
			fc.property(
				fc.integer({ min: -1e12, max: 1e12 }),
				fc.integer({ min: 0, max: 20_000 }),
				(amount, bp) => {
					const rounded = percentOf(amount, bp);
					// |rounded × 10000 − amount × bp| ≤ 5000, and a tie goes away from zero
					const error = BigInt(rounded) * 10_000n - BigInt(amount) * BigInt(bp);
					const abs = error < 0n ? -error : error;
					expect(abs <= 5000n).toBe(true);
					if (abs === 5000n) expect(Math.abs(rounded) * 10_000 > Math.abs(amount * bp)).toBe(true);
				}
			)
		);
	});
});

describe('applyDiscount: the net is rounded, the discount is what is left', () => {
	it('rounds the net up at an exact half cent', () => {
		// 10 % off 1005 ¢: 1005 × 9000 / 10000 = 904.5 → 905 ¢ (discount 100 ¢, not 100.5)
		expect(applyDiscount(1005, 1000)).toBe(905);
		// 12.5 % off $10.00: 1000 × 8750 / 10000 = 875 ¢ exactly
		expect(applyDiscount(1000, 1250)).toBe(875);
		// 33.33 % off 1 ¢: 1 × 6667 / 10000 = 0.6667 → 1 ¢
		expect(applyDiscount(1, 3333)).toBe(1);
		// 0 % and 100 %
		expect(applyDiscount(4321, 0)).toBe(4321);
		expect(applyDiscount(4321, 10_000)).toBe(0);
	});
});

describe('ratioBp: a share in whole basis points', () => {
	it('rounds to the nearest basis point, half away from zero', () => {
		// 123 / 1000 = 12.3 % = 1230 bp
		expect(ratioBp(123, 1000)).toBe(1230);
		// 1 / 3 = 3333.33 bp → 3333; 2 / 3 = 6666.67 bp → 6667
		expect(ratioBp(1, 3)).toBe(3333);
		expect(ratioBp(2, 3)).toBe(6667);
		// 1 / 20000 = 0.5 bp → 1; −1 / 20000 = −0.5 bp → −1
		expect(ratioBp(1, 20_000)).toBe(1);
		expect(ratioBp(-1, 20_000)).toBe(-1);
	});
	it('has no answer for a zero whole', () => {
		expect(ratioBp(5, 0)).toBeNull();
		expect(ratioBp(0, 0)).toBeNull();
	});
});

describe('formatMoney', () => {
	it('shows US dollars with two decimals and thousands commas', () => {
		expect(formatMoney(123_456)).toBe('$1,234.56');
		expect(formatMoney(5)).toBe('$0.05');
		expect(formatMoney(0)).toBe('$0.00');
		expect(formatMoney(-5)).toBe('-$0.05');
		expect(formatMoney(100_000_000)).toBe('$1,000,000.00');
	});
	it('is exact at the largest safe amount, where dividing by 100 in a float would not be', () => {
		// 9 007 199 254 740 991 ¢ = $90,071,992,547,409.91; formatting the float ÷100 shows …409.90
		expect(formatMoney(MAX_CENTS)).toBe('$90,071,992,547,409.91');
	});
	it('takes the minor-unit exponent from the currency and the style from the locale', () => {
		// a currency without minor units: 1234 units → ¥1,234
		expect(formatMoney(1234, 'JPY')).toBe('¥1,234');
		// German grouping and decimal signs, no-break space before the sign
		expect(formatMoney(123_456, 'EUR', 'de-DE')).toBe('1.234,56\u00a0€');
	});
	it('refuses a fractional amount', () => {
		expect(() => formatMoney(12.5)).toThrow(RangeError);
	});
});

describe('formatBp', () => {
	it('shows a rate as a percentage with up to two decimals', () => {
		expect(formatBp(1500)).toBe('15%');
		expect(formatBp(1525)).toBe('15.25%');
		expect(formatBp(5)).toBe('0.05%');
		expect(formatBp(-250)).toBe('-2.5%');
		expect(formatBp(10_000)).toBe('100%');
	});
});

describe('parseMoney', () => {
	it('reads the forms people type', () => {
		expect(cents(parseMoney('1,234.56'))).toBe(123_456);
		expect(cents(parseMoney('$1,234.56'))).toBe(123_456);
		expect(cents(parseMoney('1234'))).toBe(123_400);
		expect(cents(parseMoney('1234.5'))).toBe(123_450);
		expect(cents(parseMoney('  $ 12.05 '))).toBe(1205);
		expect(cents(parseMoney('.50'))).toBe(50);
		expect(cents(parseMoney('0'))).toBe(0);
		expect(cents(parseMoney('1,000,000'))).toBe(100_000_000);
	});
	it('converts digit by digit, without float drift', () => {
		// 0.29 × 100 = 28.999999999999996 in floating point; the parser must say 29
		expect(0.29 * 100).not.toBe(29);
		expect(cents(parseMoney('0.29'))).toBe(29);
		expect(cents(parseMoney('1.15'))).toBe(115);
		expect(cents(parseMoney('90,071,992,547,409.91'))).toBe(MAX_CENTS);
	});
	it('explains what it refuses', () => {
		expect(message(parseMoney(''))).toBe('Enter an amount, like 1,234.56.');
		expect(message(parseMoney('-5'))).toBe('Enter an amount of zero or more; "-5" is negative.');
		expect(message(parseMoney('$-5'))).toMatch(/negative/);
		expect(message(parseMoney('1.234'))).toBe(
			'"1.234" has more than two decimals; amounts are in whole cents, like 1,234.56.'
		);
		expect(message(parseMoney('12,50'))).toBe(
			'"12,50" uses a comma for cents; write cents after a point, like 12.50.'
		);
		expect(message(parseMoney('1,23,456'))).toBe('"1,23,456" is not an amount like 1,234.56.');
		expect(message(parseMoney('abc'))).toBe('"abc" is not an amount like 1,234.56.');
		expect(message(parseMoney('$'))).toMatch(/is not an amount/);
		expect(message(parseMoney('1e3'))).toMatch(/is not an amount/);
		// one cent over the largest safe amount
		expect(message(parseMoney('90071992547409.92'))).toBe('"90071992547409.92" is too large.');
	});
	it('reads back every amount formatMoney shows (property)', () => {
		fc.assert(
			fc.property(fc.integer({ min: 0, max: MAX_CENTS }), (amount) => {
				expect(cents(parseMoney(formatMoney(amount)))).toBe(amount);
			})
		);
	});
});
