/** The label and effective date of a price-book version, typed on /admin/price-book. */
import { z } from 'zod';

// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/;

/** True for a real calendar date written YYYY-MM-DD between the years 2000 and 2100. */
export function isIsoDate(text: string): boolean {
	const match = /^(\d{4})-(\d{2})-(\d{2})$/.exec(text);
	if (!match) return false;
	const [year, month, day] = match.slice(1).map(Number);
	if (year < 2000 || year > 2100) return false;
	const date = new Date(Date.UTC(year, month - 1, day));
	return date.getUTCMonth() === month - 1 && date.getUTCDate() === day;
}

export const versionSchema = z.object({
	label: z
		.string()
		.trim()
		.min(1, 'Give the version a name, like “Spring price list”.')
		.max(120, 'Keep the name to 120 characters.')
		.refine((v) => !CONTROL.test(v), 'The name must be one line of plain text.'),
	effectiveDate: z
		.string()
		.trim()
		.refine(isIsoDate, 'Enter the date the prices take effect, like 2026-04-01.')
});
export type VersionForm = z.infer<typeof versionSchema>;

/** Largest price-book upload, bytes (2 MiB). */
export const MAX_PRICE_BOOK_BYTES = 2 * 1024 * 1024;
