import { describe, expect, it } from 'vitest';
import { evaluateFieldErrors, evaluateRequestSchema, hoursPerDayProblem } from './evaluate';
import { isStepComplete, operationStepSchema, parseDraftStep, siteStepSchema, stepProblems, type SurveyData } from './survey';

const CUSTOMER = '5f2b8a9e-1c3d-4e5f-8a7b-9c0d1e2f3a4b';
const SITE = '6a3c9b0f-2d4e-4f60-9b8c-0d1e2f3a4b5c';

const goodOperation = { shiftsPerDay: 3, hoursPerShift: 8, daysPerWeek: 5, duty: 'medium', energyKwhPerHour: 3.5, charging: 'conventional' };

function messagesOf(result: ReturnType<typeof operationStepSchema.safeParse>, field: string): string[] {
	return result.success ? [] : result.error.issues.filter((i) => i.path[0] === field).map((i) => i.message);
}

describe('draft of a step: a bad answer refuses only itself', () => {
	it('keeps the name and phone when the e-mail is mistyped', () => {
		const { values, errors } = parseDraftStep('site', { contactName: 'Dale Prentice', contactPhone: '+1 555 0100 222', contactEmail: 'dale@pellham' });
		expect({ ...values }).toEqual({ contactName: 'Dale Prentice', contactPhone: '+1 555 0100 222' });
		expect(Object.keys(errors)).toEqual(['contactEmail']);
		// the message says what to type, not that something is "not of the right kind"
		expect(errors.contactEmail[0]).toMatch(/name@example\.com/);
	});

	it('keeps shifts and hours when the energy figure is 0', () => {
		const { values, errors } = parseDraftStep('operation', { shiftsPerDay: 3, hoursPerShift: 8, energyKwhPerHour: 0 });
		expect({ ...values }).toEqual({ shiftsPerDay: 3, hoursPerShift: 8 });
		expect(errors.energyKwhPerHour[0]).toMatch(/more than 0, at most 20 kWh/);
	});

	it('refuses unknown fields and wrong types by name, storing nothing of them', () => {
		const { values, errors } = parseDraftStep('operation', { shiftsPerDay: 'three', bogus: 1 });
		expect(Object.keys(values)).toEqual([]);
		expect(Object.keys(errors).sort()).toEqual(['bogus', 'shiftsPerDay']);
		expect(errors.shiftsPerDay[0]).toBe('Enter 1 to 4 shifts a day (whole shifts).');
	});

	it('treats empty answers as not given yet, not as wrong', () => {
		const { values, errors } = parseDraftStep('site', { contactName: '', surveyDate: '', siteId: '', contactEmail: '' });
		expect(errors).toEqual({});
		expect({ ...values }).toEqual({ contactName: '', surveyDate: '', siteId: '', contactEmail: '' });
		const cleared = parseDraftStep('operation', { hoursPerShift: null });
		expect({ ...cleared.values }).toEqual({ hoursPerShift: null });
	});

	it('in a list, empties only the refused answer of a row and keeps the row', () => {
		const { values, errors } = parseDraftStep('equipment', {
			palletTrucks: [{ forkLengthMm: 99_999, overallWidthMm: 540, capacityKg: 2000 }],
			hasCrane: false
		});
		expect(values.palletTrucks).toEqual([{ forkLengthMm: null, overallWidthMm: 540, capacityKg: 2000 }]);
		expect(values.hasCrane).toBe(false);
		expect(Object.keys(errors)).toEqual(['palletTrucks.0.forkLengthMm']);
		expect(errors['palletTrucks.0.forkLengthMm'][0]).toBe('The fork length can be at most 3 000 mm (118.1 in).');
	});

	it('keeps a measured battery’s good figures and refuses the bad one', () => {
		const { values, errors } = parseDraftStep('fleet', { trucks: 4, measured: { voltage: 500, lengthMm: 1000, chemistry: 'lead-acid' } });
		expect(values.trucks).toBe(4);
		expect(values.measured).toEqual({ voltage: null, lengthMm: 1000, chemistry: 'lead-acid' });
		expect(errors['measured.voltage'][0]).toMatch(/12 to 120 V/);
	});

	it('a field named like an object property is just an unknown field', () => {
		const { values, errors } = parseDraftStep('notes', JSON.parse('{"__proto__": {"x": 1}, "constructor": 2, "notes": "ok"}'));
		expect({ ...values }).toEqual({ notes: 'ok' });
		expect(Object.keys(errors).sort()).toEqual(['__proto__', 'constructor']);
	});
});

