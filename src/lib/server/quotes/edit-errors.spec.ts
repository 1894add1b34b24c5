import { describe, expect, it } from 'vitest';
import { quoteEditSchema } from '$lib/schemas/quote';
import { describeEditIssues } from './edit-errors';

const body = (over: Record<string, unknown> = {}) => ({
	lines: [
		{ sku: 'TW-B4-25', quantity: 14, discountPercent: 0 },
		{ sku: 'TW-B48-775-LA', quantity: 6, discountPercent: 150 }
	],
	overallDiscountPercent: 3,
	taxRegion: 'WA',
	notes: 'Deliver in two lots.',
	contactName: 'Dana',
	contactEmail: 'dana@example.test',
	...over
});

describe('a refused draft edit', () => {
	it('says which line and which range, and keys the message to the field', () => {
		const raw = body();
		const parsed = quoteEditSchema.safeParse(raw);
		expect(parsed.success).toBe(false);
		const { error, errors } = describeEditIssues(parsed.error!.issues, raw);
		expect(error).toBe('Line 2 (TW-B48-775-LA), discount: A discount cannot exceed 100 %: enter 0 to 100 %.');
		expect(Object.keys(errors)).toEqual(['lines.1.discountPercent']);
	});
	it('names the overall discount, an empty quantity and counts the rest', () => {
		const raw = body({ overallDiscountPercent: -2, lines: [{ sku: 'TW-B4-25', quantity: null, discountPercent: 0 }] });
		const { error, errors } = describeEditIssues(quoteEditSchema.safeParse(raw).error!.issues, raw);
		expect(errors['lines.0.quantity'][0]).toMatch(/0 to 10 000/);
		expect(errors.overallDiscountPercent[0]).toMatch(/cannot be negative/);
		expect(error).toMatch(/and 1 more field to correct/);
	});
	it('copes with a body that is not an edit at all', () => {
		const { error } = describeEditIssues(quoteEditSchema.safeParse('nope').error!.issues, 'nope');
		expect(error).toMatch(/^The edit: /);
	});
});
