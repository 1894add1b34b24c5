/**
 * PostgreSQL's "data exception" errors (SQLSTATE class 22: a NUL in text, a number out of range,
 * text that is not a valid value of the column's type) mean the request carried a value that
 * cannot be stored. Schemas refuse such values field by field; this is the net behind them, so a
 * value a schema missed is answered as a bad request (400) rather than a server fault (500).
 * https://www.postgresql.org/docs/current/errcodes-appendix.html
 */
export function isBadValueError(err: unknown): boolean {
	return /^22[0-9A-Z]{3}$/.test(sqlState(err));
}

/**
 * "lock_not_available" (55P03): the row is being changed by another request and did not come free
 * within the lock timeout. The request can simply be sent again: a conflict (409), not a fault.
 */
export function isBusyError(err: unknown): boolean {
	return sqlState(err) === '55P03';
}

function sqlState(err: unknown): string {
	if (!err || typeof err !== 'object') return '';
	const code =
		(err as { original?: { code?: unknown } }).original?.code ??
		(err as { parent?: { code?: unknown } }).parent?.code ??
		(err as { code?: unknown }).code;
	return typeof code === 'string' ? code : '';
}

export const BAD_VALUE_MESSAGE =
	'Some of what was sent cannot be stored as it is (a control character, or a number out of range). Check the fields and try again.';

export const BUSY_MESSAGE =
	'Someone else is changing this right now. Nothing was changed by this request; try again in a moment.';
