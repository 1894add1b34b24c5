import { describe, expect, it } from 'vitest';
import { z } from 'zod';
import './messages';
import { userCreateSchema } from './auth';

const first = (r: { success: boolean; error?: z.ZodError }) => r.error?.issues[0]?.message;

describe('messages for checks a schema states without words', () => {
	it('a name over 120 characters says how long it may be, in plain words', () => {
		const r = userCreateSchema.safeParse({ name: 'x'.repeat(121), email: 'a@b.example', role: 'rep', password: 'long-enough-pass' });
		expect(first(r)).toBe('Keep this to 120 characters or fewer.');
	});
	it('numbers, arrays, choices and types', () => {
		expect(first(z.number().max(7).safeParse(9))).toBe('Enter a number no higher than 7.');
		expect(first(z.number().positive().safeParse(0))).toBe('Enter a number above 0.');
		expect(first(z.number().min(1).safeParse(0))).toBe('Enter a number no lower than 1.');
		expect(first(z.number().int().safeParse(1.5))).toBe('Enter a whole number.');
		expect(first(z.array(z.string()).max(2).safeParse(['a', 'b', 'c']))).toBe('Keep this to 2 entries or fewer.');
		expect(first(z.enum(['rep', 'manager']).safeParse('boss'))).toBe('Choose one of the offered options.');
		expect(first(z.number().safeParse('12'))).toBe('Enter a number.');
		expect(first(z.string().min(1).safeParse(''))).toBe('Fill this in.');
		expect(first(z.string().max(5000).safeParse('x'.repeat(5001)))).toBe('Keep this to 5,000 characters or fewer.');
	});
	it('a message written in the schema still wins', () => {
		expect(first(z.string().max(3, 'Three at most.').safeParse('four'))).toBe('Three at most.');
	});
});
