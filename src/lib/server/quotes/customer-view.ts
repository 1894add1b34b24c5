import { error } from '@sveltejs/kit';
import { getQuote, type QuoteView } from '../repositories/quotes';
import { resolveLink, type ResolvedLink } from './customer-links';
import { isPastValidity } from './states';
import { priceLine, type LineKind } from './pricing';
import { customerSetupText, showsTaxLine } from './customer-text';
import type { EvaluateResult, ResolvedInput } from '../rules/types';

/**
 * Checks a customer link: 404 for a token never issued, 410 for a superseded revision or an expired
 * quote (saying only that), else the link. Reveals nothing else.
 */
export async function checkLink(token: string, now = new Date()): Promise<ResolvedLink> {
	const link = await resolveLink(token);
	if (!link) error(404, { message: 'This link is not valid. Check that it was copied whole from the e-mail.', kind: 'invalid' });
	if (link.revision < link.latestRevision) {
		error(410, { message: 'A newer revision of this quote has been prepared for you.', kind: 'superseded' });
	}
	if (link.state === 'expired' || (isPastValidity(now, link.expiresAt) && !['accepted', 'deposit-paid'].includes(link.state))) {
		error(410, { message: 'This quote has passed its validity date. Ask your sales contact for a fresh one.', kind: 'expired' });
	}
	return link;
}

/** A checked link with its quote revision and lines (the customer never sees the quote's history). */
export async function openLink(token: string, now = new Date()): Promise<{ link: ResolvedLink; quote: QuoteView }> {
	const link = await checkLink(token, now);
	const found = await getQuote(link.quoteId, null, { revision: link.revision, history: false });
	if (!found.ok) error(404, { message: 'This link is not valid.', kind: 'invalid' });
	return { link, quote: found.value };
}

/**
 * What the customer may see of a quote: no costs, margins or internal notes on lines, and of the
 * engine's answer only the chosen setup in the customer's words (customer-text.ts), the checks and
 * what the to-scale drawing needs — not the ranking, the other setups' costs or the catalogue prices.
 */
export function customerSafe(q: QuoteView) {
	const rev = q.revision;
	const t = rev.totals;
	const result = rev.engineResult as EvaluateResult;
	const input = rev.engineInput as ResolvedInput;
	const setup = result.setups.find((s) => s.id === rev.setupId) ?? result.setups[0];
	return {
		number: rev.number,
		revision: rev.revision,
		state: rev.state,
		customerName: q.customerName,
		siteName: q.siteName,
		siteAddress: q.siteAddress,
		ownerName: q.ownerName,
		ownerEmail: q.ownerEmail,
		contactName: rev.contactName,
		setupId: rev.setupId,
		setupName: rev.setupName,
		validUntil: rev.validUntil,
		sentAt: rev.sentAt,
		terms: rev.terms,
		notes: rev.notes,
		taxLabel: rev.taxLabel,
		// a tax line only when a rate applies (company settings: a region without a rate gets none)
		showTax: showsTaxLine(rev),
		setup: {
			batteriesPerTruck: setup.batteriesPerTruck,
			changesPerTruckPerDay: setup.changesPerTruckPerDay,
			...customerSetupText(result, input, setup.id)
		},
		cautions: result.cautions,
		drawing: {
			setup: setup.id,
			truck: input.truck,
			battery: input.battery,
			palletTruck: input.site.palletTrucks[0],
			stand: input.site.rollerStands[0],
			crane: input.site.crane,
			checks: setup.checks
		},
		lines: q.lines.map((l) => {
			const p = priceLine({ ...l, kind: l.kind as LineKind });
			return {
				sku: l.sku,
				description: l.description,
				quantity: l.quantity,
				noCharge: l.noCharge,
				unitListCents: l.unitListCents,
				lineDiscountBp: p.lineDiscountBp,
				netCents: p.netCents
			};
		}),
		totals: {
			subtotalCents: t.subtotalCents,
			overallDiscountBp: t.overallDiscountBp,
			overallDiscountCents: t.overallDiscountCents,
			netBeforeTaxCents: t.netBeforeTaxCents,
			taxRateBp: t.taxRateBp,
			taxCents: t.taxCents,
			totalCents: t.totalCents,
			depositShareBp: t.depositShareBp,
			depositCents: t.depositCents,
			balanceCents: t.balanceCents
		}
	};
}
