import { describe, expect, it } from 'vitest';
import { parsePriceBookCsv, type PriceBookError, type PriceBookItem } from './price-book-csv';

const HEADER = 'sku,description,kind,list_price,cost';

function items(text: string): PriceBookItem[] {
	const result = parsePriceBookCsv(text);
	if (!result.ok)
		throw new Error(`expected items, got: ${result.errors.map((e) => e.message).join(' | ')}`);
	return result.items;
}
function errors(text: string): PriceBookError[] {
	const result = parsePriceBookCsv(text);
	if (result.ok) throw new Error(`expected errors, got ${result.items.length} items`);
	return result.errors;
}
const messages = (text: string) => errors(text).map((e) => e.message);

describe('a good price book', () => {
	it('becomes items with exact cents', () => {
		const text = [
			HEADER,
			'TRK-48-A,48 V counterbalance truck,truck,23456.78,19100',
			'OPT-RB,Roller bed in the compartment,setup,1234.5,800.05',
			'"ACC-LATCH","Latch adapter, for the pallet truck",accessory,0.29,0.1',
			'FRT,Freight to site,freight,0,0'
		].join('\r\n');
		expect(items(text)).toEqual([
			// 23456.78 → 2 345 678 ¢; 19100 → 1 910 000 ¢
			{
				row: 2,
				sku: 'TRK-48-A',
				description: '48 V counterbalance truck',
				kind: 'truck',
				listCents: 2_345_678,
				costCents: 1_910_000
			},
			// 1234.5 → 123 450 ¢; 800.05 → 80 005 ¢
			{
				row: 3,
				sku: 'OPT-RB',
				description: 'Roller bed in the compartment',
				kind: 'setup',
				listCents: 123_450,
				costCents: 80_005
			},
			// 0.29 → 29 ¢ (as a float, 0.29 × 100 = 28.999…); 0.1 → 10 ¢
			{
				row: 4,
				sku: 'ACC-LATCH',
				description: 'Latch adapter, for the pallet truck',
				kind: 'accessory',
				listCents: 29,
				costCents: 10
			},
			{
				row: 5,
				sku: 'FRT',
				description: 'Freight to site',
				kind: 'freight',
				listCents: 0,
				costCents: 0
			}
		]);
	});
	it('may order its columns freely, in any letter case, with a BOM, spaces and blank rows', () => {
		const text =
			'\ufeffCost, SKU ,Kind,List_Price,Description\n\n 100.00 , CHG-1 , Charger ,150,Charger 48 V\n';
		// the blank line is row 2, so the item is row 3
		expect(items(text)).toEqual([
			{
				row: 3,
				sku: 'CHG-1',
				description: 'Charger 48 V',
				kind: 'charger',
				listCents: 15_000,
				costCents: 10_000
			}
		]);
	});
});

