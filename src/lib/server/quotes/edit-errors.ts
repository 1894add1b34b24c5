/**
 * A refused draft edit as the quote page shows it: every message under the field it is about
 * (`lines.3.discountPercent`, `overallDiscountPercent`, …) and one summary sentence naming the first
 * field in words ("Line 4 (TW-B48-775-LA), discount: …"), so a page without script still says which.
 */
import { fieldErrors } from '../evaluation';

export type EditErrors = Record<string, string[]>;

const FIELD_NAMES: Record<string, string> = {
	overallDiscountPercent: 'Overall discount',
	taxRegion: 'Tax region',
	notes: 'Notes',
	contactName: 'Customer contact',
	contactEmail: 'Contact e-mail',
	lines: 'Lines'
};
const LINE_FIELD_NAMES: Record<string, string> = { quantity: 'quantity', discountPercent: 'discount', sku: 'item' };

/** "Line 4 (TW-B48-775-LA), discount" for `lines.3.discountPercent`; the field's name otherwise. */
export function fieldName(key: string, rawLines: unknown): string {
	const parts = key.split('.');
	if (parts[0] === 'lines' && parts.length >= 2 && /^\d+$/.test(parts[1])) {
		const i = Number(parts[1]);
		const raw = Array.isArray(rawLines) ? (rawLines[i] as { sku?: unknown } | undefined) : undefined;
		const sku = raw && typeof raw.sku === 'string' && raw.sku.length <= 64 ? ` (${raw.sku})` : '';
		const what = parts[2] ? `, ${LINE_FIELD_NAMES[parts[2]] ?? parts[2]}` : '';
		return `Line ${i + 1}${sku}${what}`;
	}
	return FIELD_NAMES[parts[0]] ?? (parts[0] === '(body)' ? 'The edit' : parts[0]);
}

/** Field errors and the summary for zod issues on a draft edit (`raw` is the body as received). */
export function describeEditIssues(
	issues: readonly { path: readonly PropertyKey[]; message: string }[],
	raw: unknown
): { error: string; errors: EditErrors } {
	const errors = fieldErrors(issues);
	const rawLines = raw && typeof raw === 'object' ? (raw as { lines?: unknown }).lines : undefined;
	const first = Object.entries(errors)[0];
	const error = first ? `${fieldName(first[0], rawLines)}: ${first[1][0]}` : 'Check the lines and figures.';
	const more = Object.keys(errors).length - 1;
	return { error: more > 0 ? `${error} (and ${more} more field${more === 1 ? '' : 's'} to correct)` : error, errors: { ...errors } };
}
