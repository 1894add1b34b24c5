import { error, json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { quoteEditSchema } from '$lib/schemas/quote';
import { getQuote } from '$lib/server/repositories/quotes';
import { getCompanySettings, priceItems, taxRateFor } from '$lib/server/repositories/pricing';
import { fieldErrors } from '$lib/server/evaluation';
import { figures } from '$lib/server/quotes/workflow';
import { readJsonBody } from '$lib/server/json-body';
import type { NewLine } from '$lib/server/repositories/quotes';
import type { RequestHandler } from './$types';

/**
 * Recalculates a draft's totals for the edits in the body, without saving: the builder calls it as
 * the rep types. Prices come from the quote's own price-book version.
 */
export const POST: RequestHandler = async (event) => {
	const user = requirePermission(event, 'quote:edit');
	const found = await getQuote(event.params.id, user);
	if (!found.ok) error(found.status, found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.');
	const q = found.value;
	const body = await readJsonBody(event.request, 200_000);
	if (!body.ok) return body.response;
	const parsed = quoteEditSchema.safeParse(body.value);
	if (!parsed.success) return json({ message: 'Check the figures.', errors: fieldErrors(parsed.error.issues) }, { status: 400 });
	const d = parsed.data;
	const known = new Map(q.lines.map((l) => [l.sku, l]));
	const prices = await priceItems(q.revision.priceBookVersionId, d.lines.map((l) => l.sku));
	const lines: NewLine[] = [];
	for (const l of d.lines) {
		const k = known.get(l.sku);
		const p = prices.get(l.sku);
		if (!k && !p) return json({ message: `“${l.sku}” is not in this quote's price book.`, errors: { lines: [`Unknown SKU ${l.sku}`] } }, { status: 400 });
		const list = p ? p.listCents : k!.unitListCents;
		lines.push({
			sku: l.sku,
			description: k?.description ?? p!.description,
			kind: k?.kind ?? p!.kind,
			quantity: l.quantity,
			unitListCents: list,
			unitCostCents: p ? p.costCents : k!.unitCostCents,
			lineDiscountBp: list === 0 ? 0 : l.discountPercent,
			noCharge: list === 0,
			source: k?.source ?? 'accessory',
			reason: k?.reason ?? '',
			inPriceBook: !!p
		});
	}
	const settings = await getCompanySettings();
	const tax = d.taxRegion ? await taxRateFor(d.taxRegion) : null;
	const { priced, approval } = figures(
		lines,
		{ overallDiscountBp: d.overallDiscountPercent, taxRateBp: tax?.rateBp ?? 0, depositShareBp: q.revision.depositShareBp },
		settings
	);
	return json({ lines: priced.lines, totals: priced.totals, approval, lineMeta: lines.map((l) => ({ sku: l.sku, description: l.description, kind: l.kind, noCharge: l.noCharge, inPriceBook: l.inPriceBook })) });
};