describe('a bad price book names every problem, and nothing is imported', () => {
	it('an empty file', () => {
		expect(messages('')).toEqual([
			'The file is empty; the first row must be the header sku,description,kind,list_price,cost'
		]);
		expect(messages('\r\n\r\n')).toHaveLength(1);
	});
	it('a header with no rows', () => {
		expect(errors(`${HEADER}\r\n`)).toEqual([
			{ row: null, column: null, message: 'The file has a header but no price rows' }
		]);
		expect(messages(`${HEADER}\n\n\n`)).toEqual(['The file has a header but no price rows']);
	});
	it('a wrong header', () => {
		expect(messages('sku,description,kind,price,cost,cost\n')).toEqual([
			'Row 1: unknown column "price"; the columns are sku,description,kind,list_price,cost',
			'Row 1: the column cost appears twice in the header',
			'Row 1: the header has no list_price column; it must be sku,description,kind,list_price,cost'
		]);
		expect(messages('sku,,description,kind,list_price,cost\n')).toEqual([
			'Row 1: column 2 of the header has no name'
		]);
	});
	it('prices written as the price forms accept them: thousands commas and a dollar sign', () => {
		const got = items(`${HEADER}\nA-1,One,truck,"34,600.00","$1,234.5"\nA-2,Two,truck,$5.00,0007\n`);
		expect(got.map((i) => [i.listCents, i.costCents])).toEqual([
			[3_460_000, 123_450],
			[500, 700]
		]);
	});
	it('prices that are not dollars and cents', () => {
		const text = [
			HEADER,
			'A-1,One,truck,"12,50",1',
			'A-2,Two,truck,"1,23,4.00",1',
			'A-3,Three,truck,1.005,1',
			'A-4,Four,truck,-5,1',
			'A-5,Five,truck,1e3,1',
			'A-6,Six,truck,5.,1',
			'A-7,Seven,truck,,abc',
			'A-8,Eight,truck,100000000.00,1'
		].join('\n');
		expect(messages(text)).toEqual([
			'Row 2: list_price "12,50" is not a price like 1234.50',
			'Row 3: list_price "1,23,4.00" is not a price like 1234.50',
			'Row 4: list_price "1.005" is not a price like 1234.50',
			'Row 5: list_price "-5" is not a price like 1234.50',
			'Row 6: list_price "1e3" is not a price like 1234.50',
			'Row 7: list_price "5." is not a price like 1234.50',
			'Row 8: list_price is empty; write a price like 1234.50',
			'Row 8: cost "abc" is not a price like 1234.50',
			'Row 9: list_price "100000000.00" is larger than 99999999.99'
		]);
	});
	it('the largest accepted price is exact', () => {
		// 99 999 999.99 $ = 9 999 999 999 ¢
		expect(items(`${HEADER}\nBIG,Big,truck,99999999.99,0\n`)[0].listCents).toBe(9_999_999_999);
	});
	it('duplicate skus, ignoring case, pointing at the first row', () => {
		const text = [
			HEADER,
			'OPT-RB,Roller bed,setup,1,1',
			'X,x,setup,1,1',
			'opt-rb,Again,setup,1,1'
		].join('\n');
		expect(errors(text)).toEqual([
			{
				row: 4,
				column: 'sku',
				message: 'Row 4: sku "opt-rb" repeats the sku of row 2'
			}
		]);
	});
	it('an unknown kind, a bad sku, an empty description and a wrong field count', () => {
		const text = [
			HEADER,
			'A 1,,gadget,1,1',
			'B-1,"two\nlines",,1,1',
			'C-1,Three,truck,1',
			`${'D'.repeat(65)},${'d'.repeat(201)},truck,1,1`
		].join('\n');
		expect(errors(text)).toEqual([
			{
				row: 2,
				column: 'sku',
				message: 'Row 2: sku "A 1" may use only letters, digits and . _ - / (no spaces)'
			},
			{ row: 2, column: 'description', message: 'Row 2: description is empty' },
			{
				row: 2,
				column: 'kind',
				message:
					'Row 2: kind "gadget" is not one of truck, setup, accessory, freight, installation, battery, charger'
			},
			{
				row: 3,
				column: 'description',
				message: 'Row 3: description must be a single line of text'
			},
			{
				row: 3,
				column: 'kind',
				message:
					'Row 3: kind is empty; use one of truck, setup, accessory, freight, installation, battery, charger'
			},
			{
				row: 4,
				column: null,
				message:
					'Row 4: has 4 fields but the header has 5; a comma inside a field needs quotes around the field'
			},
			{
				row: 5,
				column: 'sku',
				message: `Row 5: sku "${'D'.repeat(40)}…" is longer than 64 characters`
			},
			{ row: 5, column: 'description', message: 'Row 5: description is longer than 200 characters' }
		]);
	});
	it('one bad row among good ones fails the whole file', () => {
		const text = [
			HEADER,
			'A-1,One,truck,1.00,1',
			'A-2,Two,truck,2.00,1',
			'A-3,Three,truck,12,50,1',
			'A-4,Four,truck,4.00,1'
		].join('\n');
		const result = parsePriceBookCsv(text);
		expect(result.ok).toBe(false);
		expect(!result.ok && result.errors.map((e) => e.row)).toEqual([4]);
	});
	it('a broken quote is reported at its row', () => {
		expect(errors(`${HEADER}\nA-1,"One,truck,1,1\n`)).toEqual([
			{
				row: 2,
				column: null,
				message: 'Row 2: a quoted field is never closed; check for a missing " mark'
			}
		]);
	});
	it('keeps hostile text as text', () => {
		const [item] = items(
			`${HEADER}\nX-1,"<script>alert(1)</script> \u202egnp.exe",accessory,1,1\n`
		);
		expect(item.description).toBe('<script>alert(1)</script> \u202egnp.exe');
	});
});