describe('operation step', () => {
	it('refuses 4 shifts × 12 h with a message on hours per shift that says what fits', () => {
		const r = operationStepSchema.safeParse({ ...goodOperation, shiftsPerDay: 4, hoursPerShift: 12 });
		expect(r.success).toBe(false);
		expect(messagesOf(r, 'hoursPerShift')).toEqual(['4 shifts × 12 h makes 48 hours a day; a day has 24 hours. With 4 shifts, enter at most 6 h per shift.']);
		expect(operationStepSchema.safeParse({ ...goodOperation, shiftsPerDay: 4, hoursPerShift: 6 }).success).toBe(true);
		expect(operationStepSchema.safeParse(goodOperation).success).toBe(true);
	});

	it('says the day is too long even while another answer is still wrong', () => {
		const r = operationStepSchema.safeParse({ shiftsPerDay: 4, hoursPerShift: 12, daysPerWeek: 9 });
		expect(messagesOf(r, 'hoursPerShift')[0]).toMatch(/at most 6 h per shift/);
		expect(messagesOf(r, 'daysPerWeek')).toEqual(['Enter 1 to 7 days a week (whole days).']);
	});

	it('states the range in every range message', () => {
		const cases: [string, unknown, RegExp][] = [
			['daysPerWeek', 9, /1 to 7/],
			['daysPerWeek', 0, /1 to 7/],
			['shiftsPerDay', 5, /1 to 4/],
			['hoursPerShift', 13, /at most 12/],
			['hoursPerShift', 0, /more than 0/],
			['energyKwhPerHour', 0, /more than 0, at most 20 kWh/],
			['energyKwhPerHour', 25, /at most 20 kWh/]
		];
		for (const [field, value, pattern] of cases) {
			const r = operationStepSchema.safeParse({ ...goodOperation, [field]: value });
			expect(messagesOf(r, field)[0], `${field} = ${value}`).toMatch(pattern);
		}
	});

	it('applies the same day-length rule as the engine’s request schema', () => {
		for (const [shifts, hours] of [
			[3, 8],
			[3, 8.5],
			[4, 6],
			[4, 6.5],
			[2, 12],
			[4, 12],
			[1, 12]
		]) {
			const step = operationStepSchema.safeParse({ ...goodOperation, shiftsPerDay: shifts, hoursPerShift: hours });
			const engine = evaluateRequestSchema.shape.operation.safeParse({ ...goodOperation, shiftsPerDay: shifts, hoursPerShift: hours });
			expect(step.success, `${shifts} × ${hours}`).toBe(engine.success);
			const expected = hoursPerDayProblem(shifts, hours);
			expect(messagesOf(step, 'hoursPerShift')).toEqual(expected ? [expected] : []);
			if (!engine.success) expect(evaluateFieldErrors(engine.error).hoursPerShift).toEqual([expected]);
		}
	});
});

describe('step completeness (the indicator’s ticks and the review use it)', () => {
	const site = { customerId: CUSTOMER, siteId: SITE, contactName: 'Dale Prentice', contactEmail: '', contactPhone: '', surveyDate: '2026-12-02' };

	it('a step never saved is not complete, even one whose answers are all optional', () => {
		expect(isStepComplete('notes', {})).toBe(false);
		expect(stepProblems('notes', {})).toEqual(['Not filled in yet.']);
		expect(isStepComplete('notes', { notes: { notes: '' } })).toBe(true);
	});

	it('a saved step is complete when its answers pass its own schema', () => {
		expect(siteStepSchema.safeParse(site).success).toBe(true);
		expect(isStepComplete('site', { site })).toBe(true);
		const data: SurveyData = { site: { ...site, contactName: '' } };
		expect(isStepComplete('site', data)).toBe(false);
		expect(stepProblems('site', data)).toEqual(['Enter who showed you the site.']);
	});

	it('an impossible day keeps the operation step incomplete, with a message in the wizard’s words', () => {
		const data = { operation: { ...goodOperation, shiftsPerDay: 4, hoursPerShift: 12 } } as SurveyData;
		expect(isStepComplete('operation', data)).toBe(false);
		const [problem] = stepProblems('operation', data);
		expect(problem).not.toMatch(/operation\.|hoursPerShift|\.\.$/);
	});
});

describe('draft lists', () => {
	it('take as many rows as the step schema allows, and no more', () => {
		const row = { forkLengthMm: 1150, overallWidthMm: 540, capacityKg: 2000 };
		expect(parseDraftStep('equipment', { palletTrucks: Array(20).fill(row) }).errors).toEqual({});
		const tooMany = parseDraftStep('equipment', { palletTrucks: Array(21).fill(row) });
		expect(tooMany.errors.palletTrucks).toEqual(['Up to 20 of these per survey.']);
		expect(tooMany.values).not.toHaveProperty('palletTrucks');
		expect(parseDraftStep('equipment', { rollerStands: Array(41).fill({ kind: 'stand' }) }).errors.rollerStands).toEqual(['Up to 40 of these per survey.']);
	});
});
