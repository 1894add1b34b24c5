/**
 * PostgreSQL's "data exception" errors (SQLSTATE class 22: a NUL in text, a number out of range,
 * text that is not a valid value of the column's type) mean the request carried a value that
 * cannot be stored. Schemas refuse such values field by field; this is the net behind them, so a
 * value a schema missed is answered as a bad request (400) rather than a server fault (500).
 * https://www.postgresql.org/docs/current/errcodes-appendix.html
 */
export function isBadValueError(err: unknown): boolean {
	if (!err || typeof err !== 'object') return false;
	const code =
		(err as { original?: { code?: unknown } }).original?.code ??
		(err as { parent?: { code?: unknown } }).parent?.code ??
		(err as { code?: unknown }).code;
	return typeof code === 'string' && /^22[0-9A-Z]{3}$/.test(code);
}

export const BAD_VALUE_MESSAGE =
	'Some of what was sent cannot be stored as it is (a control character, or a number out of range). Check the fields and try again.';
