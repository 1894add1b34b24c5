import { error, fail, redirect } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/auth/guard';
import { can } from '$lib/server/auth/permissions';
import { quoteActionSchema, quoteEditSchema } from '$lib/schemas/quote';
import { getQuote } from '$lib/server/repositories/quotes';
import { getCompanySettings, listTaxRates } from '$lib/server/repositories/pricing';
import { allowedActions } from '$lib/server/quotes/states';
import { ACTION_PERMISSION, act, figures, saveDraft } from '$lib/server/quotes/workflow';
import { deliveryTrail } from '$lib/server/quotes/trail';
import { describeEditIssues } from '$lib/server/quotes/edit-errors';
import { readinessProblems } from '$lib/quote-readiness';
import type { Actions, PageServerLoad } from './$types';

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'quote:read');
	const rev = Number(event.url.searchParams.get('rev')) || undefined;
	const found = await getQuote(event.params.id, user, { revision: rev });
	if (!found.ok) error(found.status, found.status === 404 ? 'No such quote.' : 'This quote belongs to another team.');
	const q = found.value;
	const [settings, taxRates, trail] = await Promise.all([getCompanySettings(), listTaxRates(), deliveryTrail(q.id)]);
	const latest = q.revisions.at(-1)?.revision === q.revision.revision;
	const actions = latest
		? allowedActions(q.revision.state, user.role, {
				approvalRequired: q.revision.approvalRequired,
				now: new Date(),
				validUntil: q.revision.validUntil ? new Date(q.revision.validUntil) : new Date('9999-12-31')
			}).filter((a) => a !== 'view' && a !== 'accept' && a !== 'pay' && a !== 'expire')
		: [];
	const { priced } = figures(q.lines, q.revision, settings);
	// the manager's latest "send back" on this revision, shown at the top while it waits for the rep
	const changeRequest =
		q.revision.state === 'changes-requested'
			? (q.events.filter((e) => e.action === 'request-changes' && e.revision === q.revision.revision).at(-1) ?? null)
			: null;
	const siteRegionRate = q.siteRegion ? (taxRates.find((t) => t.regionCode === q.siteRegion!.trim().toUpperCase()) ?? null) : null;
	return {
		quote: q,
		pricedLines: priced.lines.map((l) => ({ netCents: l.netCents, marginBp: l.marginBp })),
		latest,
		actions,
		canEdit: latest && can(user.role, 'quote:edit') && (q.revision.state === 'draft' || q.revision.state === 'changes-requested'),
		seeCost: can(user.role, 'quote:see-cost'),
		policy: { repDiscountAuthorityBp: settings.repDiscountAuthorityBp, marginFloorBp: settings.marginFloorBp },
		viewerRole: user.role,
		// what stops submit / mark-ready now, from the saved revision (the server checks it again)
		readiness: readinessProblems(q.revision),
		tax: { siteRegion: q.siteRegion, siteRegionHasRate: !!siteRegionRate },
		changeRequest: changeRequest && { comment: changeRequest.comment, by: changeRequest.actorName ?? 'A sales manager', at: changeRequest.at },
		taxRates,
		trail,
		timeZone: settings.timeZone || 'UTC'
	};
};

function parsePayload(raw: FormDataEntryValue | null): unknown {
	if (typeof raw !== 'string' || raw.length > 200_000) return null;
	try {
		return JSON.parse(raw);
	} catch {
		return null;
	}
}

export const actions: Actions = {
	save: async (event) => {
		const user = requirePermission(event, 'quote:edit');
		const raw = parsePayload((await event.request.formData()).get('payload'));
		if (raw === null) return fail(400, { error: 'The changes could not be read; reload the page and make them again.', errors: {} });
		const parsed = quoteEditSchema.safeParse(raw);
		if (!parsed.success) return fail(400, describeEditIssues(parsed.error.issues, raw));
		const d = parsed.data;
		const saved = await saveDraft(event.params.id, user, {
			overallDiscountBp: d.overallDiscountPercent,
			taxRegion: d.taxRegion || null,
			notes: d.notes,
			contactName: d.contactName,
			contactEmail: d.contactEmail,
			lines: d.lines.map((l) => ({ sku: l.sku, quantity: l.quantity, lineDiscountBp: l.discountPercent }))
		});
		if (!saved.ok) return fail(saved.status, { error: saved.message, errors: saved.field ? { [saved.field]: [saved.message] } : {} });
		return { saved: true };
	},
	act: async (event) => {
		const user = requirePermission(event, 'quote:read');
		const parsed = quoteActionSchema.safeParse(Object.fromEntries(await event.request.formData()));
		if (!parsed.success) return fail(400, { error: 'Unknown action.' });
		if (!can(user.role, ACTION_PERMISSION[parsed.data.action])) return fail(403, { error: 'Your role does not allow this.' });
		const done = await act(event.params.id, { user, role: user.role }, parsed.data.action, { comment: parsed.data.comment });
		if (!done.ok) return fail(done.status, { error: done.message });
		redirect(303, `/quotes/${event.params.id}`);
	}
};
