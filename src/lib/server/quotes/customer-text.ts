/**
 * What the customer reads about the chosen setup, on their page and in the PDF: why it fits their
 * site, in their terms, from the engine's figures and checks. The engine's ranking sentences are
 * for the dealer (ranks, costs over years, one setup's cost against another's) and never reach the
 * customer. Pure.
 */
import { checkName, checkResultLabel } from '../../check-labels';
import type { Check, EvaluateResult, ResolvedInput, SetupResult } from '../rules/types';

export interface CustomerCheck {
	name: string;
	result: Check['result'];
	resultLabel: string;
	measured: number | null;
	limit: number | null;
	unit: string;
	message: string;
	remedy: string | null;
}

export interface CustomerSetupText {
	/** why this setup suits the site, one sentence each */
	why: string[];
	/** the other setups looked at, in words that carry no price */
	others: { name: string; note: string }[];
	checks: CustomerCheck[];
}

const plural = (n: number, one: string, many: string) => `${n} ${n === 1 ? one : many}`;
const figure = (n: number) => (Number.isInteger(n) ? String(n) : n.toFixed(1));

/** How the setup handles batteries, said plainly. */
function howItWorks(setup: SetupResult, input: ResolvedInput): string {
	switch (setup.id) {
		case 'in-truck':
			return 'Each battery stays in its truck and is charged there, so no exchange equipment is needed.';
		case 'overhead-hoist':
			return input.site.crane
				? "Batteries are lifted out of and into the trucks with your site's own overhead hoist and a lifting beam."
				: 'Batteries are lifted out of and into the trucks with an overhead hoist and a lifting beam.';
		case 'roller-bed':
			return input.site.rollerStands.length
				? "Batteries slide sideways out of the trucks onto your site's own roller stands, and the charged ones slide back in."
				: 'Batteries slide sideways out of the trucks onto roller stands, and the charged ones slide back in.';
		case 'trolley-stand':
			return 'Batteries roll out of the trucks on latching trolleys onto exchange stands, so no lifting gear is needed.';
	}
}

/** The first problem of a setup, for "other setups", without any price. */
function otherNote(o: SetupResult): string {
	const fail = o.checks.find((c) => c.result === 'fail' && !c.fixable) ?? o.checks.find((c) => c.result === 'fail');
	if (o.verdict === 'does-not-fit') return `does not fit as surveyed${fail ? `: ${fail.message}` : '.'}`;
	if (o.verdict === 'fits-with-changes') return `would need changes${fail ? `: ${fail.message}` : '.'}`;
	return 'would also fit.';
}

export function customerSetupText(result: EvaluateResult, input: ResolvedInput, setupId: string): CustomerSetupText {
	const setup = result.setups.find((s) => s.id === setupId) ?? result.setups[0];
	const why: string[] = [];
	const fleet = result.fleet;
	const bpt = setup.batteriesPerTruck;
	if (fleet && fleet.hoursPerDay > 0 && fleet.runtimeHours > 0) {
		why.push(
			bpt <= 1
				? `Your trucks work ${figure(fleet.hoursPerDay)} h a day, and one charged battery per truck covers that with charging between shifts.`
				: `Your trucks work ${figure(fleet.hoursPerDay)} h a day and one charged battery lasts about ${figure(fleet.runtimeHours)} h, so each truck needs ${plural(bpt, 'battery', 'batteries')} a day.`
		);
	}
	why.push(howItWorks(setup, input));
	if (setup.changesPerTruckPerDay > 0) {
		why.push(`Each truck changes its battery ${setup.changesPerTruckPerDay === 1 ? 'once' : `${figure(setup.changesPerTruckPerDay)} times`} a day.`);
	}
	if (setup.verdict === 'fits') {
		why.push('It fits your trucks and site as surveyed, with the equipment in this quote.');
	} else if (setup.verdict === 'fits-with-changes') {
		const remedies = [...new Set(setup.checks.filter((c) => c.result === 'fail' && c.remedy).map((c) => c.remedy as string))];
		why.push(`It fits once these changes are made: ${remedies.join(' ')}`.trim());
	}
	const others = result.setups
		.filter((s) => s.id !== setup.id)
		.sort((a, b) => a.rank - b.rank)
		.map((o) => ({ name: o.name, note: otherNote(o) }));
	const checks = setup.checks.map((c) => ({
		name: checkName(c),
		result: c.result,
		resultLabel: checkResultLabel(c),
		measured: c.measured,
		limit: c.limit,
		unit: c.unit,
		message: c.message,
		remedy: c.remedy
	}));
	return { why, others, checks };
}

/**
 * Whether the customer's page and the PDF print a tax line: only when a rate applies. A quote with
 * no tax (no region, or "No tax / exempt") shows none, as the company settings page says.
 */
export function showsTaxLine(rev: { taxLabel: string | null; totals: { taxRateBp: number; taxCents: number } }): boolean {
	return rev.taxLabel !== null || rev.totals.taxRateBp > 0 || rev.totals.taxCents > 0;
}
