/**
 * Ranking (issue 3): with one battery per truck, `in-truck` comes first when it fits. With more, an
 * overhead hoist that passes puts `overhead-hoist` first; else the site's matching roller stands or
 * changer put `roller-bed` first; else `trolley-stand`. A setup that does not fit is never first.
 * The rest follow by verdict (fits, then fits with changes, then does not fit) and then by the
 * lower cost over the comparison years. Every rank carries plain-language reasons.
 */

import { formatNumber } from '../../units';
import { count, money, num, type Ctx } from './context';
import type { SetupDraft } from './setups';
import { SETUP_NAMES, type SetupId, type SetupResult, type Verdict } from './types';

const VERDICT_ORDER: Record<Verdict, number> = {
	fits: 0,
	'fits-with-changes': 1,
	'does-not-fit': 2
};
const ORDINALS = ['first', 'second', 'third', 'fourth'];

function draftOf(drafts: readonly SetupDraft[], id: SetupId): SetupDraft | undefined {
	for (const d of drafts) if (d.result.id === id) return d;
	return undefined;
}

function workable(d: SetupDraft | undefined): boolean {
	return d !== undefined && d.result.verdict !== 'does-not-fit';
}

/** The setup the site's situation favours, if it is workable (see module comment). */
export function preferredSetup(ctx: Ctx, drafts: readonly SetupDraft[]): SetupId | null {
	if (ctx.duty.batteriesPerTruck === 1) {
		return workable(draftOf(drafts, 'in-truck')) ? 'in-truck' : null;
	}
	const hoist = draftOf(drafts, 'overhead-hoist');
	if (hoist && hoist.siteFavours && workable(hoist)) return 'overhead-hoist';
	const bed = draftOf(drafts, 'roller-bed');
	if (bed && bed.siteFavours && workable(bed)) return 'roller-bed';
	return workable(draftOf(drafts, 'trolley-stand')) ? 'trolley-stand' : null;
}

function preferredWhy(ctx: Ctx, id: SetupId): string {
	const n = count(ctx.duty.batteriesPerTruck, 'battery', 'batteries');
	switch (id) {
		case 'in-truck':
			return 'one battery per truck covers the day, so no exchange gear or extra batteries are needed';
		case 'overhead-hoist':
			return `the day needs ${n} per truck and the site's overhead hoist carries battery and lifting beam, so each truck keeps one latching trolley and extra batteries need no trolleys`;
		case 'roller-bed':
			return `the day needs ${n} per truck and the site's own stands or changer meet the roller bed, so batteries transfer sideways with gear the site already owns`;
		case 'trolley-stand':
			return `the day needs ${n} per truck and, with no suitable overhead hoist or matching roller stands on site, latching trolleys and exchange stands change batteries without transfer gear`;
	}
}

function verdictReason(r: SetupResult): string {
	if (r.verdict === 'fits') return "Fits as surveyed with the setup's standard items.";
	const parts: string[] = [];
	const changes = r.verdict === 'fits-with-changes';
	for (const c of r.checks) {
		if (c.result !== 'fail') continue;
		if (changes) {
			if (c.remedy && !parts.includes(c.remedy)) parts.push(c.remedy);
		} else if (!c.fixable) {
			parts.push(c.message);
		}
	}
	return `${changes ? 'Fits with changes' : 'Does not fit'}: ${parts.join(' ')}`;
}

function costReason(ctx: Ctx, r: SetupResult): string {
	const c = r.costOverYears;
	return `Over ${ctx.years} years: ${money(c.equipment)} equipment, ${money(c.batteries)} extra batteries and ${money(c.labour)} change-out labour (${formatNumber(r.fleet.labourHoursPerYear, 0, ',')} h a year), ${money(c.total)} in all.`;
}

interface Ranked {
	r: SetupResult;
	i: number;
	preferred: boolean;
}

