import { describe, expect, it } from 'vitest';
import { formatQuoteNumber, parseQuoteNumber, validUntil } from './numbering';

describe('quote numbers', () => {
	it('pad the sequence to six digits and add -R<n> from the second revision', () => {
		expect(formatQuoteNumber({ year: 2026, sequence: 123, revision: 1 })).toBe('TW-2026-000123');
		expect(formatQuoteNumber({ year: 2026, sequence: 123, revision: 2 })).toBe('TW-2026-000123-R2');
		expect(formatQuoteNumber({ year: 2027, sequence: 1, revision: 12 })).toBe('TW-2027-000001-R12');
		expect(formatQuoteNumber({ year: 2026, sequence: 999_999, revision: 1 })).toBe(
			'TW-2026-999999'
		);
		// past six digits the number grows rather than wrapping
		expect(formatQuoteNumber({ year: 2026, sequence: 1_000_000, revision: 1 })).toBe(
			'TW-2026-1000000'
		);
	});
	it('refuse parts that cannot be printed', () => {
		expect(() => formatQuoteNumber({ year: 26, sequence: 1, revision: 1 })).toThrow(/four digits/);
		expect(() => formatQuoteNumber({ year: 2026, sequence: 0, revision: 1 })).toThrow(/sequence/);
		expect(() => formatQuoteNumber({ year: 2026, sequence: 1, revision: 0 })).toThrow(/revision/i);
		expect(() => formatQuoteNumber({ year: 2026, sequence: 1.5, revision: 1 })).toThrow(RangeError);
	});
	it('read back what they print', () => {
		expect(parseQuoteNumber('TW-2026-000123')).toEqual({ year: 2026, sequence: 123, revision: 1 });
		expect(parseQuoteNumber(' tw-2026-000123-r2 ')).toEqual({
			year: 2026,
			sequence: 123,
			revision: 2
		});
		expect(parseQuoteNumber('TW-2026-1000000')).toEqual({
			year: 2026,
			sequence: 1_000_000,
			revision: 1
		});
	});
	it('refuse anything else, including a second spelling of the same number', () => {
		for (const text of [
			'',
			'TW-2026-123',
			'TW-2026-000123-R1',
			'TW-2026-000123-R0',
			'TW-2026-0000123',
			'TW-2026-000000',
			'XX-2026-000123',
			'TW-26-000123',
			'TW-2026-000123-R',
			'TW-2026-000123R2'
		]) {
			expect(parseQuoteNumber(text), text).toBeNull();
		}
	});
});

describe('validUntil', () => {
	it('runs to the end of the last valid day, in UTC by default', () => {
		// sent 10 March 15:00 UTC, 30 days: 10 March + 30 days = 9 April (March has 31 days:
		// 21 days left in March after the 10th, then 9 in April), valid through 23:59:59.999
		expect(validUntil(new Date('2026-03-10T15:00:00Z'), 30).toISOString()).toBe(
			'2026-04-09T23:59:59.999Z'
		);
	});
	it('0 days means until the end of the sending day', () => {
		expect(validUntil(new Date('2026-03-10T00:00:00Z'), 0).toISOString()).toBe(
			'2026-03-10T23:59:59.999Z'
		);
	});
	it('crosses months, years and a leap day', () => {
		// 20 Dec 2027 + 14 days = 3 Jan 2028
		expect(validUntil(new Date('2027-12-20T09:00:00Z'), 14).toISOString()).toBe(
			'2028-01-03T23:59:59.999Z'
		);
		// 15 Feb 2028 + 15 days: 2028 is a leap year, so 29 Feb is day 14 and 1 March is day 15
		expect(validUntil(new Date('2028-02-15T09:00:00Z'), 15).toISOString()).toBe(
			'2028-03-01T23:59:59.999Z'
		);
	});
	it("uses the dealer's calendar day, not UTC's", () => {
		// 10 March 2026 03:00 UTC is still 9 March, 22:00 in Chicago (UTC−5 after 8 March's change
		// to daylight time), so 30 days run from 9 March: to 8 April, ending at midnight CDT =
		// 9 April 05:00 UTC, minus 1 ms
		expect(validUntil(new Date('2026-03-10T03:00:00Z'), 30, 'America/Chicago').toISOString()).toBe(
			'2026-04-09T04:59:59.999Z'
		);
	});
	it('keeps local midnight across a daylight-saving change', () => {
		// sent 1 March 2026 12:00 CST (18:00 UTC); 14 days → 15 March, after the change on 8 March,
		// so the day ends at midnight CDT (UTC−5) = 16 March 05:00 UTC, not 06:00
		expect(validUntil(new Date('2026-03-01T18:00:00Z'), 14, 'America/Chicago').toISOString()).toBe(
			'2026-03-16T04:59:59.999Z'
		);
		// and back: sent 20 Oct 2026 12:00 CDT, 30 days → 19 Nov, after 1 Nov's return to CST (UTC−6)
		expect(validUntil(new Date('2026-10-20T17:00:00Z'), 30, 'America/Chicago').toISOString()).toBe(
			'2026-11-20T05:59:59.999Z'
		);
	});
	it('refuses a negative or fractional number of days and an invalid date', () => {
		expect(() => validUntil(new Date('2026-03-10T00:00:00Z'), -1)).toThrow(RangeError);
		expect(() => validUntil(new Date('2026-03-10T00:00:00Z'), 1.5)).toThrow(RangeError);
		expect(() => validUntil(new Date('nonsense'), 30)).toThrow(/not a valid date/);
	});
});
