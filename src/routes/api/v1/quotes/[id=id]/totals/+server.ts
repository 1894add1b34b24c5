import { error, json } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { quoteEditSchema } from '$lib/schemas/quote';
import { getQuote } from '$lib/server/repositories/quotes';
import { getCompanySettings, taxRateFor } from '$lib/server/repositories/pricing';
import { describeEditIssues } from '$lib/server/quotes/edit-errors';
import { figures, linesFromEdit } from '$lib/server/quotes/workflow';
import { readJsonBody } from '$lib/server/json-body';
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
	if (!parsed.success) {
		const { error: message, errors } = describeEditIssues(parsed.error.issues, body.value);
		return json({ message, errors }, { status: 400 });
	}
	const d = parsed.data;
	const priced = await linesFromEdit(
		q,
		d.lines.map((l) => ({ sku: l.sku, quantity: l.quantity, lineDiscountBp: l.discountPercent }))
	);
	if (!priced.ok) return json({ message: priced.message, errors: { [priced.field]: [priced.message] } }, { status: 400 });
	const lines = priced.value;
	const settings = await getCompanySettings();
	const tax = d.taxRegion ? await taxRateFor(d.taxRegion) : null;
	const { priced: result, approval } = figures(
		lines,
		{ overallDiscountBp: d.overallDiscountPercent, taxRateBp: tax?.rateBp ?? 0, depositShareBp: q.revision.depositShareBp },
		settings
	);
	return json({ lines: result.lines, totals: result.totals, approval, lineMeta: lines.map((l) => ({ sku: l.sku, description: l.description, kind: l.kind, noCharge: l.noCharge, inPriceBook: l.inPriceBook })) });
};
