import { describe, expect, it } from 'vitest';
import { checkName, checkResultLabel } from './check-labels';

describe('check names for people', () => {
	it('names a check and the part it is about', () => {
		expect(checkName({ code: 'compartment-fit', subject: 'height' })).toBe('Fit in the compartment — height');
		expect(checkName({ code: 'handling-capacity', subject: 'pallet-truck' })).toBe('Lifting capacity — pallet truck');
		expect(checkName({ code: 'voltage' })).toBe('Battery voltage');
	});
	it('falls back to words for a code it does not know', () => {
		expect(checkName({ code: 'new-check' })).toBe('New check');
	});
	it('says the result in words', () => {
		expect(checkResultLabel({ result: 'pass' })).toBe('Passes');
		expect(checkResultLabel({ result: 'warn' })).toBe('Check on site');
		expect(checkResultLabel({ result: 'fail', fixable: true })).toBe('Needs a change');
		expect(checkResultLabel({ result: 'fail', fixable: false })).toBe('Does not fit');
	});
});
