import { describe, expect, it } from 'vitest';
import { centsToDecimal, formatPriceBookCsv, type ExportItem } from './price-book-export';
import { parsePriceBookCsv } from './price-book-csv';

describe('centsToDecimal', () => {
	it.each([
		[123_450, '1234.50'],
		[5, '0.05'],
		[0, '0.00'],
		[99, '0.99'],
		[100, '1.00'],
		[9_999_999_999, '99999999.99']
	])('%i ¢ → %s', (cents, text) => expect(centsToDecimal(cents)).toBe(text));

	it('refuses fractions and negatives', () => {
		expect(() => centsToDecimal(1.5)).toThrow(RangeError);
		expect(() => centsToDecimal(-1)).toThrow(RangeError);
	});
});

describe('formatPriceBookCsv', () => {
	const items: ExportItem[] = [
		{
			sku: 'TW-L3-13',
			description: 'Truck 1.3 t',
			kind: 'truck',
			listCents: 2_480_000,
			costCents: 1_890_000
		},
		{
			sku: 'ACC-1',
			description: 'Adapter, "latching"',
			kind: 'accessory',
			listCents: 29,
			costCents: 10
		},
		{ sku: 'FRT', description: ' padded ', kind: 'freight', listCents: 0, costCents: 0 }
	];

	it('writes the upload header and quotes only what needs quoting', () => {
		expect(formatPriceBookCsv(items)).toBe(
			'sku,description,kind,list_price,cost\r\n' +
				'TW-L3-13,Truck 1.3 t,truck,24800.00,18900.00\r\n' +
				'ACC-1,"Adapter, ""latching""",accessory,0.29,0.10\r\n' +
				'FRT," padded ",freight,0.00,0.00\r\n'
		);
	});

	it('reads back through the upload parser as the same items', () => {
		const result = parsePriceBookCsv(formatPriceBookCsv(items.slice(0, 2)));
		expect(result.ok).toBe(true);
		if (result.ok)
			expect(result.items.map(({ row: _row, ...rest }) => rest)).toEqual(items.slice(0, 2));
	});
});
