/**
 * Percentages typed by a person, held as whole basis points (1 % = 100 bp, 100 % = 10 000 bp; see
 * money.ts). Shared by the browser and the server.
 */

/** Result of parsing a typed percentage: basis points, or a sentence to show the user. */
export type PercentParseResult = { ok: true; bp: number } | { ok: false; message: string };

// digits with at most two decimals (".5" allowed), then an optional percent sign, spaces anywhere
// around the sign
const PERCENT = /^(\d*)(?:\.(\d{1,2}))?\s*%?$/;

/**
 * Parse "10", "10 %", "10%", "7.25", "0.5 %" or ".5" into whole basis points, digit by digit
 * (never through a float): "7.25" → 725 bp. Refused with a message: empty text, a negative number,
 * more than two decimals (a basis point is 0.01 %), a decimal comma, and anything else. No upper
 * bound here: callers state their own range.
 */
export function parsePercentBp(text: string): PercentParseResult {
	const typed = text.trim();
	if (typed === '' || typed === '%')
		return { ok: false, message: 'Enter a percentage, like 10 or 7.25 %.' };
	if (typed.startsWith('-'))
		return { ok: false, message: `Enter zero or more; "${typed}" is negative.` };
	const match = PERCENT.exec(typed);
	if (!match || (match[1] === '' && match[2] === undefined)) {
		if (/^\d*\.\d{3,}\s*%?$/.test(typed))
			return {
				ok: false,
				message: `"${typed}" has more than two decimals; 7.25 % is as fine as it goes.`
			};
		if (/^\d+,\d+\s*%?$/.test(typed))
			return { ok: false, message: `Write decimals after a point: ${typed.replace(',', '.')}.` };
		return { ok: false, message: `"${typed}" is not a percentage like 10 or 7.25 %.` };
	}
	const whole = match[1].replace(/^0+(?=\d)/, '') || '0';
	if (whole.length > 6) return { ok: false, message: `"${typed}" is far too large.` };
	return { ok: true, bp: Number(whole) * 100 + Number((match[2] ?? '').padEnd(2, '0')) };
}

/** Basis points as the text a person would type: 725 → "7.25", 1000 → "10", 5 → "0.05". */
export function percentText(bp: number): string {
	if (!Number.isSafeInteger(bp) || bp < 0)
		throw new RangeError(`not a rate in basis points: ${bp}`);
	const whole = Math.floor(bp / 100);
	const rest = bp % 100;
	if (rest === 0) return String(whole);
	return `${whole}.${String(rest).padStart(2, '0').replace(/0$/, '')}`;
}
