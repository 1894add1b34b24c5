/**
 * Company settings and tax rates, as typed on /admin/settings. Percentages are typed as text
 * ("10", "10 %", "7.25") and stored as whole basis points; `settingsInput` and `taxRateInput`
 * turn a valid form into the numbers the repository stores.
 */
import { z } from 'zod';
import { parsePercentBp } from '../percent';

/** 100 % in basis points: no rate here may exceed the whole. */
const MAX_BP = 10_000;

/** Tax region codes: letters and digits, up to three parts joined by hyphens (`HB`, `EU-DE`). */
export const REGION_CODE = /^[A-Z0-9]{1,8}(?:-[A-Z0-9]{1,8}){0,2}$/;

/** Currencies a quote can be in; one for now (the price book is in US dollars). */
export const CURRENCIES = ['USD'] as const;

// C0/C1 control characters other than line breaks and tabs
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u0008\u000b\u000c\u000e-\u001f\u007f-\u009f]/;
// eslint-disable-next-line no-control-regex
const LINE_BREAK_OR_CONTROL = /[\u0000-\u001f\u007f-\u009f]/;

const oneLine = (what: string, max: number) =>
	z
		.string()
		.trim()
		.min(1, `Enter the ${what}.`)
		.max(max, `Keep the ${what} to ${max} characters.`)
		.refine((v) => !LINE_BREAK_OR_CONTROL.test(v), `The ${what} must be one line of plain text.`);

/** A percentage between 0 and 100 %, typed as "10" or "10 %"; two decimals at most. */
const percentField = (what: string) =>
	z
		.string()
		.trim()
		.max(20, `Enter the ${what} as a percentage, like 10 %.`)
		.superRefine((text, ctx) => {
			const parsed = parsePercentBp(text);
			if (!parsed.ok) ctx.addIssue({ code: 'custom', message: parsed.message });
			else if (parsed.bp > MAX_BP)
				ctx.addIssue({
					code: 'custom',
					message: `The ${what} must be between 0 and 100 %; ${text.replace(/\s*%$/, '')} % is more than the whole.`
				});
		});

function isTimeZone(name: string): boolean {
	try {
		new Intl.DateTimeFormat('en-US', { timeZone: name });
		return true;
	} catch {
		return false;
	}
}

const PHONE = /^\+?[0-9 ().\/-]{3,}(?:\s*(?:x|ext\.?)\s*[0-9]{1,6})?$/i;

export const settingsSchema = z.object({
	dealerName: oneLine('dealer name', 120),
	address: z
		.string()
		.trim()
		.min(1, 'Enter the dealer’s address; it prints on every quote.')
		.max(400, 'Keep the address to 400 characters.')
		.refine((v) => v.split(/\r?\n/).length <= 6, 'Keep the address to 6 lines.')
		.refine((v) => !CONTROL.test(v), 'The address must be plain text.'),
	phone: z
		.string()
		.trim()
		.max(40, 'Keep the phone number to 40 characters.')
		.refine(
			(v) => v === '' || PHONE.test(v),
			'Enter a phone number of digits, spaces and + ( ) - .'
		),
	email: z
		.string()
		.trim()
		.toLowerCase()
		.max(254, 'Keep the e-mail address to 254 characters.')
		.email('Enter a valid e-mail address, like quotes@example.test.'),
	repDiscountAuthority: percentField('rep discount authority'),
	marginFloor: percentField('margin floor'),
	depositShare: percentField('deposit share'),
	quoteValidityDays: z
		.number({ error: 'Enter a whole number of days from 1 to 365.' })
		.int('Enter a whole number of days from 1 to 365.')
		.min(1, 'A quote must stay valid for at least 1 day.')
		.max(365, 'A quote can stay valid for at most 365 days.'),
	termsText: z
		.string()
		.trim()
		.max(10_000, 'Keep the terms to 10,000 characters.')
		.refine((v) => !CONTROL.test(v), 'The terms must be plain text.'),
	currency: z.enum(CURRENCIES, { error: 'Quotes are in US dollars (USD) for now.' }),
	timeZone: z
		.string()
		.trim()
		.min(1, 'Choose a time zone.')
		.max(64, 'Choose a time zone from the list.')
		.refine(isTimeZone, 'Choose a time zone from the list.')
});
export type SettingsForm = z.infer<typeof settingsSchema>;

export const taxRateSchema = z.object({
	regionCode: z
		.string()
		.trim()
		.toUpperCase()
		.min(1, 'Enter a region code, like HB.')
		.max(26, 'Use a short region code, like HB or EU-DE.')
		.regex(REGION_CODE, 'Use letters and digits, parts joined by a hyphen (like HB or EU-DE).'),
	label: oneLine('region name', 120),
	rate: percentField('tax rate')
});
export type TaxRateForm = z.infer<typeof taxRateSchema>;

export const taxRateUpdateSchema = taxRateSchema.extend({ id: z.string().uuid() });

/** What the repository stores for valid settings: rates in basis points. */
export interface CompanySettingsInput {
	dealerName: string;
	address: string;
	phone: string;
	email: string;
	repDiscountAuthorityBp: number;
	marginFloorBp: number;
	depositShareBp: number;
	quoteValidityDays: number;
	termsText: string;
	currency: string;
	timeZone: string;
}

function bp(text: string): number {
	const parsed = parsePercentBp(text);
	if (!parsed.ok) throw new RangeError(`not a valid percentage: ${text}`);
	return parsed.bp;
}

/** A validated settings form as stored values (percentages → basis points, line breaks → \n). */
export function settingsInput(form: SettingsForm): CompanySettingsInput {
	return {
		dealerName: form.dealerName,
		address: form.address.replace(/\r\n?/g, '\n'),
		phone: form.phone,
		email: form.email,
		repDiscountAuthorityBp: bp(form.repDiscountAuthority),
		marginFloorBp: bp(form.marginFloor),
		depositShareBp: bp(form.depositShare),
		quoteValidityDays: form.quoteValidityDays,
		termsText: form.termsText.replace(/\r\n?/g, '\n'),
		currency: form.currency,
		timeZone: form.timeZone
	};
}

/** A validated tax-rate form as stored values. */
export function taxRateInput(form: TaxRateForm): {
	regionCode: string;
	label: string;
	rateBp: number;
} {
	return { regionCode: form.regionCode, label: form.label, rateBp: bp(form.rate) };
}
