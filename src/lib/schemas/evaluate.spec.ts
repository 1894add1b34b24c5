import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import catalogueFile from '../../../seed-data/catalogue.json';
import {
	evaluateFieldErrors,
	evaluateRequestSchema,
	truckSpecSchema,
	batterySpecSchema
} from './evaluate';
import {
	evaluate,
	fromCatalogueFile,
	resolveInput,
	DESIGN_EXAMPLE_REQUEST,
	type CatalogueFile
} from '../server/rules';
import { inputArb } from '../server/rules/testing';

const seed = fromCatalogueFile(catalogueFile as CatalogueFile);
const file = catalogueFile as CatalogueFile;

function errorsOf(body: unknown): Record<string, string[]> {
	const r = evaluateRequestSchema.safeParse(body);
	if (r.success) throw new Error('expected a refusal');
	return evaluateFieldErrors(r.error);
}

describe('evaluate request schema', () => {
	it('accepts the DESIGN.md §4 example as it is', () => {
		const r = evaluateRequestSchema.safeParse(JSON.parse(JSON.stringify(DESIGN_EXAMPLE_REQUEST)));
		expect(r.success).toBe(true);
		if (r.success) expect(r.data.operation.years).toBe(5);
	});

	it('accepts catalogue references, empty lists and null crane and charging area', () => {
		const r = evaluateRequestSchema.safeParse({
			truck: { modelId: 'TW-B4-25' },
			battery: { modelId: 'TW-B48-775-LA' },
			fleet: { trucks: 2 },
			operation: {
				shiftsPerDay: 2,
				hoursPerShift: 8,
				daysPerWeek: 5,
				energyKwhPerHour: 3,
				charging: 'opportunity'
			},
			site: { palletTrucks: [], rollerStands: [], crane: null, chargingArea: null }
		});
		expect(r.success).toBe(true);
	});

	it('answers a field error per bad field, by path', () => {
		const body = structuredClone(DESIGN_EXAMPLE_REQUEST) as unknown as Record<string, any>;
		body.truck.compartment.lengthMm = -1;
		body.battery.chemistry = 'nickel';
		body.fleet.trucks = 2.5;
		body.site.palletTrucks[0].forkLengthMm = 1e9;
		body.site.rollerStands[0].adjustRangeMm = { minMm: 300, maxMm: 200 };
		const e = errorsOf(body);
		expect(Object.keys(e).sort()).toEqual([
			'battery.chemistry',
			'fleet.trucks',
			'site.palletTrucks.0.forkLengthMm',
			'site.rollerStands.0.adjustRangeMm.maxMm',
			'truck.compartment.lengthMm'
		]);
		expect(e['truck.compartment.lengthMm'][0]).toMatch(/more than zero/);
		expect(e['site.palletTrucks.0.forkLengthMm'][0]).toMatch(/at most 3,000/);
	});

	it('refuses a day longer than 24 hours and a malformed model reference', () => {
		const body = structuredClone(DESIGN_EXAMPLE_REQUEST) as unknown as Record<string, any>;
		body.operation.hoursPerShift = 10;
		expect(errorsOf(body)['operation.hoursPerShift'][0]).toMatch(/24 hours/);
		const ref = structuredClone(DESIGN_EXAMPLE_REQUEST) as unknown as Record<string, any>;
		ref.truck = { modelId: 5 };
		expect(Object.keys(errorsOf(ref))).toEqual(['truck.modelId']);
		const spec = structuredClone(DESIGN_EXAMPLE_REQUEST) as unknown as Record<string, any>;
		spec.truck.voltage = 'high';
		expect(Object.keys(errorsOf(spec))).toEqual(['truck.voltage']);
	});

	it('refuses non-numbers and non-objects', () => {
		expect(errorsOf(null)['(body)']).toBeDefined();
		const body = structuredClone(DESIGN_EXAMPLE_REQUEST) as unknown as Record<string, any>;
		body.operation.energyKwhPerHour = Number.NaN;
		expect(errorsOf(body)['operation.energyKwhPerHour']).toBeDefined();
	});

	it('validates every catalogue spec of the demo data', () => {
		for (const t of file.trucks)
			expect(truckSpecSchema.safeParse(t.spec).success, t.code).toBe(true);
		for (const b of file.batteries)
			expect(batterySpecSchema.safeParse(b.spec).success, b.code).toBe(true);
	});
});

