import { describe, expect, it } from 'vitest';
import { readinessProblems, taxUndecided } from './quote-readiness';

const ready = { contactName: 'Dana Quillfeather', contactEmail: 'dana.q@marlow-crossing.example', taxRegion: 'WA', taxLabel: 'Washington sites' };

describe('what a quote needs before it leaves the rep', () => {
	it('is ready with a contact, a valid address and a tax decision', () => {
		expect(readinessProblems(ready)).toEqual([]);
		expect(readinessProblems({ ...ready, taxRegion: null, taxLabel: null })).toEqual([]); // "No tax / exempt", chosen
	});
	it('names each missing piece', () => {
		expect(readinessProblems({ ...ready, contactName: '  ' }).map((p) => p.field)).toEqual(['contactName']);
		expect(readinessProblems({ ...ready, contactEmail: '' })[0].message).toMatch(/e-mail address/);
		expect(readinessProblems({ ...ready, contactEmail: 'dana at marlow' })[0].message).toMatch(/not valid/);
	});
	it('treats a region with no rate as undecided', () => {
		const undecided = { ...ready, taxRegion: 'EU-DE', taxLabel: null };
		expect(taxUndecided(undecided)).toBe(true);
		expect(readinessProblems(undecided)).toEqual([{ field: 'taxRegion', message: expect.stringContaining('“EU-DE” has no tax rate') }]);
		expect(taxUndecided(ready)).toBe(false);
	});
});
