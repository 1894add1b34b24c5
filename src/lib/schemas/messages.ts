/**
 * Plain-language messages for the checks a schema states without words of its own (a bare
 * `.max(120)`, a number where text came): people never see a validator's own phrasing such as
 * "Too big: expected string to have <=120 characters". A message written in a schema still wins.
 * Imported once by the server (hooks.server.ts): the browser shows the messages the server sends.
 */
import { z } from 'zod';

const n = (v: number | bigint) => Number(v).toLocaleString('en-US');

export const plainError: z.core.$ZodErrorMap = (issue) => {
	switch (issue.code) {
		case 'too_big': {
			const max = n(issue.maximum);
			if (issue.origin === 'string') return `Keep this to ${max} characters or fewer.`;
			if (issue.origin === 'array' || issue.origin === 'set') return `Keep this to ${max} entries or fewer.`;
			if (issue.origin === 'file') return `Choose a file of at most ${max} bytes.`;
			return issue.inclusive === false ? `Enter a number below ${max}.` : `Enter a number no higher than ${max}.`;
		}
		case 'too_small': {
			const min = n(issue.minimum);
			if (issue.origin === 'string') return Number(issue.minimum) <= 1 ? 'Fill this in.' : `Use at least ${min} characters.`;
			if (issue.origin === 'array' || issue.origin === 'set') return `Add at least ${min} ${Number(issue.minimum) === 1 ? 'entry' : 'entries'}.`;
			return issue.inclusive === false ? `Enter a number above ${min}.` : `Enter a number no lower than ${min}.`;
		}
		case 'invalid_type':
			if (issue.expected === 'int') return 'Enter a whole number.';
			if (issue.expected === 'number') return 'Enter a number.';
			if (issue.expected === 'string') return 'Enter text here.';
			if (issue.expected === 'boolean') return 'Choose yes or no.';
			if (issue.expected === 'array') return 'Choose from the list.';
			return 'This value is missing or not the right kind.';
		case 'invalid_value':
			return 'Choose one of the offered options.';
		case 'invalid_format':
			if (issue.format === 'email') return 'Enter a valid e-mail address.';
			if (issue.format === 'uuid' || issue.format === 'guid') return 'Choose from the list.';
			return 'Check the format of this value.';
		case 'not_multiple_of':
			return issue.divisor === 1 ? 'Enter a whole number.' : `Enter a multiple of ${n(issue.divisor as number)}.`;
		case 'unrecognized_keys':
			return `Remove the unknown field${issue.keys.length === 1 ? '' : 's'}: ${issue.keys.join(', ')}.`;
		default:
			return undefined;
	}
};

z.config({ customError: plainError });
