/** Words and formats the price-book and settings pages share (browser and server). */

/** How each price-book kind is named on screen. */
export const KIND_LABELS: Record<string, string> = {
	truck: 'Truck',
	setup: 'Setup option',
	accessory: 'Accessory',
	freight: 'Freight',
	installation: 'Installation',
	battery: 'Battery',
	charger: 'Charger'
};

export const STATUS_LABELS: Record<string, string> = {
	draft: 'Draft',
	active: 'Active',
	archived: 'Archived'
};

const dayFormat = new Intl.DateTimeFormat('en-GB', {
	day: 'numeric',
	month: 'short',
	year: 'numeric',
	timeZone: 'UTC'
});

/** A calendar date 'YYYY-MM-DD' as "1 Apr 2026". */
export function formatDay(isoDate: string): string {
	const d = new Date(`${isoDate}T00:00:00Z`);
	return Number.isNaN(d.getTime()) ? isoDate : dayFormat.format(d);
}

/** A timestamp as "2 Dec 2026, 14:05" in the dealer's time zone. */
export function formatStamp(iso: string, timeZone: string): string {
	const d = new Date(iso);
	if (Number.isNaN(d.getTime())) return '';
	try {
		return new Intl.DateTimeFormat('en-GB', {
			dateStyle: 'medium',
			timeStyle: 'short',
			timeZone
		}).format(d);
	} catch {
		return new Intl.DateTimeFormat('en-GB', {
			dateStyle: 'medium',
			timeStyle: 'short',
			timeZone: 'UTC'
		}).format(d);
	}
}
