import { z } from 'zod';

// Control characters never belong in quote text (PostgreSQL cannot even store NUL); notes and
// comments keep tabs and line breaks.
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f]/;
const PLAIN = 'Use plain text, without control characters.';
const plain = <T extends z.ZodType<string>>(schema: T) => schema.refine((v) => !CONTROL.test(v), PLAIN);

/** A percentage typed by a person ("12.5") as whole basis points (1 250). */
export const percentBp = z
	.number({ error: 'Enter a discount from 0 to 100 %.' })
	.min(0, 'A discount cannot be negative: enter 0 to 100 %.')
	.max(100, 'A discount cannot exceed 100 %: enter 0 to 100 %.')
	.transform((v) => Math.round(v * 100));

/** The largest quantity on one line. */
export const MAX_LINE_QUANTITY = 10_000;

export const quoteLineEditSchema = z.object({
	sku: plain(z.string().trim().min(1, 'Every line needs its SKU.').max(64)),
	quantity: z
		.number({ error: 'Enter a quantity: a whole number from 0 to 10 000.' })
		.int('Quantities are whole numbers from 0 to 10 000.')
		.min(0, 'A quantity cannot be negative: enter 0 to 10 000.')
		.max(MAX_LINE_QUANTITY, 'A quantity cannot exceed 10 000 on one line.'),
	discountPercent: percentBp
});

/** The rep's edits to a draft: prices never come from the browser, only SKUs, quantities and discounts. */
export const quoteEditSchema = z.object({
	lines: z.array(quoteLineEditSchema).min(1, 'A quote needs at least one line.').max(200),
	overallDiscountPercent: percentBp,
	taxRegion: plain(z.string().trim().max(20, 'Choose a tax region from the list.')).nullable(),
	notes: plain(z.string().max(4_000, 'Keep the notes under 4 000 characters.')),
	contactName: plain(z.string().trim().max(120, 'Keep the contact name under 120 characters.')),
	contactEmail: z.union([z.literal(''), z.string().trim().email('Enter a valid e-mail address.').max(254)])
});
export type QuoteEdit = z.input<typeof quoteEditSchema>;

export const quoteActionSchema = z.object({
	action: z.enum(['submit', 'approve', 'request-changes', 'mark-ready', 'send', 'revise']),
	comment: plain(z.string().trim().max(2_000)).optional()
});

export const quoteListQuerySchema = z.object({
	state: z.enum(['draft', 'awaiting-approval', 'approved', 'changes-requested', 'sent', 'viewed', 'accepted', 'deposit-paid', 'expired', 'superseded']).optional().catch(undefined),
	owner: z.uuid().optional().catch(undefined),
	customer: z.string().trim().max(100).optional().catch(undefined),
	from: z.iso.date().optional().catch(undefined),
	to: z.iso.date().optional().catch(undefined),
	sort: z.enum(['updated', 'created', 'total', 'customer', 'number']).optional().catch(undefined),
	dir: z.enum(['asc', 'desc']).optional().catch(undefined),
	page: z.coerce.number().int().min(1).max(10_000).optional().catch(undefined)
});
