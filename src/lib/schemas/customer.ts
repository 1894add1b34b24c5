import { z } from 'zod';

// Control characters never belong in these fields (PostgreSQL text cannot even hold NUL);
// notes may keep tabs and line breaks.
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
const CONTROL_OR_BREAK = /[\u0000-\u001f\u007f]/;
const PLAIN = 'Use plain text, without control characters.';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** A required one-line text field. */
function line(label: string, max: number) {
	return z
		.string()
		.trim()
		.min(1, `Enter the ${label}.`)
		.max(max, `Keep the ${label} to ${max} characters or fewer.`)
		.refine((v) => !CONTROL_OR_BREAK.test(v), PLAIN);
}

/** An optional one-line text field ('' when left empty). */
function optionalLine(label: string, max: number, pattern?: RegExp, patternMessage?: string) {
	return z
		.string()
		.trim()
		.max(max, `Keep the ${label} to ${max} characters or fewer.`)
		.refine((v) => !CONTROL_OR_BREAK.test(v), PLAIN)
		.refine((v) => v === '' || !pattern || pattern.test(v), patternMessage ?? PLAIN)
		.default('');
}

export const customerSchema = z.object({
	name: line('customer name', 160),
	accountNumber: optionalLine(
		'account number',
		40,
		/^[A-Za-z0-9][A-Za-z0-9./ -]*$/,
		'Account numbers use letters, digits, spaces and . / - only.'
	),
	notes: z
		.string()
		.trim()
		.max(4000, 'Keep the notes to 4000 characters or fewer.')
		.refine((v) => !CONTROL.test(v), PLAIN)
		.default('')
});
export type CustomerInput = z.infer<typeof customerSchema>;

/** Short tax region codes: `WA`, `EU-DE`, `CA-ON`, `US-WA-KNG`. */
export const REGION_CODE = /^[A-Z0-9]{1,4}(?:-[A-Z0-9]{1,4}){0,2}$/;

export const siteSchema = z.object({
	name: line('site name', 120),
	addressLine1: line('street address', 200),
	addressLine2: optionalLine('second address line', 200),
	city: line('town or city', 100),
	postalCode: optionalLine(
		'postal code',
		16,
		/^[A-Za-z0-9][A-Za-z0-9 -]*$/,
		'Postal codes use letters, digits, spaces and hyphens only.'
	),
	country: line('country', 60),
	regionCode: z
		.string()
		.trim()
		.toUpperCase()
		.max(14, 'Use a short region code such as WA or EU-DE.')
		.refine((v) => v === '' || REGION_CODE.test(v), 'Use a short region code such as WA or EU-DE: letters and digits, parts joined by a hyphen.')
		.default('')
});
export type SiteInput = z.infer<typeof siteSchema>;

const PHONE = /^\+?[0-9 ().\/-]+(?:\s*(?:x|ext\.?)\s*[0-9]{1,6})?$/i;

export const contactSchema = z
	.object({
		name: line('contact’s name', 120),
		roleTitle: optionalLine('role or title', 120),
		email: z
			.string()
			.trim()
			.max(254, 'Keep the e-mail address to 254 characters or fewer.')
			.refine((v) => v === '' || z.email().safeParse(v).success, 'Enter a valid e-mail address, like name@example.com.')
			.default(''),
		phone: z
			.string()
			.trim()
			.max(32, 'Keep the phone number to 32 characters or fewer.')
			.refine(
				(v) => v === '' || (PHONE.test(v) && (v.match(/[0-9]/g) ?? []).length >= 5),
				'Enter a phone number with at least 5 digits; use digits, spaces and + ( ) - . only.'
			)
			.default(''),
		siteId: z
			.string()
			.trim()
			.refine((v) => v === '' || UUID.test(v), 'Choose a site from the list.')
			.default('')
	})
	.superRefine((c, ctx) => {
		if (c.email === '' && c.phone === '') {
			ctx.addIssue({ code: 'custom', path: ['email'], message: 'Give an e-mail address or a phone number.' });
		}
	});
export type ContactInput = z.infer<typeof contactSchema>;

export const CUSTOMER_SORTS = ['name', 'created', 'updated'] as const;
export type CustomerSort = (typeof CUSTOMER_SORTS)[number];

/** Names sort A→Z by default; dates newest first. */
export function defaultDirection(sort: CustomerSort): 'asc' | 'desc' {
	return sort === 'name' ? 'asc' : 'desc';
}

/**
 * The customer list's URL parameters. Anything odd falls back to the default rather than
 * failing: a hand-edited URL still shows the list.
 */
export const customerListQuerySchema = z.object({
	q: z
		.string()
		.catch('')
		.transform((v) => v.replace(/[\u0000-\u001f\u007f]/g, ' ').trim().slice(0, 100)),
	sort: z.enum(CUSTOMER_SORTS).catch('name'),
	dir: z.enum(['asc', 'desc']).optional().catch(undefined),
	page: z.coerce.number().int().min(1).max(100_000).catch(1)
});
export type CustomerListQuery = z.infer<typeof customerListQuerySchema>;

/** `GET /api/v1/customers` query: a bad value answers 400 with the field's message. */
export const customerPickerQuerySchema = z.object({
	q: z
		.string()
		.max(100, 'Search for at most 100 characters.')
		.refine((v) => !CONTROL_OR_BREAK.test(v), PLAIN)
		.default(''),
	limit: z.coerce
		.number({ message: 'limit must be a whole number from 1 to 50.' })
		.int('limit must be a whole number from 1 to 50.')
		.min(1, 'limit must be a whole number from 1 to 50.')
		.max(50, 'limit must be a whole number from 1 to 50.')
		.default(20)
});
