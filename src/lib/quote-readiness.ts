/**
 * What a quote must carry before it leaves the rep's hands (submitted for approval or marked ready
 * to send): someone to address it to, an address to send it to, and a tax decision. Checked by the
 * server on the transition and shown on the quote page before the rep taps. Pure; no server imports.
 */
import { z } from 'zod';

export type ReadinessField = 'contactName' | 'contactEmail' | 'taxRegion';

export interface ReadinessProblem {
	field: ReadinessField;
	message: string;
}

export interface ReadinessInput {
	contactName: string;
	contactEmail: string;
	/** the region whose rate the quote carries; null when the rep chose "No tax / exempt" */
	taxRegion: string | null;
	/** the label of the rate found for `taxRegion`; null when none was found */
	taxLabel: string | null;
}

const email = z.string().trim().email().max(254);

/**
 * True when the quote names a tax region that has no rate in the settings (a site region missing
 * from the tax table): nobody has decided its tax yet.
 */
export function taxUndecided(rev: Pick<ReadinessInput, 'taxRegion' | 'taxLabel'>): boolean {
	return rev.taxRegion !== null && rev.taxRegion.trim() !== '' && rev.taxLabel === null;
}

/** Everything missing before the quote can be submitted or marked ready; empty when nothing is. */
export function readinessProblems(rev: ReadinessInput): ReadinessProblem[] {
	const problems: ReadinessProblem[] = [];
	if (!rev.contactName.trim()) {
		problems.push({ field: 'contactName', message: "Add the customer contact's name: the quote is addressed to them." });
	}
	if (!rev.contactEmail.trim()) {
		problems.push({ field: 'contactEmail', message: "Add the customer contact's e-mail address: the quote and its private link are sent there." });
	} else if (!email.safeParse(rev.contactEmail).success) {
		problems.push({ field: 'contactEmail', message: 'The contact e-mail address is not valid; correct it so the quote can be sent.' });
	}
	if (taxUndecided(rev)) {
		problems.push({
			field: 'taxRegion',
			message: `The site's region “${rev.taxRegion}” has no tax rate in the settings: choose the tax region that applies, or “No tax / exempt”.`
		});
	}
	return problems;
}
