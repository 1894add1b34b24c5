/**
 * Reading a price-book upload: a CSV file with the header `sku,description,kind,list_price,cost`,
 * one price-book item per row. Pure; the caller stores the items as a new draft version only when
 * the whole file is good (all or nothing).
 *
 * Rows are numbered as a spreadsheet shows them: the header is row 1, the first item row 2; blank
 * rows are skipped but still counted. Every problem is collected, not just the first, each with its
 * row and column. Checks:
 * - the file is not empty and has at least one item row;
 * - the header names each of the five columns exactly once (any order, any letter case) and nothing
 *   else;
 * - each row has as many fields as the header;
 * - `sku`: 1–64 characters of letters, digits and `. _ - /`; unique in the file, ignoring case;
 * - `description`: 1–200 characters on one line;
 * - `kind`: one of the quote line kinds (pricing.ts), any letter case;
 * - `list_price`, `cost`: dollars such as `1234.50`, `1234.5`, `1234`, `1,234.50` or `$1,234.50` —
 *   digits (thousands in groups of three), an optional point and at most two decimals, no sign —
 *   read as the price forms read them (`parseMoney`), to cents digit by digit, never through a float.
 * Spaces around a field are ignored.
 */
import { parseMoney } from '../../money';
import { parseCsv } from './csv';
import { LINE_KINDS, type LineKind } from './pricing';

export const PRICE_BOOK_COLUMNS = ['sku', 'description', 'kind', 'list_price', 'cost'] as const;
export type PriceBookColumn = (typeof PRICE_BOOK_COLUMNS)[number];

export interface PriceBookItem {
	/** the spreadsheet row it came from */
	row: number;
	sku: string;
	description: string;
	kind: LineKind;
	/** list price of one unit, cents */
	listCents: number;
	/** dealer's cost of one unit, cents */
	costCents: number;
}

export interface PriceBookError {
	/** spreadsheet row, or null for the file as a whole */
	row: number | null;
	column: PriceBookColumn | null;
	/** a full sentence for the admin, starting with "Row n:" when it concerns a row */
	message: string;
}

export type PriceBookResult =
	{ ok: true; items: PriceBookItem[] } | { ok: false; errors: PriceBookError[] };

export const MAX_SKU_LENGTH = 64;
export const MAX_DESCRIPTION_LENGTH = 200;
/** Largest price accepted, in cents: $99,999,999.99, far beyond any truck, to catch typos. */
export const MAX_PRICE_CENTS = 9_999_999_999;

const SKU = /^[A-Za-z0-9._\-/]+$/;
// C0 and C1 control characters, including line breaks and tabs
// eslint-disable-next-line no-control-regex
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/;

/**
 * Dollars → cents, exactly, by the same rule as the price forms (`parseMoney`): `1234.50`, `1234`,
 * `1,234.50` (thousands in groups of three, as spreadsheets export them) and a leading `$`; null
 * when the text is not such a price. Beyond MAX_PRICE_CENTS it comes back as Infinity.
 */
function parsePriceCents(text: string): number | null {
	if (!/^\$?[\d,]*(\.\d*)?$/.test(text)) return null; // no spaces, signs or exponents inside a cell
	const parsed = parseMoney(text);
	if (!parsed.ok) return /too large/.test(parsed.message) ? Number.POSITIVE_INFINITY : null;
	return parsed.cents;
}

function quoted(value: string): string {
	return `"${value.length > 40 ? `${value.slice(0, 40)}…` : value}"`;
}

/**
 * Parse and check a price-book CSV upload. Returns every item, or every problem found; never a
 * partial list. See the module comment for the rules.
 */
