import { describe, expect, it } from 'vitest';
import { evaluateProblems, listSentence, surveyProgress } from './survey-progress';
import type { SurveyData } from './schemas/survey';

const CUSTOMER = '5f2b8a9e-1c3d-4e5f-8a7b-9c0d1e2f3a4b';
const SITE = '6a3c9b0f-2d4e-4f60-9b8c-0d1e2f3a4b5c';
const TRUCK = '7b4d0c1a-3e5f-4071-8c9d-1e2f3a4b5c6d';
const BATTERY = '8c5e1d2b-4f60-4182-9d0e-2f3a4b5c6d7e';

/** A survey with every step saved and complete. */
const complete = (): SurveyData => ({
	site: { customerId: CUSTOMER, siteId: SITE, contactName: 'Dale Prentice', contactEmail: '', contactPhone: '', surveyDate: '2026-12-02' },
	fleet: { truckModelId: TRUCK, trucks: 4, batterySource: 'catalogue', batteryId: BATTERY, measured: null },
	operation: { shiftsPerDay: 2, hoursPerShift: 8, daysPerWeek: 5, duty: 'medium', energyKwhPerHour: 3.5, charging: 'conventional' },
	equipment: { palletTrucks: [], rollerStands: [], hasCrane: false, craneRatedLoadKg: null, hasBeam: false, beamWeightKg: null },
	charging: { hasArea: false, floorAreaM2: null, ventilationM3h: null, eyewash: false, neutraliser: false },
	notes: { notes: '' }
});

describe('survey progress', () => {
	it('ticks the review only when every step is complete', () => {
		const all = surveyProgress(complete());
		expect(all.complete).toEqual({ site: true, fleet: true, operation: true, equipment: true, charging: true, notes: true, review: true });
		expect(all.incomplete).toEqual([]);
	});

	it('does not tick the notes step (or the review) before the notes step has been saved', () => {
		const { notes: _, ...rest } = complete();
		const p = surveyProgress(rest);
		expect(p.complete.notes).toBe(false);
		expect(p.complete.review).toBe(false);
		expect(p.incomplete).toEqual([{ step: 'notes', problems: ['Not filled in yet.'] }]);
	});

	it('an impossible day is an incomplete operation step, for the review as for the indicator', () => {
		const data = complete();
		data.operation = { ...data.operation, shiftsPerDay: 4, hoursPerShift: 12 };
		const p = surveyProgress(data);
		expect(p.complete.operation).toBe(false);
		expect(p.complete.review).toBe(false);
		expect(p.incomplete[0].step).toBe('operation');
		expect(p.incomplete[0].problems[0]).toMatch(/^4 shifts × 12 h makes 48 hours a day/);
	});
});

describe('what the engine still needs, in the wizard’s words', () => {
	it('names fields by their labels, never by their internal keys, with one full stop', () => {
		const lines = evaluateProblems({ 'operation.hoursPerShift': ['Shifts × hours per shift cannot exceed 24 hours a day.'] });
		expect(lines).toEqual(['Hours per shift — Shifts × hours per shift cannot exceed 24 hours a day']);
		const sentence = listSentence(lines);
		expect(sentence).not.toMatch(/operation\.|hoursPerShift/);
		expect(sentence.endsWith('day.')).toBe(true);
		expect(sentence).not.toMatch(/\.\.$/);
	});

	it('labels the other parts of the request', () => {
		expect(
			evaluateProblems({
				'truck.modelId': ['No such truck model.'],
				'fleet.trucks': ['The number of trucks must be at most 500.'],
				'site.palletTrucks.0.forkLengthMm': ['The fork length must be at most 3,000.'],
				'site.chargingArea.floorAreaM2': ['The floor area must be more than zero.']
			}).map((l) => l.split(' — ')[0])
		).toEqual(['Truck model', 'How many trucks', 'Pallet trucks', 'Charging area']);
	});

	it('joins short names with commas and sentences with semicolons, ending with one full stop', () => {
		expect(listSentence(['truck model', 'battery'])).toBe('truck model, battery.');
		expect(listSentence(['Hours per shift — too long.', 'battery'])).toBe('Hours per shift — too long; battery.');
		expect(listSentence([])).toBe('');
	});
});