/** Does-not-fit last; the preferred setup first; then by verdict, cost and the fixed order. */
function compareRanked(a: Ranked, b: Ranked): number {
	const da = a.r.verdict === 'does-not-fit' ? 1 : 0;
	const db = b.r.verdict === 'does-not-fit' ? 1 : 0;
	if (da !== db) return da - db;
	if (a.preferred !== b.preferred) return a.preferred ? -1 : 1;
	const va = VERDICT_ORDER[a.r.verdict];
	const vb = VERDICT_ORDER[b.r.verdict];
	if (va !== vb) return va - vb;
	if (a.r.costOverYears.total !== b.r.costOverYears.total) {
		return a.r.costOverYears.total - b.r.costOverYears.total;
	}
	return a.i - b.i;
}

/**
 * Sets `rank` and `reasons` on every setup (the array keeps the fixed setup order) and returns the
 * recommended setup: the first-ranked one unless nothing fits.
 */
export function rankSetups(ctx: Ctx, drafts: readonly SetupDraft[]): SetupId | null {
	const preferred = preferredSetup(ctx, drafts);
	const order: Ranked[] = [];
	for (let i = 0; i < drafts.length; i++) {
		const r = drafts[i].result;
		order.push({ r, i, preferred: r.id === preferred });
	}
	order.sort(compareRanked);

	const preferredName = preferred ? SETUP_NAMES[preferred] : '';
	for (let k = 0; k < order.length; k++) {
		const r = order[k].r;
		r.rank = k + 1;
		const reasons: string[] = [];
		const ord = ORDINALS[k] ?? `number ${k + 1}`;
		if (r.verdict === 'does-not-fit') {
			reasons.push(`Ranked ${ord}: it does not fit, whatever is ordered.`);
		} else if (r.id === preferred) {
			let cheaper: SetupResult | null = null;
			for (const o of order) {
				const x = o.r;
				if (x === r || x.verdict === 'does-not-fit') continue;
				if (x.costOverYears.total < (cheaper ?? r).costOverYears.total) cheaper = x;
			}
			const note = cheaper
				? ` ${cheaper.name} would cost ${money(r.costOverYears.total - cheaper.costOverYears.total)} less over ${ctx.years} years.`
				: '';
			reasons.push(`Ranked ${ord}: ${preferredWhy(ctx, r.id)}.${note}`);
		} else {
			const prev = k > 0 ? order[k - 1].r : null;
			let why = '';
			if (preferred && k === 1)
				why = ` ${preferredName} comes first because ${preferredWhy(ctx, preferred)}.`;
			else if (prev && VERDICT_ORDER[prev.verdict] < VERDICT_ORDER[r.verdict]) {
				why = ` It needs changes; ${prev.name} fits as surveyed.`;
			} else if (prev) {
				const diff = r.costOverYears.total - prev.costOverYears.total;
				why =
					diff > 0
						? ` It costs ${money(diff)} more over ${ctx.years} years than ${prev.name}.`
						: ` It costs the same over ${ctx.years} years as ${prev.name}.`;
			} else if (!preferred && ctx.duty.batteriesPerTruck > 1) {
				why = ` No setup is favoured by the site's own gear, so the lowest cost over ${ctx.years} years decides.`;
			}
			reasons.push(`Ranked ${ord}.${why}`);
		}
		reasons.push(verdictReason(r));
		if (r.id !== 'in-truck') {
			reasons.push(
				r.changesPerTruckPerDay > 0
					? `${count(r.batteriesPerTruck, 'battery', 'batteries')} per truck, ${count(r.changesPerTruckPerDay, 'change', 'changes')} per truck a day at ${num(ctx.p.minutesPerChange[r.id], 1)} min each.`
					: `${count(r.batteriesPerTruck, 'battery', 'batteries')} per truck; no daily changes.`
			);
		}
		reasons.push(costReason(ctx, r));
		r.reasons = reasons;
	}
	const first = order[0].r;
	return first.verdict === 'does-not-fit' ? null : first.id;
}
