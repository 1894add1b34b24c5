/**
 * Quote numbers and validity dates. Pure.
 *
 * A quote number is `TW-<year>-<sequence>` with the sequence zero-padded to six digits
 * (`TW-2026-000123`); revisions after the first add `-R<n>` (`TW-2026-000123-R2`). Every revision of
 * a quote shares the year and sequence; revision 1 carries no suffix, so the number printed on the
 * first PDF never changes meaning. A sequence past 999 999 simply prints more digits.
 */

export const QUOTE_NUMBER_PREFIX = 'TW';

export interface QuoteNumberParts {
	/** four-digit calendar year the quote was first created in */
	year: number;
	/** per-year running number, ≥ 1 */
	sequence: number;
	/** revision, ≥ 1; 1 is the original */
	revision: number;
}

function checkParts({ year, sequence, revision }: QuoteNumberParts): void {
	if (!Number.isInteger(year) || year < 1000 || year > 9999) {
		throw new RangeError(`A quote year must have four digits, got ${year}.`);
	}
	if (!Number.isSafeInteger(sequence) || sequence < 1) {
		throw new RangeError(`A quote sequence must be a whole number from 1, got ${sequence}.`);
	}
	if (!Number.isSafeInteger(revision) || revision < 1) {
		throw new RangeError(`A revision must be a whole number from 1, got ${revision}.`);
	}
}

/** `TW-2026-000123` for revision 1, `TW-2026-000123-R2` for revision 2. */
export function formatQuoteNumber(parts: QuoteNumberParts): string {
	checkParts(parts);
	const base = `${QUOTE_NUMBER_PREFIX}-${parts.year}-${String(parts.sequence).padStart(6, '0')}`;
	return parts.revision === 1 ? base : `${base}-R${parts.revision}`;
}

const QUOTE_NUMBER = /^TW-(\d{4})-(\d{6,15})(?:-R([1-9]\d{0,5}))?$/;

/**
 * Read a quote number back (case-insensitive, surrounding spaces ignored), or null when the text is
 * not one. `-R1` is refused: the first revision is written without a suffix, so each revision has
 * exactly one spelling.
 */
export function parseQuoteNumber(text: string): QuoteNumberParts | null {
	const match = QUOTE_NUMBER.exec(text.trim().toUpperCase());
	if (!match) return null;
	const parts = {
		year: Number(match[1]),
		sequence: Number(match[2]),
		revision: match[3] === undefined ? 1 : Number(match[3])
	};
	if (match[3] === '1' || parts.sequence < 1 || parts.year < 1000) return null;
	// a sequence with extra leading zeros ("0000123") is not how we print it
	if (formatQuoteNumber(parts) !== text.trim().toUpperCase()) return null;
	return parts;
}

/** The year, month and day of an instant on the wall calendar of `timeZone`, plus its UTC offset. */
function wallClock(instant: number, timeZone: string) {
	const parts = new Intl.DateTimeFormat('en-US', {
		timeZone,
		hourCycle: 'h23',
		year: 'numeric',
		month: 'numeric',
		day: 'numeric',
		hour: 'numeric',
		minute: 'numeric',
		second: 'numeric'
	}).formatToParts(new Date(instant));
	const get = (type: Intl.DateTimeFormatPartTypes) =>
		Number(parts.find((p) => p.type === type)?.value);
	const year = get('year');
	const month = get('month');
	const day = get('day');
	const asUtc = Date.UTC(year, month - 1, day, get('hour'), get('minute'), get('second'));
	// whole seconds: the formatter drops milliseconds
	const offsetMs = asUtc - (instant - (((instant % 1000) + 1000) % 1000));
	return { year, month, day, offsetMs };
}

/** The instant local midnight begins on a calendar date in `timeZone`. */
function startOfDay(year: number, month: number, day: number, timeZone: string): number {
	const midnightAsUtc = Date.UTC(year, month - 1, day);
	// guess with the offset at that moment, then correct once with the offset at the guess
	// (the two differ only when a daylight-saving change falls between them)
	let instant = midnightAsUtc - wallClock(midnightAsUtc, timeZone).offsetMs;
	instant = midnightAsUtc - wallClock(instant, timeZone).offsetMs;
	return instant;
}

/**
 * The last instant a quote sent at `sentAt` is valid: through the end of the `validityDays`-th
 * calendar day after the day it was sent, on the dealer's wall clock in `timeZone` (an IANA name,
 * default UTC). Sent on 10 March with 30 days → valid until 9 April, 23:59:59.999 local time. The
 * quote is past validity when now is strictly later (states.ts). `validityDays` is a whole number
 * ≥ 0; 0 means until the end of the day it was sent.
 */
export function validUntil(sentAt: Date, validityDays: number, timeZone = 'UTC'): Date {
	if (!Number.isSafeInteger(validityDays) || validityDays < 0) {
		throw new RangeError(`Validity must be a whole number of days from 0, got ${validityDays}.`);
	}
	if (Number.isNaN(sentAt.getTime())) throw new RangeError('The sending time is not a valid date.');
	const sent = wallClock(sentAt.getTime(), timeZone);
	// the local day after the last valid day; Date.UTC normalises day overflow into months and years
	const next = new Date(Date.UTC(sent.year, sent.month - 1, sent.day + validityDays + 1));
	const end = startOfDay(
		next.getUTCFullYear(),
		next.getUTCMonth() + 1,
		next.getUTCDate(),
		timeZone
	);
	return new Date(end - 1);
}