describe('catalogue references', () => {
	it('resolve to the same answer as the explicit DESIGN.md example', () => {
		const parsed = evaluateRequestSchema.parse({
			...JSON.parse(JSON.stringify(DESIGN_EXAMPLE_REQUEST)),
			truck: { modelId: 'TW-B4-25' },
			battery: { modelId: 'TW-B48-775-LA' }
		});
		const resolved = resolveInput(parsed, seed);
		expect(resolved.ok).toBe(true);
		if (!resolved.ok) return;
		const byRef = evaluate(resolved.input, seed.catalogue);
		const explicit = evaluate(DESIGN_EXAMPLE_REQUEST, seed.catalogue);
		expect(byRef.setups.map((s) => s.verdict)).toEqual(explicit.setups.map((s) => s.verdict));
		expect(byRef.recommended).toBe('overhead-hoist');
	});

	it('an unknown model is a field error', () => {
		const parsed = evaluateRequestSchema.parse({
			...JSON.parse(JSON.stringify(DESIGN_EXAMPLE_REQUEST)),
			truck: { modelId: 'NO-SUCH' }
		});
		const r = resolveInput(parsed, seed);
		expect(r.ok).toBe(false);
		if (!r.ok) expect(r.errors[0].path).toBe('truck.modelId');
	});
});

function assertFinite(value: unknown, path = 'result'): void {
	if (typeof value === 'number') {
		if (!Number.isFinite(value)) throw new Error(`${path} is ${value}`);
	} else if (Array.isArray(value)) {
		value.forEach((v, i) => assertFinite(v, `${path}[${i}]`));
	} else if (value && typeof value === 'object') {
		for (const [k, v] of Object.entries(value)) assertFinite(v, `${path}.${k}`);
	}
}

describe('property: schema-valid input never throws', () => {
	const truckCodes = file.trucks.map((t) => t.code);
	const batteryCodes = file.batteries.map((b) => b.code);
	const bodyArb = fc
		.record({
			input: inputArb,
			truckRef: fc.option(fc.constantFrom(...truckCodes), { nil: undefined }),
			batteryRef: fc.option(fc.constantFrom(...batteryCodes), { nil: undefined })
		})
		.map(({ input, truckRef, batteryRef }) =>
			JSON.parse(
				JSON.stringify({
					...input,
					truck: truckRef ? { modelId: truckRef } : input.truck,
					battery: batteryRef ? { modelId: batteryRef } : input.battery
				})
			)
		);

	it('parses, resolves and evaluates to a finite, complete answer', () => {
		fc.assert(
			fc.property(bodyArb, (body) => {
				const parsed = evaluateRequestSchema.safeParse(body);
				if (!parsed.success) throw new Error(JSON.stringify(evaluateFieldErrors(parsed.error)));
				const resolved = resolveInput(parsed.data, seed);
				expect(resolved.ok).toBe(true);
				if (!resolved.ok) return;
				const r = evaluate(resolved.input, seed.catalogue);
				expect(r.setups).toHaveLength(4);
				expect(r.setups.map((s) => s.rank).sort()).toEqual([1, 2, 3, 4]);
				for (const s of r.setups) {
					expect(['fits', 'fits-with-changes', 'does-not-fit']).toContain(s.verdict);
					expect(s.reasons.length).toBeGreaterThan(0);
				}
				expect(r.batteriesPerTruck).toBeGreaterThanOrEqual(1);
				assertFinite(r);
				expect(JSON.parse(JSON.stringify(r))).toEqual(r);
				expect(r.cautions[r.cautions.length - 1]).toMatch(/licensed practice govern/);
			}),
			{ numRuns: 400 }
		);
	}, 60_000);
});
