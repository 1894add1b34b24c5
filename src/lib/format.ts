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

/**
 * How long something has waited, from `fromIso` to `nowIso`, in the largest sensible units:
 * "less than a minute", "25 min", "3 h 10 min", "2 days 4 h". Never negative.
 */
export function waitedFor(fromIso: string, nowIso: string): string {
	const ms = new Date(nowIso).getTime() - new Date(fromIso).getTime();
	if (!Number.isFinite(ms) || ms < 60_000) return 'less than a minute';
	const minutes = Math.floor(ms / 60_000);
	if (minutes < 60) return `${minutes} min`;
	const hours = Math.floor(minutes / 60);
	if (hours < 24) return minutes % 60 ? `${hours} h ${minutes % 60} min` : `${hours} h`;
	const days = Math.floor(hours / 24);
	const rest = hours % 24;
	return `${days} day${days === 1 ? '' : 's'}${rest ? ` ${rest} h` : ''}`;
}
