/**
 * Formatting helpers for outgoing mail. Pure: no I/O, no framework imports.
 */

const HTML_ESCAPES: Record<string, string> = {
	'&': '&amp;',
	'<': '&lt;',
	'>': '&gt;',
	'"': '&quot;',
	"'": '&#39;'
};

/** Escapes the five characters that matter in HTML text and attribute values. */
export function escapeHtml(value: string): string {
	return value.replace(/[&<>"']/g, (c) => HTML_ESCAPES[c]);
}

/**
 * Bidirectional embedding, override and isolate controls (U+202A–U+202E, U+2066–U+2069). A name
 * carrying them can visually reorder the text around it (a spoofed amount or link), and no
 * legitimate name needs them: right-to-left letters display correctly without.
 */
const BIDI_CONTROLS = /[\u202A-\u202E\u2066-\u2069]/g;
/** C0/C1 control characters other than tab and line feed. */
const CONTROL_CHARS = /[\u0000-\u0008\u000B-\u001F\u007F-\u009F]/g;

/** A user-supplied value made safe for plain text: bidi controls and control characters removed. */
export function cleanText(value: string): string {
	return value.replace(BIDI_CONTROLS, '').replace(CONTROL_CHARS, '');
}

/** A user-supplied value for a one-line header such as the subject: also no line breaks. */
export function cleanLine(value: string): string {
	return cleanText(value).replace(/[\r\n\t]+/g, ' ').trim();
}

/**
 * A user-supplied value for HTML: cleaned, escaped, and isolated in `<bdi>` so a right-to-left
 * name does not reorder the words around it.
 */
export function userHtml(value: string): string {
	return `<bdi>${escapeHtml(cleanText(value))}</bdi>`;
}

/** Digits after the decimal point of a currency's minor unit (2 for EUR/USD, 0 for JPY). */
export function minorDigits(currency: string): number {
	return new Intl.NumberFormat('en', { style: 'currency', currency }).resolvedOptions()
		.maximumFractionDigits ?? 2;
}

/**
 * Integer minor units (cents) as money text, e.g. `formatMoney(1234567, 'EUR', 'de-DE')` →
 * "12.345,67 €". Never goes through a float sum: the division happens once, on display.
 */
export function formatMoney(cents: number, currency: string, locale = 'en-US'): string {
	if (!Number.isInteger(cents)) throw new Error(`money must be integer minor units, got ${cents}`);
	const digits = minorDigits(currency);
	return new Intl.NumberFormat(locale, {
		style: 'currency',
		currency,
		minimumFractionDigits: digits,
		maximumFractionDigits: digits
	}).format(cents / 10 ** digits);
}

/** A calendar date (e.g. a validity date, ISO `YYYY-MM-DD` or a Date) in words. */
export function formatDate(value: string | Date, locale = 'en-US', timeZone = 'UTC'): string {
	const date = typeof value === 'string' && /^\d{4}-\d{2}-\d{2}$/.test(value) ? new Date(`${value}T12:00:00Z`) : new Date(value);
	return new Intl.DateTimeFormat(locale, { dateStyle: 'long', timeZone }).format(date);
}

/** A moment (e.g. when a deposit was paid) with date and time. */
export function formatDateTime(value: string | Date, locale = 'en-US', timeZone = 'UTC'): string {
	return new Intl.DateTimeFormat(locale, {
		year: 'numeric',
		month: 'long',
		day: 'numeric',
		hour: 'numeric',
		minute: '2-digit',
		timeZone,
		timeZoneName: 'short'
	}).format(new Date(value));
}
