/**
 * Writing a price-book version as CSV in exactly the form the upload reads (price-book-csv.ts):
 * the header `sku,description,kind,list_price,cost`, prices as decimal dollars with two decimals,
 * CRLF line ends. Pure. Downloading a version, editing it and uploading it again gives the same
 * items.
 *
 * Fields are quoted only when they must be (a comma, quote or line break; a leading or trailing
 * space, which the reader would trim). Nothing is prefixed to defuse spreadsheet formulas: the
 * file's only author is an admin, and a prefix would change the descriptions on re-upload.
 */
import { PRICE_BOOK_COLUMNS } from './price-book-csv';
import type { LineKind } from './pricing';

export interface ExportItem {
	sku: string;
	description: string;
	kind: LineKind;
	/** cents */
	listCents: number;
	/** cents */
	costCents: number;
}

/** Cents as decimal dollars, digit by digit: 123450 → "1234.50", 5 → "0.05". */
export function centsToDecimal(cents: number): string {
	if (!Number.isSafeInteger(cents) || cents < 0)
		throw new RangeError(`not an amount in cents: ${cents}`);
	const text = String(cents).padStart(3, '0');
	return `${text.slice(0, -2)}.${text.slice(-2)}`;
}

function field(value: string): string {
	return /[",\r\n]|^\s|\s$/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/** The CSV text of a version's items, in the given order. */
export function formatPriceBookCsv(items: readonly ExportItem[]): string {
	const lines = [PRICE_BOOK_COLUMNS.join(',')];
	for (const item of items) {
		lines.push(
			[
				field(item.sku),
				field(item.description),
				item.kind,
				centsToDecimal(item.listCents),
				centsToDecimal(item.costCents)
			].join(',')
		);
	}
	return lines.join('\r\n') + '\r\n';
}
