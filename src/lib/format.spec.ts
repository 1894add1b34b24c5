import { describe, expect, it } from 'vitest';
import { formatDate, quoteDate, quoteMoment, waitedFor } from './format';

// IANA zone rules (tz database): Los Angeles is UTC−8 in December (PST), Tokyo UTC+9 all year.
describe('quote dates on the dealer calendar', () => {
	it('names the dealer day, not the reader’s: 04:49 UTC on 2 Dec is still 1 Dec in Los Angeles', () => {
		expect(quoteDate('2026-12-02T04:49:00Z', 'America/Los_Angeles')).toBe('December 1, 2026');
		expect(quoteDate('2026-12-02T04:49:00Z', 'UTC')).toBe('December 2, 2026');
		expect(quoteDate('2026-12-01T16:00:00Z', 'Asia/Tokyo')).toBe('December 2, 2026');
	});
	it('gives a moment with its zone named', () => {
		expect(quoteMoment('2026-12-02T04:49:00Z', 'America/Los_Angeles')).toBe('Dec 1, 2026, 8:49 PM PST');
	});
	it('shows a dash for a missing or broken date', () => {
		expect(quoteDate(null, 'UTC')).toBe('—');
		expect(quoteDate('not a date', 'UTC')).toBe('—');
		expect(quoteMoment(undefined, 'UTC')).toBe('—');
		expect(formatDate('nope')).toBe('');
	});
});

describe('how long something has waited', () => {
	it('uses the largest sensible units', () => {
		const at = '2026-12-01T08:00:00Z';
		expect(waitedFor(at, '2026-12-01T08:00:30Z')).toBe('less than a minute');
		expect(waitedFor(at, '2026-12-01T08:25:00Z')).toBe('25 min');
		expect(waitedFor(at, '2026-12-01T11:10:00Z')).toBe('3 h 10 min');
		expect(waitedFor(at, '2026-12-01T11:00:00Z')).toBe('3 h');
		expect(waitedFor(at, '2026-12-03T12:00:00Z')).toBe('2 days 4 h');
		expect(waitedFor(at, '2026-12-02T08:00:00Z')).toBe('1 day');
		expect(waitedFor(at, '2026-11-30T08:00:00Z')).toBe('less than a minute');
	});
});
