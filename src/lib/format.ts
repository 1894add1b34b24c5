const dateFormat = new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'short', year: 'numeric', timeZone: 'UTC' });

/** An ISO timestamp as a short date ("4 Mar 2026"), the same on server and browser (UTC). */
export function formatDate(iso: string): string {
	const d = new Date(iso);
	return Number.isNaN(d.getTime()) ? '' : dateFormat.format(d);
}

/**
 * A quote's dates ("December 31, 2026") on the dealer's wall calendar (`timeZone`, from the company
 * settings): the page, the PDF and the e-mail then name the same day wherever they are read.
 */
export function quoteDate(iso: string | null | undefined, timeZone: string): string {
	if (!iso) return '—';
	const d = new Date(iso);
	if (Number.isNaN(d.getTime())) return '—';
	return new Intl.DateTimeFormat('en-US', { year: 'numeric', month: 'long', day: 'numeric', timeZone }).format(d);
}

/** A moment in a quote's trail ("Dec 1, 2026, 8:49 PM PST") on the dealer's clock, with its zone named. */
export function quoteMoment(iso: string | null | undefined, timeZone: string): string {
	if (!iso) return '—';
	const d = new Date(iso);
	if (Number.isNaN(d.getTime())) return '—';
	return new Intl.DateTimeFormat('en-US', {
		year: 'numeric',
		month: 'short',
		day: 'numeric',
		hour: 'numeric',
		minute: '2-digit',
		timeZone,
		timeZoneName: 'short'
	}).format(d);
}