export function parsePriceBookCsv(text: string): PriceBookResult {
	const csv = parseCsv(text);
	if (!csv.ok) return { ok: false, errors: [{ row: csv.row, column: null, message: csv.message }] };

	const isBlank = (record: string[]) => record.every((field) => field.trim() === '');
	const records = csv.records;
	if (records.every(isBlank)) {
		return {
			ok: false,
			errors: [
				{
					row: null,
					column: null,
					message: `The file is empty; the first row must be the header ${PRICE_BOOK_COLUMNS.join(',')}`
				}
			]
		};
	}

	// the header is the first non-blank row (normally row 1)
	const headerIndex = records.findIndex((r) => !isBlank(r));
	const headerRow = headerIndex + 1;
	const names = records[headerIndex].map((name) => name.trim().toLowerCase());
	const errors: PriceBookError[] = [];
	const position = new Map<PriceBookColumn, number>();
	names.forEach((name, index) => {
		if (!(PRICE_BOOK_COLUMNS as readonly string[]).includes(name)) {
			errors.push({
				row: headerRow,
				column: null,
				message:
					name === ''
						? `Row ${headerRow}: column ${index + 1} of the header has no name`
						: `Row ${headerRow}: unknown column ${quoted(name)}; the columns are ${PRICE_BOOK_COLUMNS.join(',')}`
			});
			return;
		}
		const column = name as PriceBookColumn;
		if (position.has(column)) {
			errors.push({
				row: headerRow,
				column,
				message: `Row ${headerRow}: the column ${column} appears twice in the header`
			});
			return;
		}
		position.set(column, index);
	});
	for (const column of PRICE_BOOK_COLUMNS) {
		if (!position.has(column)) {
			errors.push({
				row: headerRow,
				column,
				message: `Row ${headerRow}: the header has no ${column} column; it must be ${PRICE_BOOK_COLUMNS.join(',')}`
			});
		}
	}
	if (errors.length > 0) return { ok: false, errors };

	const items: PriceBookItem[] = [];
	const firstRowOfSku = new Map<string, number>();
	for (let index = headerIndex + 1; index < records.length; index++) {
		const record = records[index];
		const row = index + 1;
		if (isBlank(record)) continue;
		if (record.length !== names.length) {
			errors.push({
				row,
				column: null,
				message: `Row ${row}: has ${record.length} fields but the header has ${names.length}; a comma inside a field needs quotes around the field`
			});
			continue;
		}
		const rowErrors: PriceBookError[] = [];
		const fail = (column: PriceBookColumn, message: string) =>
			rowErrors.push({ row, column, message: `Row ${row}: ${message}` });
		const value = (column: PriceBookColumn) => record[position.get(column) ?? 0].trim();

		const sku = value('sku');
		if (sku === '') fail('sku', 'sku is empty');
		else if (sku.length > MAX_SKU_LENGTH)
			fail('sku', `sku ${quoted(sku)} is longer than ${MAX_SKU_LENGTH} characters`);
		else if (!SKU.test(sku))
			fail('sku', `sku ${quoted(sku)} may use only letters, digits and . _ - / (no spaces)`);
		else {
			const key = sku.toUpperCase();
			const first = firstRowOfSku.get(key);
			if (first !== undefined) fail('sku', `sku ${quoted(sku)} repeats the sku of row ${first}`);
			else firstRowOfSku.set(key, row);
		}

		const description = value('description');
		if (description === '') fail('description', 'description is empty');
		else if (CONTROL.test(description))
			fail('description', 'description must be a single line of text');
		else if (description.length > MAX_DESCRIPTION_LENGTH)
			fail('description', `description is longer than ${MAX_DESCRIPTION_LENGTH} characters`);

		const kindText = value('kind');
		const kind = kindText.toLowerCase();
		if (kindText === '') fail('kind', `kind is empty; use one of ${LINE_KINDS.join(', ')}`);
		else if (!(LINE_KINDS as readonly string[]).includes(kind))
			fail('kind', `kind ${quoted(kindText)} is not one of ${LINE_KINDS.join(', ')}`);

		const prices = {} as Record<'list_price' | 'cost', number>;
		for (const column of ['list_price', 'cost'] as const) {
			const text = value(column);
			const cents = text === '' ? null : parsePriceCents(text);
			if (text === '') fail(column, `${column} is empty; write a price like 1234.50`);
			else if (cents === null)
				fail(column, `${column} ${quoted(text)} is not a price like 1234.50`);
			else if (cents > MAX_PRICE_CENTS)
				fail(column, `${column} ${quoted(text)} is larger than 99999999.99`);
			else prices[column] = cents;
		}

		if (rowErrors.length > 0) {
			errors.push(...rowErrors);
			continue;
		}
		items.push({
			row,
			sku,
			description,
			kind: kind as LineKind,
			listCents: prices.list_price,
			costCents: prices.cost
		});
	}

	if (errors.length > 0) return { ok: false, errors };
	if (items.length === 0) {
		return {
			ok: false,
			errors: [{ row: null, column: null, message: 'The file has a header but no price rows' }]
		};
	}
	return { ok: true, items };
}
