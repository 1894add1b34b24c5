import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { parseCsv } from './csv';

function records(text: string): string[][] {
	const result = parseCsv(text);
	if (!result.ok) throw new Error(`expected records, got: ${result.message}`);
	return result.records;
}

describe('parseCsv (RFC 4180)', () => {
	it('splits fields on commas and records on CRLF, LF or CR', () => {
		expect(records('a,b,c\r\n1,2,3\r\n')).toEqual([
			['a', 'b', 'c'],
			['1', '2', '3']
		]);
		expect(records('a,b\n1,2\n')).toEqual([
			['a', 'b'],
			['1', '2']
		]);
		expect(records('a,b\r1,2')).toEqual([
			['a', 'b'],
			['1', '2']
		]);
	});
	it('ends the last record without a final line break, and adds none for one', () => {
		expect(records('a,b')).toEqual([['a', 'b']]);
		expect(records('a,b\r\n')).toEqual([['a', 'b']]);
	});
	it('keeps empty fields, including a trailing one', () => {
		expect(records(',a,,\n')).toEqual([['', 'a', '', '']]);
		expect(records('a,')).toEqual([['a', '']]);
	});
	it('reads quoted fields with commas, line breaks and doubled quotes', () => {
		expect(records('"a,b","line 1\r\nline 2","say ""hi"""\n')).toEqual([
			['a,b', 'line 1\r\nline 2', 'say "hi"']
		]);
		// an empty quoted field, and a field that is just one quote mark
		expect(records('"",""""\n')).toEqual([['', '"']]);
	});
	it('keeps a quote inside an unquoted field as a character', () => {
		expect(records('FRK-12,12" fork extension\n')).toEqual([['FRK-12', '12" fork extension']]);
	});
	it('drops a byte-order mark and keeps blank lines as rows', () => {
		expect(records('\ufeffsku\n\nA\n')).toEqual([['sku'], [''], ['A']]);
	});
	it('reads nothing from an empty text', () => {
		expect(records('')).toEqual([]);
		expect(records('\ufeff')).toEqual([]);
	});
	it('keeps spaces as written', () => {
		expect(records(' a , b \n')).toEqual([[' a ', ' b ']]);
	});
	it('reports a quoted field that is never closed, at the row where it opened', () => {
		expect(parseCsv('a,b\n1,"open\n2,3\n')).toEqual({
			ok: false,
			row: 2,
			message: 'Row 2: a quoted field is never closed; check for a missing " mark'
		});
	});
	it('reports text after a closing quote', () => {
		const result = parseCsv('a,b\n"x"y,2\n');
		expect(result).toMatchObject({ ok: false, row: 2 });
		expect(!result.ok && result.message).toMatch(/^Row 2: text follows a closing " mark/);
	});
	it('reads back any table written with every field quoted (property)', () => {
		const table = fc.array(fc.array(fc.string(), { minLength: 1, maxLength: 5 }), {
			minLength: 1,
			maxLength: 6
		});
		fc.assert(
			fc.property(table, fc.constantFrom('\r\n', '\n'), (rows, eol) => {
				const text = rows
					.map((row) => row.map((f) => `"${f.replace(/"/g, '""')}"`).join(','))
					.join(eol);
				expect(records(text)).toEqual(rows);
			})
		);
	});
});
