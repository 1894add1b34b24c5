import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import catalogueFile from '../../../../seed-data/catalogue.json';
import { fromCatalogueFile, type CatalogueFile } from '../rules/catalogue';
import { evaluate } from '../rules/evaluate';
import { designExample } from '../rules/fixtures';
import { plausibleInputArb } from '../rules/testing';
import { customerSetupText, showsTaxLine } from './customer-text';

const { catalogue } = fromCatalogueFile(catalogueFile as CatalogueFile);
const CHECK_CODES = /^(voltage|duty|ventilation)$|battery-weight|compartment-fit|fork-length|fork-width|roller-height|door-swing|handling-capacity|floor-space/;

/** Sentences for the dealer that must never reach the customer: ranks and cost comparisons. */
function internal(text: string): boolean {
	return /Ranked|rank \d|would cost|costs? .* (more|less|the same) over|Over \d+ years|\$\d/.test(text);
}

describe('what the customer reads about the setup', () => {
	it('says why the chosen setup fits, with no ranking and no prices (the demo site: six trucks, three shifts)', () => {
		const result = evaluate(designExample(), catalogue);
		for (const s of result.setups) {
			const text = customerSetupText(result, designExample(), s.id);
			const all = [...text.why, ...text.others.map((o) => `${o.name} ${o.note}`)].join('\n');
			expect(internal(all), all).toBe(false);
			expect(text.why.length).toBeGreaterThan(1);
			expect(text.others.map((o) => o.name)).not.toContain(s.name);
		}
		// the engine's own reasons do carry the ranking and the cost comparison
		expect(result.setups.some((s) => s.reasons.some(internal))).toBe(true);
	});

	it('names checks and results in words, never by code', () => {
		const result = evaluate(designExample(), catalogue);
		const text = customerSetupText(result, designExample(), 'trolley-stand');
		for (const c of text.checks) {
			expect(c.name).not.toMatch(CHECK_CODES);
			expect(['Passes', 'Check on site', 'Needs a change', 'Does not fit']).toContain(c.resultLabel);
			expect(c.resultLabel).not.toMatch(/^(pass|warn|fail)$/i);
		}
		expect(text.checks.map((c) => c.name)).toContain('Battery voltage');
	});

	it('holds for any plausible site and fleet', () => {
		fc.assert(
			fc.property(plausibleInputArb, (input) => {
				const result = evaluate(input, catalogue);
				for (const s of result.setups) {
					const text = customerSetupText(result, input, s.id);
					expect(internal([...text.why, ...text.others.map((o) => o.note)].join(' '))).toBe(false);
				}
			}),
			{ numRuns: 60 }
		);
	});
});

describe('the tax line', () => {
	it('is printed only when a rate applies', () => {
		expect(showsTaxLine({ taxLabel: 'Washington sites', totals: { taxRateBp: 890, taxCents: 100 } })).toBe(true);
		expect(showsTaxLine({ taxLabel: 'Oregon sites', totals: { taxRateBp: 0, taxCents: 0 } })).toBe(true);
		expect(showsTaxLine({ taxLabel: null, totals: { taxRateBp: 0, taxCents: 0 } })).toBe(false);
	});
});
