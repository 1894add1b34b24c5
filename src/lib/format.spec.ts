import { describe, expect, it } from 'vitest';
import { formatDate, quoteDate, quoteMoment } from './format';

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
