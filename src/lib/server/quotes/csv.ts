/**
 * A small CSV reader following RFC 4180, written here rather than pulled in as a package. Pure.
 *
 * - Fields are separated by commas, records by CRLF, LF or a lone CR (all three turn up in exports).
 * - A field that starts with a double quote is quoted: it runs to the next lone quote and may hold
 *   commas, line breaks and doubled quotes (`""` → `"`). After its closing quote only a comma, a
 *   line break or the end of the text may follow.
 * - A quote inside an unquoted field is kept as a character (`12" forks`), as spreadsheets read it.
 * - A leading byte-order mark is dropped. A final line break does not start an empty record.
 * - A blank line is kept as a record with one empty field, so record n is always spreadsheet row n.
 * Fields are returned exactly as written: no trimming, no type conversion.
 */

export type CsvResult =
	{ ok: true; records: string[][] } | { ok: false; row: number; message: string };

/** Split CSV text into records of fields; see the module comment for the dialect. */
export function parseCsv(text: string): CsvResult {
	const input = text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
	const n = input.length;
	const records: string[][] = [];
	if (n === 0) return { ok: true, records };

	let record: string[] = [];
	let i = 0;
	for (;;) {
		// one field, starting at i
		const row = records.length + 1;
		let field = '';
		if (input[i] === '"') {
			i++;
			let closed = false;
			while (i < n) {
				if (input[i] === '"') {
					if (input[i + 1] === '"') {
						field += '"';
						i += 2;
						continue;
					}
					closed = true;
					i++;
					break;
				}
				field += input[i];
				i++;
			}
			if (!closed) {
				return {
					ok: false,
					row,
					message: `Row ${row}: a quoted field is never closed; check for a missing " mark`
				};
			}
			if (i < n && input[i] !== ',' && input[i] !== '\r' && input[i] !== '\n') {
				return {
					ok: false,
					row: records.length + 1,
					message: `Row ${records.length + 1}: text follows a closing " mark; inside quotes, write a " mark as ""`
				};
			}
		} else {
			while (i < n && input[i] !== ',' && input[i] !== '\r' && input[i] !== '\n') {
				field += input[i];
				i++;
			}
		}
		record.push(field);

		// what ends the field: the end of the text, a comma, or a line break
		if (i >= n) {
			records.push(record);
			break;
		}
		if (input[i] === ',') {
			i++;
			continue;
		}
		i += input[i] === '\r' && input[i + 1] === '\n' ? 2 : 1;
		records.push(record);
		record = [];
		// a final line break does not start another record
		if (i >= n) break;
	}
	return { ok: true, records };
}
