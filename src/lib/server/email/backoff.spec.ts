import { describe, expect, it } from 'vitest';
import { decideRetry, relayUnreachable, retryDelayMs } from './backoff';

const defaults = { baseMs: 5_000, maxMs: 600_000 };

describe('retryDelayMs', () => {
	it('doubles from 5 s and stops at the 10 min cap (the configured defaults)', () => {
		const schedule = Array.from({ length: 10 }, (_, i) => retryDelayMs(i + 1, defaults));
		expect(schedule).toEqual([5_000, 10_000, 20_000, 40_000, 80_000, 160_000, 320_000, 600_000, 600_000, 600_000]);
	});

	it('stays finite and capped for very large attempt numbers', () => {
		expect(retryDelayMs(10_000, defaults)).toBe(600_000);
	});

	it('follows a short test schedule', () => {
		expect([1, 2, 3, 4].map((a) => retryDelayMs(a, { baseMs: 200, maxMs: 1_000 }))).toEqual([200, 400, 800, 1_000]);
	});

	it('refuses attempt numbers below 1', () => {
		expect(() => retryDelayMs(0, defaults)).toThrow(/positive integer/);
		expect(() => retryDelayMs(1.5, defaults)).toThrow(/positive integer/);
	});
});

describe('decideRetry', () => {
	const options = { ...defaults, maxAttempts: 5 };

	it('retries a refused connection with the back-off delay', () => {
		expect(decideRetry(3, { responseCode: undefined }, options)).toEqual({ retry: true, delayMs: 20_000 });
	});

	it('retries a temporary 4xx refusal (RFC 5321 §4.2.1: 4yz is transient)', () => {
		expect(decideRetry(1, { responseCode: 451 }, options)).toEqual({ retry: true, delayMs: 5_000 });
	});

	it('gives up on a permanent 5xx refusal (RFC 5321 §4.2.1: 5yz is permanent)', () => {
		expect(decideRetry(1, { responseCode: 550 }, options)).toEqual({ retry: false });
	});

	it('gives up once the attempt limit is reached', () => {
		expect(decideRetry(4, undefined, options).retry).toBe(true);
		expect(decideRetry(5, undefined, options)).toEqual({ retry: false });
		// a relay that answered with a temporary refusal each time
		expect(decideRetry(5, { responseCode: 451, code: 'EENVELOPE' }, options)).toEqual({ retry: false });
	});

	it('never gives up while the relay cannot be reached at all, and waits at most the cap between tries', () => {
		// nodemailer's codes for a refused connection, a timeout, a dropped socket and a failed lookup
		for (const code of ['ESOCKET', 'ECONNECTION', 'ETIMEDOUT', 'EDNS']) {
			expect(decideRetry(5, { code }, options)).toEqual({ retry: true, delayMs: 80_000 });
			expect(decideRetry(500, { code }, options)).toEqual({ retry: true, delayMs: 600_000 });
		}
	});

	it('tells an unreachable relay from one that answered', () => {
		expect(relayUnreachable({ code: 'ESOCKET' })).toBe(true);
		expect(relayUnreachable({ code: 'ETIMEDOUT' })).toBe(true);
		expect(relayUnreachable({ code: 'EAUTH', responseCode: 535 })).toBe(false);
		expect(relayUnreachable({ code: 'EENVELOPE', responseCode: 451 })).toBe(false);
		expect(relayUnreachable({ code: 'ETLS' })).toBe(false);
		expect(relayUnreachable(undefined)).toBe(false);
	});
});
