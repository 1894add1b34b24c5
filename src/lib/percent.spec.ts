import { describe, expect, it } from 'vitest';
import { parsePercentBp, percentText } from './percent';

describe('parsePercentBp', () => {
	it.each([
		// 1 % = 100 bp (money.ts)
		['10', 1000],
		['10 %', 1000],
		['10%', 1000],
		['  18 % ', 1800],
		['7.25', 725],
		['6.5 %', 650],
		['.5', 50],
		['0', 0],
		['0.01', 1],
		['100', 10_000],
		['150 %', 15_000],
		['007', 700]
	])('%s → %i bp', (text, bp) => {
		expect(parsePercentBp(text)).toEqual({ ok: true, bp });
	});

	it.each([
		['', 'Enter a percentage'],
		['%', 'Enter a percentage'],
		['-5', 'negative'],
		['7.125', 'more than two decimals'],
		['7,25', 'Write decimals after a point: 7.25.'],
		['ten', 'is not a percentage'],
		['10 % %', 'is not a percentage'],
		['1e3', 'is not a percentage'],
		['12345678', 'far too large']
	])('refuses %j with a message', (text, message) => {
		const result = parsePercentBp(text);
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.message).toContain(message);
	});
});

describe('percentText', () => {
	it.each([
		[725, '7.25'],
		[1000, '10'],
		[650, '6.5'],
		[5, '0.05'],
		[0, '0'],
		[10_000, '100']
	])('%i bp → %s', (bp, text) => {
		expect(percentText(bp)).toBe(text);
		// and back again
		expect(parsePercentBp(text)).toEqual({ ok: true, bp });
	});
});
